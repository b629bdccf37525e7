import { existsSync } from "node:fs";
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import type { SolveProgress, TransportMethod, TransportResult } from "../../core/result";
import { type SolveMessage, type SolveRequest, type WorkerReply, portableCopy, routeWorkerReply } from "./solve-protocol";

export type { SolveRequest } from "./solve-protocol";

/** Caller-side control of an off-thread solve. */
export interface OffThreadControl {
  /** Aborting terminates the worker at once; the promise rejects with `signal.reason`. */
  readonly signal?: AbortSignal;
  /** Called on the caller's thread with each progress report the solver makes. */
  readonly onProgress?: (progress: SolveProgress) => void;
  /** The built worker module. Default: see {@link solveWorkerUrl}. */
  readonly workerUrl?: URL;
}

/**
 * The built solve worker (dist/solve-worker.mjs): next to this module when it is
 * bundled into dist/, else at dist/ of the source tree (running from source, as
 * tests do: `npm test` builds first).
 */
export function solveWorkerUrl(): URL {
  const beside = new URL("./solve-worker.mjs", import.meta.url);
  return existsSync(beside) ? beside : new URL("../../dist/solve-worker.mjs", import.meta.url);
}

/**
 * Runs `solveTransport(source, target, cost, options)` (core/solve.ts) in a fresh
 * worker_threads Worker, so the calling thread stays free. Typed arrays are copied
 * once into compact buffers and transferred (the caller's arrays are left intact);
 * the result's arrays are transferred back. Progress reports stream to
 * `control.onProgress` while the solve runs.
 *
 * Outcomes: resolves with the TransportResult (any status the solver reports);
 * rejects with the solver's error (a TransportInputError stays one, with its
 * field); on abort, terminates the worker at once and rejects with
 * `control.signal.reason` — an "AbortError" DOMException unless the caller gave
 * another reason. A rejection, not a "cancelled" result, because a terminated
 * worker leaves no partial result to report, and callers (the study engine)
 * already drop superseded computations; this matches `fetch`.
 * A fresh worker per call: start-up measured 70–90 ms on the 2-core development
 * machine, see {@link shouldSolveOffThread}; the worker also runs the solver cold.
 */
export async function solveOffThread(request: SolveRequest, control: OffThreadControl = {}): Promise<TransportResult> {
  control.signal?.throwIfAborted();
  const worker = new Worker(control.workerUrl ?? solveWorkerUrl());
  return solveOnWorker(worker, 1, request, control, () => void worker.terminate());
}

/**
 * A few warm solve workers reused across calls, for callers that solve many
 * problems in a row (a sweep runs dozens): a fresh worker costs 70–90 ms to start
 * and runs the solver cold, which dominated sweeps of small problems. A worker
 * whose solve was aborted is terminated, never reused; idle workers do not keep
 * the process alive. `close()` terminates them all.
 */
export interface SolveWorkerPool {
  solve(request: SolveRequest, control?: Omit<OffThreadControl, "workerUrl">): Promise<TransportResult>;
  close(): Promise<void>;
}

/**
 * A {@link SolveWorkerPool} running at most `maxRunning` solves at once (default: the
 * number of cores; more would only compete for them — measured: ten cold workers on
 * two cores made a 50-cell study 4× slower than solving in-thread) and keeping at
 * most `maxIdle` (default 2) idle workers. Further requests wait their turn.
 */
export function createSolveWorkerPool(options: { workerUrl?: URL; maxIdle?: number; maxRunning?: number } = {}): SolveWorkerPool {
  const { workerUrl = solveWorkerUrl(), maxIdle = 2, maxRunning = Math.max(1, availableParallelism()) } = options;
  const idle: Worker[] = [];
  const busy = new Set<Worker>();
  const waiting: Array<() => void> = [];
  let running = 0;
  let closed = false;
  let nextId = 1;
  const acquire = async (signal?: AbortSignal) => {
    while (running >= maxRunning) {
      await new Promise<void>((resolve) => waiting.push(resolve));
      if (closed) throw new Error("the solve worker pool is closed");
      if (signal?.aborted) {
        waiting.shift()?.(); // pass the turn on, it was not used
        signal.throwIfAborted();
      }
    }
    running++;
  };
  const releaseSlot = () => {
    running--;
    waiting.shift()?.();
  };
  return {
    async solve(request, control = {}) {
      if (closed) throw new Error("the solve worker pool is closed");
      control.signal?.throwIfAborted();
      await acquire(control.signal);
      let worker: Worker;
      try {
        worker = idle.pop() ?? new Worker(workerUrl);
      } catch (error) {
        releaseSlot();
        throw error;
      }
      worker.ref();
      busy.add(worker);
      return solveOnWorker(worker, nextId++, request, control, (reusable) => {
        releaseSlot();
        busy.delete(worker);
        if (reusable && !closed && idle.length < maxIdle) {
          worker.unref();
          idle.push(worker);
        } else void worker.terminate();
      });
    },
    async close() {
      closed = true;
      for (const wake of waiting.splice(0)) wake();
      const all = [...idle, ...busy];
      idle.length = 0;
      busy.clear();
      await Promise.all(all.map((w) => w.terminate()));
    },
  };
}

