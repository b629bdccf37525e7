import { describe, expect, it } from "vitest";
import { pointMeasure } from "../../../core/measure";
import type { SolveProgress, TransportResult } from "../../../core/result";
import { solveTransport } from "../../../core/solve";
import { CellSettingError } from "../../../cells/kinds/cell-error";
import type { TransportSolver } from "../../../cells/kinds/define-context";
import { defineTransportCell, describeTransport } from "../../../cells/kinds/transport/define";
import type { TransportCellValue } from "../../../cells/kinds/transport/transport-value";
import { makeStudy, run, valueOf } from "../study/study-helpers";
import { cellOf, computeContext, defineContext } from "./define-helpers";

const line = (xs: number[]) => xs.map((x) => [x]);
const inline = (id: string, name: string, points: number[][], mass?: number[]) => ({ id, kind: "data", name, settings: { from: "inline", points, ...(mass ? { mass } : {}) } });

/** Computes transport cell `id` of `cells` with the given inputs and define-context extras. */
async function solve(cells: object[], id: string, inputs: Record<string, unknown>, extra: Parameters<typeof defineContext>[1] = {}) {
  const study = makeStudy(cells);
  const def = defineTransportCell(cellOf(study, id, "transport"), defineContext(study, extra));
  return (await def.compute(inputs, computeContext())) as TransportCellValue;
}

