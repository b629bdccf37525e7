import { describe, expect, it } from "vitest";
import { densePlan, topPlanEntries } from "../../../../cells/views/figures/plan-entries";
import { seededRandom } from "../../../../core/random";
import type { GibbsPlan, SparsePlan } from "../../../../core/result";

function randomGibbs(seed: number): { plan: GibbsPlan; cost: { rows: number; cols: number; data: Float64Array } } {
  const random = seededRandom(seed);
  const rows = 1 + Math.floor(random() * 7), cols = 1 + Math.floor(random() * 7);
  const data = Float64Array.from({ length: rows * cols }, () => random() * 3);
  const plan: GibbsPlan = {
    kind: "gibbs", rows, cols, epsilon: 0.1 + random(),
    f: Float64Array.from({ length: rows }, () => random() - 0.5),
    g: Float64Array.from({ length: cols }, () => random() - 0.5),
    sourceMass: Float64Array.from({ length: rows }, () => 0.1 + random()),
    targetMass: Float64Array.from({ length: cols }, () => 0.1 + random()),
  };
  return { plan, cost: { rows, cols, data } };
}

describe("topPlanEntries", () => {
  it("topPlanEntries(gibbs, k) equals sorting all entries, over 100 seeded cases", () => {
    // Law: the bounded heap must agree with a full sort (heaviest first, ties by position).
    for (let seed = 1; seed <= 100; seed++) {
      const { plan, cost } = randomGibbs(seed);
      const dense = densePlan(plan, cost);
      const all = Array.from(dense.data, (m, p) => ({ m, p })).sort((a, b) => b.m - a.m || a.p - b.p);
      const k = seed % 9;
      const top = topPlanEntries(plan, k, cost);
      const expected = all.slice(0, k);
      const got = Array.from(top.mass, (m, q) => ({ m, p: top.from[q] * plan.cols + top.to[q] }));
      expect(got, `seed ${seed}, k ${k}`).toEqual(expected);
      expect(top.totalMass, `seed ${seed}`).toBeCloseTo(all.reduce((s, e) => s + e.m, 0), 12);
    }
  });

  it("topPlanEntries(sparse with ties and zeros) breaks ties by row-major position and skips zero mass", () => {
    const plan: SparsePlan = { kind: "sparse", rows: 2, cols: 2, from: Int32Array.of(1, 0, 0, 1), to: Int32Array.of(1, 1, 0, 0), mass: Float64Array.of(0.25, 0.25, 0, 0.5) };
    const top = topPlanEntries(plan, 3);
    expect(Array.from(top.mass)).toEqual([0.5, 0.25, 0.25]);
    expect(Array.from(top.from)).toEqual([1, 0, 1]);
    expect(Array.from(top.to)).toEqual([0, 1, 1]);
    expect(top.positiveCount).toBe(3);
  });
});

describe("densePlan", () => {
  it("densePlan(sparse with a repeated pair) sums the repeats", () => {
    const plan: SparsePlan = { kind: "sparse", rows: 1, cols: 2, from: Int32Array.of(0, 0), to: Int32Array.of(1, 1), mass: Float64Array.of(0.25, 0.5) };
    expect(Array.from(densePlan(plan).data)).toEqual([0, 0.75]);
  });

  it("densePlan(gibbs, cost of the wrong shape) throws naming cost", () => {
    const { plan } = randomGibbs(3);
    expect(() => densePlan(plan, { rows: plan.rows + 1, cols: plan.cols, data: new Float64Array((plan.rows + 1) * plan.cols) })).toThrow(/^cost: dimension mismatch/);
  });
});
