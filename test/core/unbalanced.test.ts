import { describe, expect, it } from "vitest";
import { costMatrix, costScale } from "../../core/cost";
import { TransportInputError } from "../../core/errors";
import type { Matrix } from "../../core/matrix";
import { type PointMeasure, pointMeasure } from "../../core/measure";
import { planDense } from "../../core/plan";
import { seededRandom } from "../../core/random";
import { sinkhorn, solveEntropic, solveUnbalanced } from "../../core/sinkhorn";
import { dampingFactor, resolveMassPenalty } from "../../core/unbalanced";
import { inputError } from "./expectations";

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function expectNear(actual: number, expected: number, tolerance: number, what = ""): void {
  expect(Math.abs(actual - expected), `${what} actual ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

/** n random points in the unit square with random positive masses summing to `total` (seeded). */
function cloud(n: number, seed: number, total = 1): PointMeasure {
  const r = seededRandom(seed);
  const pts = Array.from({ length: n }, () => [r(), r()]);
  const w = Array.from({ length: n }, () => 0.2 + r());
  const s = w.reduce((p, q) => p + q, 0);
  return pointMeasure(pts, w.map((v) => (total * v) / s));
}

function maxOf(C: Matrix): number {
  let m = -Infinity;
  for (const v of C.data) m = Math.max(m, v);
  return m;
}

/**
 * Two Dirac masses μ = m₁δ_x, ν = m₂δ_y at cost c, reference μ⊗ν, penalty ρ on both sides
 * (REFERENCES.md, "Unbalanced, two Dirac masses"). Derivation: the plan is one number t and
 *   U(t) = c·t + ε(t log(t/(m₁m₂)) − t + m₁m₂) + ρ(t log(t/m₁) − t + m₁) + ρ(t log(t/m₂) − t + m₂).
 * U'(t) = c + ε log(t/(m₁m₂)) + ρ log(t/m₁) + ρ log(t/m₂) = 0 gives
 *   (2ρ + ε) log t = −c + (ρ + ε) log(m₁m₂),  t* = (m₁m₂)^((ρ+ε)/(2ρ+ε)) · e^(−c/(2ρ+ε)).
 * At t*, the t·log terms sum to −c·t* (by U'(t*) = 0 times t*), leaving
 *   U(t*) = ρ(m₁ + m₂) + ε m₁m₂ − (2ρ + ε) t*.
 */
function twoDirac(m1: number, m2: number, c: number, eps: number, rho: number): { value: number; mass: number } {
  const t = Math.pow(m1 * m2, (rho + eps) / (2 * rho + eps)) * Math.exp(-c / (2 * rho + eps));
  return { value: rho * (m1 + m2) + eps * m1 * m2 - (2 * rho + eps) * t, mass: t };
}

describe("unbalanced Sinkhorn", () => {
  it("sinkhorn(...) between two Dirac masses gives UOT = 1.3245962621 and t* = 0.8930493990 (m₁=1, m₂=2, c=1, ε=0.1, ρ=1)", () => {
    // Closed form and check values from REFERENCES.md (derived from the KL objective; see twoDirac above).
    const closed = twoDirac(1, 2, 1, 0.1, 1);
    expectNear(closed.value, 1.3245962621, 1e-10, "closed form value");
    expectNear(closed.mass, 0.893049399, 1e-10, "closed form mass");
    for (const domain of ["log", "kernel"] as const) {
      const out = sinkhorn(Float64Array.of(1), Float64Array.of(2), { data: Float64Array.of(1), rows: 1, cols: 1 }, { epsilon: 0.1, massPenalty: { source: 1, target: 1 }, tolerance: 1e-13, domain });
      expect(out.status).toBe("converged");
      expectNear(out.values.objective, 1.3245962621, 1e-10, `${domain} objective`);
      expectNear(out.values.dual, 1.3245962621, 1e-10, `${domain} dual`);
      expectNear(out.values.mass, 0.893049399, 1e-10, `${domain} mass`);
    }
  });

  it("sinkhorn(...) between two Dirac masses matches the closed form over a range of ε and ρ", () => {
    // Same derivation (REFERENCES.md), other parameters: unequal penalties are not covered by it, equal ones are.
    for (const [m1, m2, c, eps, rho] of [
      [0.3, 1.7, 2, 0.5, 0.2],
      [3, 1, 0.1, 0.01, 5],
      [1, 1, 4, 1, 50],
    ]) {
      const closed = twoDirac(m1, m2, c, eps, rho);
      const out = sinkhorn(Float64Array.of(m1), Float64Array.of(m2), { data: Float64Array.of(c), rows: 1, cols: 1 }, { epsilon: eps, massPenalty: { source: rho, target: rho }, tolerance: 1e-13, maxIterations: 100_000 });
      expectNear(out.values.objective, closed.value, 1e-9 * Math.max(1, closed.value), `value for ${[m1, m2, c, eps, rho]}`);
      expectNear(out.values.mass, closed.mass, 1e-9 * closed.mass, `mass for ${[m1, m2, c, eps, rho]}`);
    }
  });

  const x = cloud(40, 21, 1);
  const y = cloud(35, 22, 1.6);
  const C = costMatrix(x, y, { kind: "sqeuclidean" });
  const maxC = maxOf(C);

  it("sinkhorn(..., {massPenalty}) satisfies the first-order optimality conditions of the primal entry by entry", () => {
    // KKT of the unbalanced primal (Chizat, Peyré, Schmitzer & Vialard 2018, Math. Comp. 87): for every
    // entry, C_ij + ε log(P_ij/(a_i b_j)) + ρ_a log(r_i/a_i) + ρ_b log(c_j/b_j) = 0, with r, c the
    // marginals of P. Evaluated on the dense plan itself, independently of the potentials.
    const eps = 0.02 * maxC;
    for (const rho of [{ source: 0.1, target: 0.1 }, { source: 0.05, target: 1 }]) {
      const out = sinkhorn(x.mass, y.mass, C, { epsilon: eps, massPenalty: rho, tolerance: 1e-12, maxIterations: 100_000 });
      expect(out.status).toBe("converged");
      const P = planDense({ kind: "gibbs", rows: 40, cols: 35, epsilon: eps, f: out.f, g: out.g, sourceMass: x.mass, targetMass: y.mass }, C);
      const r = new Float64Array(40);
      const c = new Float64Array(35);
      for (let i = 0; i < 40; i++) for (let j = 0; j < 35; j++) {
        r[i] += P.data[i * 35 + j];
        c[j] += P.data[i * 35 + j];
      }
      let worst = 0;
      for (let i = 0; i < 40; i++) for (let j = 0; j < 35; j++) {
        const grad = C.data[i * 35 + j] + eps * Math.log(P.data[i * 35 + j] / (x.mass[i] * y.mass[j])) + rho.source * Math.log(r[i] / x.mass[i]) + rho.target * Math.log(c[j] / y.mass[j]);
        worst = Math.max(worst, Math.abs(grad));
      }
      expect(worst).toBeLessThan(1e-9 * maxC);
      expectNear(out.values.objective, out.values.dual, 1e-10 * maxC, "strong duality");
    }
  });

  it("sinkhorn(..., {massPenalty: ρ}) tends to the balanced value as ρ → ∞ (equal masses)", () => {
    // ρ → ∞ recovers the balanced problem (Chizat et al. 2018; Séjourné et al. 2019): the gap shrinks like 1/ρ.
    // (Sweeps grow like ρ/ε here: the potentials' common shift is only weakly pinned by the penalties.)
    const b = y.mass.map((v) => v / 1.6);
    const eps = 0.05 * maxC;
    const balanced = sinkhorn(x.mass, b, C, { epsilon: eps, tolerance: 1e-12 });
    const gaps = [1, 10, 100].map((r) => {
      const out = sinkhorn(x.mass, b, C, { epsilon: eps, massPenalty: { source: r * maxC, target: r * maxC }, tolerance: 1e-12, maxIterations: 200_000 });
      expect(out.status).toBe("converged");
      return balanced.values.objective - out.values.objective;
    });
    for (let k = 0; k < gaps.length; k++) expect(gaps[k]).toBeGreaterThanOrEqual(-1e-12);
    for (let k = 1; k < gaps.length; k++) expect(gaps[k]).toBeLessThan(gaps[k - 1] / 5);
    expect(gaps[2]).toBeLessThan(3e-4 * balanced.values.objective);
    const infinite = sinkhorn(x.mass, b, C, { epsilon: eps, massPenalty: { source: Infinity, target: Infinity }, tolerance: 1e-12 });
    expect(infinite.values.objective).toBe(balanced.values.objective);
  });

  it("sinkhorn(...) with unequal masses and a huge ρ stops at the cap with 'not-converged' (no hang)", () => {
    // REFERENCES.md: with unequal masses and huge ρ the problem tends to an infeasible balanced
    // one; convergence needs ~ρ/ε sweeps, so the solver must stop at its cap and say so.
    const out = sinkhorn(x.mass, y.mass, C, { epsilon: 0.05 * maxC, massPenalty: { source: 1e8, target: 1e8 }, maxIterations: 300 });
    expect(out.status).toBe("not-converged");
    expect(out.iterations).toBe(300);
    expect(out.warnings.map((w) => w.code)).toEqual(["not-converged"]);
    expect(Number.isFinite(out.values.objective) && Number.isFinite(out.values.dual)).toBe(true);
  });

  it("sinkhorn(..., {massPenalty: {source: Infinity, target: ρ}}) meets the source marginal exactly and lets the target side adjust", () => {
    // ρ = ∞ on a side makes it a hard constraint (REFERENCES.md conventions).
    const out = sinkhorn(x.mass, y.mass, C, { epsilon: 0.05 * maxC, massPenalty: { source: Infinity, target: 0.1 }, tolerance: 1e-11 });
    expect(out.status).toBe("converged");
    expectNear(out.values.mass, 1, 1e-10, "transported mass = source mass");
    expect(out.values.penalties!.source).toBe(0);
    expect(out.values.penalties!.target).toBeGreaterThan(0);
    expectNear(out.values.objective, out.values.dual, 1e-10 * maxC, "strong duality");
  });

  it("sinkhorn(..., {massPenalty}) gives the same result in the log and kernel domains", () => {
    // Same iteration in two variables (Chizat et al. 2018, Sec. 4 scaling form vs log form).
    const rho = { source: 0.3, target: 0.2 };
    const log = sinkhorn(x.mass, y.mass, C, { epsilon: 0.02 * maxC, massPenalty: rho, tolerance: 1e-11, domain: "log" });
    const ker = sinkhorn(x.mass, y.mass, C, { epsilon: 0.02 * maxC, massPenalty: rho, tolerance: 1e-11, domain: "kernel" });
    expect(ker.algorithm).toBe("sinkhorn-kernel");
    expect(ker.iterations).toBe(log.iterations);
    expectNear(ker.values.objective, log.values.objective, 1e-12 * maxC);
    for (let i = 0; i < 40; i++) expectNear(ker.f[i], log.f[i], 1e-9 * maxC);
  });

  it("sinkhorn(..., {massPenalty, schedule}) reaches the value of the plain iteration", () => {
    // Epsilon scaling does not change the fixed point (Schmitzer 2019; Chizat et al. 2018 use it too).
    const rho = { source: 0.5, target: 0.5 };
    const plain = sinkhorn(x.mass, y.mass, C, { epsilon: 0.003 * maxC, massPenalty: rho, tolerance: 1e-10, maxIterations: 100_000 });
    const sched = sinkhorn(x.mass, y.mass, C, { epsilon: 0.003 * maxC, massPenalty: rho, tolerance: 1e-10, maxIterations: 100_000, schedule: true });
    expectNear(sched.values.objective, plain.values.objective, 1e-9 * maxC);
  });
});

describe("solveUnbalanced", () => {
  const x = cloud(30, 31, 1);
  const y = cloud(25, 32, 2);
  const C = costMatrix(x, y, { kind: "sqeuclidean" });
  const scale = costScale(C);

  it("solveUnbalanced(...) returns method 'unbalanced', the penalties used and the penalty terms", () => {
    // Result contract (core/result.ts): massPenalty reported, values.penalties = ρ·KL terms.
    const r = solveUnbalanced(x, y, C, { method: "unbalanced", epsilon: { relative: 0.05 }, massPenalty: 0.2, tolerance: 1e-10 }, scale);
    expect(r.method).toBe("unbalanced");
    expect(r.massPenalty).toEqual({ source: 0.2, target: 0.2 });
    expect(r.diagnostics.status).toBe("converged");
    expect(r.diagnostics.warnings).toEqual([]);
    const { cost, entropic, penalties, objective } = r.values;
    expectNear(objective, cost + entropic! + penalties!.source + penalties!.target, 1e-14);
    // Unequal masses (1 vs 2): the transported mass lies between them (common practice, no source).
    expect(r.values.mass).toBeGreaterThan(0.9);
    expect(r.values.mass).toBeLessThan(2);
    expect(r.plan?.kind).toBe("gibbs");
  });

  it("solveUnbalanced(...) without a mass penalty or with a bad one throws naming massPenalty", () => {
    // Caller mistakes throw a typed error naming the field (DESIGN.md).
    const base = { method: "unbalanced" as const, epsilon: { relative: 0.05 } };
    expect(inputError(() => solveUnbalanced(x, y, C, base, scale)).field).toBe("massPenalty");
    expect(inputError(() => solveUnbalanced(x, y, C, { ...base, massPenalty: 0 }, scale)).field).toBe("massPenalty");
    expect(inputError(() => solveUnbalanced(x, y, C, { ...base, massPenalty: NaN }, scale)).field).toBe("massPenalty");
    expect(inputError(() => solveUnbalanced(x, y, C, { ...base, massPenalty: { source: 1, target: -3 } }, scale)).field).toBe("massPenalty.target");
    // Both sides balanced with unequal masses is the balanced problem's mistake.
    expect(inputError(() => solveUnbalanced(x, y, C, { ...base, massPenalty: Infinity }, scale)).field).toBe("target.mass");
  });

  it("solveUnbalanced(..., {massPenalty: Infinity}) equals solveEntropic on equal masses", () => {
    // ρ = ∞ on both sides is the balanced problem (REFERENCES.md conventions).
    const y1 = pointMeasure(Array.from(y.points), y.mass.map((v) => v / 2), { dim: 2 });
    const C1 = costMatrix(x, y1, { kind: "sqeuclidean" });
    const u = solveUnbalanced(x, y1, C1, { method: "unbalanced", epsilon: { relative: 0.05 }, massPenalty: Infinity }, scale);
    const e = solveEntropic(x, y1, C1, { method: "entropic", epsilon: { relative: 0.05 } }, scale);
    expect(u.values.objective).toBe(e.values.objective);
    expect(u.massPenalty).toEqual({ source: Infinity, target: Infinity });
  });
});

describe("resolveMassPenalty", () => {
  it("resolveMassPenalty(ρ) accepts one number or per-side values, Infinity included", () => {
    // Our option contract (core/result.ts SolveOptions.massPenalty).
    expect(resolveMassPenalty(2)).toEqual({ source: 2, target: 2 });
    expect(resolveMassPenalty({ source: Infinity, target: 0.5 })).toEqual({ source: Infinity, target: 0.5 });
    expect(inputError(() => resolveMassPenalty("1" as never)).field).toBe("massPenalty");
    expect(inputError(() => resolveMassPenalty({ source: 1 } as never)).field).toBe("massPenalty.target");
  });

  it("dampingFactor(ρ, ε) is ρ/(ρ+ε), and 1 for ρ = Infinity", () => {
    // Chizat et al. 2018, unbalanced Sinkhorn update exponent.
    expect(dampingFactor(1, 0.1)).toBeCloseTo(1 / 1.1, 15);
    expect(dampingFactor(Infinity, 0.1)).toBe(1);
  });
});

describe("reference-mass caution", () => {
  // Fact of the objective (REFERENCES.md convention): ε·KL(P‖a⊗b) is minimised by
  // total mass m(a)·m(b), so masses far from 1 pull the transported mass there.
  it("solveUnbalanced(a, b) with totals 50 and 50 warns that a⊗b has mass 2500", () => {
    const a = cloud(8, 3, 50);
    const b = cloud(9, 4, 50);
    const C = costMatrix(a, b, { kind: "sqeuclidean" });
    const result = solveUnbalanced(a, b, C, { method: "unbalanced", epsilon: { relative: 0.1 }, massPenalty: 1 }, costScale(C));
    const codes = result.diagnostics.warnings.map((w) => w.code);
    expect(codes).toContain("reference-mass");
    expect(result.diagnostics.warnings.find((w) => w.code === "reference-mass")!.message).toMatch(/2500/);
  });

  it("solveUnbalanced(a, b) with totals 1 and 0.8 gives no reference-mass warning", () => {
    const a = cloud(8, 3, 1);
    const b = cloud(9, 4, 0.8);
    const C = costMatrix(a, b, { kind: "sqeuclidean" });
    const result = solveUnbalanced(a, b, C, { method: "unbalanced", epsilon: { relative: 0.1 }, massPenalty: 1 }, costScale(C));
    expect(result.diagnostics.warnings.map((w) => w.code)).not.toContain("reference-mass");
  });
});
