import { build } from "esbuild";
import { existsSync } from "node:fs";
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { CellContext } from "../../../cells/runtime/cell-definition";
import { createSolveWorkerPool, shouldSolveOffThread, solveOffThread, solveWorkerUrl } from "../../../cells/runtime/solve-off-thread";
import { StudyEngine } from "../../../cells/runtime/study-engine";
import type { SolveProgress, SparsePlan } from "../../../core/result";
import { TransportInputError } from "../../../core/errors";
import { pointMeasure } from "../../../core/measure";

// The transfer semantics checked here are those of the HTML structured clone and
// transfer algorithms, which Node's worker_threads follows (Node.js documentation,
// "worker_threads: port.postMessage(value[, transferList])"): a transferred
// ArrayBuffer is detached on the sending side, a cloned one is copied.
// Solver values in the fake tests are invented; the real-path tests below use
// the published transportation problem cited there.

let dir: string;
let fakeWorker: URL;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "couplet-fake-worker-"));
  const outfile = join(dir, "fake-solve-worker.mjs");
  await build({
    entryPoints: [fileURLToPath(new URL("./fixtures/fake-solve-worker.ts", import.meta.url))],
    outfile,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    logLevel: "error",
  });
  fakeWorker = pathToFileURL(outfile);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const source = () => pointMeasure([[0], [1], [2]], [0.2, 0.3, 0.5]);
const target = () => pointMeasure([[0.5], [1.5]], [0.6, 0.4]);

