import { describe, expect, it } from "vitest";
import { TransportInputError } from "../../core/errors";
import type { Matrix } from "../../core/matrix";
import { networkSimplex } from "../../core/network-simplex";
import { transport1d } from "../../core/one-dimensional";
import { type RandomSource, seededRandom } from "../../core/random";
import { lpCertificate } from "../oracle/lp-oracle";
import { expectClose, inputError } from "./expectations";

function powerCost(x: Float64Array, y: Float64Array, p: number): Matrix {
  const data = new Float64Array(x.length * y.length);
  for (let i = 0; i < x.length; i++) for (let j = 0; j < y.length; j++) data[i * y.length + j] = Math.abs(x[i] - y[j]) ** p;
  return { data, rows: x.length, cols: y.length };
}

function normalized(w: ArrayLike<number>): Float64Array {
  const total = Array.from(w).reduce((s, x) => s + x, 0);
  return Float64Array.from(w, (x) => x / total);
}

/** Random 1-D weighted points; some masses zero and some locations repeated (degenerate cases). */
function line(random: RandomSource, count: number, repeats = true): { x: Float64Array; w: Float64Array } {
  const x = Float64Array.from({ length: count }, () => 10 * random() - 3);
  if (repeats) for (let k = 1; k < count; k += 4) x[k] = x[k - 1];
  const w = Float64Array.from({ length: count }, () => (random() < 0.2 ? 0 : random()));
  if (w.every((v) => v === 0)) w[0] = 1;
  return { x, w: normalized(w) };
}

/**
 * Inverse standard normal CDF by Acklam's rational approximation (P. J. Acklam 2003,
 * relative error < 1.15e-9; coefficients from memory, checked below against table values).
 */