/**
 * Sends one solve request to `worker` and settles with its answer. `release(reusable)`
 * is called exactly once: reusable only after a normal answer (result or solver error),
 * never after an abort, a crash or an exit.
 */
function solveOnWorker(worker: Worker, id: number, request: SolveRequest, control: OffThreadControl, release: (reusable: boolean) => void): Promise<TransportResult> {
  const { signal, onProgress } = control;
  // Callers may hand over full SolveOptions: their signal and callback are the
  // caller's business (see `control`) and cannot cross the thread boundary.
  const { signal: _signal, onProgress: _onProgress, ...options } = request.options as SolveRequest["options"] & { signal?: unknown; onProgress?: unknown };
  const { value: portable, transfer } = portableCopy<SolveRequest>({ ...request, options });
  return new Promise<TransportResult>((resolve, reject) => {
    let finished = false;
    const finish = (reusable: boolean, outcome: () => void) => {
      if (finished) return;
      finished = true;
      signal?.removeEventListener("abort", onAbort);
      worker.off("message", onMessage);
      worker.off("error", onError);
      worker.off("exit", onExit);
      release(reusable);
      outcome();
    };
    const onAbort = () => finish(false, () => reject(signal!.reason));
    const onMessage = (reply: WorkerReply) => {
      if (!finished) routeWorkerReply(reply, id, onProgress, finish, resolve, reject);
    };
    const onError = (error: Error) => finish(false, () => reject(error));
    const onExit = (code: number) => finish(false, () => reject(new Error(`solve worker stopped (exit code ${code}) before answering`)));
    signal?.addEventListener("abort", onAbort, { once: true });
    worker.on("message", onMessage);
    worker.on("error", onError);
    worker.on("exit", onExit);
    const message: SolveMessage = { type: "solve", id, request: portable };
    worker.postMessage(message, transfer);
  });
}

/** Least cost-matrix entries (n·m) for which an exact solve goes to a worker. */
export const EXACT_OFF_THREAD_ENTRIES = 40_000;
/** Least cost-matrix entries for which an iterative (entropic, unbalanced, debiased) solve goes to a worker. */
export const ITERATIVE_OFF_THREAD_ENTRIES = 10_000;

/**
 * Whether a problem of n source and m target points is worth a worker: true when
 * the solve would likely block the calling thread for longer than a worker takes
 * to start. Off-thread never wins on wall time for a single solve (the worker
 * starts cold and runs the same code); it buys a responsive caller and a solve
 * that can be cancelled (a synchronous in-thread solve cannot see an abort made
 * by its own blocked thread).
 *
 * Measured with dist/solve-worker.mjs on the 2-core development machine (Node 20,
 * under load; medians of 15 runs, 2-D Gaussian clouds, squared Euclidean cost):
 * - worker start-up, spawn to the answer of a 3×3 problem: median 80–88 ms in two
 *   sessions (min 70 ms; the bundle is ~80 KB);
 * - exact, first solve in a fresh process: 50×50 37 ms, 100×100 69 ms,
 *   200×200 127 ms, 400×400 219 ms (network simplex 300×300 non-uniform: 119 ms) —
 *   blocking exceeds start-up from about 200×200, hence n·m ≥ 40 000;
 * - entropic: 5–20 ns per cost entry per iteration (kernel vs log domain), and
 *   iterations range from ~50 (ε = 0.01 × max cost) to the 10 000 cap (ε = 0.01 ×
 *   median cost did not converge at 200×200 in 8.5 s). At a middling 1000
 *   iterations, 10 000 entries already block for 50–200 ms, hence n·m ≥ 10 000;
 * - debiased solves three problems (n·m + n² + m² entries in all).
 * Throws a RangeError for sizes that are not positive integers.
 */
export function shouldSolveOffThread(n: number, m: number, method: TransportMethod): boolean {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be a positive integer, got ${n}`);
  if (!Number.isInteger(m) || m < 1) throw new RangeError(`m must be a positive integer, got ${m}`);
  switch (method) {
    case "exact":
      return n * m >= EXACT_OFF_THREAD_ENTRIES;
    case "debiased":
      return n * m + n * n + m * m >= ITERATIVE_OFF_THREAD_ENTRIES;
    default:
      return n * m >= ITERATIVE_OFF_THREAD_ENTRIES;
  }
}
