import { describe, expect, it } from "vitest";
import { TransportInputError } from "../../core/errors";
import { gaussianMixture } from "../../core/generators";
import { gridMeasure, pointMeasure } from "../../core/measure";
import { parkMiller } from "../../core/random";
import { slicedWasserstein } from "../../core/sliced";
import { inputError } from "./expectations";

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function expectNear(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual - expected), `actual ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

const bits = (a: Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

describe("slicedWasserstein in 1-D", () => {
  it("slicedWasserstein([0,1,3], [5,6,8], p = 1) is 5, scipy's wasserstein_distance docstring example", () => {
    // scipy.stats.wasserstein_distance docstring: ([0,1,3],[5,6,8]) → 5.0. In 1-D every direction is ±1.
    const r = slicedWasserstein(pointMeasure([0, 1, 3]), pointMeasure([5, 6, 8]), { projections: 4, p: 1, random: 1 });
    expectNear(r.value, 5, 1e-14);
    expect(r.standardError).toBe(0);
    for (const v of r.perDirection) expectNear(v, 5, 1e-14);
  });

  it("slicedWasserstein weighted ([0,1] w [3,1], [0,1] w [2,2], p = 1) is 0.25 (scipy docstring)", () => {
    // scipy.stats.wasserstein_distance docstring: ([0,1],[0,1],[3,1],[2,2]) → 0.25.
    const r = slicedWasserstein(pointMeasure([0, 1], [3, 1]), pointMeasure([0, 1], [2, 2]), { projections: 3, p: 1, random: 2 });
    expectNear(r.value, 0.25, 1e-15);
  });

  it("slicedWasserstein on scipy's unequal weighted docstring example (p = 1) is 4.078133143804786", () => {
    // scipy.stats.wasserstein_distance docstring:
    // ([3.4,3.9,7.5,7.8],[4.5,1.4],[1.4,0.9,3.1,7.2],[3.2,3.5]) → 4.078133143804786.
    const u = pointMeasure([3.4, 3.9, 7.5, 7.8], [1.4, 0.9, 3.1, 7.2]);
    const v = pointMeasure([4.5, 1.4], [3.2, 3.5]);
    expectNear(slicedWasserstein(u, v, { projections: 2, p: 1, random: 3 }).value, 4.078133143804786, 1e-13);
  });

  it("slicedWasserstein(p = 2) of equal-size uniform clouds is the mean squared gap of the sorted points", () => {
    // Equal-size uniform 1-D: the optimal plan matches sorted points (Villani 2003, Thm 2.18).
    const x = [3, -1, 0.5, 7, 2];
    const y = [0, 10, -4, 1, 1];
    const xs = [...x].sort((a, b) => a - b);
    const ys = [...y].sort((a, b) => a - b);
    const expected = xs.reduce((s, v, i) => s + (v - ys[i]) ** 2, 0) / 5;
    expectNear(slicedWasserstein(pointMeasure(x), pointMeasure(y), { projections: 1, random: 4 }).value, expected, 1e-13);
  });

  it("slicedWasserstein(p = 3) in 1-D is ∫₀¹|F⁻¹ − G⁻¹|³ dt (quantiles by hand)", () => {
    // a = ½δ0 + ½δ1, b = ¼δ0 + ¾δ2: quantile pairs (0,0) on [0,¼], (0,2) on [¼,½], (1,2) on [½,1].
    const value = slicedWasserstein(pointMeasure([0, 1]), pointMeasure([0, 2], [1, 3]), { projections: 1, p: 3, random: 5 }).value;
    expectNear(value, 0.25 * 8 + 0.5 * 1, 1e-14);
  });

  it("slicedWasserstein ignores zero-mass points and equals it on a grid's cell centres", () => {
    const grid = gridMeasure([5], [0, 1, 2, 0, 1], { origin: [-1], spacing: [0.5] });
    const dropped = pointMeasure([-0.5, 0, 1], [1, 2, 1]);
    const other = pointMeasure([0.3, 2]);
    const options = { projections: 2, random: 6 };
    expectNear(slicedWasserstein(grid, other, options).value, slicedWasserstein(dropped, other, options).value, 1e-15);
  });
});

describe("slicedWasserstein in several dimensions", () => {
  it("slicedWasserstein with the same seed gives the same bits; another seed other directions", () => {
    const a = gaussianMixture({ n: 300, components: [{ mean: [0, 0, 0] }], random: 1 });
    const b = gaussianMixture({ n: 200, components: [{ mean: [1, 0, 0], scale: 2 }], random: 2 });
    const r1 = slicedWasserstein(a, b, { projections: 50, random: 77 });
    const r2 = slicedWasserstein(a, b, { projections: 50, random: 77 });
    const r3 = slicedWasserstein(a, b, { projections: 50, random: 78 });
    expect(bits(r1.perDirection).equals(bits(r2.perDirection))).toBe(true);
    expect(bits(r1.directions.data).equals(bits(r2.directions.data))).toBe(true);
    expect(r1.value).toBe(r2.value);
    expect(bits(r1.directions.data).equals(bits(r3.directions.data))).toBe(false);
  });

  it("slicedWasserstein accepts a RandomSource and draws unit directions", () => {
    const a = pointMeasure([[0, 0, 0, 0]]);
    const r = slicedWasserstein(a, a, { projections: 20, random: parkMiller(9) });
    expect(r.directions.rows).toBe(20);
    expect(r.directions.cols).toBe(4);
    for (let l = 0; l < 20; l++) {
      let norm = 0;
      for (let k = 0; k < 4; k++) norm += r.directions.data[l * 4 + k] ** 2;
      expectNear(norm, 1, 1e-14);
    }
    expect(r.value).toBe(0);
  });

  it("slicedWasserstein of N(0, I₅) vs N(Δm, I₅) samples is |Δm|²/d within 4 standard errors + 0.02", () => {
    // E[(θ·Δm)²] = |Δm|²/d for θ uniform on the sphere (common practice, no source); a projected
    // Gaussian pair with equal variances has W2² = (θ·Δm)². Allowance 0.02 covers the positive
    // sampling bias of the empirical W2² at n = 2000 (measured mean 0.815 ± 0.011 over 10 seeds).
    const d = 5;
    const a = gaussianMixture({ n: 2000, components: [{ mean: [0, 0, 0, 0, 0] }], random: 31 });
    const b = gaussianMixture({ n: 2000, components: [{ mean: [2, 0, 0, 0, 0] }], random: 32 });
    const r = slicedWasserstein(a, b, { projections: 500, random: 33 });
    expect(r.standardError).toBeGreaterThan(0);
    expectNear(r.value, 4 / d, 4 * r.standardError + 0.02);
  });

  it("slicedWasserstein per direction tracks (θ·Δm)² on average over directions within 0.1", () => {
    // Same fact per direction: the mean of perDirection[k] − (θ_k·Δm)² removes the Monte Carlo
    // spread over directions and leaves the sampling error of the clouds (sd ≈ 0.025 by the
    // delta method: 2Δm·δm/d with δm ~ N(0, 2/n)); tolerance 4 sd.
    const a = gaussianMixture({ n: 2000, components: [{ mean: [0, 0, 0, 0, 0] }], random: 41 });
    const b = gaussianMixture({ n: 2000, components: [{ mean: [2, 0, 0, 0, 0] }], random: 42 });
    const r = slicedWasserstein(a, b, { projections: 200, random: 43 });
    let gap = 0;
    for (let k = 0; k < 200; k++) gap += r.perDirection[k] - (2 * r.directions.data[k * 5]) ** 2;
    expectNear(gap / 200, 0, 0.1);
  });

  it("slicedWasserstein per direction never exceeds the cost of pairing point i with point i", () => {
    // Projection is 1-Lipschitz, so W_p^p(θ#a, θ#b) ≤ W_p^p(a, b) ≤ cost of any coupling
    // (common practice, no source); here the identity pairing of equal-size uniform clouds.
    const a = gaussianMixture({ n: 100, components: [{ mean: [0, 0] }], random: 51 });
    const b = gaussianMixture({ n: 100, components: [{ mean: [1, 1], scale: 0.5 }], random: 52 });
    for (const p of [1, 2, 3]) {
      let pairing = 0;
      for (let i = 0; i < 100; i++) {
        const dx = a.points[2 * i] - b.points[2 * i];
        const dy = a.points[2 * i + 1] - b.points[2 * i + 1];
        pairing += Math.hypot(dx, dy) ** p / 100;
      }
      const r = slicedWasserstein(a, b, { projections: 100, p, random: 53 });
      for (const v of r.perDirection) expect(v).toBeLessThanOrEqual(pairing * (1 + 1e-12));
    }
  });

  it("slicedWasserstein with one projection reports a NaN standard error", () => {
    const a = pointMeasure([[0, 0], [1, 1]]);
    expect(slicedWasserstein(a, a, { projections: 1, random: 1 }).standardError).toBeNaN();
  });

  it("slicedWasserstein does not modify its inputs", () => {
    const a = gaussianMixture({ n: 30, components: [{ mean: [0, 0] }], random: 61 });
    const before = Float64Array.from(a.points);
    const mass = Float64Array.from(a.mass);
    slicedWasserstein(a, a, { projections: 5, random: 62 });
    expect(bits(a.points).equals(bits(before))).toBe(true);
    expect(bits(a.mass).equals(bits(mass))).toBe(true);
  });
});

describe("slicedWasserstein input errors", () => {
  const a = pointMeasure([[0, 0]]);

  it("slicedWasserstein with projections 0 or 2.5 throws naming projections", () => {
    expect(inputError(() => slicedWasserstein(a, a, { projections: 0, random: 1 })).field).toBe("projections");
    expect(inputError(() => slicedWasserstein(a, a, { projections: 2.5, random: 1 })).field).toBe("projections");
  });

  it("slicedWasserstein with p = 0.5 or NaN throws naming p (sorting needs a convex cost)", () => {
    expect(inputError(() => slicedWasserstein(a, a, { projections: 1, p: 0.5, random: 1 })).field).toBe("p");
    expect(inputError(() => slicedWasserstein(a, a, { projections: 1, p: Number.NaN, random: 1 })).field).toBe("p");
  });

  it("slicedWasserstein without a random source throws naming random", () => {
    expect(inputError(() => slicedWasserstein(a, a, { projections: 1 } as never)).field).toBe("random");
  });

  it("slicedWasserstein between 2-D and 3-D measures throws naming target.points", () => {
    expect(inputError(() => slicedWasserstein(a, pointMeasure([[0, 0, 0]]), { projections: 1, random: 1 })).field).toBe("target.points");
  });
});