function normalQuantile(p: number): number {
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const low = 0.02425;
  if (p < low || p > 1 - low) {
    const q = Math.sqrt(-2 * Math.log(p < low ? p : 1 - p));
    const x = (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
    return p < low ? x : -x;
  }
  const q = p - 0.5;
  const r = q * q;
  return ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
}

describe("transport1d against the network simplex", () => {
  const cases: [number, number, number, number][] = [];
  for (const p of [1, 2, 1.5]) for (let s = 0; s < 6; s++) cases.push([p, 1 + ((s * 13) % 60), 1 + ((s * 29 + 7) % 80), 300 + s]);
  it.each(cases)("transport1d(p = %d, %d × %d points, seed %d) equals the network simplex cost and certifies its potentials", (p, n, m, seed) => {
    const random = seededRandom(seed);
    const { x, w: a } = line(random, n);
    const { x: y, w: b } = line(random, m);
    const C = powerCost(x, y, p);
    const result = transport1d(x, a, y, b, p);
    // Oracle: our network simplex, itself checked against HiGHS in network-simplex.test.ts.
    const reference = networkSimplex(a, b, C);
    expectClose(result.cost, reference.cost, 1e-12, 1e-12);
    // LP optimality conditions on the full cost matrix (Dantzig 1963), zero-mass points included.
    const cert = lpCertificate(a, b, C, result.plan, result.f, result.g);
    expect(cert.marginalError).toBeLessThanOrEqual(1e-13);
    expect(cert.negativeMass).toBe(0);
    expect(cert.dualViolation).toBeLessThanOrEqual(1e-12);
    expect(cert.slackness).toBeLessThanOrEqual(1e-12);
    expect(cert.gap).toBeLessThanOrEqual(1e-12);
    expect(result.plan.mass.length).toBeLessThanOrEqual(n + m - 1);
  });

  it("transport1d returns the monotone coupling: entries sorted by x have non-decreasing y", () => {
    // The quantile coupling (Villani 2003, Thm 2.18) is the comonotone one.
    const random = seededRandom(7);
    const { x, w: a } = line(random, 40);
    const { x: y, w: b } = line(random, 55);
    const { plan } = transport1d(x, a, y, b, 2);
    const entries = Array.from(plan.mass, (_, k) => [x[plan.from[k]], y[plan.to[k]]]).sort((u, v) => u[0] - v[0] || u[1] - v[1]);
    for (let k = 1; k < entries.length; k++) expect(entries[k][1]).toBeGreaterThanOrEqual(entries[k - 1][1]);
  });
});

describe("transport1d worked examples", () => {
  // scipy.stats.wasserstein_distance docstring examples (REFERENCES.md): W1 with weights normalised.
  it("transport1d([0,1,3] vs [5,6,8], p = 1) is 5", () => {
    const u = Float64Array.from([1, 1, 1]).map((v) => v / 3);
    expectClose(transport1d(Float64Array.from([0, 1, 3]), u, Float64Array.from([5, 6, 8]), u, 1).cost, 5.0, 1e-15);
  });

  it("transport1d([0,1] weights [3,1] vs [0,1] weights [2,2], p = 1) is 0.25", () => {
    const x = Float64Array.from([0, 1]);
    expectClose(transport1d(x, normalized([3, 1]), x, normalized([2, 2]), 1).cost, 0.25, 1e-15);
  });

  it("transport1d([3.4,3.9,7.5,7.8] vs [4.5,1.4] with weights, p = 1) is 4.078133143804786", () => {
    const result = transport1d(Float64Array.from([3.4, 3.9, 7.5, 7.8]), normalized([1.4, 0.9, 3.1, 7.2]), Float64Array.from([4.5, 1.4]), normalized([3.2, 3.5]), 1);
    expectClose(result.cost, 4.078133143804786, 1e-14);
  });

  it("normalQuantile (test helper) reproduces table values of the standard normal", () => {
    // Table values of Φ⁻¹ (common practice, any statistics table): 1.959964 at 0.975, 2.326348 at 0.99.
    expectClose(normalQuantile(0.975), 1.959963984540054, 1e-8);
    expectClose(normalQuantile(0.99), 2.326347874040841, 1e-8);
    expectClose(normalQuantile(0.001), -3.090232306167814, 1e-8);
    expect(normalQuantile(0.5)).toBe(0);
  });

  it("transport1d between quantile discretisations of N(0,1) and N(1.5, 2²) gives W2² ≈ (m₁−m₂)² + (s₁−s₂)² = 3.25", () => {
    // Dowson & Landau 1982 (1-D case of the Gaussian W2 formula, REFERENCES.md).
    const quantiles = (count: number, mean: number, sd: number) => Float64Array.from({ length: count }, (_, k) => mean + sd * normalQuantile((k + 0.5) / count));
    const x = quantiles(3000, 0, 1);
    const y = quantiles(5000, 1.5, 2);
    const result = transport1d(x, new Float64Array(3000).fill(1 / 3000), y, new Float64Array(5000).fill(1 / 5000), 2);
    // Midpoint quantile levels miss part of the tails: 1.5e-5 relative at these sizes.
    expectClose(result.cost, 3.25, 1e-4);
  });
});

describe("transport1d laws", () => {
  it("transport1d with shuffled inputs returns the same cost and the plan in the caller's original indices", () => {
    const random = seededRandom(21);
    const { x, w: a } = line(random, 30, false);
    const { x: y, w: b } = line(random, 20);
    const base = transport1d(x, a, y, b, 1.5);
    const perm = Int32Array.from({ length: 30 }, (_, k) => (k * 7) % 30);
    const shuffled = transport1d(Float64Array.from(perm, (i) => x[i]), Float64Array.from(perm, (i) => a[i]), y, b, 1.5);
    expectClose(shuffled.cost, base.cost, 1e-14);
    // Each entry of the shuffled plan moves mass between the same locations.
    const moved = (r: typeof base, xs: Float64Array) => Array.from(r.plan.mass, (mass, k) => `${xs[r.plan.from[k]]}→${y[r.plan.to[k]]}:${mass.toPrecision(12)}`);
    const xsShuffled = Float64Array.from(perm, (i) => x[i]);
    // Distinct locations: the optimal plan is unique up to these labels.
    expect(moved(shuffled, xsShuffled).sort()).toEqual(moved(base, x).sort());
    // Potentials follow their points: f of a point is the same whatever its index.
    const cert = lpCertificate(Float64Array.from(perm, (i) => a[i]), b, powerCost(xsShuffled, y, 1.5), shuffled.plan, shuffled.f, shuffled.g);
    expect(cert.dualViolation).toBeLessThanOrEqual(1e-12);
  });

  it("transport1d of a measure with itself costs 0", () => {
    // W_p(μ, μ) = 0 (metric axiom).
    const { x, w } = line(seededRandom(22), 25);
    expect(transport1d(x, w, x, w, 2).cost).toBe(0);
  });

  it("transport1d returns identical bits for identical inputs", () => {
    const random = seededRandom(23);
    const { x, w: a } = line(random, 50);
    const { x: y, w: b } = line(random, 60);
    const r1 = transport1d(x, a, y, b, 1.5);
    const r2 = transport1d(Float64Array.from(x), Float64Array.from(a), Float64Array.from(y), Float64Array.from(b), 1.5);
    expect(Object.is(r1.cost, r2.cost)).toBe(true);
    expect(Buffer.from(r1.f.buffer).equals(Buffer.from(r2.f.buffer))).toBe(true);
    expect(Buffer.from(r1.g.buffer).equals(Buffer.from(r2.g.buffer))).toBe(true);
    expect(Buffer.from(r1.plan.mass.buffer).equals(Buffer.from(r2.plan.mass.buffer))).toBe(true);
  });

  it("transport1d does not modify its inputs", () => {
    const random = seededRandom(24);
    const { x, w: a } = line(random, 10);
    const { x: y, w: b } = line(random, 12);
    const copies = [x, a, y, b].map((v) => Float64Array.from(v));
    transport1d(x, a, y, b, 1);
    expect([x, a, y, b]).toEqual(copies);
  });
});

describe("transport1d input errors", () => {
  const x = Float64Array.from([0, 1]);
  const w = Float64Array.from([0.5, 0.5]);

  it("transport1d(…, p = 0.5) throws a TransportInputError naming p", () => {
    expect(inputError(() => transport1d(x, w, x, w, 0.5)).field).toBe("p");
    expect(inputError(() => transport1d(x, w, x, w, NaN)).field).toBe("p");
  });

  it("transport1d with unequal totals throws naming b", () => {
    expect(inputError(() => transport1d(x, w, x, Float64Array.from([0.5, 0.6]), 1)).field).toBe("b");
  });

  it("transport1d with a NaN point or mismatched lengths throws naming the field", () => {
    expect(inputError(() => transport1d(Float64Array.from([0, NaN]), w, x, w, 1)).field).toBe("x[1]");
    expect(inputError(() => transport1d(x, Float64Array.from([1]), x, w, 1)).field).toBe("a");
  });
});
