import { describe, expect, it } from "vitest";
import { costMatrix, costScale } from "../../core/cost";
import { TransportInputError } from "../../core/errors";
import type { Matrix } from "../../core/matrix";
import { type PointMeasure, pointMeasure } from "../../core/measure";
import { planMarginals } from "../../core/plan";
import { seededRandom } from "../../core/random";
import type { SolveProgress } from "../../core/result";
import { sinkhorn, solveEntropic } from "../../core/sinkhorn";
import { solveTransportLp } from "../oracle/lp-oracle";
import { inputError } from "./expectations";

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function expectNear(actual: number, expected: number, tolerance: number, what = ""): void {
  expect(Math.abs(actual - expected), `${what} actual ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

/** n random points in the unit square with random positive masses summing to 1 (seeded). */
function cloud(n: number, seed: number, uniform = false): PointMeasure {
  const r = seededRandom(seed);
  const pts = Array.from({ length: n }, () => [r(), r()]);
  const w = Array.from({ length: n }, () => (uniform ? 1 : 0.2 + r()));
  const total = w.reduce((s, x) => s + x, 0);
  return pointMeasure(pts, w.map((x) => x / total));
}

function sqCost(x: PointMeasure, y: PointMeasure): Matrix {
  return costMatrix(x, y, { kind: "sqeuclidean" });
}

function maxOf(C: Matrix): number {
  let m = -Infinity;
  for (const v of C.data) m = Math.max(m, v);
  return m;
}

/** Shannon entropy −Σ a log a (0 log 0 = 0). */
function entropy(a: Float64Array): number {
  let h = 0;
  for (const x of a) if (x > 0) h -= x * Math.log(x);
  return h;
}

function relativeL1(x: Float64Array, y: Float64Array): number {
  let d = 0;
  let t = 0;
  for (let i = 0; i < x.length; i++) {
    d += Math.abs(x[i] - y[i]);
    t += Math.abs(y[i]);
  }
  return d / t;
}

/** The 1-D grid of REFERENCES.md: 801 points on [−10, 14], masses ∝ the normal pdf. */
function gaussianGrid(mean: number, sd: number): PointMeasure {
  const N = 801;
  const xs = Array.from({ length: N }, (_, k) => -10 + (24 * k) / (N - 1));
  const w = xs.map((x) => Math.exp(-0.5 * ((x - mean) / sd) ** 2));
  const total = w.reduce((s, x) => s + x, 0);
  return pointMeasure(xs, w.map((x) => x / total));
}

/**
 * Entropic OT between 1-D Gaussians in our convention (Janati, Muzellec, Peyré & Cuturi
 * 2020, NeurIPS 33, Thm 1; 1-D form from REFERENCES.md): with N = sqrt(1 + 16 s₁²s₂²/ε²),
 * OT_ε = (m₁−m₂)² + s₁² + s₂² − (ε/2)N + (ε/2)(1 − log 2) + (ε/2)log(1 + N).
 */
function gaussianEntropic1d(m1: number, s1: number, m2: number, s2: number, eps: number): number {
  const N = Math.sqrt(1 + (16 * s1 * s1 * s2 * s2) / (eps * eps));
  return (m1 - m2) ** 2 + s1 * s1 + s2 * s2 - (eps / 2) * N + (eps / 2) * (1 - Math.log(2)) + (eps / 2) * Math.log(1 + N);
}

describe("sinkhorn", () => {
  const x = cloud(60, 1);
  const y = cloud(50, 2);
  const C = sqCost(x, y);
  const maxC = maxOf(C);

  it("sinkhorn(a, b, C, {epsilon}) returns a plan whose marginals match a and b to the tolerance", () => {
    // Marginal feasibility of the Sinkhorn plan (Sinkhorn 1967; common practice, no source for the check).
    for (const domain of ["log", "kernel"] as const) {
      const out = sinkhorn(x.mass, y.mass, C, { epsilon: 0.05 * maxC, tolerance: 1e-8, domain });
      expect(out.status).toBe("converged");
      expect(out.warnings).toEqual([]);
      const plan = { kind: "gibbs" as const, rows: 60, cols: 50, epsilon: out.epsilon, f: out.f, g: out.g, sourceMass: x.mass, targetMass: y.mass };
      const { source, target } = planMarginals(plan, C);
      expect(relativeL1(source, x.mass)).toBeLessThanOrEqual(1e-8);
      expect(relativeL1(target, y.mass)).toBeLessThanOrEqual(1e-8);
      expect(out.marginalError).toBeLessThanOrEqual(1e-8);
    }
  });

  it("sinkhorn(...) at convergence has primal objective = dual = ⟨f,a⟩ + ⟨g,b⟩", () => {
    // Strong duality of entropic OT; for probability masses the dual reduces to ⟨f,a⟩ + ⟨g,b⟩ (REFERENCES.md conventions).
    const out = sinkhorn(x.mass, y.mass, C, { epsilon: 0.02 * maxC, tolerance: 1e-10 });
    let fa = 0;
    let gb = 0;
    out.f.forEach((v, i) => (fa += v * x.mass[i]));
    out.g.forEach((v, j) => (gb += v * y.mass[j]));
    expectNear(out.values.objective, fa + gb, 1e-9 * maxC, "primal vs ⟨f,a⟩+⟨g,b⟩");
    expectNear(out.values.dual, fa + gb, 1e-12 * maxC, "dual vs ⟨f,a⟩+⟨g,b⟩");
    expectNear(out.values.mass, 1, 1e-9);
    expectNear(out.values.objective, out.values.cost + out.values.entropic, 1e-14);
    expect(out.values.entropic).toBeGreaterThan(0);
  });

  it("solveEntropic(...) lies between OT_0 and OT_0 + ε·min(H(a), H(b)), OT_0 from the HiGHS LP", async () => {
    // Elementary bound (REFERENCES.md): OT_0 ≤ OT_ε ≤ OT_0 + ε·min(H(a), H(b)); OT_0 from the
    // LP oracle (HiGHS, Huangfu & Hall 2018), independent of our solvers.
    const { cost: ot0 } = await solveTransportLp(x.mass, y.mass, C);
    const hmin = Math.min(entropy(x.mass), entropy(y.mass));
    for (const rel of [0.5, 0.1, 0.02, 0.005]) {
      const r = solveEntropic(x, y, C, { method: "entropic", epsilon: { relative: rel }, tolerance: 1e-9 }, costScale(C));
      const eps = r.epsilon!.absolute;
      expect(r.values.objective).toBeGreaterThanOrEqual(ot0 - 1e-9);
      expect(r.values.objective).toBeLessThanOrEqual(ot0 + eps * hmin + 1e-9);
      expect(r.values.cost).toBeGreaterThanOrEqual(ot0 - 1e-9);
    }
  });

  it("solveEntropic(...) transport cost ⟨C,P⟩ tends to the LP optimum as epsilon shrinks", async () => {
    // Convergence of entropic OT to OT_0 as ε → 0 (Cominetti & San Martín 1994; Peyré & Cuturi 2019,
    // Prop. 4.1), at the rate of the elementary bound 0 ≤ ⟨C,P_ε⟩ − OT_0 ≤ ε·min(H(a), H(b)) (REFERENCES.md).
    const { cost: ot0 } = await solveTransportLp(x.mass, y.mass, C);
    const hmin = Math.min(entropy(x.mass), entropy(y.mass));
    const rels = [0.1, 0.01, 0.001];
    const gaps = rels.map((rel) => {
      const r = solveEntropic(x, y, C, { method: "entropic", epsilon: { relative: rel }, tolerance: 1e-8, maxIterations: 50_000 }, costScale(C));
      expect(r.diagnostics.status).toBe("converged");
      return r.values.cost - ot0;
    });
    gaps.forEach((gap, k) => {
      expect(gap).toBeGreaterThanOrEqual(-1e-9);
      expect(gap).toBeLessThanOrEqual(rels[k] * maxC * hmin);
    });
    expect(gaps[1]).toBeLessThan(gaps[0]);
    expect(gaps[2]).toBeLessThan(gaps[1]);
    expect(gaps[2]).toBeLessThan(0.01 * ot0);
  });

  it("sinkhorn(...) matches the closed form for 1-D Gaussians N(0,1), N(1.5, 2²) at ε = 1: 4.474357", () => {
    // Janati et al. 2020 (NeurIPS 33) Thm 1, 1-D form and check value 4.474357 from REFERENCES.md,
    // on its 801-point grid over [−10, 14] with masses ∝ pdf.
    const a = gaussianGrid(0, 1);
    const b = gaussianGrid(1.5, 2);
    const Cg = costMatrix(a, b, { kind: "sqeuclidean" });
    const closed = gaussianEntropic1d(0, 1, 1.5, 2, 1);
    expectNear(closed, 4.474357, 5e-7, "closed form");
    const out = sinkhorn(a.mass, b.mass, Cg, { epsilon: 1, tolerance: 1e-10 });
    expect(out.status).toBe("converged");
    expectNear(out.values.objective, 4.474357, 1e-6, "primal");
    expectNear(out.values.dual, closed, 1e-6, "dual");
  });

  it("sinkhorn(...) matches the 1-D Gaussian closed form for N(−1, 0.8²), N(0.5, 1.2²) at ε = 0.5", () => {
    // Janati et al. 2020, Thm 1 (1-D form, REFERENCES.md); grid discretisation error is far below 1e-5 here.
    const a = gaussianGrid(-1, 0.8);
    const b = gaussianGrid(0.5, 1.2);
    const Cg = costMatrix(a, b, { kind: "sqeuclidean" });
    const out = sinkhorn(a.mass, b.mass, Cg, { epsilon: 0.5, tolerance: 1e-10 });
    expectNear(out.values.objective, gaussianEntropic1d(-1, 0.8, 0.5, 1.2, 0.5), 1e-5);
  });

  it("sinkhorn(..., {warmStart}) from converged potentials converges in at most 2 iterations", () => {
    // Fixed-point property of Sinkhorn potentials (common practice, no source).
    const eps = 0.01 * maxC;
    const cold = sinkhorn(x.mass, y.mass, C, { epsilon: eps, tolerance: 1e-9 });
    expect(cold.iterations).toBeGreaterThan(10);
    for (const domain of ["log", "kernel"] as const) {
      const warm = sinkhorn(x.mass, y.mass, C, { epsilon: eps, tolerance: 1e-9, warmStart: { f: cold.f, g: cold.g }, domain });
      expect(warm.status).toBe("converged");
      expect(warm.iterations).toBeLessThanOrEqual(2);
      expectNear(warm.values.objective, cold.values.objective, 1e-12);
    }
  });

  it("sinkhorn(..., {schedule: true}) reaches the value of the plain iteration", () => {
    // Epsilon scaling changes the path, not the fixed point (Schmitzer 2019, SIAM J. Sci. Comput. 41).
    const eps = 0.002 * maxC;
    const plain = sinkhorn(x.mass, y.mass, C, { epsilon: eps, tolerance: 1e-9, maxIterations: 100_000 });
    const scheduled = sinkhorn(x.mass, y.mass, C, { epsilon: eps, tolerance: 1e-9, maxIterations: 100_000, schedule: true });
    const custom = sinkhorn(x.mass, y.mass, C, { epsilon: eps, tolerance: 1e-9, maxIterations: 100_000, schedule: { factor: 0.3, startEpsilon: 2 * maxC } });
    for (const s of [scheduled, custom]) {
      expect(s.status).toBe("converged");
      expectNear(s.values.dual, plain.values.dual, 1e-9 * maxC);
      expect(s.history.length).toBe(s.iterations);
      expect(Array.from(s.historyIterations)).toEqual(Array.from({ length: s.iterations }, (_, k) => k + 1));
    }
  });

  it("sinkhorn(..., {schedule}) reports progress with a shrinking epsilon", () => {
    // Geometric epsilon schedule ending at the target (Schmitzer 2019); common practice.
    const seen: SolveProgress[] = [];
    sinkhorn(x.mass, y.mass, C, { epsilon: 0.01 * maxC, schedule: { factor: 0.5 }, onProgress: (p) => seen.push(p), progressEvery: 1 });
    const eps = seen.map((p) => p.epsilon!);
    expect(eps[0]).toBeCloseTo(maxC, 12);
    for (let k = 1; k < eps.length; k++) expect(eps[k]).toBeLessThanOrEqual(eps[k - 1]);
    expect(eps[eps.length - 1]).toBe(0.01 * maxC);
  });

  it("sinkhorn(..., {domain: 'log'}) and {domain: 'kernel'} give the same potentials and values", () => {
    // Kernel and log-domain Sinkhorn are the same iteration in different variables (Peyré & Cuturi 2019, Sec. 4.4).
    for (const rel of [1, 0.05, 0.005]) {
      const log = sinkhorn(x.mass, y.mass, C, { epsilon: rel * maxC, tolerance: 1e-10, domain: "log" });
      const ker = sinkhorn(x.mass, y.mass, C, { epsilon: rel * maxC, tolerance: 1e-10, domain: "kernel" });
      expect(log.algorithm).toBe("sinkhorn-log");
      expect(ker.algorithm).toBe("sinkhorn-kernel");
      expect(ker.iterations).toBe(log.iterations);
      expectNear(ker.values.objective, log.values.objective, 1e-12 * maxC);
      for (let i = 0; i < 60; i++) expectNear(ker.f[i], log.f[i], 1e-10 * maxC);
      for (let j = 0; j < 50; j++) expectNear(ker.g[j], log.g[j], 1e-10 * maxC);
    }
  });

  it("sinkhorn(..., {domain: 'auto'}) uses the kernel for moderate epsilon and the log domain for tiny epsilon", () => {
    // Our documented rule (KERNEL_SAFE_RANGE): kernel iff (max C − min C)/ε ≤ 500.
    expect(sinkhorn(x.mass, y.mass, C, { epsilon: 0.05 * maxC }).algorithm).toBe("sinkhorn-kernel");
    expect(sinkhorn(x.mass, y.mass, C, { epsilon: 0.001 * maxC, maxIterations: 20 }).algorithm).toBe("sinkhorn-log");
  });

  it("sinkhorn(..., {domain: 'kernel'}) hands over to the log domain with a 'kernel-fallback' warning when the kernel underflows", () => {
    // a = (½, ½), b = (0.9, 0.1), C = [[0,1],[1,0]]: the optimal plan moves 0.4 across cost 1,
    // but at ε = 1e-3 the kernel entry e^(−1000) is 0 in double precision, so the scaling
    // iteration has no feasible kernel and its scalings diverge (common practice, no source).
    const a = Float64Array.from([0.5, 0.5]);
    const b = Float64Array.from([0.9, 0.1]);
    const C2 = { data: Float64Array.from([0, 1, 1, 0]), rows: 2, cols: 2 };
    const ker = sinkhorn(a, b, C2, { epsilon: 1e-3, domain: "kernel", tolerance: 1e-10 });
    const log = sinkhorn(a, b, C2, { epsilon: 1e-3, domain: "log", tolerance: 1e-10 });
    expect(ker.algorithm).toBe("sinkhorn-log");
    expect(ker.warnings.map((w) => w.code)).toContain("kernel-fallback");
    expect(ker.status).toBe("converged");
    expectNear(ker.values.objective, log.values.objective, 1e-12);
    // OT_0 = 0.4 (move 0.4 at cost 1); the entropic value is within ε·H of it.
    expectNear(log.values.cost, 0.4, 1e-9);
  });

  it("sinkhorn(...) at epsilon 10× and 1e-4× the largest cost gives finite numbers and warns", () => {
    // Extreme regularisation (common practice, no source): values finite, marginals met or an
    // honest "not-converged", and the epsilon warnings naming the regime.
    const big = sinkhorn(x.mass, y.mass, C, { epsilon: 10 * maxC });
    expect(big.status).toBe("converged");
    expect(big.warnings.map((w) => w.code)).toEqual(["epsilon-large"]);
    // ε ≫ C: the plan is close to a⊗b, so the transport cost is close to Σ a_i b_j C_ij.
    let independent = 0;
    for (let i = 0; i < 60; i++) for (let j = 0; j < 50; j++) independent += x.mass[i] * y.mass[j] * C.data[i * 50 + j];
    expectNear(big.values.cost, independent, 0.02 * independent);

    for (const domain of ["auto", "log", "kernel"] as const) {
      const tiny = sinkhorn(x.mass, y.mass, C, { epsilon: 1e-4 * maxC, maxIterations: 300, domain });
      for (const v of [tiny.values.cost, tiny.values.objective, tiny.values.dual, tiny.values.mass, tiny.values.entropic, tiny.marginalError]) {
        expect(Number.isFinite(v)).toBe(true);
      }
      expect(tiny.f.every(Number.isFinite) && tiny.g.every(Number.isFinite)).toBe(true);
      expect(tiny.history.every((e) => Number.isFinite(e))).toBe(true);
      expect(tiny.status).toBe("not-converged");
      expect(tiny.warnings.map((w) => w.code)).toContain("epsilon-tiny");
      expect(tiny.warnings.map((w) => w.code)).toContain("not-converged");
    }
    const tinyConverged = sinkhorn(x.mass, y.mass, C, { epsilon: 1e-4 * maxC, tolerance: 1e-3, maxIterations: 100_000 });
    expect(tinyConverged.status).toBe("converged");
    expect(tinyConverged.marginalError).toBeLessThanOrEqual(1.01e-3);
  });

  it("sinkhorn(..., {maxIterations}) stops at the cap with status 'not-converged' and a warning naming the numbers", () => {
    // Non-convergence is an outcome, not an exception (DESIGN.md).
    const out = sinkhorn(x.mass, y.mass, C, { epsilon: 0.001 * maxC, maxIterations: 7, tolerance: 1e-9 });
    expect(out.status).toBe("not-converged");
    expect(out.iterations).toBe(7);
    expect(out.history.length).toBe(7);
    const w = out.warnings.find((w) => w.code === "not-converged")!;
    expect(w.message).toContain("7 iterations");
    expect(w.message).toContain("1e-9");
    expect(w.message).toMatch(/marginal error \d/);
  });

  it("sinkhorn(..., {signal}) returns status 'cancelled' without throwing", () => {
    // AbortSignal contract of SolveControl (core/result.ts).
    const before = new AbortController();
    before.abort();
    const none = sinkhorn(x.mass, y.mass, C, { epsilon: 0.01 * maxC, signal: before.signal });
    expect(none.status).toBe("cancelled");
    expect(none.iterations).toBe(0);
    expect(Number.isFinite(none.values.objective)).toBe(true);

    const during = new AbortController();
    const out = sinkhorn(x.mass, y.mass, C, {
      epsilon: 0.001 * maxC,
      signal: during.signal,
      progressEvery: 5,
      onProgress: (p) => {
        if (p.iteration === 20) during.abort();
      },
    });
    expect(out.status).toBe("cancelled");
    expect(out.iterations).toBe(20);
    expect(out.warnings.map((w) => w.code)).not.toContain("not-converged");
  });

  it("sinkhorn(..., {onProgress}) is called every progressEvery iterations with the error and epsilon", () => {
    // SolveProgress contract (core/result.ts).
    const seen: SolveProgress[] = [];
    const out = sinkhorn(x.mass, y.mass, C, { epsilon: 0.01 * maxC, tolerance: 1e-9, onProgress: (p) => seen.push(p), progressEvery: 3 });
    expect(seen.length).toBe(Math.floor(out.iterations / 3));
    seen.forEach((p, k) => {
      expect(p.iteration).toBe(3 * (k + 1));
      expect(p.epsilon).toBe(0.01 * maxC);
      expect(p.marginalError).toBe(out.history[p.iteration - 1]);
    });
    const every10: SolveProgress[] = [];
    const out10 = sinkhorn(x.mass, y.mass, C, { epsilon: 0.01 * maxC, tolerance: 1e-9, onProgress: (p) => every10.push(p) });
    expect(every10.length).toBe(Math.floor(out10.iterations / 10));
  });

  it("sinkhorn(...) with bad options throws a TransportInputError naming the option", () => {
    // Caller mistakes throw a typed error naming the field (DESIGN.md).
    const a = x.mass;
    const b = y.mass;
    const cases: [string, () => unknown][] = [
      ["epsilon", () => sinkhorn(a, b, C, { epsilon: 0 })],
      ["epsilon", () => sinkhorn(a, b, C, { epsilon: NaN })],
      ["epsilon", () => sinkhorn(a, b, C, { epsilon: Infinity })],
      ["epsilon", () => sinkhorn(a, b, C, {} as never)],
      ["tolerance", () => sinkhorn(a, b, C, { epsilon: 1, tolerance: 0 })],
      ["tolerance", () => sinkhorn(a, b, C, { epsilon: 1, tolerance: NaN })],
      ["maxIterations", () => sinkhorn(a, b, C, { epsilon: 1, maxIterations: 2.5 })],
      ["maxIterations", () => sinkhorn(a, b, C, { epsilon: 1, maxIterations: 0 })],
      ["progressEvery", () => sinkhorn(a, b, C, { epsilon: 1, progressEvery: -1 })],
      ["massPenalty.source", () => sinkhorn(a, b, C, { epsilon: 1, massPenalty: { source: -1, target: 1 } })],
      ["massPenalty.target", () => sinkhorn(a, b, C, { epsilon: 1, massPenalty: { source: 1, target: NaN } })],
      ["domain", () => sinkhorn(a, b, C, { epsilon: 1, domain: "fast" as never })],
      ["schedule.factor", () => sinkhorn(a, b, C, { epsilon: 1, schedule: { factor: 1.5 } })],
      ["schedule.startEpsilon", () => sinkhorn(a, b, C, { epsilon: 1, schedule: { startEpsilon: -2 } })],
      ["warmStart.f", () => sinkhorn(a, b, C, { epsilon: 1, warmStart: { f: new Float64Array(3), g: new Float64Array(50) } })],
      ["warmStart.g[1]", () => sinkhorn(a, b, C, { epsilon: 1, warmStart: { f: new Float64Array(60), g: Float64Array.from({ length: 50 }, (_, j) => (j === 1 ? NaN : 0)) } })],
      ["onProgress", () => sinkhorn(a, b, C, { epsilon: 1, onProgress: 3 as never })],
      ["a[2]", () => sinkhorn(Float64Array.from(a, (v, i) => (i === 2 ? -1 : v)), b, C, { epsilon: 1 })],
      ["C", () => sinkhorn(a, b, { data: new Float64Array(6), rows: 2, cols: 3 }, { epsilon: 1 })],
    ];
    for (const [field, call] of cases) expect(inputError(call).field, field).toBe(field);
  });

  it("sinkhorn(...) does not mutate its inputs and gives identical bits on a second run", () => {
    // Determinism and pure functions (DESIGN.md: same inputs, same bits).
    const a = Float64Array.from(x.mass);
    const b = Float64Array.from(y.mass);
    const data = Float64Array.from(C.data);
    const f0 = new Float64Array(60).fill(0.01);
    const g0 = new Float64Array(50);
    const run = () => sinkhorn(a, b, { data, rows: 60, cols: 50 }, { epsilon: 0.003 * maxC, warmStart: { f: f0, g: g0 }, schedule: true });
    const first = run();
    const second = run();
    expect(Array.from(second.f)).toEqual(Array.from(first.f));
    expect(Array.from(second.g)).toEqual(Array.from(first.g));
    expect(Array.from(second.history)).toEqual(Array.from(first.history));
    expect(second.values).toEqual(first.values);
    expect(Array.from(a)).toEqual(Array.from(x.mass));
    expect(Array.from(data)).toEqual(Array.from(C.data));
    expect(f0.every((v) => v === 0.01)).toBe(true);
  });

  it("sinkhorn(...) handles zero masses without NaN", () => {
    // Zero-mass points carry no plan mass; their potentials stay finite (c-transform extension; common practice).
    const a = Float64Array.from(x.mass, (v, i) => (i % 7 === 0 ? 0 : v));
    const b = Float64Array.from(y.mass, (v, j) => (j % 5 === 0 ? 0 : v));
    const sa = a.reduce((s, v) => s + v, 0);
    const sb = b.reduce((s, v) => s + v, 0);
    const an = a.map((v) => v / sa);
    const bn = b.map((v) => v / sb);
    for (const domain of ["log", "kernel"] as const) {
      const out = sinkhorn(an, bn, C, { epsilon: 0.01 * maxC, tolerance: 1e-9, domain });
      expect(out.status).toBe("converged");
      expect(out.f.every(Number.isFinite) && out.g.every(Number.isFinite)).toBe(true);
      expect(Number.isFinite(out.values.objective)).toBe(true);
    }
  });

  it("sinkhorn(...) with unequal total masses and both sides balanced stops at the cap and warns 'unequal-mass'", () => {
    // Balanced transport between unequal masses is infeasible (common practice): honest non-convergence, no hang.
    const b2 = y.mass.map((v) => 2 * v);
    const out = sinkhorn(x.mass, b2, C, { epsilon: 0.05 * maxC, maxIterations: 200 });
    expect(out.status).toBe("not-converged");
    expect(out.warnings.map((w) => w.code)).toEqual(["not-converged", "unequal-mass"]);
  });
});

describe("solveEntropic", () => {
  const x = cloud(40, 11);
  const y = cloud(30, 12);
  const C = sqCost(x, y);
  const scale = costScale(C);

  it("solveEntropic(...) returns the TransportResult shape with a Gibbs plan and epsilon in both forms", () => {
    // Result contract of core/result.ts; relative epsilon resolved against the max cost (core/cost.ts).
    const r = solveEntropic(x, y, C, { method: "entropic", epsilon: { relative: 0.05 } }, scale);
    expect(r.method).toBe("entropic");
    expect(r.algorithm).toBe("sinkhorn-kernel");
    expect(r.epsilon).toEqual({ absolute: 0.05 * scale.max, relative: 0.05, reference: "max" });
    expect(r.costScale).toBe(scale);
    expect(r.massPenalty).toBeUndefined();
    expect(r.plan?.kind).toBe("gibbs");
    if (r.plan?.kind !== "gibbs") throw new Error("unreachable");
    expect(r.plan.rows).toBe(40);
    expect(r.plan.cols).toBe(30);
    expect(r.plan.epsilon).toBe(0.05 * scale.max);
    expect(Array.from(r.plan.f)).toEqual(Array.from(r.potentials!.f));
    expect(r.diagnostics.status).toBe("converged");
    expect(r.diagnostics.warnings).toEqual([]);
    expect(r.diagnostics.history.length).toBe(r.diagnostics.iterations);
    expect(r.values.penalties).toBeUndefined();
    expect(r.values.divergence).toBeUndefined();
  });

  it("solveEntropic(...) with unequal total masses throws on target.mass suggesting normalisation or the unbalanced method", () => {
    // Caller mistake (DESIGN.md): balanced entropic OT needs equal masses.
    const heavy = pointMeasure(Array.from(y.points), y.mass.map((v) => 1.5 * v), { dim: 2 });
    const e = inputError(() => solveEntropic(x, heavy, C, { method: "entropic", epsilon: { relative: 0.1 } }, scale));
    expect(e.field).toBe("target.mass");
    expect(e.message).toMatch(/normalis/);
    expect(e.message).toMatch(/unbalanced/);
    // Within relative 1e-9 is accepted.
    const close = pointMeasure(Array.from(y.points), y.mass.map((v) => v * (1 + 1e-12)), { dim: 2 });
    expect(solveEntropic(x, close, C, { method: "entropic", epsilon: { relative: 0.1 } }, scale).diagnostics.status).toBe("converged");
  });

  it("solveEntropic(...) without epsilon or with bad options throws naming the option", () => {
    // Caller mistakes throw a typed error naming the field (DESIGN.md).
    expect(inputError(() => solveEntropic(x, y, C, { method: "entropic" }, scale)).field).toBe("epsilon");
    expect(inputError(() => solveEntropic(x, y, C, { method: "entropic", epsilon: { absolute: -1 } }, scale)).field).toBe("epsilon");
    expect(inputError(() => solveEntropic(x, y, C, { method: "entropic", epsilon: { relative: 0.1 }, tolerance: -1 }, scale)).field).toBe("tolerance");
    expect(inputError(() => solveEntropic(x, y, C, { method: "entropic", epsilon: { relative: 0.1 }, maxIterations: 1.5 }, scale)).field).toBe("maxIterations");
    expect(inputError(() => solveEntropic(x, y, C, { method: "entropic", epsilon: { relative: 0.1 }, schedule: { start: { relative: -1 } } }, scale)).field).toBe("schedule.start.relative");
    expect(inputError(() => solveEntropic(x, y, { data: new Float64Array(4), rows: 2, cols: 2 }, { method: "entropic", epsilon: { relative: 0.1 } }, scale)).field).toBe("cost.matrix");
  });

  it("solveEntropic(..., {schedule: {start}}) resolves the start epsilon against the cost scale", () => {
    // Same fixed point with or without the schedule (Schmitzer 2019).
    const plain = solveEntropic(x, y, C, { method: "entropic", epsilon: { relative: 0.01 }, tolerance: 1e-9 }, scale);
    const seen: number[] = [];
    const sched = solveEntropic(
      x,
      y,
      C,
      { method: "entropic", epsilon: { relative: 0.01 }, tolerance: 1e-9, schedule: { factor: 0.25, start: { relative: 0.5 } }, onProgress: (p) => seen.push(p.epsilon!), progressEvery: 1 },
      scale,
    );
    expect(seen[0]).toBeCloseTo(0.5 * scale.max, 12);
    expectNear(sched.values.dual!, plain.values.dual!, 1e-9 * scale.max);
  });
});