describe("solveOffThread (protocol, with a fake solver)", () => {
  it("solveOffThread(request) resolves with the worker's result, typed arrays intact and of their types", async () => {
    const a = source();
    const b = target();
    const result = await solveOffThread({ source: a, target: b, cost: { kind: "sqeuclidean" }, options: { method: "exact" } }, { workerUrl: fakeWorker });
    expect(result.potentials!.f).toBeInstanceOf(Float64Array);
    expect([...result.potentials!.f]).toEqual([0.4, 0.6, 1]);
    expect([...result.potentials!.g]).toEqual([1.7999999999999998, 1.2000000000000002]); // 3·0.6, 3·0.4 in doubles
    const plan = result.plan as SparsePlan;
    expect(plan.from).toBeInstanceOf(Int32Array);
    expect([...plan.to]).toEqual([0, 1, 0]);
    expect(result.diagnostics.history).toBeInstanceOf(Float64Array);
    expect([...result.diagnostics.historyIterations]).toEqual([10, 20, 30]);
  });

  it("solveOffThread(request) leaves the caller's arrays attached and unchanged", async () => {
    const a = source();
    const b = target();
    const big = new Float64Array([9, 9, 0.2, 0.3, 0.5, 9]);
    const viewed = { ...a, mass: big.subarray(2, 5) }; // a view into a larger buffer
    await solveOffThread({ source: viewed, target: b, cost: { kind: "sqeuclidean" }, options: { method: "exact" } }, { workerUrl: fakeWorker });
    expect(a.points.byteLength).toBe(24);
    expect([...big]).toEqual([9, 9, 0.2, 0.3, 0.5, 9]);
    expect([...b.mass]).toEqual([0.6, 0.4]);
  });

  it("solveOffThread(request, {onProgress}) delivers every progress report in order, before the result", async () => {
    const reports: SolveProgress[] = [];
    let resolvedAfter = -1;
    await solveOffThread({ source: source(), target: target(), cost: { kind: "sqeuclidean" }, options: { method: "entropic" } }, {
      workerUrl: fakeWorker,
      onProgress: (p) => reports.push(p),
    }).then(() => (resolvedAfter = reports.length));
    expect(reports.map((p) => p.iteration)).toEqual([10, 20, 30]);
    expect(resolvedAfter).toBe(3);
  });

  it("solveOffThread(request) rejects with a TransportInputError naming the field when the solver throws one", async () => {
    const failure = solveOffThread({ source: source(), target: target(), cost: { kind: "power", p: -1 }, options: { method: "exact" } }, { workerUrl: fakeWorker });
    await expect(failure).rejects.toBeInstanceOf(TransportInputError);
    await expect(failure).rejects.toMatchObject({ field: "cost.p", value: -1, message: "cost.p: must be > 0 and finite, got -1" });
  });

  it("solveOffThread(request, {signal}) terminates the worker on abort and rejects with an AbortError", async () => {
    const heartbeat = new Int32Array(new SharedArrayBuffer(4));
    const controller = new AbortController();
    let reports = 0;
    const solving = solveOffThread(
      { source: source(), target: target(), cost: { kind: "sqeuclidean" }, options: { method: "entropic", spin: true, heartbeat } as never },
      {
        workerUrl: fakeWorker,
        signal: controller.signal,
        onProgress: () => {
          if (++reports === 2) controller.abort();
        },
      },
    );
    await expect(solving).rejects.toMatchObject({ name: "AbortError" });
    expect(reports).toBe(2);
    // Terminated: the shared counter the worker bumps in its loop stops moving.
    await new Promise((resolve) => setTimeout(resolve, 100));
    const stopped = Atomics.load(heartbeat, 0);
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(Atomics.load(heartbeat, 0)).toBe(stopped);
  });

  it("solveOffThread(request, cell context) in a study cell: progress shows as running, a superseding update terminates the worker", async () => {
    const heartbeat = new Int32Array(new SharedArrayBuffer(4));
    const engine = new StudyEngine({ progressInterval: 0 });
    try {
      const solveCell = (spin: boolean, version: number) => ({
        id: "solve",
        name: "solved",
        inputs: [],
        version,
        compute: (_inputs: Record<string, unknown>, context: CellContext) =>
          solveOffThread(
            { source: source(), target: target(), cost: { kind: "sqeuclidean" }, options: { method: "entropic", spin, heartbeat } as never },
            { workerUrl: fakeWorker, signal: context.signal, onProgress: context.progress },
          ).then((result) => result.algorithm),
      });
      engine.update([solveCell(true, 1)]);
      for (let k = 0; k < 400 && !("progress" in engine.state("solve")); k++) await new Promise((resolve) => setTimeout(resolve, 10));
      expect(engine.state("solve")).toMatchObject({ status: "running", progress: { iteration: expect.any(Number) } });
      engine.update([solveCell(false, 2)]);
      await engine.settled();
      expect(engine.state("solve")).toMatchObject({ status: "done", value: "fake" });
      await new Promise((resolve) => setTimeout(resolve, 100));
      const stopped = Atomics.load(heartbeat, 0);
      await new Promise((resolve) => setTimeout(resolve, 100));
      expect(Atomics.load(heartbeat, 0)).toBe(stopped);
    } finally {
      engine.dispose();
    }
  });

  it("solveOffThread(request, {signal}) with an already aborted signal rejects without starting a worker", async () => {
    const controller = new AbortController();
    controller.abort(new Error("not wanted"));
    await expect(solveOffThread({ source: source(), target: target(), cost: { kind: "sqeuclidean" }, options: { method: "exact" } }, { signal: controller.signal, workerUrl: new URL("file:///nonexistent.mjs") })).rejects.toThrow("not wanted");
  });

  it("solveOffThread(request) rejects with a TypeError naming the path of a value that cannot cross", async () => {
    await expect(
      solveOffThread({ source: source(), target: target(), cost: { kind: "sqeuclidean" }, options: { method: "exact", extra: () => 1 } as never }, { workerUrl: fakeWorker }),
    ).rejects.toThrow(/request\.options\.extra: a function cannot be sent/);
  });

  it("solveOffThread(request) rejects when the worker module cannot start", async () => {
    await expect(solveOffThread({ source: source(), target: target(), cost: { kind: "sqeuclidean" }, options: { method: "exact" } }, { workerUrl: new URL("file:///nonexistent/worker.mjs") })).rejects.toThrow();
  });
});

