import { describe, expect, it } from "vitest";
import { energyDistance, mmd } from "../../core/energy-distance";
import { TransportInputError } from "../../core/errors";
import { gaussianMixture } from "../../core/generators";
import { type PointMeasure, gridMeasure, pointMeasure } from "../../core/measure";
import { seededRandom } from "../../core/random";
import { inputError } from "./expectations";

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function expectNear(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual - expected), `actual ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

/** Standard normal CDF via erf (Abramowitz & Stegun 1964, 7.1.26; |error| ≤ 1.5e-7). */
function normalCdf(x: number): number {
  const z = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.3275911 * z);
  const poly = t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
  const erf = 1 - poly * Math.exp(-z * z);
  return x >= 0 ? 0.5 * (1 + erf) : 0.5 * (1 - erf);
}

/** A random weighted 1-D measure with some zero masses. */
function randomLine(n: number, seed: number): PointMeasure {
  const r = seededRandom(seed);
  const x = Array.from({ length: n }, () => 10 * r() - 3);
  const w = Array.from({ length: n }, (_, i) => (i % 5 === 0 ? 0 : r()));
  return pointMeasure(x, w);
}

/** The same measure embedded in the plane (second coordinate 0), to force the pairwise path. */
function toPlane(m: PointMeasure): PointMeasure {
  const flat = new Float64Array(m.n * 2);
  m.points.forEach((v, i) => (flat[2 * i] = v));
  return pointMeasure(flat, m.mass, { dim: 2 });
}

describe("energyDistance", () => {
  it("energyDistance([0], [2]) is 4, the square of scipy's energy_distance docstring value 2.0", () => {
    // scipy.stats.energy_distance docstring (returns √E): ([0], [2]) → 2.0.
    expect(Math.sqrt(energyDistance(pointMeasure([0]), pointMeasure([2])))).toBeCloseTo(2, 14);
  });

  it("energyDistance([0,8] w [3,1], [0,8] w [2,2]) is 1, scipy's weighted docstring example", () => {
    // scipy.stats.energy_distance docstring: ([0,8],[0,8],[3,1],[2,2]) → 1.0.
    expect(Math.sqrt(energyDistance(pointMeasure([0, 8], [3, 1]), pointMeasure([0, 8], [2, 2])))).toBeCloseTo(1, 14);
  });

  it("energyDistance on scipy's third weighted docstring example gives 0.88003340976158217", () => {
    // scipy.stats.energy_distance docstring, value from memory:
    // ([0.7, 7.4, 2.4, 6.8], [1.4, 8.], [2.1, 4.2, 7.4, 8.], [7.6, 8.8]) → 0.88003340976158217.
    const u = pointMeasure([0.7, 7.4, 2.4, 6.8], [2.1, 4.2, 7.4, 8]);
    const v = pointMeasure([1.4, 8], [7.6, 8.8]);
    expectNear(Math.sqrt(energyDistance(u, v)), 0.88003340976158217, 1e-13);
  });

  it("energyDistance of 1-D measures (sorted path) equals the pairwise formula on the same points in 2-D", () => {
    // Both compute 2E|X−Y| − E|X−X'| − E|Y−Y'| (Székely & Rizzo 2013); one by 2∫(F−G)², one by pairs.
    for (let seed = 1; seed <= 5; seed++) {
      const a = randomLine(40 + seed, seed);
      const b = randomLine(25, 100 + seed);
      const fast = energyDistance(a, b);
      const pairwise = energyDistance(toPlane(a), toPlane(b));
      expectNear(fast, pairwise, 1e-12 * Math.max(1, pairwise));
    }
  });

  it("energyDistance(δx, δy) in 3-D is 2|x − y|", () => {
    // With Diracs E|X−X'| = E|Y−Y'| = 0 (definition, Székely & Rizzo 2013).
    const a = pointMeasure([[1, 2, 3]]);
    const b = pointMeasure([[4, 6, 3]]);
    expect(energyDistance(a, b)).toBeCloseTo(10, 14);
  });

  it("energyDistance(a, a) is 0 and energyDistance(a, b) = energyDistance(b, a)", () => {
    const a = gaussianMixture({ n: 200, components: [{ mean: [0, 0] }], random: 1 });
    const b = gaussianMixture({ n: 150, components: [{ mean: [1, 0] }], random: 2 });
    expect(energyDistance(a, a)).toBeLessThan(1e-14);
    expect(energyDistance(a, b)).toBeCloseTo(energyDistance(b, a), 13);
    expect(energyDistance(a, b)).toBeGreaterThan(0);
  });

  it("energyDistance of a grid histogram equals that of its cell centres as points", () => {
    const grid = gridMeasure([3, 2], [1, 0, 2, 1, 0, 3], { origin: [0, 1], spacing: [0.5, 2] });
    const points = pointMeasure([[0, 1], [0, 3], [0.5, 1], [0.5, 3], [1, 1], [1, 3]], [1, 0, 2, 1, 0, 3]);
    const other = pointMeasure([[0.2, 2], [1, 0]]);
    expect(energyDistance(grid, other)).toBeCloseTo(energyDistance(points, other), 14);
  });

  it("energyDistance of samples of N(0,1) and N(1,1) (n = 20 000) is the normal closed form 0.5418 within 0.04", () => {
    // E|Z| for Z ~ N(δ, τ²) is τ√(2/π)e^(−δ²/2τ²) + δ(1 − 2Φ(−δ/τ)) (folded normal mean, common
    // practice, no source); E|X−X'| = 2/√π for unit variance. Spread of this estimate over 20 seeds
    // measured at sd 0.009: tolerance ≈ 4 sd.
    const tau = Math.SQRT2;
    const cross = tau * Math.sqrt(2 / Math.PI) * Math.exp(-1 / (2 * tau * tau)) + (1 - 2 * normalCdf(-1 / tau));
    const truth = 2 * cross - 2 * (2 / Math.sqrt(Math.PI));
    const a = gaussianMixture({ n: 20000, components: [{ mean: [0] }], random: 5 });
    const b = gaussianMixture({ n: 20000, components: [{ mean: [1] }], random: 6 });
    expectNear(energyDistance(a, b), truth, 0.04);
    expectNear(truth, 0.54181, 1e-5);
  });

  it("energyDistance between 2-D and 1-D measures throws naming target.points", () => {
    const error = inputError(() => energyDistance(pointMeasure([[0, 0]]), pointMeasure([0])));
    expect(error.field).toBe("target.points");
    expect(error.message).toMatch(/dimension mismatch/);
  });
});

describe("mmd", () => {
  it("mmd(a, b, {kind: energy}) is energyDistance(a, b)", () => {
    const a = gaussianMixture({ n: 50, components: [{ mean: [0, 0] }], random: 3 });
    const b = gaussianMixture({ n: 60, components: [{ mean: [0.5, 0] }], random: 4 });
    expect(mmd(a, b, { kind: "energy" })).toBe(energyDistance(a, b));
  });

  it("mmd(δx, δy, gaussian h) is 2 − 2exp(−|x−y|²/2h²)", () => {
    // k(x,x) = 1, so MMD² = k(x,x) + k(y,y) − 2k(x,y) (Gretton et al. 2012, definition).
    const value = mmd(pointMeasure([[0, 0]]), pointMeasure([[3, 4]]), { kind: "gaussian", bandwidth: 2 });
    expect(value).toBeCloseTo(2 - 2 * Math.exp(-25 / 8), 14);
  });

  it("mmd of weighted measures uses the masses: ([0,1] w [3,1]) vs δ0 by hand", () => {
    // MMD² = Σ a a' k + 1 − 2 Σ a k(x, 0) with a = (3/4, 1/4), k(0,1) = e^(−1/2) for h = 1; by hand.
    const q = Math.exp(-0.5);
    const expected = 0.5625 + 0.0625 + 2 * 0.1875 * q + 1 - 2 * (0.75 + 0.25 * q);
    const value = mmd(pointMeasure([0, 1], [3, 1]), pointMeasure([0]), { kind: "gaussian", bandwidth: 1 });
    expect(value).toBeCloseTo(expected, 14);
  });

  it("mmd of samples of N(0, I) and N((1, ½), I) in 2-D matches the Gaussian-kernel closed form within 0.04", () => {
    // For X ~ N(μ₁, s²I), Y ~ N(μ₂, s²I), E k(X,Y) = (h²/(h²+2s²))^(d/2) exp(−|μ₁−μ₂|²/(2(h²+2s²)))
    // (Gaussian convolution, common practice, no source). The V-statistic also counts i = i':
    // its mean exceeds MMD² by 2(1 − c)/n with c = E k(X,X'). Spread over 10 seeds: sd 0.0096.
    const h = 1.5;
    const n = 1500;
    const c = (h * h) / (h * h + 2);
    const truth = 2 * c * (1 - Math.exp(-1.25 / (2 * (h * h + 2))));
    const a = gaussianMixture({ n, components: [{ mean: [0, 0] }], random: 21 });
    const b = gaussianMixture({ n, components: [{ mean: [1, 0.5] }], random: 22 });
    expectNear(mmd(a, b, { kind: "gaussian", bandwidth: h }), truth + (2 * (1 - c)) / n, 0.04);
  });

  it("mmd(a, a, gaussian) is 0 up to rounding", () => {
    const a = gaussianMixture({ n: 300, components: [{ mean: [0, 0, 0] }], random: 8 });
    expect(mmd(a, a, { kind: "gaussian", bandwidth: 0.7 })).toBeLessThan(1e-14);
  });

  it("mmd with bandwidth ≤ 0, NaN or an unknown kernel throws naming the kernel field", () => {
    const a = pointMeasure([0]);
    expect(inputError(() => mmd(a, a, { kind: "gaussian", bandwidth: 0 })).field).toBe("kernel.bandwidth");
    expect(inputError(() => mmd(a, a, { kind: "gaussian", bandwidth: Number.NaN })).field).toBe("kernel.bandwidth");
    expect(inputError(() => mmd(a, a, { kind: "laplace" } as never)).field).toBe("kernel.kind");
    expect(inputError(() => mmd(a, a, undefined as never)).field).toBe("kernel");
  });
});
