import { describe, expect, it } from "vitest";
import { TransportInputError } from "../../core/errors";
import { gaussianFit } from "../../core/gaussian";
import { gaussianMixture, gridHistogram, ring, sampleWithoutReplacement, subsample, twoMoons, uniformBox } from "../../core/generators";
import { type PointMeasure, measurePoints, pointMeasure, totalMass } from "../../core/measure";
import { seededRandom } from "../../core/random";
import { inputError } from "./expectations";

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function expectNear(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual - expected), `actual ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

const bits = (a: Float64Array | Int32Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);
const sameBits = (a: PointMeasure, b: PointMeasure) => bits(a.points).equals(bits(b.points)) && bits(a.mass).equals(bits(b.mass));

const mixture = (random: number | (() => number)) =>
  gaussianMixture({
    n: 500,
    components: [
      { weight: 1, mean: [0, 0], covariance: [[1, 0.3], [0.3, 0.5]] },
      { weight: 2, mean: [4, 1], scale: 0.5 },
    ],
    random,
  });

describe("generators: same seed, same bits", () => {
  it("gaussianMixture, uniformBox, ring and twoMoons repeat bit for bit for the same seed", () => {
    expect(sameBits(mixture(5), mixture(5))).toBe(true);
    expect(sameBits(mixture(5), mixture(6))).toBe(false);
    const box = (seed: number) => uniformBox({ n: 100, lower: [0, -1, 2], upper: [1, 1, 5], random: seed });
    expect(sameBits(box(1), box(1))).toBe(true);
    const circle = (seed: number) => ring({ n: 100, radius: 2, noise: 0.1, random: seed });
    expect(sameBits(circle(2), circle(2))).toBe(true);
    const moons = (seed: number) => twoMoons({ n: 101, noise: 0.05, random: seed });
    expect(sameBits(moons(3), moons(3))).toBe(true);
    expect(sameBits(moons(3), moons(4))).toBe(false);
  });

  it("gaussianMixture({random: seed}) equals gaussianMixture({random: seededRandom(seed)})", () => {
    expect(sameBits(mixture(9), mixture(seededRandom(9)))).toBe(true);
  });

  it("gaussianMixture with a shared RandomSource continues its stream (two calls differ)", () => {
    const random = seededRandom(10);
    expect(sameBits(mixture(random), mixture(random))).toBe(false);
  });
});

describe("gaussianMixture", () => {
  it("gaussianMixture gives n points in d dimensions with uniform mass 1/n", () => {
    const m = mixture(1);
    expect(m).toMatchObject({ kind: "points", n: 500, dim: 2 });
    for (const w of m.mass) expect(w).toBe(1 / 500);
  });

  it("gaussianMixture with one component has the requested mean and covariance (4 standard errors)", () => {
    // Sample-mean and sample-covariance standard errors √(Sₖₖ/n), √((SᵢᵢSⱼⱼ + Sᵢⱼ²)/n) (common practice, no source).
    const n = 20000;
    const S = [
      [2, -0.8, 0],
      [-0.8, 1, 0.2],
      [0, 0.2, 0.3],
    ];
    const fit = gaussianFit(gaussianMixture({ n, components: [{ mean: [1, 2, 3], covariance: S }], random: 12 }));
    for (let i = 0; i < 3; i++) {
      expectNear(fit.mean[i], i + 1, 4 * Math.sqrt(S[i][i] / n));
      for (let j = 0; j < 3; j++) expectNear(fit.covariance.data[i * 3 + j], S[i][j], 4 * Math.sqrt((S[i][i] * S[j][j] + S[i][j] ** 2) / n));
    }
  });

  it("gaussianMixture picks components in proportion to their weights (binomial, 4 sd)", () => {
    // Components far apart: count points right of x = 50. Expected fraction 3/4, sd √(pq/n).
    const n = 10000;
    const m = gaussianMixture({ n, components: [{ weight: 1, mean: [0] }, { weight: 0, mean: [-100] }, { weight: 3, mean: [100] }], random: 13 });
    let right = 0;
    let ghost = 0;
    for (const x of m.points) {
      if (x > 50) right++;
      if (x < -50) ghost++;
    }
    expect(ghost).toBe(0);
    expectNear(right / n, 0.75, 4 * Math.sqrt((0.75 * 0.25) / n));
  });

  it("gaussianMixture with a rank-one covariance puts every point on its line", () => {
    // Covariance v vᵀ with v = (1, 2): points satisfy 2(x − m₀) − (y − m₁) = 0.
    const m = gaussianMixture({ n: 200, components: [{ mean: [1, -1], covariance: [[1, 2], [2, 4]] }], random: 14 });
    for (let i = 0; i < m.n; i++) expect(Math.abs(2 * (m.points[2 * i] - 1) - (m.points[2 * i + 1] + 1))).toBeLessThan(1e-12);
  });

  it("gaussianMixture with per-axis scale [3, 0] has spread 3 on x and none on y", () => {
    const m = gaussianMixture({ n: 20000, components: [{ mean: [0, 5], scale: [3, 0] }], random: 15 });
    // Variance of a sample variance of N(0, s²): 2s⁴/n (common practice, no source).
    expectNear(gaussianFit(m).covariance.data[0], 9, 4 * Math.sqrt((2 * 81) / 20000));
    for (let i = 0; i < m.n; i++) expect(m.points[2 * i + 1]).toBe(5);
  });

  it("gaussianMixture with bad options throws naming the option", () => {
    const ok = { mean: [0, 0] };
    expect(inputError(() => gaussianMixture({ n: 0, components: [ok], random: 1 })).field).toBe("n");
    expect(inputError(() => gaussianMixture({ n: 2.5, components: [ok], random: 1 })).field).toBe("n");
    expect(inputError(() => gaussianMixture({ n: 5, components: [], random: 1 })).field).toBe("components");
    expect(inputError(() => gaussianMixture({ n: 5, components: [ok, { weight: -1, mean: [0, 0] }], random: 1 })).field).toBe("components[1].weight");
    expect(inputError(() => gaussianMixture({ n: 5, components: [{ weight: 0, mean: [0] }], random: 1 })).field).toBe("components");
    expect(inputError(() => gaussianMixture({ n: 5, components: [ok, { mean: [0] }], random: 1 })).field).toBe("components[1].mean");
    expect(inputError(() => gaussianMixture({ n: 5, components: [{ mean: [0, Number.NaN] }], random: 1 })).field).toBe("components[0].mean[1]");
    expect(inputError(() => gaussianMixture({ n: 5, components: [{ mean: [0, 0], covariance: [[1, 0], [0, -1]] }], random: 1 })).field).toBe("components[0].covariance");
    expect(inputError(() => gaussianMixture({ n: 5, components: [{ mean: [0, 0], scale: -1 }], random: 1 })).field).toBe("components[0].scale");
    expect(inputError(() => gaussianMixture({ n: 5, components: [{ mean: [0, 0], scale: [1, -1] }], random: 1 })).field).toBe("components[0].scale[1]");
    expect(inputError(() => gaussianMixture({ n: 5, components: [{ mean: [0], scale: 1, covariance: [[1]] }], random: 1 })).field).toBe("components[0].scale");
    expect(inputError(() => gaussianMixture({ n: 5, components: [ok], random: "seed" as never })).field).toBe("random");
  });
});

describe("uniformBox", () => {
  it("uniformBox stays in [lower, upper) with mean at the centre and variance width²/12", () => {
    // Moments of U(a, b) (common practice, no source); 5 standard errors.
    const n = 20000;
    const m = uniformBox({ n, lower: [-1, 10], upper: [3, 10.5], random: 21 });
    const width = [4, 0.5];
    const fit = gaussianFit(m);
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const [x, y] = [m.points[2 * i], m.points[2 * i + 1]];
      if (!(x >= -1 && x < 3 && y >= 10 && y < 10.5)) outside++;
    }
    expect(outside).toBe(0);
    expectNear(fit.mean[0], 1, 5 * Math.sqrt(width[0] ** 2 / 12 / n));
    expectNear(fit.covariance.data[0], 16 / 12, 5 * Math.sqrt(((1 / 80 - 1 / 144) * 256) / n));
    expectNear(fit.covariance.data[3], 0.25 / 12, 5 * Math.sqrt(((1 / 80 - 1 / 144) * 0.0625) / n));
  });

  it("uniformBox with upper < lower or mismatched lengths throws naming upper", () => {
    expect(inputError(() => uniformBox({ n: 3, lower: [0, 0], upper: [1, -1], random: 1 })).field).toBe("upper[1]");
    expect(inputError(() => uniformBox({ n: 3, lower: [0, 0], upper: [1], random: 1 })).field).toBe("upper");
    expect(inputError(() => uniformBox({ n: 3, lower: [Number.NaN], upper: [1], random: 1 })).field).toBe("lower[0]");
  });
});

describe("ring", () => {
  it("ring without noise puts every point at distance radius from the centre", () => {
    const m = ring({ n: 300, center: [2, -1], radius: 1.5, random: 31 });
    for (let i = 0; i < m.n; i++) expectNear(Math.hypot(m.points[2 * i] - 2, m.points[2 * i + 1] + 1), 1.5, 1e-12);
  });

  it("ring with the same seed keeps the angles when only noise changes (noise scales one perturbation)", () => {
    const base = ring({ n: 50, radius: 1, noise: 0, random: 32 });
    const a = ring({ n: 50, radius: 1, noise: 0.1, random: 32 });
    const b = ring({ n: 50, radius: 1, noise: 0.2, random: 32 });
    for (let k = 0; k < 100; k++) expectNear(b.points[k] - base.points[k], 2 * (a.points[k] - base.points[k]), 1e-12);
  });

  it("ring with angles uniform has its centroid at the centre (4 standard errors)", () => {
    // For a uniform angle, cos and sin have mean 0 and variance ½ (common practice, no source).
    const n = 20000;
    const fit = gaussianFit(ring({ n, center: [1, 1], radius: 2, random: 33 }));
    expectNear(fit.mean[0], 1, 4 * 2 * Math.sqrt(0.5 / n));
    expectNear(fit.mean[1], 1, 4 * 2 * Math.sqrt(0.5 / n));
  });

  it("ring with a 3-D centre, negative radius or NaN noise throws naming the option", () => {
    expect(inputError(() => ring({ n: 3, center: [0, 0, 0], random: 1 })).field).toBe("center");
    expect(inputError(() => ring({ n: 3, radius: -1, random: 1 })).field).toBe("radius");
    expect(inputError(() => ring({ n: 3, noise: Number.NaN, random: 1 })).field).toBe("noise");
  });
});

describe("twoMoons", () => {
  it("twoMoons without noise puts ⌈n/2⌉ points on the upper arc and the rest on the lower arc", () => {
    // Upper arc: unit circle about (−½, −¼), y ≥ −¼; lower arc: unit circle about (½, ¼), y ≤ ¼.
    const n = 101;
    const m = twoMoons({ n, random: 41 });
    for (let i = 0; i < n; i++) {
      const x = m.points[2 * i];
      const y = m.points[2 * i + 1];
      if (i < 51) {
        expectNear(Math.hypot(x + 0.5, y + 0.25), 1, 1e-12);
        expect(y).toBeGreaterThanOrEqual(-0.25 - 1e-12);
      } else {
        expectNear(Math.hypot(x - 0.5, y - 0.25), 1, 1e-12);
        expect(y).toBeLessThanOrEqual(0.25 + 1e-12);
      }
    }
  });

  it("twoMoons with n = 0 or negative noise throws naming the option", () => {
    expect(inputError(() => twoMoons({ n: 0, random: 1 })).field).toBe("n");
    expect(inputError(() => twoMoons({ n: 4, noise: -0.1, random: 1 })).field).toBe("noise");
    expect(inputError(() => twoMoons(undefined as never)).field).toBe("options");
  });
});

describe("gridHistogram", () => {
  it("gridHistogram([4], density x²) has mass ∝ x² at the cell centres, total 1", () => {
    // Centres 1, 1.5, 2, 2.5: weights 1, 2.25, 4, 6.25 over 13.5.
    const g = gridHistogram({ shape: [4], origin: [1], spacing: [0.5], density: (x) => x * x });
    expect(Array.from(g.mass)).toEqual([1, 2.25, 4, 6.25].map((w) => w / 13.5));
    expect(totalMass(g)).toBeCloseTo(1, 15);
  });

  it("gridHistogram([2, 3], density(x, y)) evaluates x along axis 0 and y along axis 1, row-major", () => {
    const g = gridHistogram({ shape: [2, 3], origin: [0, 10], spacing: [1, 1], density: (x, y) => 1 + x + (y! - 10) * 10 });
    // Cells (i, j): 1 + i + 10 j → [1, 11, 21, 2, 12, 22] / 69.
    expect(Array.from(g.mass)).toEqual([1, 11, 21, 2, 12, 22].map((w) => w / 69));
    expect(Array.from(measurePoints(g)).slice(0, 4)).toEqual([0, 10, 0, 11]);
  });

  it("gridHistogram whose density is negative or NaN at a cell throws naming density[i][j]", () => {
    const negative = inputError(() => gridHistogram({ shape: [3, 4], density: (x, y) => (x === 2 && y === 3 ? -1 : 1) }));
    expect(negative.field).toBe("density[2][3]");
    expect(negative.message).toMatch(/x = 2, y = 3/);
    expect(inputError(() => gridHistogram({ shape: [3], density: (x) => (x === 1 ? Number.NaN : 1) })).field).toBe("density[1]");
    expect(inputError(() => gridHistogram({ shape: [3], density: () => 0 })).field).toBe("density");
  });

  it("gridHistogram with a bad shape or spacing throws naming the option", () => {
    expect(inputError(() => gridHistogram({ shape: [2, 2, 2], density: () => 1 })).field).toBe("shape");
    expect(inputError(() => gridHistogram({ shape: [2, 0], density: () => 1 })).field).toBe("shape[1]");
    expect(inputError(() => gridHistogram({ shape: [2], spacing: [0], density: () => 1 })).field).toBe("spacing[0]");
    expect(inputError(() => gridHistogram({ shape: [2], origin: [0, 0], density: () => 1 })).field).toBe("origin");
    expect(inputError(() => gridHistogram({ shape: [2], density: 3 as never })).field).toBe("density");
  });
});

describe("sampleWithoutReplacement", () => {
  it("sampleWithoutReplacement(size, count) draws distinct indices, a smaller count a prefix of a larger", () => {
    const big = sampleWithoutReplacement(1000, 300, 51);
    const small = sampleWithoutReplacement(1000, 100, 51);
    expect(new Set(big).size).toBe(300);
    for (const i of big) expect(i >= 0 && i < 1000).toBe(true);
    expect(bits(small).equals(bits(big.subarray(0, 100)))).toBe(true);
    expect(Array.from(sampleWithoutReplacement(5, 5, 52)).sort()).toEqual([0, 1, 2, 3, 4]);
  });

  it("sampleWithoutReplacement(10, 3) picks every index with probability 3/10 (4 sd over 20 000 draws)", () => {
    // Inclusion probability count/size for a uniform subset (common practice, no source).
    const random = seededRandom(53);
    const hits = new Float64Array(10);
    const reps = 20000;
    for (let r = 0; r < reps; r++) for (const i of sampleWithoutReplacement(10, 3, random)) hits[i]++;
    for (const h of hits) expectNear(h / reps, 0.3, 4 * Math.sqrt((0.3 * 0.7) / reps));
  });

  it("sampleWithoutReplacement with count > size throws naming count", () => {
    expect(inputError(() => sampleWithoutReplacement(3, 4, 1)).field).toBe("count");
    expect(inputError(() => sampleWithoutReplacement(0, 0, 1)).field).toBe("size");
  });
});

describe("subsample", () => {
  const cloud = pointMeasure(
    Array.from({ length: 40 }, (_, i) => [i, -i]),
    Array.from({ length: 40 }, (_, i) => (i % 4 === 0 ? 0 : i)),
  );

  it("subsample(measure, n) keeps original order, never picks zero mass and keeps the total mass", () => {
    const s = subsample(cloud, 12, 61);
    expect(s.n).toBe(12);
    const xs = Array.from({ length: 12 }, (_, k) => s.points[2 * k]);
    expect(xs).toEqual([...xs].sort((a, b) => a - b));
    for (const x of xs) expect(x % 4).not.toBe(0);
    expectNear(totalMass(s), totalMass(cloud), 1e-12);
    // Relative masses kept: mass ∝ original index.
    for (let k = 0; k < 12; k++) expectNear(s.mass[k] / s.mass[0], xs[k] / xs[0], 1e-12);
  });

  it("subsample with the same seed is nested: 10 points are among the 20", () => {
    const small = new Set(Array.from(subsample(cloud, 10, 62).points.filter((_, k) => k % 2 === 0)));
    const large = new Set(Array.from(subsample(cloud, 20, 62).points.filter((_, k) => k % 2 === 0)));
    for (const x of small) expect(large.has(x)).toBe(true);
  });

  it("subsample with n above the positive-mass support or 0 throws naming n", () => {
    expect(inputError(() => subsample(cloud, 31, 1)).field).toBe("n");
    expect(inputError(() => subsample(cloud, 0, 1)).field).toBe("n");
  });
});
