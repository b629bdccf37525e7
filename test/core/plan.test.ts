import { describe, expect, it } from "vitest";
import { costMatrix } from "../../core/cost";
import { TransportInputError } from "../../core/errors";
import { pointMeasure } from "../../core/measure";
import { planDense, planEntries, planMarginals, planRow } from "../../core/plan";
import { seededRandom } from "../../core/random";
import type { GibbsPlan, SparsePlan } from "../../core/result";
import { sinkhorn } from "../../core/sinkhorn";
import { inputError } from "./expectations";

// A hand-made sparse plan (2 × 3) with a repeated entry (0, 1).
const sparse: SparsePlan = {
  kind: "sparse",
  rows: 2,
  cols: 3,
  from: Int32Array.from([0, 1, 1, 0]),
  to: Int32Array.from([1, 0, 2, 1]),
  mass: Float64Array.from([0.3, 0.2, 0.5, 0.1]),
};

function randomProblem(n: number, m: number, seed: number) {
  const r = seededRandom(seed);
  const x = pointMeasure(Array.from({ length: n }, () => [r(), r()]));
  const y = pointMeasure(Array.from({ length: m }, () => [r(), r()]));
  return { x, y, C: costMatrix(x, y, { kind: "sqeuclidean" }) };
}

function gibbsOf(out: { f: Float64Array; g: Float64Array; epsilon: number }, a: Float64Array, b: Float64Array): GibbsPlan {
  return { kind: "gibbs", rows: a.length, cols: b.length, epsilon: out.epsilon, f: out.f, g: out.g, sourceMass: a, targetMass: b };
}