// The real worker (dist/solve-worker.mjs, built by `npm test`'s pretest step).
const realWorker = solveWorkerUrl();
describe.skipIf(!existsSync(realWorker))("solveOffThread (real worker, core solveTransport)", () => {
  it("solveOffThread(request) solves a published transportation problem exactly: Taha's SunRay example, optimum 435", async () => {
    // Taha, Operations Research: An Introduction (SunRay transport): supplies 15, 25, 10;
    // demands 5, 15, 15, 15; optimum 435 (from memory, re-solved with an LP solver; see REFERENCES.md).
    const supplies = [15, 25, 10];
    const demands = [5, 15, 15, 15];
    const costs = [10, 2, 20, 11, 12, 7, 9, 20, 4, 14, 16, 18];
    const { solveTransport } = await import("../../../core/solve");
    const request = {
      source: pointMeasure([[0], [1], [2]], supplies),
      target: pointMeasure([[0], [1], [2], [3]], demands),
      cost: { kind: "matrix" as const, matrix: { data: new Float64Array(costs), rows: 3, cols: 4 } },
      options: { method: "exact" as const },
    };
    const offThread = await solveOffThread(request);
    expect(offThread.values.cost).toBeCloseTo(435, 9);
    const inThread = solveTransport(request.source, request.target, request.cost, request.options);
    expect(offThread.values).toEqual(inThread.values);
    expect(offThread.plan).toEqual(inThread.plan);
  });

  it("solveOffThread(request, {onProgress}) streams the entropic solver's progress and returns the same bits as solving in-thread", async () => {
    const { solveTransport } = await import("../../../core/solve");
    const n = 60;
    const xs = Array.from({ length: n }, (_, i) => [Math.cos(i), Math.sin(2 * i)]);
    const ys = Array.from({ length: n }, (_, i) => [0.5 + Math.cos(3 * i), Math.sin(i) - 0.2]);
    const request = {
      source: pointMeasure(xs),
      target: pointMeasure(ys),
      cost: { kind: "sqeuclidean" as const },
      options: { method: "entropic" as const, epsilon: { relative: 0.01 }, tolerance: 1e-9, progressEvery: 5 },
    };
    const reports: SolveProgress[] = [];
    const offThread = await solveOffThread(request, { onProgress: (p) => reports.push(p) });
    const inThread = solveTransport(request.source, request.target, request.cost, request.options);
    expect(reports.length).toBeGreaterThan(0);
    expect(offThread.values).toEqual(inThread.values);
    expect(offThread.potentials!.f).toEqual(inThread.potentials!.f);
    expect(offThread.diagnostics.iterations).toBe(inThread.diagnostics.iterations);
  });

  it("solveOffThread(request, {signal}) aborts a long entropic solve by terminating its worker", async () => {
    const n = 400;
    const xs = Array.from({ length: n }, (_, i) => [i / n]);
    const request = {
      source: pointMeasure(xs),
      target: pointMeasure(xs.map(([x]) => [x * x])),
      cost: { kind: "sqeuclidean" as const },
      options: { method: "entropic" as const, epsilon: { absolute: 1e-5 }, tolerance: 1e-15, maxIterations: 10_000_000, progressEvery: 1 },
    };
    const controller = new AbortController();
    const solving = solveOffThread(request, { signal: controller.signal, onProgress: (p) => p.iteration >= 3 && controller.abort() });
    await expect(solving).rejects.toMatchObject({ name: "AbortError" });
  });
});

