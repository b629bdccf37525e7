import { type Module, type Observer, Runtime, RuntimeError, type Variable } from "@observablehq/runtime";
import type { CellContext, CellDefinition, CellState, FailureCause } from "./cell-definition";
import { UnknownNameError, globalResolver } from "./global-resolver";
import { shortestCycle } from "./shortest-cycle";

/**
 * Names the runtime resolves itself in every module (its module builtins). A cell
 * may not take them as its name — `invalidation` is how the engine learns that a
 * computation is superseded — and may not list them as inputs.
 */
export const RESERVED_NAMES: ReadonlySet<string> = new Set(["invalidation", "visibility", "@variable"]);

/** Options of a {@link StudyEngine}. */
export interface StudyEngineOptions {
  /** Called on every state change (running-state refreshes are batched, see `progressInterval`). */
  onChange?: (id: string, state: CellState) => void;
  /** Names every cell may use besides the standard built-ins, e.g. the core API and Plot. */
  globals?: Record<string, unknown>;
  /**
   * Least time between two refreshes of a running cell's state (progress reports,
   * progressive values), in ms. Default 50. Status changes are never delayed.
   */
  progressInterval?: number;
}

/** One computation of a cell. */
interface Run {
  readonly controller: AbortController;
  /** performance.now() at start, for `seconds`. */
  readonly started: number;
  /** Date.now() at start, for the `since` of the running state. */
  readonly since: number;
  /** The compute returned an iterable; the run ends when it does. */
  progressive: boolean;
  finished: boolean;
  progress?: unknown;
  value?: unknown;
  hasValue: boolean;
}

interface Entry {
  def: CellDefinition;
  variable: Variable;
  state: CellState;
  run: Run | null;
  removed: boolean;
  /** Pending batched refresh of the running state, and when the last one was shown. */
  timer: ReturnType<typeof setTimeout> | null;
  lastRefresh: number;
}

const WAITING: CellState = Object.freeze({ status: "waiting" });

/** Marks errors the engine made or caught itself, so the observer knows their cause. */
type Tag = "own" | FailureCause;

/**
 * Runs a study's cells reactively on `@observablehq/runtime`: one runtime variable
 * (with an observer, so it computes) per cell. A cell recomputes when its
 * definition or an input changes, and only then; a failure (own error, cycle,
 * unknown or duplicate name) marks that cell and its dependents failed and
 * nothing else. Superseded computations are aborted through their context's
 * signal and their late results ignored.
 *
 * Unknown names are errors: names are resolved from other cells, then from the
 * standard built-ins and `globals` (see global-resolver.ts), never from the real
 * global object.
 */
export class StudyEngine {
  private readonly runtime: Runtime;
  private readonly module: Module;
  private readonly entries = new Map<string, Entry>();
  private readonly counts = new Map<string, number>();
  private readonly tags = new WeakMap<object, Tag>();
  private readonly onChange?: (id: string, state: CellState) => void;
  private readonly progressInterval: number;
  private quietWaiters: (() => void)[] = [];
  /** Wakes pending flushes on dispose (a disposed runtime computes nothing more). */
  private readonly flushWaiters = new Set<() => void>();
  private disposed = false;

  constructor(options: StudyEngineOptions = {}) {
    const { onChange, globals = {}, progressInterval = 50 } = options;
    if (!(progressInterval >= 0)) throw new RangeError(`progressInterval must be >= 0 ms, got ${progressInterval}`);
    this.onChange = onChange;
    this.progressInterval = progressInterval;
    this.runtime = new Runtime(null, globalResolver(globals).resolve);
    this.module = this.runtime.module();
  }

  /**
   * Makes the engine run exactly `definitions`: defines new cells, redefines changed
   * ones (see {@link CellDefinition.version}) and deletes cells no longer listed.
   * Unchanged cells keep their values and do not recompute unless an input changed.
   * Throws a TypeError for a repeated id or a definition without `compute`.
   */
  update(definitions: readonly CellDefinition[]): void {
    if (this.disposed) throw new Error("StudyEngine.update: the engine is disposed");
    const next = new Map<string, CellDefinition>();
    definitions.forEach((def, k) => {
      if (typeof def?.id !== "string") throw new TypeError(`definitions[${k}].id: must be a string, got ${typeof def?.id}`);
      if (next.has(def.id)) throw new TypeError(`definitions[${k}].id: "${def.id}" is used by more than one cell`);
      if (typeof def.compute !== "function") throw new TypeError(`definitions[${k}].compute: must be a function (cell "${def.id}")`);
      if (def.name !== null && typeof def.name !== "string") throw new TypeError(`definitions[${k}].name: must be a string or null (cell "${def.id}")`);
      next.set(def.id, def);
    });
    for (const [id, entry] of this.entries) {
      if (next.has(id)) continue;
      entry.removed = true;
      this.clearRefresh(entry);
      this.entries.delete(id);
      this.counts.delete(id);
      entry.variable.delete();
    }
    const touched: Entry[] = [];
    for (const def of next.values()) {
      let entry = this.entries.get(def.id);
      if (entry && sameDefinition(entry.def, def)) {
        entry.def = def; // same by the caller's key: later runs use the newest closure
        continue;
      }
      if (!entry) {
        // The observer needs the entry and the entry the variable: complete it in two steps.
        entry = { def, state: WAITING, run: null, removed: false, timer: null, lastRefresh: -Infinity } as Entry;
        entry.variable = this.module.variable(this.observer(entry));
        this.entries.set(def.id, entry);
        this.counts.set(def.id, 0);
      }
      entry.def = def;
      this.define(entry);
      touched.push(entry);
    }
    for (const entry of touched) this.setState(entry, WAITING, true);
  }