describe("plan readers", () => {
  const { x, y, C } = randomProblem(12, 9, 5);
  const out = sinkhorn(x.mass, y.mass, C, { epsilon: 0.05, tolerance: 1e-12 });
  const gibbs = gibbsOf(out, x.mass, y.mass);

  it("planDense(sparse) scatters the entries, adding repeated ones", () => {
    // Definition of a sparse plan (core/result.ts).
    expect(Array.from(planDense(sparse).data)).toEqual([0, 0.4, 0, 0.2, 0, 0.5]);
  });

  it("planDense(gibbs, C) equals a_i b_j exp((f_i + g_j − C_ij)/ε) entry by entry", () => {
    // Our convention for entropic plans (REFERENCES.md), recomputed with Math.exp.
    const P = planDense(gibbs, C);
    for (let i = 0; i < 12; i++) {
      for (let j = 0; j < 9; j++) {
        const expected = x.mass[i] * y.mass[j] * Math.exp((out.f[i] + out.g[j] - C.data[i * 9 + j]) / gibbs.epsilon);
        expect(Math.abs(P.data[i * 9 + j] - expected)).toBeLessThanOrEqual(1e-13 * expected);
      }
    }
  });

  it("planMarginals(gibbs, C) of a converged solve returns the source and target masses", () => {
    // Marginal feasibility of the Sinkhorn plan (Sinkhorn 1967).
    const { source, target } = planMarginals(gibbs, C);
    source.forEach((v, i) => expect(Math.abs(v - x.mass[i])).toBeLessThan(1e-12));
    target.forEach((v, j) => expect(Math.abs(v - y.mass[j])).toBeLessThan(1e-12));
    const s = planMarginals(sparse);
    expect(Array.from(s.source)).toEqual([0.4, 0.7]);
    expect(Array.from(s.target)).toEqual([0.2, 0.4, 0.5]);
  });

  it("planRow(plan, C, i) equals row i of planDense", () => {
    // Consistency of the readers (common practice, no source).
    const P = planDense(gibbs, C);
    for (const i of [0, 5, 11]) expect(Array.from(planRow(gibbs, C, i))).toEqual(Array.from(P.data.subarray(i * 9, i * 9 + 9)));
    expect(Array.from(planRow(sparse, undefined, 1))).toEqual([0.2, 0, 0.5]);
  });

  it("planEntries(plan, C, {threshold, limit}) lists the largest entries in decreasing order", () => {
    // Top-k selection checked against a full sort of the dense plan (common practice, no source).
    const P = planDense(gibbs, C);
    const all = Array.from(P.data, (mass, k) => ({ mass, k })).sort((p, q) => q.mass - p.mass || p.k - q.k);
    const top = planEntries(gibbs, C, { limit: 10 });
    expect(top.mass.length).toBe(10);
    for (let t = 0; t < 10; t++) {
      expect(top.from[t] * 9 + top.to[t]).toBe(all[t].k);
      expect(top.mass[t]).toBe(all[t].mass);
    }
    const threshold = all[20].mass;
    const above = planEntries(gibbs, C, { threshold, limit: 1000 });
    expect(above.mass.length).toBe(all.filter((e) => e.mass > threshold).length);
    expect(Array.from(planEntries(sparse).mass)).toEqual([0.5, 0.3, 0.2, 0.1]);
    // Ties: equal masses ordered by source, then target index.
    const ties: SparsePlan = { kind: "sparse", rows: 2, cols: 2, from: Int32Array.from([1, 0, 0]), to: Int32Array.from([0, 1, 0]), mass: Float64Array.from([0.25, 0.25, 0.5]) };
    const e = planEntries(ties, undefined, { limit: 2 });
    expect([Array.from(e.from), Array.from(e.to)]).toEqual([
      [0, 0],
      [0, 1],
    ]);
  });

  it("planEntries(...) of uniform n-to-n clouds at small ε picks out the optimal permutation (Birkhoff–von Neumann)", () => {
    // n uniform points vs n uniform points have a permutation/n as an optimal plan (Birkhoff 1946;
    // von Neumann 1953); the entropic plan concentrates on it as ε → 0. Brute force over all 7! permutations.
    const n = 7;
    const p = randomProblem(n, n, 9);
    const solve = sinkhorn(p.x.mass, p.y.mass, p.C, { epsilon: 1e-3, tolerance: 1e-9, maxIterations: 100_000 });
    const top = planEntries(gibbsOf(solve, p.x.mass, p.y.mass), p.C, { limit: n });
    let best = Infinity;
    let bestPerm: number[] = [];
    const perm = Array.from({ length: n }, (_, i) => i);
    const visit = (k: number) => {
      if (k === n) {
        const c = perm.reduce((s, j, i) => s + p.C.data[i * n + j], 0);
        if (c < best) [best, bestPerm] = [c, perm.slice()];
        return;
      }
      for (let t = k; t < n; t++) {
        [perm[k], perm[t]] = [perm[t], perm[k]];
        visit(k + 1);
        [perm[k], perm[t]] = [perm[t], perm[k]];
      }
    };
    visit(0);
    const chosen = new Array<number>(n);
    for (let t = 0; t < n; t++) chosen[top.from[t]] = top.to[t];
    expect(chosen).toEqual(bestPerm);
    for (const mass of top.mass) expect(mass).toBeGreaterThan(0.9 / n);
  });

  it("plan readers with missing or wrong inputs throw a TransportInputError naming the field", () => {
    // Caller mistakes throw a typed error naming the field (DESIGN.md).
    expect(inputError(() => planDense(gibbs)).field).toBe("C");
    expect(inputError(() => planMarginals(gibbs, { data: new Float64Array(4), rows: 2, cols: 2 })).field).toBe("C");
    expect(inputError(() => planRow(gibbs, C, 12)).field).toBe("i");
    expect(inputError(() => planRow(sparse, undefined, -1)).field).toBe("i");
    expect(inputError(() => planEntries(sparse, undefined, { limit: 0 })).field).toBe("limit");
    expect(inputError(() => planEntries(sparse, undefined, { threshold: -1 })).field).toBe("threshold");
    expect(inputError(() => planDense({ kind: "dense" } as never)).field).toBe("plan");
  });
});