describe.skipIf(!existsSync(realWorker))("createSolveWorkerPool (real worker)", () => {
  // Taha's SunRay problem again (optimum 435, REFERENCES.md; from memory, re-solved with an LP solver).
  const request = {
    source: pointMeasure([[0], [1], [2]], [15, 25, 10]),
    target: pointMeasure([[0], [1], [2], [3]], [5, 15, 15, 15]),
    cost: { kind: "matrix" as const, matrix: { data: new Float64Array([10, 2, 20, 11, 12, 7, 9, 20, 4, 14, 16, 18]), rows: 3, cols: 4 } },
    options: { method: "exact" as const },
  };

  it("pool.solve(request) answers several requests in a row, each with the optimum 435", async () => {
    const pool = createSolveWorkerPool();
    try {
      const results = [];
      for (let k = 0; k < 4; k++) results.push(await pool.solve(request));
      for (const result of results) expect(result.values.cost).toBeCloseTo(435, 9);
      const together = await Promise.all([pool.solve(request), pool.solve(request), pool.solve(request)]);
      for (const result of together) expect(result.values.cost).toBeCloseTo(435, 9);
    } finally {
      await pool.close();
    }
  });

  it("pool.solve(request, {signal}) rejects an aborted solve and the pool keeps working", async () => {
    const pool = createSolveWorkerPool();
    try {
      const n = 400;
      const xs = Array.from({ length: n }, (_, i) => [i / n]);
      const long = {
        source: pointMeasure(xs),
        target: pointMeasure(xs.map(([x]) => [x * x])),
        cost: { kind: "sqeuclidean" as const },
        options: { method: "entropic" as const, epsilon: { absolute: 1e-5 }, tolerance: 1e-15, maxIterations: 10_000_000, progressEvery: 1 },
      };
      const controller = new AbortController();
      const solving = pool.solve(long, { signal: controller.signal, onProgress: (p) => p.iteration >= 3 && controller.abort() });
      await expect(solving).rejects.toMatchObject({ name: "AbortError" });
      expect((await pool.solve(request)).values.cost).toBeCloseTo(435, 9);
    } finally {
      await pool.close();
    }
  });

  it("pool.solve after pool.close() rejects, naming the closed pool", async () => {
    const pool = createSolveWorkerPool();
    await pool.close();
    await expect(pool.solve(request)).rejects.toThrow(/pool is closed/);
  });
});

// The thresholds are Couplet's own, from the measurements documented beside
// shouldSolveOffThread; these checks pin the documented boundaries.
describe("shouldSolveOffThread", () => {
  it("shouldSolveOffThread(n, m, 'exact') is true from 40 000 cost entries (200×200)", () => {
    expect(shouldSolveOffThread(199, 200, "exact")).toBe(false);
    expect(shouldSolveOffThread(200, 200, "exact")).toBe(true);
  });

  it("shouldSolveOffThread(n, m, iterative method) is true from 10 000 cost entries (100×100)", () => {
    expect(shouldSolveOffThread(99, 100, "entropic")).toBe(false);
    expect(shouldSolveOffThread(100, 100, "entropic")).toBe(true);
    expect(shouldSolveOffThread(100, 100, "unbalanced")).toBe(true);
  });

  it("shouldSolveOffThread(n, m, 'debiased') counts the two self-problems too", () => {
    expect(shouldSolveOffThread(60, 60, "debiased")).toBe(true); // 3 × 3600 entries
    expect(shouldSolveOffThread(60, 60, "entropic")).toBe(false);
  });

  it("shouldSolveOffThread(n, m, method) throws a RangeError naming a size that is not a positive integer", () => {
    expect(() => shouldSolveOffThread(0, 5, "exact")).toThrow(/n must be a positive integer, got 0/);
    expect(() => shouldSolveOffThread(5, Number.NaN, "exact")).toThrow(/m must be/);
  });
});

describe.skipIf(!existsSync(realWorker))("createSolveWorkerPool concurrency", () => {
  it("pool.solve with maxRunning 1 runs five requests one at a time and answers all of them (Taha's SunRay, 435)", async () => {
    // Taha's SunRay problem (REFERENCES.md; optimum from memory, re-solved with an LP solver).
    const request = {
      source: pointMeasure([[0], [1], [2]], [15, 25, 10]),
      target: pointMeasure([[0], [1], [2], [3]], [5, 15, 15, 15]),
      cost: { kind: "matrix" as const, matrix: { data: new Float64Array([10, 2, 20, 11, 12, 7, 9, 20, 4, 14, 16, 18]), rows: 3, cols: 4 } },
      options: { method: "exact" as const },
    };
    const pool = createSolveWorkerPool({ maxRunning: 1 });
    try {
      const results = await Promise.all(Array.from({ length: 5 }, () => pool.solve(request)));
      for (const result of results) expect(result.values.cost).toBeCloseTo(435, 9);
    } finally {
      await pool.close();
    }
  });
});