describe("defineTransportCell", () => {
  it("defineTransportCell(exact, euclidean, 1-D) gives scipy's wasserstein_distance docstring values", async () => {
    // scipy.stats.wasserstein_distance docstring: ([0,1,3],[5,6,8]) → 5.0; ([0,1],[0,1], weights [3,1],[2,2]) → 0.25.
    const cells = [{ id: "t1", kind: "transport", name: "w", settings: { source: "a", target: "b", method: "exact", cost: { kind: "euclidean" } } }];
    const first = await solve(cells, "t1", { a: pointMeasure(line([0, 1, 3])), b: pointMeasure(line([5, 6, 8])) });
    expect(first.values.cost).toBeCloseTo(5, 12);
    const second = await solve(cells, "t1", { a: pointMeasure(line([0, 1]), [0.75, 0.25]), b: pointMeasure(line([0, 1]), [0.5, 0.5]) });
    expect(second.values.cost).toBeCloseTo(0.25, 12);
  });

  it("runStudy(exact transport with a cost matrix from a code cell) solves Taha's SunRay transportation problem to 435", async () => {
    // Taha, Operations Research: An Introduction (SunRay): supplies 15, 25, 10; demands 5, 15, 15, 15 → 435
    // (values from memory, re-solved with an LP solver; shared/REFERENCES.md).
    const study = makeStudy([
      inline("d1", "plants", line([0, 1, 2]), [15, 25, 10]),
      inline("d2", "depots", line([0, 1, 2, 3]), [5, 15, 15, 15]),
      { id: "c1", kind: "code", name: "freight", settings: { code: "[[10, 2, 20, 11], [12, 7, 9, 20], [4, 14, 16, 18]]" } },
      { id: "t1", kind: "transport", name: "shipping", settings: { source: "plants", target: "depots", method: "exact", cost: { kind: "matrix", cell: "freight" } } },
    ]);
    const value = valueOf<TransportCellValue>(await run(study), "t1");
    expect(value.values.cost).toBeCloseTo(435, 9);
    expect(value.algorithm).toBe("network-simplex");
  });

  it("defineTransportCell(entropic with references) resolves them and gives what solveTransport gives for the same problem", async () => {
    const source = pointMeasure([[0, 0], [1, 0], [0, 1], [2, 2]]);
    const target = pointMeasure([[1, 1], [2, 0], [0.5, 0.5]]);
    const cells = [
      {
        id: "t1",
        kind: "transport",
        name: "plan",
        settings: { source: "a", target: "b", method: "entropic", epsilon: { relative: { param: "eps" }, reference: "median" }, tolerance: { param: "tol" }, cost: { kind: "power", p: { param: "p" } } },
      },
    ];
    const value = await solve(cells, "t1", { a: source, b: target, eps: 0.1, tol: 1e-9, p: 1.5 });
    const direct = solveTransport(source, target, { kind: "power", p: 1.5 }, { method: "entropic", epsilon: { relative: 0.1, reference: "median" }, tolerance: 1e-9 });
    expect(value.values).toEqual(direct.values);
    expect(value.diagnostics.iterations).toBe(direct.diagnostics.iterations);
    expect(value.solveOptions).toMatchObject({ method: "entropic", epsilon: { relative: 0.1, reference: "median" }, tolerance: 1e-9, maxIterations: 10000, schedule: false, domain: "auto" });
    expect(value.costSpec).toEqual({ kind: "power", p: 1.5 });
    expect(value.source).toBe(source);
  });

  it("defineTransportCell(inputs) depends on source, target and every reference", () => {
    const study = makeStudy([
      { id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "unbalanced", epsilon: { absolute: { param: "eps" } }, massPenalty: { source: { param: "rho" }, target: "balanced" } } },
    ]);
    expect(defineTransportCell(cellOf(study, "t1", "transport"), defineContext(study)).inputs).toEqual(["a", "b", "eps", "rho"]);
  });

  it("defineTransportCell(reference out of bounds) throws a CellSettingError naming the setting, the reference and the value", async () => {
    const cells = [{ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "entropic", epsilon: { relative: { param: "eps" } } } }];
    const inputs = { a: pointMeasure(line([0, 1])), b: pointMeasure(line([2, 3])), eps: -1 };
    await expect(solve(cells, "t1", inputs)).rejects.toThrow(CellSettingError);
    await expect(solve(cells, "t1", inputs)).rejects.toThrow("epsilon.relative (from eps): must be > 0, got -1");
  });

  it("defineTransportCell(source that is not a measure) fails saying what the named cell gave", async () => {
    const cells = [{ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact" } }];
    await expect(solve(cells, "t1", { a: 3, b: pointMeasure(line([0])) })).rejects.toThrow('source: "a" gives 3, not a measure');
  });

  it("defineTransportCell(normalize) rescales both measures to mass 1, so an exact solve runs on unequal totals", async () => {
    const settings = (normalize: boolean) => [{ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact", normalize } }];
    const inputs = { a: pointMeasure(line([0, 1]), [1, 1]), b: pointMeasure(line([3]), [1]) };
    await expect(solve(settings(false), "t1", inputs)).rejects.toThrow("target.mass: totals differ");
    const value = await solve(settings(true), "t1", inputs);
    expect(Array.from(value.source.mass)).toEqual([0.5, 0.5]);
    expect(value.values.cost).toBeCloseTo(0.5 * 9 + 0.5 * 4, 12);
    expect(value.normalized).toBe(true);
  });

  it("defineTransportCell(unbalanced, 'balanced' side) hands the solver Infinity for that side", async () => {
    const requests: unknown[] = [];
    const spy: TransportSolver = async (request, control) => (requests.push(request.options), solveTransport(request.source, request.target, request.cost, { ...request.options, signal: control.signal }));
    const cells = [{ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "unbalanced", epsilon: { absolute: 0.5 }, massPenalty: { source: 2, target: "balanced" } } }];
    const value = await solve(cells, "t1", { a: pointMeasure(line([0, 1])), b: pointMeasure(line([1, 2])) }, { solve: spy });
    expect(requests[0]).toMatchObject({ massPenalty: { source: 2, target: Infinity } });
    expect(value.massPenalty).toEqual({ source: 2, target: Infinity });
  });

  it("defineTransportCell(warmStart) starts from this cell's previous potentials when the sizes match, and cold otherwise", async () => {
    const source = pointMeasure([[0, 0], [1, 0], [0, 1], [1, 1], [0.5, 0.2]]);
    const target = pointMeasure([[0.2, 0.1], [1.1, 0.3], [0.4, 0.9], [0.9, 1.2]]);
    const settings = (warmStart: boolean) => ({ source: "a", target: "b", method: "entropic", epsilon: { absolute: 0.02 }, tolerance: 1e-10, warmStart });
    for (const warmStart of [true, false]) {
      const study = makeStudy([{ id: "t1", kind: "transport", name: "plan", settings: settings(warmStart) }]);
      const context = defineContext(study);
      const def = defineTransportCell(cellOf(study, "t1", "transport"), context);
      const first = (await def.compute({ a: source, b: target }, computeContext())) as TransportCellValue;
      const second = (await def.compute({ a: source, b: target }, computeContext())) as TransportCellValue;
      expect(context.memory.potentials.get("t1")).toBe(second.potentials);
      if (warmStart) expect(second.diagnostics.iterations).toBeLessThan(first.diagnostics.iterations / 4);
      else expect(second.diagnostics.iterations).toBe(first.diagnostics.iterations);
      const resized = (await def.compute({ a: source, b: pointMeasure([[0, 0], [1, 1]]) }, computeContext())) as TransportCellValue;
      const cold = solveTransport(source, pointMeasure([[0, 0], [1, 1]]), { kind: "sqeuclidean" }, { method: "entropic", epsilon: { absolute: 0.02 }, tolerance: 1e-10 });
      expect(resized.diagnostics.iterations).toBe(cold.diagnostics.iterations);
    }
  });

  it("defineTransportCell(compute) passes the computation's signal to the solver and forwards its progress", async () => {
    const reports: unknown[] = [];
    let seen: AbortSignal | undefined;
    const fake: TransportSolver = async (request, control) => {
      seen = control.signal;
      const progress: SolveProgress = { iteration: 10, marginalError: 0.5 };
      control.onProgress?.(progress);
      return solveTransport(request.source, request.target, request.cost, request.options);
    };
    const study = makeStudy([{ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact" } }]);
    const def = defineTransportCell(cellOf(study, "t1", "transport"), defineContext(study, { solve: fake }));
    const context = computeContext(reports);
    await def.compute({ a: pointMeasure(line([0])), b: pointMeasure(line([1])) }, context);
    expect(seen).toBe(context.signal);
    expect(reports).toEqual([{ iteration: 10, marginalError: 0.5 }]);
  });

  it("defineTransportCell(debiased, a measure against itself) gives a divergence of 0 up to the tolerance", async () => {
    // Law: S_ε(α, α) = 0 by definition (Feydy et al. 2019, AISTATS).
    const cloud = pointMeasure([[0, 0], [1, 0.3], [0.2, 1], [0.7, 0.7]]);
    const cells = [{ id: "t1", kind: "transport", name: "self", settings: { source: "a", target: "b", method: "debiased", epsilon: { absolute: 0.1 }, tolerance: 1e-10 } }];
    const value = await solve(cells, "t1", { a: cloud, b: cloud });
    expect(Math.abs(value.values.divergence!)).toBeLessThan(1e-8);
  });
});

describe("describeTransport", () => {
  const study = makeStudy([{ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact" } }]);
  const cell = cellOf(study, "t1", "transport");
  const problem = (method: "exact" | "entropic" | "debiased", n: number) => {
    const a = pointMeasure(Array.from({ length: n }, (_, i) => [i / n]));
    const b = pointMeasure(Array.from({ length: n }, (_, i) => [(i + 0.5) / n]));
    const options = method === "exact" ? { method } : { method, epsilon: { absolute: 0.05 } };
    const result: TransportResult = solveTransport(a, b, { kind: "sqeuclidean" }, options);
    return { ...result, source: a, target: b, costSpec: { kind: "sqeuclidean" as const }, solveOptions: options, names: { source: "a", target: "b" } };
  };

  it("describeTransport(exact, 10 points) states the cost, algorithm and status, and cautions a small sample", () => {
    const { headline, cautions } = describeTransport(cell, problem("exact", 10));
    expect(headline).toMatch(/^cost = 0\.0025 \(exact, sorting, converged, \d+ it\)$/);
    expect(cautions).toEqual([expect.stringMatching(/^Small sample: 10 points/)]);
  });

  it("describeTransport(debiased, 60 points) leads with S_ε and drops the core's not-a-distance note", () => {
    const { headline, cautions } = describeTransport(cell, problem("debiased", 60));
    expect(headline).toMatch(/^S_ε = [\d.e−]+ \(debiased, ε = 0\.05, converged, \d+ it\)$/);
    expect(cautions).toEqual([]);
  });

  it("describeTransport(entropic) leads with OT_ε and cautions that the value is regularised", () => {
    const { headline, cautions } = describeTransport(cell, problem("entropic", 60));
    expect(headline).toMatch(/^OT_ε = /);
    expect(cautions.some((c) => c.startsWith("Regularised value"))).toBe(true);
  });
});
