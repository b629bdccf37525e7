import { describe, expect, it } from "vitest";
import { subsample } from "../../../core/generators";
import { type PointMeasure, pointMeasure } from "../../../core/measure";
import { seededRandom } from "../../../core/random";
import { solveTransport } from "../../../core/solve";
import { defineSweepCell, describeSweep } from "../../../cells/kinds/sweep/define";
import { sweepProblem } from "../../../cells/kinds/sweep/sweep-problem";
import type { SweepCellValue } from "../../../cells/kinds/sweep/sweep-value";
import { defineTransportCell } from "../../../cells/kinds/transport/define";
import type { TransportCellValue } from "../../../cells/kinds/transport/transport-value";
import { makeStudy } from "../study/study-helpers";
import { cellOf, collect, computeContext, defineContext } from "./define-helpers";

/** FNV-1a 32 from its specification (Fowler, Noll & Vo), independent of the code under test. */
function fnv1a(text: string): number {
  let h = 2166136261;
  for (const byte of Buffer.from(text, "utf8")) {
    h ^= byte;
    h = Number((BigInt(h) * 16777619n) % 4294967296n);
  }
  return h;
}

const cloud = (n: number, shift: number, seed: number): PointMeasure => {
  const random = seededRandom(seed);
  return pointMeasure(Array.from({ length: n }, () => [random() + shift, random()]));
};

/** Solves transport `settings` on a and b, then runs sweep `sweep` over it; returns every yielded value. */
async function sweep(transport: object, settings: object, a: PointMeasure, b: PointMeasure, extra: Record<string, unknown> = {}, reports: unknown[] = []) {
  const study = makeStudy([
    { id: "t1", kind: "transport", name: "plan", settings: transport },
    { id: "s1", kind: "sweep", name: "sw", settings: { transport: "plan", ...settings } },
  ]);
  const context = defineContext(study);
  const base = (await defineTransportCell(cellOf(study, "t1", "transport"), context).compute({ a, b, ...extra }, computeContext())) as TransportCellValue;
  const def = defineSweepCell(cellOf(study, "s1", "sweep"), context);
  const values = await collect(def.compute({ plan: base, ...extra }, computeContext(reports)) as AsyncIterable<SweepCellValue>);
  return { base, values, final: values[values.length - 1], def };
}

const debiased = { source: "a", target: "b", method: "debiased", epsilon: { absolute: 0.1 } };
const a = cloud(40, 0, 1);
const b = cloud(30, 0.5, 2);