  /** The current state of cell `id`; throws a RangeError for an unknown id. */
  state(id: string): CellState {
    const entry = this.entries.get(id);
    if (!entry) throw new RangeError(`no cell with id "${id}"`);
    return entry.state;
  }

  /** The current state of every cell, by id (a fresh map). */
  states(): Map<string, CellState> {
    return new Map([...this.entries].map(([id, e]) => [id, e.state]));
  }

  /**
   * Resolves once no cell is waiting or running (every progressive cell has ended).
   * Immediately after `update` it first lets the runtime take in the change, so it
   * never resolves on states the update has made stale.
   */
  async settled(): Promise<void> {
    for (;;) {
      if (this.disposed) return;
      await this.flush();
      if (this.disposed || this.quiet()) return;
      await new Promise<void>((resolve) => this.quietWaiters.push(resolve));
    }
  }

  /** How many times each current cell's `compute` has been called, by id (a fresh map). */
  computeCounts(): Map<string, number> {
    return new Map(this.counts);
  }

  /** Stops everything: aborts every running computation; the engine cannot be updated again. */
  dispose(): void {
    if (this.disposed) return;
    this.disposed = true;
    for (const entry of this.entries.values()) this.clearRefresh(entry);
    this.runtime.dispose();
    this.wakeQuietWaiters();
    for (const wake of this.flushWaiters) wake();
    this.flushWaiters.clear();
  }

  // ---- defining ---------------------------------------------------------------

  private define(entry: Entry): void {
    const { def } = entry;
    const inputs = [...new Set(def.inputs)];
    const reservedInput = inputs.find((name) => RESERVED_NAMES.has(name));
    if (def.name !== null && RESERVED_NAMES.has(def.name)) {
      const error = new Error(`${def.name} is a name the engine reserves; give the cell another name`);
      return this.defineFailing(entry, null, error, { kind: "duplicate-name", name: def.name, cellIds: [def.id] });
    }
    if (reservedInput !== undefined) {
      return this.defineFailing(entry, def.name, new UnknownNameError(reservedInput), { kind: "unknown-name", name: reservedInput });
    }
    entry.variable.define(def.name, [...inputs, "invalidation"], (...args: unknown[]) => this.start(entry, inputs, args));
  }

  /** Defines a cell that fails with a cause known before it runs. */
  private defineFailing(entry: Entry, name: string | null, error: Error, cause: FailureCause): void {
    this.tags.set(error, cause);
    entry.variable.define(name, [], () => {
      throw error;
    });
  }

  /** The runtime calls this once all inputs are ready: one computation of the cell. */
  private start(entry: Entry, names: readonly string[], args: unknown[]): unknown {
    const invalidation = args[names.length] as Promise<void>;
    const controller = new AbortController();
    invalidation.then(() => controller.abort());
    const run: Run = { controller, started: performance.now(), since: Date.now(), progressive: false, finished: false, hasValue: false };
    entry.run = run;
    this.counts.set(entry.def.id, (this.counts.get(entry.def.id) ?? 0) + 1);
    this.setState(entry, { status: "running", since: run.since });

    const values: Record<string, unknown> = {};
    names.forEach((name, k) => (values[name] = args[k]));
    const context: CellContext = {
      signal: controller.signal,
      progress: (report) => {
        run.progress = report;
        this.refresh(entry, run);
      },
    };
    let result: unknown;
    try {
      result = entry.def.compute(values, context);
    } catch (error) {
      throw this.own(error);
    }
    if (isThenable(result)) {
      return untilAborted(Promise.resolve(result), controller.signal).then(
        (value) => this.maybeProgressive(entry, run, value),
        (error) => {
          throw this.own(error);
        },
      );
    }
    return this.maybeProgressive(entry, run, result);
  }

