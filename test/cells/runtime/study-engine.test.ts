import { afterEach, describe, expect, it } from "vitest";
import type { CellContext, CellDefinition, CellState } from "../../../cells/runtime/cell-definition";
import { StudyEngine } from "../../../cells/runtime/study-engine";

// What is checked here is reactive-dataflow behaviour, common practice with no
// single source: a cell recomputes when, and only when, its definition or an input
// changes; a failure propagates to dependents and nowhere else; a superseded
// computation is cancelled. The runtime facts relied on (one `fulfilled` per
// generator yield, `invalidation` resolved on recompute, "circular definition")
// are those of @observablehq/runtime 6.0.1, read from its source.

type Compute = (inputs: Record<string, any>, context: CellContext) => unknown;
const cell = (id: string, name: string | null, inputs: string[], compute: Compute, version?: number): CellDefinition => ({
  id,
  name,
  inputs,
  compute,
  ...(version === undefined ? {} : { version }),
});
const constant = (id: string, value: unknown) => cell(id, id, [], () => value);

/** A promise with its resolve/reject handles. */
function deferred<T = unknown>() {
  let resolve!: (value: T) => void;
  let reject!: (error: unknown) => void;
  const promise = new Promise<T>((y, n) => ((resolve = y), (reject = n)));
  return { promise, resolve, reject };
}

/** Waits until `test` holds, checking after each macrotask (no wall-clock assertions). */
async function until(test: () => boolean, what: string, limit = 2000): Promise<void> {
  for (let k = 0; k < limit; k++) {
    if (test()) return;
    await new Promise((resolve) => setTimeout(resolve, 5));
  }
  throw new Error(`timed out waiting for ${what}`);
}

const engines: StudyEngine[] = [];
function makeEngine(options: ConstructorParameters<typeof StudyEngine>[0] = {}): StudyEngine {
  const engine = new StudyEngine(options);
  engines.push(engine);
  return engine;
}
afterEach(() => {
  for (const engine of engines.splice(0)) engine.dispose();
});

const valueOf = (engine: StudyEngine, id: string) => {
  const state = engine.state(id);
  if (state.status !== "done") throw new Error(`cell ${id} is ${state.status}: ${JSON.stringify(state)}`);
  return state.value;
};
const causeOf = (engine: StudyEngine, id: string) => {
  const state = engine.state(id);
  if (state.status !== "failed") throw new Error(`cell ${id} is ${state.status}, not failed`);
  return state.cause;
};