describe("defineSweepCell", () => {
  it("defineSweepCell(sampleSize × 3 replicates) gives values × replicates rows, value-major, with one subsample per replicate", async () => {
    const { final, base } = await sweep(debiased, { vary: "sampleSize", values: [10, 20], replicates: 3, seed: 99, record: ["divergence", "energyDistance"] }, a, b);
    expect(final.complete).toBe(true);
    expect(final.rows.map((r) => [r.value, r.replicate])).toEqual([[10, 0], [10, 1], [10, 2], [20, 0], [20, 1], [20, 2]]);
    expect(final.columns).toEqual(["sampleSize", "replicate", "divergence", "energyDistance"]);
    expect(final.rows[0].sampleSize).toBe(10);
    const energies = final.rows.slice(0, 3).map((r) => r.energyDistance);
    expect(new Set(energies).size).toBe(3);
    // Replicate r draws the source with seed FNV-1a-32("99:replicate-r") (docs/format.md, "sweep"),
    // the target with FNV-1a-32("<that seed>:target") (docs/cells.md).
    for (let r = 0; r < 3; r++) {
      const seed = fnv1a(`99:replicate-${r}`);
      const problem = sweepProblem(base, "sampleSize", 10, seed);
      expect(problem.source).toEqual(subsample(a, 10, seededRandom(seed)));
      expect(problem.target).toEqual(subsample(b, 10, seededRandom(fnv1a(`${seed}:target`))));
    }
  });

  it("defineSweepCell(same settings twice) gives the same rows (determinism)", async () => {
    const settings = { vary: "sampleSize.source", values: [8, 16], replicates: 2, record: ["cost", "objective", "divergence", "iterations", "energyDistance"] };
    const first = (await sweep(debiased, settings, a, b)).final;
    const second = (await sweep(debiased, settings, a, b)).final;
    expect(second.rows).toEqual(first.rows);
  });

  it("defineSweepCell(compute) yields the table after every run, then complete, reporting progress", async () => {
    const reports: unknown[] = [];
    const { values } = await sweep(debiased, { vary: "epsilon", values: [0.5, 0.2, 0.1] }, a, b, {}, reports);
    expect(values.map((v) => [v.rows.length, v.complete])).toEqual([[1, false], [2, false], [3, false], [3, true]]);
    expect(reports).toEqual([{ run: 1, of: 3 }, { run: 2, of: 3 }, { run: 3, of: 3 }]);
  });

  it("defineSweepCell(vary epsilon) keeps the transport's relative form and equals solveTransport at each value", async () => {
    const transport = { source: "a", target: "b", method: "entropic", epsilon: { relative: 0.1, reference: "median" } };
    const { final } = await sweep(transport, { vary: "epsilon", values: [0.05, 0.2] }, a, b);
    for (const row of final.rows) {
      const direct = solveTransport(a, b, { kind: "sqeuclidean" }, { method: "entropic", epsilon: { relative: row.value as number, reference: "median" }, tolerance: 1e-6, maxIterations: 10000 });
      expect(row.cost).toBe(direct.values.cost);
      expect(row.objective).toBe(direct.values.objective);
    }
  });

  it("defineSweepCell(vary massPenalty with 'balanced') solves the balanced side with ρ = ∞", async () => {
    const transport = { source: "a", target: "b", method: "unbalanced", epsilon: { absolute: 0.1 }, massPenalty: 1 };
    const { final } = await sweep(transport, { vary: "massPenalty.target", values: [0.5, "balanced"], record: ["mass", "status"] }, a, b);
    const direct = solveTransport(a, b, { kind: "sqeuclidean" }, { method: "unbalanced", epsilon: { absolute: 0.1 }, massPenalty: { source: 1, target: Infinity }, tolerance: 1e-6, maxIterations: 10000 });
    expect(final.rows[1]).toMatchObject({ value: "balanced", "massPenalty.target": "balanced", mass: direct.values.mass, status: direct.diagnostics.status });
  });

  it("defineSweepCell(costExponent, energyDistance) records scipy's energy distance example squared", async () => {
    // scipy.stats.energy_distance([0], [2]) = 2.0 (its docstring), the square root of E = 4 (shared/REFERENCES.md).
    const transport = { source: "a", target: "b", method: "exact" };
    const { final } = await sweep(transport, { vary: "costExponent", values: [1, 2], record: ["cost", "energyDistance"] }, pointMeasure([[0]]), pointMeasure([[2]]));
    expect(final.rows.map((r) => [r.cost, r.energyDistance])).toEqual([[2, 4], [4, 4]]);
  });

  it("defineSweepCell(range with references) resolves the ends and expands the range, log spaced", async () => {
    const { final } = await sweep(debiased, { vary: "epsilon", values: { from: { param: "lo" }, to: 1, count: 3, spacing: "log" }, record: ["divergence"] }, a, b, { lo: 0.01 });
    expect(final.values).toEqual([0.01, 0.1, 1]);
    expect(final.logSpaced).toBe(true);
  });

  it("defineSweepCell(settings that do not apply) fails before running: epsilon of an exact transport, samples beyond the measure", async () => {
    await expect(sweep({ source: "a", target: "b", method: "exact" }, { vary: "epsilon", values: [0.1] }, a, b)).rejects.toThrow('vary: "epsilon" has no effect on an exact transport ("plan")');
    await expect(sweep(debiased, { vary: "sampleSize", values: [35] }, a, b)).rejects.toThrow('values: sample size 35 is more than the 30 points (with mass) of "b"');
  });

  it("describeSweep(value) states the runs, and cautions replicates that repeat one problem", async () => {
    const { final } = await sweep(debiased, { vary: "epsilon", values: [0.5, 0.2], replicates: 2, record: ["divergence"] }, a, b);
    const study = makeStudy([{ id: "s1", kind: "sweep", name: "sw", settings: { transport: "plan", vary: "epsilon", values: [0.5] } }]);
    const { headline, cautions } = describeSweep(cellOf(study, "s1", "sweep"), final);
    expect(headline).toBe("epsilon over 2 values × 2 replicates (4 runs)");
    expect(cautions).toEqual(["Replicates repeat the same problem: only sample-size sweeps draw new subsamples."]);
  });
});
