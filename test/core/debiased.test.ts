import { describe, expect, it } from "vitest";
import { costMatrix } from "../../core/cost";
import { solveDebiased } from "../../core/debiased";
import { TransportInputError } from "../../core/errors";
import { type PointMeasure, pointMeasure } from "../../core/measure";
import { seededRandom } from "../../core/random";
import type { SolveOptions } from "../../core/result";
import { solveTransportLp } from "../oracle/lp-oracle";
import { inputError } from "./expectations";

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function expectNear(actual: number, expected: number, tolerance: number, what = ""): void {
  expect(Math.abs(actual - expected), `${what} actual ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

/** n random points in [0,1]^dim with random positive masses summing to `total` (seeded). */
function cloud(n: number, seed: number, total = 1, dim = 2, shift = 0): PointMeasure {
  const r = seededRandom(seed);
  const pts = Array.from({ length: n }, () => Array.from({ length: dim }, () => r() + shift));
  const w = Array.from({ length: n }, () => 0.2 + r());
  const s = w.reduce((p, q) => p + q, 0);
  return pointMeasure(pts, w.map((v) => (total * v) / s));
}

function entropy(a: Float64Array): number {
  let h = 0;
  for (const x of a) if (x > 0) h -= x * Math.log(x);
  return h;
}

const debiased = (extra: Partial<SolveOptions> & Pick<SolveOptions, "epsilon">): SolveOptions => ({ method: "debiased", tolerance: 1e-10, ...extra });

/** The 1-D grid of REFERENCES.md: 801 points on [−10, 14], masses ∝ the normal pdf. */
function gaussianGrid(mean: number, sd: number): PointMeasure {
  const N = 801;
  const xs = Array.from({ length: N }, (_, k) => -10 + (24 * k) / (N - 1));
  const w = xs.map((x) => Math.exp(-0.5 * ((x - mean) / sd) ** 2));
  const total = w.reduce((s, x) => s + x, 0);
  return pointMeasure(xs, w.map((x) => x / total));
}

/** 1-D entropic OT between Gaussians, our convention (Janati et al. 2020, Thm 1; REFERENCES.md). */
function gaussianEntropic1d(m1: number, s1: number, m2: number, s2: number, eps: number): number {
  const N = Math.sqrt(1 + (16 * s1 * s1 * s2 * s2) / (eps * eps));
  return (m1 - m2) ** 2 + s1 * s1 + s2 * s2 - (eps / 2) * N + (eps / 2) * (1 - Math.log(2)) + (eps / 2) * Math.log(1 + N);
}

describe("solveDebiased", () => {
  it("solveDebiased(a, a, ...) is 0, balanced and unbalanced", () => {
    // S_ε(α, α) = 0 by construction (Feydy et al. 2019, AISTATS, Thm 1; Séjourné et al. 2019).
    const x = cloud(30, 1);
    for (const extra of [{}, { massPenalty: 0.3 }, { massPenalty: { source: 2, target: 2 } }]) {
      const r = solveDebiased(x, x, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: 0.05 }, ...extra }));
      expect(r.diagnostics.status).toBe("converged");
      expectNear(r.values.divergence!, 0, 1e-10, `S(a,a) ${JSON.stringify(extra)}`);
      expect(r.values.objective).toBeGreaterThan(0.01); // OT_ε(a, a) itself is not 0
    }
  });

  it("solveDebiased(...) is ≥ 0 on random seeded instances, balanced and unbalanced with unequal masses", () => {
    // Positivity of the Sinkhorn divergence for positive definite kernels e^(−C/ε), C = |x−y|^p, p ≤ 2
    // (Feydy et al. 2019, Thm 1; unbalanced with the mass correction: Séjourné et al. 2019).
    for (let seed = 1; seed <= 6; seed++) {
      const r = seededRandom(100 + seed);
      const x = cloud(12 + seed, 10 * seed, 1, 2, 0);
      const y = cloud(15, 10 * seed + 1, 1, 2, 0.3 * r());
      const yHeavy = cloud(15, 10 * seed + 1, 0.4 + 2 * r(), 2, 0.3 * r());
      const cases: [PointMeasure, SolveOptions, string][] = [
        [y, debiased({ epsilon: { relative: 0.01 + 0.2 * r() } }), "balanced sqeuclidean"],
        [yHeavy, debiased({ epsilon: { relative: 0.01 + 0.2 * r() }, massPenalty: 0.01 + r() }), "unbalanced sqeuclidean"],
        [yHeavy, debiased({ epsilon: { relative: 0.01 + 0.2 * r() }, massPenalty: 0.001 }), "unbalanced, tiny ρ"],
      ];
      for (const [target, options, what] of cases) {
        for (const cost of [{ kind: "sqeuclidean" as const }, { kind: "euclidean" as const }]) {
          const res = solveDebiased(x, target, cost, { ...options, maxIterations: 100_000 });
          expect(res.diagnostics.status).toBe("converged");
          expect(res.values.divergence!, `seed ${seed}, ${what}, ${cost.kind}, ${JSON.stringify(options)}`).toBeGreaterThanOrEqual(-1e-10);
        }
      }
    }
  });

  it("solveDebiased(a, 2a, ...) unbalanced needs the (ε/2)(m(a) − m(b))² correction to stay ≥ 0", () => {
    // Derivation in core/debiased.ts (Séjourné et al. 2019 in our a⊗b convention): without the
    // correction the three-term value is negative for a small mass penalty.
    const x = cloud(20, 7);
    const x2 = pointMeasure(Array.from(x.points), x.mass.map((v) => 2 * v), { dim: 2 });
    const r = solveDebiased(x, x2, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: 0.1 }, massPenalty: 0.01 }));
    const eps = r.epsilon!.absolute;
    const uncorrected = r.values.objective - 0.5 * r.values.selfTerms!.source - 0.5 * r.values.selfTerms!.target;
    expect(uncorrected).toBeLessThan(0);
    expectNear(r.values.divergence!, uncorrected + 0.5 * eps * (1 - 2) ** 2, 1e-14);
    expect(r.values.divergence!).toBeGreaterThan(0);
  });

  it("solveDebiased(..., euclidean cost, large ε) tends to half the energy distance: scipy example → ½·1.0²", () => {
    // ε → ∞: S_ε → ½∫∫−C d(α−β)d(α−β); for C = |x−y| that is ½·E, E the energy distance (Feydy et al. 2019;
    // Székely & Rizzo 2013). scipy.stats.energy_distance docstring: ([0,8],[0,8],[3,1],[2,2]) → 1.0 = √E,
    // so the limit is ½·1.0² = 0.5 (REFERENCES.md). The gap decays like 1/ε.
    const alpha = pointMeasure([0, 8], [0.75, 0.25]);
    const beta = pointMeasure([0, 8], [0.5, 0.5]);
    const gaps = [100, 1000, 10_000].map((e) => solveDebiased(alpha, beta, { kind: "euclidean" }, debiased({ epsilon: { absolute: e }, tolerance: 1e-12 })).values.divergence! - 0.5);
    expect(Math.abs(gaps[2])).toBeLessThan(1e-4);
    expect(Math.abs(gaps[1])).toBeLessThan(Math.abs(gaps[0]) / 5);
    expect(Math.abs(gaps[2])).toBeLessThan(Math.abs(gaps[1]) / 5);
    // scipy docstring ([0], [2]) → 2.0: two Diracs, S_ε = C = 2 = ½·2² at every ε (REFERENCES.md).
    for (const e of [0.1, 10]) expectNear(solveDebiased(pointMeasure([0]), pointMeasure([2]), { kind: "euclidean" }, debiased({ epsilon: { absolute: e } })).values.divergence!, 2, 1e-12);
  });

  it("solveDebiased(..., sqeuclidean cost, large ε) tends to |mean(α) − mean(β)|²", () => {
    // ε → ∞ limit for C = |x−y|² (Feydy et al. 2019; REFERENCES.md "Limits of the debiased divergence").
    const x = cloud(30, 1);
    const y = cloud(25, 2, 1, 2, 0.1);
    const mean = (m: PointMeasure) => [0, 1].map((k) => m.mass.reduce((s, w, i) => s + w * m.points[2 * i + k], 0));
    const [mx, my] = [mean(x), mean(y)];
    const target = (mx[0] - my[0]) ** 2 + (mx[1] - my[1]) ** 2;
    const S = solveDebiased(x, y, { kind: "sqeuclidean" }, debiased({ epsilon: { absolute: 1000 }, tolerance: 1e-12 })).values.divergence!;
    expectNear(S, target, 1e-3 * target);
  });

  it("solveDebiased(..., small ε) tends to the exact OT cost from the HiGHS LP", async () => {
    // ε → 0: S_ε → OT_0 (Feydy et al. 2019; REFERENCES.md). Elementary bracket from OT_0 ≤ OT_ε ≤ OT_0 + ε·min H
    // applied to the cross and self terms (OT_0(a, a) = 0): OT_0 − ε(H(a)+H(b))/2 ≤ S_ε ≤ OT_0 + ε·min(H(a), H(b)).
    const x = cloud(25, 3);
    const y = cloud(20, 4, 1, 2, 0.2);
    const C = costMatrix(x, y, { kind: "sqeuclidean" });
    const { cost: ot0 } = await solveTransportLp(x.mass, y.mass, C);
    const [ha, hb] = [entropy(x.mass), entropy(y.mass)];
    const errors = [0.01, 0.001, 0.0001].map((rel) => {
      const r = solveDebiased(x, y, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: rel }, tolerance: 1e-9, maxIterations: 100_000 }));
      const eps = r.epsilon!.absolute;
      expect(r.values.divergence!).toBeGreaterThanOrEqual(ot0 - (eps * (ha + hb)) / 2 - 1e-9);
      expect(r.values.divergence!).toBeLessThanOrEqual(ot0 + eps * Math.min(ha, hb) + 1e-9);
      return Math.abs(r.values.divergence! - ot0);
    });
    // Discrete measures: the error is O(ε) (self terms ≈ ε·H), so it drops about tenfold per decade of ε.
    expect(errors[1]).toBeLessThan(errors[0] / 5);
    expect(errors[2]).toBeLessThan(errors[1] / 5);
    expect(errors[2]).toBeLessThan(0.002 * ot0);
  });

  it("solveDebiased(...) matches the closed form for 1-D Gaussians N(0,1), N(1.5, 2²) at ε = 1", () => {
    // S_ε from the entropic Gaussian closed form applied to the three terms (Janati et al. 2020, NeurIPS 33,
    // Thm 1; REFERENCES.md 801-point grid on [−10, 14], masses ∝ pdf).
    const a = gaussianGrid(0, 1);
    const b = gaussianGrid(1.5, 2);
    const closed = gaussianEntropic1d(0, 1, 1.5, 2, 1) - 0.5 * gaussianEntropic1d(0, 1, 0, 1, 1) - 0.5 * gaussianEntropic1d(1.5, 2, 1.5, 2, 1);
    const r = solveDebiased(a, b, { kind: "sqeuclidean" }, debiased({ epsilon: { absolute: 1 }, tolerance: 1e-9 }));
    expect(r.diagnostics.status).toBe("converged");
    expectNear(r.values.objective, 4.474357, 1e-6, "cross term (REFERENCES.md check value)");
    expectNear(r.values.selfTerms!.source, gaussianEntropic1d(0, 1, 0, 1, 1), 1e-6, "self term a");
    expectNear(r.values.selfTerms!.target, gaussianEntropic1d(1.5, 2, 1.5, 2, 1), 1e-6, "self term b");
    expectNear(r.values.divergence!, closed, 1e-6, "divergence");
  });

  it("solveDebiased(...) returns the combined result shape and the 'regularised-value' warning", () => {
    // Result contract (core/result.ts): divergence, cross objective, self terms, cross plan, combined diagnostics.
    const x = cloud(20, 5);
    const y = cloud(18, 6);
    const r = solveDebiased(x, y, { kind: "euclidean" }, debiased({ epsilon: { relative: 0.1 } }));
    expect(r.method).toBe("debiased");
    expect(r.algorithm).toBe("sinkhorn-divergence-kernel");
    expect(r.plan?.kind).toBe("gibbs");
    expect(r.massPenalty).toBeUndefined();
    expect(r.diagnostics.warnings.map((w) => w.code)).toEqual(["regularised-value"]);
    expect(r.diagnostics.warnings[0].message).toMatch(/not a distance/);
    const { divergence, objective, selfTerms } = r.values;
    expectNear(divergence!, objective - 0.5 * selfTerms!.source - 0.5 * selfTerms!.target, 1e-15);
    const d = r.diagnostics;
    expect(d.history.length).toBe(d.iterations);
    expect(Array.from(d.historyIterations)).toEqual(Array.from({ length: d.iterations }, (_, k) => k + 1));
    expect(d.marginalError).toBeLessThanOrEqual(1e-10);
    const u = solveDebiased(x, y, { kind: "euclidean" }, debiased({ epsilon: { relative: 0.1 }, massPenalty: 1 }));
    expect(u.massPenalty).toEqual({ source: 1, target: 1 });
    expect(u.values.penalties).toBeDefined();
  });

  it("solveDebiased(...) reports the worst status: a cap hit in any term gives 'not-converged'", () => {
    // Combined diagnostics: worst status, summed iterations (our contract, core/debiased.ts).
    const x = cloud(20, 5);
    const y = cloud(18, 6);
    const r = solveDebiased(x, y, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: 0.001 }, maxIterations: 5 }));
    expect(r.diagnostics.status).toBe("not-converged");
    expect(r.diagnostics.iterations).toBe(15);
    const codes = r.diagnostics.warnings.map((w) => w.code);
    expect(codes.filter((c) => c === "not-converged").length).toBe(3);
    expect(codes.filter((c) => c === "epsilon-tiny").length).toBe(1);
  });

  it("solveDebiased(..., {signal}) aborted gives status 'cancelled'", () => {
    // AbortSignal contract of SolveControl (core/result.ts).
    const x = cloud(20, 5);
    const y = cloud(18, 6);
    const controller = new AbortController();
    let calls = 0;
    const r = solveDebiased(
      x,
      y,
      { kind: "sqeuclidean" },
      debiased({
        epsilon: { relative: 0.001 },
        signal: controller.signal,
        progressEvery: 1,
        onProgress: () => {
          if (++calls === 4) controller.abort();
        },
      }),
    );
    expect(r.diagnostics.status).toBe("cancelled");
    expect(r.diagnostics.iterations).toBe(4);
    expect(Number.isFinite(r.values.divergence!)).toBe(true);
  });

  it("solveDebiased(...) with a user-matrix cost, unequal masses or bad options throws naming the field", () => {
    // Caller mistakes throw a typed error naming the field (DESIGN.md).
    const x = cloud(5, 5);
    const y = cloud(4, 6);
    const heavy = cloud(4, 6, 2);
    const matrix = { kind: "matrix" as const, matrix: { data: new Float64Array(20), rows: 5, cols: 4 } };
    expect(inputError(() => solveDebiased(x, y, matrix, debiased({ epsilon: { relative: 0.1 } }))).field).toBe("cost.kind");
    expect(inputError(() => solveDebiased(x, heavy, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: 0.1 } }))).field).toBe("target.mass");
    expect(inputError(() => solveDebiased(x, y, { kind: "sqeuclidean" }, { method: "debiased" })).field).toBe("epsilon");
    expect(inputError(() => solveDebiased(x, y, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: 0.1 }, massPenalty: -1 }))).field).toBe("massPenalty");
    expect(inputError(() => solveDebiased(x, y, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: 0.1 }, tolerance: 0 }))).field).toBe("tolerance");
  });

  it("solveDebiased(...) gives identical bits on a second run", () => {
    // Determinism (DESIGN.md: same inputs, same bits).
    const x = cloud(20, 8);
    const y = cloud(18, 9);
    const run = () => solveDebiased(x, y, { kind: "sqeuclidean" }, debiased({ epsilon: { relative: 0.02 }, schedule: true }));
    const [p, q] = [run(), run()];
    expect(q.values).toEqual(p.values);
    expect(Array.from(q.diagnostics.history)).toEqual(Array.from(p.diagnostics.history));
  });
});