describe("StudyEngine", () => {
  it("update(definitions) computes each cell from its inputs", async () => {
    const engine = makeEngine();
    engine.update([cell("sum", "sum", ["a", "b"], ({ a, b }) => a + b), constant("a", 2), cell("b", "b", [], async () => 3)]);
    await engine.settled();
    expect(valueOf(engine, "sum")).toBe(5);
    expect(engine.state("sum")).toMatchObject({ status: "done", runs: 1 });
  });

  it("update(definitions) reports waiting, running and done in that order", async () => {
    const seen: string[] = [];
    const engine = makeEngine({ onChange: (id, state) => id === "b" && seen.push(state.status) });
    engine.update([constant("a", 1), cell("b", "b", ["a"], async ({ a }) => a + 1)]);
    await engine.settled();
    expect(seen).toEqual(["waiting", "running", "done"]);
  });

  it("update(definitions) gives anonymous cells values without making their names usable", async () => {
    const engine = makeEngine();
    engine.update([constant("a", 1), cell("figure", null, ["a"], ({ a }) => `a is ${a}`)]);
    await engine.settled();
    expect(valueOf(engine, "figure")).toBe("a is 1");
  });

  it("a cell that throws fails with cause own-error and its message", async () => {
    const engine = makeEngine();
    engine.update([cell("bad", "bad", [], () => {
      throw new RangeError("epsilon must be > 0, got 0");
    })]);
    await engine.settled();
    const state = engine.state("bad");
    expect(state).toMatchObject({ status: "failed", message: "epsilon must be > 0, got 0", cause: { kind: "own-error", cellId: "bad" } });
    expect((state as { error: Error }).error).toBeInstanceOf(RangeError);
  });

  it("a cell whose promise rejects, or that throws a non-Error, fails with cause own-error", async () => {
    const engine = makeEngine();
    engine.update([cell("r", "r", [], async () => Promise.reject(new Error("no data"))), cell("s", "s", [], () => {
      throw "plain string";
    })]);
    await engine.settled();
    expect(engine.state("r")).toMatchObject({ status: "failed", message: "no data", cause: { kind: "own-error" } });
    expect(engine.state("s")).toMatchObject({ status: "failed", message: "plain string", cause: { kind: "own-error" } });
  });

  it("a failing cell fails its dependents with cause upstream naming the first failed cell, and leaves other cells done", async () => {
    const engine = makeEngine();
    engine.update([
      cell("root", "root", [], () => {
        throw new Error("boom");
      }),
      cell("mid", "mid", ["root"], ({ root }) => root),
      cell("leaf", "leaf", ["mid"], ({ mid }) => mid),
      constant("other", 7),
      cell("otherDependent", "otherDependent", ["other"], ({ other }) => other * 2),
    ]);
    await engine.settled();
    expect(causeOf(engine, "mid")).toEqual({ kind: "upstream", cellId: "root", name: "root" });
    expect(causeOf(engine, "leaf")).toEqual({ kind: "upstream", cellId: "root", name: "root" });
    expect(engine.state("leaf")).toMatchObject({ message: "root failed: boom" });
    expect(valueOf(engine, "other")).toBe(7);
    expect(valueOf(engine, "otherDependent")).toBe(14);
    expect(engine.computeCounts().get("mid")).toBe(0); // never ran
  });

  it("a cell using an unknown name fails with cause unknown-name naming it; allowed globals resolve", async () => {
    const engine = makeEngine({ globals: { scale: 10 } });
    engine.update([
      cell("typo", "typo", ["lenght"], ({ lenght }) => lenght),
      cell("dependent", "dependent", ["typo"], ({ typo }) => typo),
      cell("ok", "ok", ["Math", "scale", "Float64Array"], ({ Math, scale, Float64Array }) => new Float64Array([Math.sqrt(scale * 10)])[0]),
    ]);
    await engine.settled();
    expect(engine.state("typo")).toMatchObject({ status: "failed", message: "lenght is not defined", cause: { kind: "unknown-name", name: "lenght" } });
    expect(causeOf(engine, "dependent")).toEqual({ kind: "upstream", cellId: "typo", name: "typo" });
    expect(valueOf(engine, "ok")).toBe(10);
  });

  it("a cell using a real global outside the allowed list (console, process, globalThis) fails with unknown-name", async () => {
    const engine = makeEngine();
    engine.update([
      cell("c", "c", ["console"], () => 1),
      cell("p", "p", ["process"], () => 1),
      cell("g", "g", ["globalThis"], () => 1),
    ]);
    await engine.settled();
    expect(causeOf(engine, "c")).toEqual({ kind: "unknown-name", name: "console" });
    expect(causeOf(engine, "p")).toEqual({ kind: "unknown-name", name: "process" });
    expect(causeOf(engine, "g")).toEqual({ kind: "unknown-name", name: "globalThis" });
  });

  it("a cycle of two cells fails both with cause cycle listing the cycle; dependents fail upstream; others are unaffected", async () => {
    const engine = makeEngine();
    engine.update([
      cell("a", "a", ["b"], ({ b }) => b),
      cell("b", "b", ["a"], ({ a }) => a),
      cell("c", "c", ["a"], ({ a }) => a),
      constant("d", 4),
    ]);
    await engine.settled();
    expect(engine.state("a")).toMatchObject({ status: "failed", message: "circular definition: a → b → a", cause: { kind: "cycle", cellId: "a", cycle: ["a", "b"] } });
    expect(causeOf(engine, "b")).toMatchObject({ kind: "cycle", cycle: ["b", "a"] });
    expect(causeOf(engine, "c")).toEqual({ kind: "upstream", cellId: "a", name: "a" });
    expect(valueOf(engine, "d")).toBe(4);
    expect(engine.computeCounts().get("a")).toBe(0);
  });

  it("a cycle of three cells names all three, and a self-reference is a cycle of one", async () => {
    const engine = makeEngine();
    engine.update([
      cell("x", "x", ["y"], () => 0),
      cell("y", "y", ["z"], () => 0),
      cell("z", "z", ["x"], () => 0),
      cell("self", "self", ["self"], () => 0),
    ]);
    await engine.settled();
    expect(causeOf(engine, "x")).toMatchObject({ kind: "cycle", cycle: ["x", "y", "z"] });
    expect(causeOf(engine, "z")).toMatchObject({ kind: "cycle", cycle: ["z", "x", "y"] });
    expect(engine.state("y")).toMatchObject({ message: "circular definition: y → z → x → y" });
    expect(causeOf(engine, "self")).toMatchObject({ kind: "cycle", cycle: ["self"] });
  });

  it("two cells defining one name both fail with cause duplicate-name; dependents fail upstream; removing one recovers", async () => {
    const engine = makeEngine();
    const user = cell("user", "user", ["n"], ({ n }) => n + 1);
    engine.update([cell("first", "n", [], () => 1), cell("second", "n", [], () => 2), user, constant("free", 0)]);
    await engine.settled();
    expect(engine.state("first")).toMatchObject({ status: "failed", cause: { kind: "duplicate-name", name: "n", cellIds: ["first", "second"] } });
    expect(causeOf(engine, "second")).toMatchObject({ kind: "duplicate-name", name: "n" });
    expect(causeOf(engine, "user")).toMatchObject({ kind: "upstream", name: "n" });
    expect(valueOf(engine, "free")).toBe(0);

    engine.update([cell("second", "n", [], () => 2), user, constant("free", 0)]);
    await engine.settled();
    expect(valueOf(engine, "second")).toBe(2);
    expect(valueOf(engine, "user")).toBe(3);
  });

  it("a cell named like an engine-reserved name fails with duplicate-name, and a cell using one fails with unknown-name", async () => {
    const engine = makeEngine();
    engine.update([constant("invalidation", 1), cell("uses", "uses", ["visibility"], () => 1), constant("fine", 2)]);
    await engine.settled();
    expect(causeOf(engine, "invalidation")).toMatchObject({ kind: "duplicate-name", name: "invalidation" });
    expect(causeOf(engine, "uses")).toEqual({ kind: "unknown-name", name: "visibility" });
    expect(valueOf(engine, "fine")).toBe(2);
  });

  it("update(definitions) redefining a failed cell recovers it and its dependents", async () => {
    const engine = makeEngine();
    const dependent = cell("dependent", "dependent", ["source"], ({ source }) => source * 3);
    engine.update([cell("source", "source", [], () => {
      throw new Error("not yet");
    }), dependent]);
    await engine.settled();
    expect(causeOf(engine, "dependent").kind).toBe("upstream");

    engine.update([cell("source", "source", [], () => 2), dependent]);
    await engine.settled();
    expect(valueOf(engine, "source")).toBe(2);
    expect(valueOf(engine, "dependent")).toBe(6);
  });

  it("update(definitions) adding a cell that defines an unknown name recovers its users; deleting it fails them again", async () => {
    const engine = makeEngine();
    const user = cell("user", "user", ["later"], ({ later }) => later + 1);
    engine.update([user]);
    await engine.settled();
    expect(causeOf(engine, "user")).toEqual({ kind: "unknown-name", name: "later" });
    engine.update([user, constant("later", 1)]);
    await engine.settled();
    expect(valueOf(engine, "user")).toBe(2);
    engine.update([user]);
    await engine.settled();
    expect(causeOf(engine, "user")).toEqual({ kind: "unknown-name", name: "later" });
    expect([...engine.states().keys()]).toEqual(["user"]);
  });

  it("update(definitions) breaking a cycle recovers its cells", async () => {
    const engine = makeEngine();
    engine.update([cell("a", "a", ["b"], ({ b }) => b + 1), cell("b", "b", ["a"], ({ a }) => a)]);
    await engine.settled();
    engine.update([cell("a", "a", ["b"], ({ b }) => b + 1), cell("b", "b", [], () => 1, 2)]);
    await engine.settled();
    expect(valueOf(engine, "a")).toBe(2);
  });

  it("computeCounts() shows a parameter change recomputes only its dependents", async () => {
    const engine = makeEngine();
    const rest = [
      cell("scaled", "scaled", ["p"], ({ p }) => p * 2),
      cell("summary", "summary", ["scaled", "q"], ({ scaled, q }) => scaled + q),
      constant("q", 100),
      cell("unrelated", "unrelated", ["q"], ({ q }) => q - 1),
      cell("figure", null, ["summary"], ({ summary }) => `${summary}`),
    ];
    engine.update([cell("p", "p", [], () => 1, 1), ...rest]);
    await engine.settled();
    const before = engine.computeCounts();
    expect([...before.values()].every((n) => n === 1)).toBe(true);

    engine.update([cell("p", "p", [], () => 5, 2), ...rest]);
    await engine.settled();
    const after = engine.computeCounts();
    const recomputed = [...after].filter(([id, n]) => n > before.get(id)!).map(([id]) => id).sort();
    expect(recomputed).toEqual(["figure", "p", "scaled", "summary"]);
    expect(valueOf(engine, "figure")).toBe("110");
    expect(engine.state("summary")).toMatchObject({ runs: 2 });
  });

  it("update(definitions) with unchanged definitions (same compute, or same version key) recomputes nothing", async () => {
    const engine = makeEngine();
    const a = constant("a", 1);
    engine.update([a, cell("b", "b", ["a"], ({ a }) => a, 1)]);
    await engine.settled();
    engine.update([a, cell("b", "b", ["a"], ({ a }) => a + 1000, 1)]); // same key: the caller says nothing changed
    await engine.settled();
    expect(engine.computeCounts()).toEqual(new Map([["a", 1], ["b", 1]]));
    expect(valueOf(engine, "b")).toBe(1);
  });

  it("a progressive cell (AsyncIterable) shows running values and ends done with its last yield", async () => {
    const gate = deferred<void>();
    const runningValues: unknown[] = [];
    const engine = makeEngine({
      progressInterval: 0,
      onChange: (id, state) => {
        if (id === "iter" && state.status === "running" && "value" in state) runningValues.push(state.value);
      },
    });
    engine.update([
      cell("iter", "iter", [], async function* () {
        yield 1;
        yield 2;
        await gate.promise;
        yield 3;
      }),
      cell("double", "double", ["iter"], ({ iter }) => iter * 2),
    ]);
    await until(() => runningValues.includes(2), "the second yield");
    expect(engine.state("iter").status).toBe("running");
    gate.resolve();
    await engine.settled();
    expect(engine.state("iter")).toMatchObject({ status: "done", value: 3, runs: 1 });
    expect(valueOf(engine, "double")).toBe(6);
    expect(runningValues).toContain(1);
  });

  it("a progressive cell's dependents recompute on its yields", async () => {
    const engine = makeEngine();
    const seenByDependent: number[] = [];
    engine.update([
      cell("iter", "iter", [], async function* () {
        for (let k = 1; k <= 3; k++) {
          yield k;
          await new Promise((resolve) => setTimeout(resolve, 20));
        }
      }),
      cell("watch", "watch", ["iter"], ({ iter }) => seenByDependent.push(iter)),
    ]);
    await engine.settled();
    expect(seenByDependent).toEqual([1, 2, 3]);
  });

  it("a cell returning a generator is progressive too", async () => {
    const engine = makeEngine();
    engine.update([cell("gen", "gen", [], function* () {
      yield "a";
      yield "b";
    })]);
    await engine.settled();
    expect(valueOf(engine, "gen")).toBe("b");
  });

  it("a progressive cell that throws mid-way fails with own-error", async () => {
    const engine = makeEngine();
    engine.update([cell("iter", "iter", [], async function* () {
      yield 1;
      throw new Error("diverged");
    })]);
    await engine.settled();
    expect(engine.state("iter")).toMatchObject({ status: "failed", message: "diverged", cause: { kind: "own-error" } });
  });

  it("context.progress(report) is batched into at most one state change per interval, the latest report winning", async () => {
    const gate = deferred<void>();
    const progressStates: unknown[] = [];
    const engine = makeEngine({
      onChange: (id, state) => {
        if (state.status === "running" && "progress" in state) progressStates.push(state.progress);
      },
    });
    engine.update([cell("solve", "solve", [], async (_inputs, { progress }) => {
      for (let iteration = 1; iteration <= 1000; iteration++) progress({ iteration, marginalError: 1 / iteration });
      await gate.promise;
      return "solved";
    })]);
    await until(() => progressStates.some((p) => (p as { iteration: number }).iteration === 1000), "the last report");
    // 1000 synchronous reports: the first shows at once, the rest collapse into one trailing refresh.
    expect(progressStates.length).toBeLessThanOrEqual(2);
    expect(engine.state("solve")).toMatchObject({ status: "running", progress: { iteration: 1000, marginalError: 0.001 } });
    gate.resolve();
    await engine.settled();
    expect(valueOf(engine, "solve")).toBe("solved");
  });

  it("a computation superseded by an input change has its signal aborted and its late result ignored", async () => {
    const slow = deferred<string>();
    const signals: AbortSignal[] = [];
    const values: unknown[] = [];
    const engine = makeEngine({ onChange: (id, state) => id === "work" && state.status === "done" && values.push(state.value) });
    const work = cell("work", "work", ["p"], ({ p }, { signal }) => {
      signals.push(signal);
      return p === 1 ? slow.promise : `fast ${p}`;
    });
    engine.update([cell("p", "p", [], () => 1, 1), work]);
    await until(() => signals.length === 1, "the first run");
    engine.update([cell("p", "p", [], () => 2, 2), work]);
    await engine.settled();
    expect(signals[0].aborted).toBe(true);
    expect(signals[1].aborted).toBe(false);
    slow.resolve("stale result"); // arrives after being superseded
    await new Promise((resolve) => setTimeout(resolve, 20));
    await engine.settled();
    expect(values).toEqual(["fast 2"]);
    expect(valueOf(engine, "work")).toBe("fast 2");
  });

  it("redefining a running cell aborts its signal, and a computation that ignores the signal does not delay the new one", async () => {
    const never = new Promise<never>(() => {});
    let firstSignal: AbortSignal | undefined;
    const engine = makeEngine();
    engine.update([cell("c", "c", [], (_inputs, { signal }) => {
      firstSignal = signal;
      return never; // ignores its signal entirely
    }, 1)]);
    await until(() => firstSignal !== undefined, "the first run");
    engine.update([cell("c", "c", [], () => "second", 2)]);
    await engine.settled();
    expect(firstSignal!.aborted).toBe(true);
    expect(valueOf(engine, "c")).toBe("second");
  });

  it("a superseded progressive cell has its signal aborted and its source iterator closed", async () => {
    let closed = false;
    let signal: AbortSignal | undefined;
    const engine = makeEngine();
    engine.update([cell("iter", "iter", [], async function* (_inputs, context) {
      signal = context.signal;
      try {
        for (let k = 0; ; k++) {
          yield k;
          await new Promise((resolve) => setTimeout(resolve, 5));
        }
      } finally {
        closed = true;
      }
    }, 1)]);
    await until(() => engine.state("iter").status === "running" && "value" in engine.state("iter"), "a first yield");
    engine.update([cell("iter", "iter", [], () => "replaced", 2)]);
    await engine.settled();
    await until(() => closed, "the source to close");
    expect(signal!.aborted).toBe(true);
    expect(valueOf(engine, "iter")).toBe("replaced");
  });

  it("settled() right after deleting an input waits for the dependents to fail", async () => {
    const engine = makeEngine();
    const user = cell("user", "user", ["gone"], ({ gone }) => gone);
    engine.update([constant("gone", 1), user]);
    await engine.settled();
    engine.update([user]);
    await engine.settled();
    expect(causeOf(engine, "user")).toEqual({ kind: "unknown-name", name: "gone" });
  });

  it("dispose() aborts running computations and settled() then resolves", async () => {
    let signal: AbortSignal | undefined;
    const engine = makeEngine();
    engine.update([cell("c", "c", [], (_inputs, context) => {
      signal = context.signal;
      return new Promise(() => {});
    })]);
    await until(() => signal !== undefined, "the run");
    const settled = engine.settled();
    engine.dispose();
    await settled;
    expect(signal!.aborted).toBe(true);
    expect(() => engine.update([])).toThrow(/disposed/);
  });

  it("update(definitions) throws a TypeError for a repeated id", () => {
    const engine = makeEngine();
    expect(() => engine.update([constant("a", 1), constant("a", 2)])).toThrow(/definitions\[1\]\.id: "a" is used by more than one cell/);
  });

  it("state(id) throws a RangeError for an unknown id", () => {
    expect(() => makeEngine().state("nope")).toThrow(RangeError);
  });
});

// Keep the CellState type exercised so a change to its shape is a compile error here.
const _doneShape: CellState = { status: "done", value: 1, seconds: 0, runs: 1 };
void _doneShape;