  /** Turns an iterable result into the generator the runtime pulls values from. */
  private maybeProgressive(entry: Entry, run: Run, value: unknown): unknown {
    if (!isIterator(value)) return value;
    run.progressive = true;
    return this.drive(entry, run, value);
  }

  private async *drive(entry: Entry, run: Run, source: AsyncIterable<unknown> | Iterator<unknown>): AsyncGenerator<unknown, void, unknown> {
    const iterator = Symbol.asyncIterator in source ? source[Symbol.asyncIterator]() : (source as Iterator<unknown>);
    let last: unknown;
    let ended = false;
    try {
      for (;;) {
        const step = await untilAborted(Promise.resolve(iterator.next()), run.controller.signal);
        if (step.done) break;
        last = step.value;
        run.value = last;
        run.hasValue = true;
        yield last;
      }
      ended = true;
    } catch (error) {
      throw this.own(error);
    } finally {
      // Superseded or failed: let the source release what it holds.
      if (!ended) Promise.resolve(iterator.return?.()).catch(() => {});
    }
    this.finish(entry, run, last);
  }

  private finish(entry: Entry, run: Run, value: unknown): void {
    if (run.finished || !this.isCurrent(entry, run)) return;
    run.finished = true;
    this.setState(entry, { status: "done", value, seconds: (performance.now() - run.started) / 1000, runs: this.counts.get(entry.def.id) ?? 0 });
  }

  private own(error: unknown): Error {
    const wrapped = error instanceof Error ? error : new Error(typeof error === "string" ? error : `threw ${String(error)}`);
    if (!this.tags.has(wrapped)) this.tags.set(wrapped, "own");
    return wrapped;
  }

  // ---- observing --------------------------------------------------------------

  private observer(entry: Entry): Observer {
    return {
      pending: () => {
        if (!entry.removed) this.setState(entry, WAITING);
      },
      fulfilled: (value) => {
        if (entry.removed) return;
        const run = entry.run;
        // A progressive run's yields refresh its running state; it is done when its iterable ends (finish).
        if (run?.progressive) return this.refresh(entry, run);
        if (run) run.finished = true;
        this.setState(entry, { status: "done", value, seconds: run ? (performance.now() - run.started) / 1000 : 0, runs: this.counts.get(entry.def.id) ?? 0 });
      },
      rejected: (error) => {
        if (entry.removed) return;
        if (entry.run) entry.run.finished = true;
        this.setState(entry, this.failure(entry, error));
      },
    };
  }

  /** Works out why a cell failed from the error the runtime handed its observer. */
  private failure(entry: Entry, thrown: unknown): CellState {
    const error = thrown instanceof Error ? thrown : new Error(String(thrown));
    const tag = this.tags.get(error);
    const { id, name } = entry.def;
    const failed = (message: string, cause: FailureCause): CellState => ({ status: "failed", error, message, cause });
    if (tag === "own") return failed(error.message || error.name, { kind: "own-error", cellId: id, ...(name === null ? {} : { name }) });
    if (tag) return failed(error.message, tag);
    if (error instanceof RuntimeError && error.input == null) {
      if (error.message === "circular definition") {
        const cycle = shortestCycle(id, (at) => this.inputCells(at)) ?? [id];
        const names = [...cycle, cycle[0]].map((cellId) => this.entries.get(cellId)?.def.name ?? cellId);
        return failed(`circular definition: ${names.join(" → ")}`, { kind: "cycle", cellId: id, ...(name === null ? {} : { name }), cycle });
      }
      if (name !== null && error.message.endsWith("is defined more than once")) {
        const cellIds = this.cellsNamed(name).map((e) => e.def.id);
        return failed(`${name} is defined by more than one cell (${cellIds.join(", ")})`, { kind: "duplicate-name", name, cellIds });
      }
    }
    if (error instanceof RuntimeError && typeof error.input === "string") {
      const input = error.input;
      const upstream = this.cellsNamed(input)[0];
      if (!upstream) return failed(`${input} is not defined`, { kind: "unknown-name", name: input });
      const up = upstream.state;
      const root =
        up.status === "failed" && up.cause.kind === "upstream" && up.cause.cellId !== undefined
          ? { cellId: up.cause.cellId, name: up.cause.name }
          : { cellId: upstream.def.id, name: input };
      return failed(`${root.name ?? root.cellId} failed: ${error.message}`, { kind: "upstream", ...root });
    }
    return failed(error.message || error.name, { kind: "own-error", cellId: id, ...(name === null ? {} : { name }) });
  }

