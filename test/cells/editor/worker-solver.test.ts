import { describe, expect, it } from "vitest";
import { pointMeasure } from "../../../core/measure";
import { solveTransport } from "../../../core/solve";
import { WorkerSolver, type WorkerLike } from "../../../cells/editor/run/worker-solver";
import type { SolveMessage } from "../../../cells/runtime/solve-protocol";
import { portableError, transferList } from "../../../cells/runtime/solve-protocol";

// A stand-in for a Web Worker that answers the solve protocol
// (cells/runtime/solve-protocol.ts) on demand, so tests decide when it replies.
class FakeWorker implements WorkerLike {
  onmessage: ((event: MessageEvent) => void) | null = null;
  onerror: ((event: ErrorEvent) => void) | null = null;
  terminated = false;
  received: SolveMessage[] = [];
  postMessage(message: unknown): void {
    this.received.push(message as SolveMessage);
  }
  terminate(): void {
    this.terminated = true;
  }
  /** Solves the last request for real and replies. */
  answer(): void {
    const { id, request } = this.received[this.received.length - 1];
    try {
      const result = solveTransport(request.source, request.target, request.cost, { ...request.options, onProgress: (progress) => this.onmessage?.({ data: { type: "progress", id, progress } } as MessageEvent) });
      void transferList(result);
      this.onmessage?.({ data: { type: "result", id, result } } as MessageEvent);
    } catch (error) {
      this.onmessage?.({ data: { type: "failure", id, error: portableError(error) } } as MessageEvent);
    }
  }
}

const a = pointMeasure([[0], [1]]);
const b = pointMeasure([[0.5], [2]]);
const request = { source: a, target: b, cost: { kind: "sqeuclidean" as const }, options: { method: "exact" as const } };

describe("WorkerSolver", () => {
  it("solve() resolves with the worker's result and keeps the worker for the next solve", async () => {
    const workers: FakeWorker[] = [];
    const solver = new WorkerSolver(() => (workers.push(new FakeWorker()), workers[workers.length - 1]));
    const first = solver.solve(request);
    await Promise.resolve();
    workers[0].answer();
    // Exact 1-D transport pairs the sorted points (the monotone coupling; a fact of the trade,
    // no source): masses ½ each, cost ½(0 − 0.5)² + ½(1 − 2)² = 0.625.
    expect((await first).values.cost).toBeCloseTo(0.625, 12);
    const second = solver.solve(request);
    await Promise.resolve();
    expect(workers).toHaveLength(1);
    workers[0].answer();
    await second;
  });

  it("solve() rejects with the signal's reason and terminates the worker when aborted", async () => {
    const workers: FakeWorker[] = [];
    const solver = new WorkerSolver(() => (workers.push(new FakeWorker()), workers[workers.length - 1]));
    const controller = new AbortController();
    const pending = solver.solve(request, { signal: controller.signal });
    await Promise.resolve();
    controller.abort(new Error("superseded"));
    await expect(pending).rejects.toThrow("superseded");
    expect(workers[0].terminated).toBe(true);
  });

  it("solve() rebuilds a TransportInputError sent back by the worker", async () => {
    const workers: FakeWorker[] = [];
    const solver = new WorkerSolver(() => (workers.push(new FakeWorker()), workers[workers.length - 1]));
    const pending = solver.solve({ ...request, options: { method: "entropic" as const } });
    await Promise.resolve();
    workers[0].answer();
    await expect(pending).rejects.toMatchObject({ name: "TransportInputError", field: "epsilon" });
  });

  it("solve() beyond maxRunning waits for a free slot and says so in a progress report", async () => {
    const workers: FakeWorker[] = [];
    const solver = new WorkerSolver(() => (workers.push(new FakeWorker()), workers[workers.length - 1]), { maxRunning: 1 });
    const first = solver.solve(request);
    const reports: unknown[] = [];
    const second = solver.solve(request, { onProgress: (p) => reports.push(p) });
    await Promise.resolve();
    expect(workers).toHaveLength(1);
    expect(solver.waiting).toBe(1);
    expect(reports).toEqual([{ message: "waiting for a free solver" }]);
    workers[0].answer();
    await first;
    await Promise.resolve();
    await Promise.resolve();
    workers[0].answer();
    await second;
    expect(solver.waiting).toBe(0);
  });

  it("solve() aborted while queued leaves the queue without starting a worker", async () => {
    const workers: FakeWorker[] = [];
    const solver = new WorkerSolver(() => (workers.push(new FakeWorker()), workers[workers.length - 1]), { maxRunning: 1 });
    void solver.solve(request);
    const controller = new AbortController();
    const queued = solver.solve(request, { signal: controller.signal });
    controller.abort(new Error("gone"));
    await expect(queued).rejects.toThrow("gone");
    expect(solver.waiting).toBe(0);
    expect(workers).toHaveLength(1);
  });
});
