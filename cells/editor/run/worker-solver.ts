import type { SolveProgress, TransportResult } from "../../../core/result";
import { type SolveMessage, type SolveRequest, type WorkerReply, portableCopy, routeWorkerReply } from "../../runtime/solve-protocol";

/** Caller-side control of one solve in a Web Worker. */
export interface WorkerSolveControl {
  /** Aborting terminates the worker at once; the promise rejects with `signal.reason`. */
  readonly signal?: AbortSignal;
  /** Called on the page's thread with each progress report. */
  readonly onProgress?: (progress: SolveProgress) => void;
}

/** The part of the Worker API the solver uses (a fake in tests). */
export interface WorkerLike {
  postMessage(message: unknown, transfer: Transferable[]): void;
  terminate(): void;
  onmessage: ((event: MessageEvent) => void) | null;
  onerror: ((event: ErrorEvent) => void) | null;
}

/**
 * Runs transport solves in browser Web Workers, speaking the same protocol as the
 * Node worker (cells/runtime/solve-protocol.ts, served by solve-worker.ts). The
 * page's thread stays free while a solve runs, and a superseded solve is stopped
 * by terminating its worker (a synchronous solve cannot read a cancel message).
 *
 * A worker that answered is kept for the next solve (up to `keepIdle` of them),
 * so tuning a slider does not pay a worker start each time; a cancelled one is
 * terminated and never reused.
 */
export class WorkerSolver {
  private readonly create: () => WorkerLike;
  private readonly keepIdle: number;
  private readonly maxRunning: number;
  private readonly idle: WorkerLike[] = [];
  private readonly busy = new Set<WorkerLike>();
  /** Solves waiting for a free slot, oldest first. */
  private readonly queue: (() => void)[] = [];
  private nextId = 1;
  private disposed = false;

  /**
   * `create` starts a worker, e.g. `() => new Worker(url, {type: "module"})`.
   * `keepIdle` (default 2) is how many finished workers are kept warm;
   * `maxRunning` (default 2, at least 1) how many solves run at once — more
   * workers than cores only slow each other down; the others wait their turn.
   */
  constructor(create: () => WorkerLike, options: { keepIdle?: number; maxRunning?: number } = {}) {
    const { keepIdle = 2, maxRunning = 2 } = options;
    if (!(Number.isInteger(keepIdle) && keepIdle >= 0)) throw new RangeError(`keepIdle must be a non-negative integer, got ${keepIdle}`);
    if (!(Number.isInteger(maxRunning) && maxRunning >= 1)) throw new RangeError(`maxRunning must be a positive integer, got ${maxRunning}`);
    this.create = create;
    this.keepIdle = keepIdle;
    this.maxRunning = maxRunning;
  }

  /** Solves waiting for a free slot. */
  get waiting(): number {
    return this.queue.length;
  }

  /** Solves currently running. */
  get running(): number {
    return this.busy.size;
  }

  /**
   * Solves `request` off the page's thread. Resolves with the TransportResult (any
   * status the solver reports); rejects with the solver's error (a
   * TransportInputError stays one); on abort rejects with `signal.reason`. The
   * caller's typed arrays are copied, never transferred away.
   */
  async solve(request: SolveRequest, control: WorkerSolveControl = {}): Promise<TransportResult> {
    const { signal } = control;
    if (this.disposed) throw new Error("WorkerSolver: disposed");
    signal?.throwIfAborted();
    if (this.busy.size >= this.maxRunning) {
      // The cell's state line says why nothing moves yet (progress reports reach it as they are).
      control.onProgress?.({ message: "waiting for a free solver" } as unknown as SolveProgress);
      await this.slot(signal);
    }
    return this.run(request, control);
  }

  /** Waits until fewer than `maxRunning` solves run; rejects (and leaves the queue) when aborted first. */
  private slot(signal?: AbortSignal): Promise<void> {
    return new Promise<void>((resolve, reject) => {
      const go = () => {
        signal?.removeEventListener("abort", onAbort);
        resolve();
      };
      const onAbort = () => {
        const k = this.queue.indexOf(go);
        if (k >= 0) this.queue.splice(k, 1);
        reject(signal!.reason);
      };
      signal?.addEventListener("abort", onAbort, { once: true });
      this.queue.push(go);
    });
  }

  /** Starts the next queued solve, if a slot is free. */
  private next(): void {
    while (this.queue.length > 0 && this.busy.size < this.maxRunning) this.queue.shift()!();
  }

  private run(request: SolveRequest, control: WorkerSolveControl): Promise<TransportResult> {
    const { signal, onProgress } = control;
    if (this.disposed) return Promise.reject(new Error("WorkerSolver: disposed"));
    if (signal?.aborted) return Promise.reject(signal.reason);
    const { signal: _s, onProgress: _p, ...options } = request.options as SolveRequest["options"] & { signal?: unknown; onProgress?: unknown };
    const { value: portable, transfer } = portableCopy<SolveRequest>({ ...request, options });
    const worker = this.idle.pop() ?? this.create();
    this.busy.add(worker);
    const id = this.nextId++;
    return new Promise<TransportResult>((resolve, reject) => {
      let finished = false;
      const finish = (reuse: boolean, outcome: () => void) => {
        if (finished) return;
        finished = true;
        signal?.removeEventListener("abort", onAbort);
        worker.onmessage = null;
        worker.onerror = null;
        this.busy.delete(worker);
        if (reuse && !this.disposed && this.idle.length < this.keepIdle) this.idle.push(worker);
        else worker.terminate();
        outcome();
        this.next();
      };
      const onAbort = () => finish(false, () => reject(signal!.reason));
      signal?.addEventListener("abort", onAbort, { once: true });
      worker.onmessage = (event: MessageEvent) => {
        if (!finished) routeWorkerReply(event.data as WorkerReply, id, onProgress, finish, resolve, reject);
      };
      worker.onerror = (event: ErrorEvent) => {
        event.preventDefault?.();
        finish(false, () => reject(new Error(`the solve worker failed: ${event.message || "it could not start"}`)));
      };
      const message: SolveMessage = { type: "solve", id, request: portable };
      worker.postMessage(message, transfer);
    });
  }

  /** Terminates every worker, idle or busy; later solves reject. */
  dispose(): void {
    this.disposed = true;
    for (const worker of [...this.idle, ...this.busy]) worker.terminate();
    this.idle.length = 0;
    this.busy.clear();
  }
}