  /** Ids of the cells whose names cell `id` uses (uniquely named cells only: duplicates break edges). */
  private inputCells(id: string): string[] {
    const entry = this.entries.get(id);
    if (!entry) return [];
    const out: string[] = [];
    for (const name of entry.def.inputs) {
      const defining = this.cellsNamed(name);
      if (defining.length === 1) out.push(defining[0].def.id);
    }
    return out;
  }

  private cellsNamed(name: string): Entry[] {
    return [...this.entries.values()].filter((e) => e.def.name === name);
  }

  // ---- states -----------------------------------------------------------------

  private isCurrent(entry: Entry, run: Run): boolean {
    return !entry.removed && entry.run === run && !run.controller.signal.aborted;
  }

  /** Shows a running cell's latest progress/value: at once if the last refresh is old enough, else batched. */
  private refresh(entry: Entry, run: Run): void {
    if (run.finished || !this.isCurrent(entry, run) || entry.timer !== null) return;
    const show = () => {
      entry.timer = null;
      if (run.finished || !this.isCurrent(entry, run) || entry.state.status !== "running") return;
      entry.lastRefresh = performance.now();
      this.setState(entry, {
        status: "running",
        since: run.since,
        ...(run.progress === undefined ? {} : { progress: run.progress }),
        ...(run.hasValue ? { value: run.value } : {}),
      });
    };
    const wait = entry.lastRefresh + this.progressInterval - performance.now();
    if (wait <= 0) show();
    else entry.timer = setTimeout(show, wait);
  }

  private clearRefresh(entry: Entry): void {
    if (entry.timer !== null) clearTimeout(entry.timer);
    entry.timer = null;
  }

  private setState(entry: Entry, state: CellState, force = false): void {
    if (state === WAITING && entry.state === WAITING && !force) return;
    if (state.status !== "running") this.clearRefresh(entry);
    entry.state = state;
    if (this.onChange) {
      try {
        this.onChange(entry.def.id, state);
      } catch (error) {
        // A listener's bug must not break the runtime's bookkeeping; surface it uncaught.
        queueMicrotask(() => {
          throw error;
        });
      }
    }
    if (this.quietWaiters.length && this.quiet()) this.wakeQuietWaiters();
  }

  private quiet(): boolean {
    for (const entry of this.entries.values()) {
      if (entry.state.status === "waiting" || entry.state.status === "running") return false;
    }
    return true;
  }

  private wakeQuietWaiters(): void {
    const waiters = this.quietWaiters;
    this.quietWaiters = [];
    for (const wake of waiters) wake();
  }

  /**
   * Resolves after the runtime's next computing pass, by computing a throwaway
   * variable in it: every change scheduled before has then reached the observers.
   */
  private flush(): Promise<void> {
    return new Promise((resolve) => {
      let done = false;
      const finish = () => {
        if (done) return; // the deleted probe is computed (and observed) once more
        done = true;
        this.flushWaiters.delete(finish);
        resolve();
        queueMicrotask(() => probe.delete());
      };
      this.flushWaiters.add(finish);
      const probe = this.module.variable({ fulfilled: finish });
      probe.define(null, [], () => true);
    });
  }
}

function sameDefinition(a: CellDefinition, b: CellDefinition): boolean {
  if (a.name !== b.name) return false;
  const x = new Set(a.inputs);
  const y = new Set(b.inputs);
  if (x.size !== y.size || [...x].some((name) => !y.has(name))) return false;
  if (a.version !== undefined || b.version !== undefined) return a.version === b.version;
  return a.compute === b.compute;
}

function isThenable(value: unknown): value is PromiseLike<unknown> {
  return (typeof value === "object" || typeof value === "function") && value !== null && typeof (value as PromiseLike<unknown>).then === "function";
}

/** An async iterable, or a generator (the runtime's own test: `next` and `return` functions). */
function isIterator(value: unknown): value is AsyncIterable<unknown> | Iterator<unknown> {
  if ((typeof value !== "object" && typeof value !== "function") || value === null) return false;
  if (typeof (value as AsyncIterable<unknown>)[Symbol.asyncIterator] === "function") return true;
  return typeof (value as Iterator<unknown>).next === "function" && typeof (value as Iterator<unknown>).return === "function";
}

/** `promise`, or a rejection with the signal's reason as soon as it aborts. */
function untilAborted<T>(promise: Promise<T>, signal: AbortSignal): Promise<T> {
  if (signal.aborted) {
    promise.catch(() => {});
    return Promise.reject(signal.reason);
  }
  return new Promise<T>((resolve, reject) => {
    const onAbort = () => reject(signal.reason);
    signal.addEventListener("abort", onAbort, { once: true });
    promise.then(
      (value) => {
        signal.removeEventListener("abort", onAbort);
        resolve(value);
      },
      (error) => {
        signal.removeEventListener("abort", onAbort);
        reject(error);
      },
    );
  });
}
