import { describe, expect, it } from "vitest";
import { TransportInputError } from "../../core/errors";
import { gaussianEntropicOT, gaussianFit, gaussianSinkhornDivergence, gaussianW2 } from "../../core/gaussian";
import { gaussianMixture } from "../../core/generators";
import type { Matrix } from "../../core/matrix";
import { gridMeasure, pointMeasure } from "../../core/measure";
import { inputError } from "./expectations";

/** |actual − expected| ≤ tolerance, with both numbers in the failure message. */
function expectNear(actual: number, expected: number, tolerance: number): void {
  expect(Math.abs(actual - expected), `actual ${actual}, expected ${expected} ± ${tolerance}`).toBeLessThanOrEqual(tolerance);
}

/** R·diag(values)·Rᵀ for the plane rotation by `angle`. */
function rotated(values: [number, number], angle: number): Matrix {
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  const [a, b] = values;
  return { data: Float64Array.from([a * c * c + b * s * s, (a - b) * c * s, (a - b) * c * s, a * s * s + b * c * c]), rows: 2, cols: 2 };
}

/** 1-D entropic closed form of REFERENCES.md with N = √(1 + 16 s₁²s₂²/ε²) (Janati et al. 2020, Thm 1). */
function entropic1d(m1: number, s1: number, m2: number, s2: number, epsilon: number): number {
  const N = Math.sqrt(1 + (16 * s1 * s1 * s2 * s2) / (epsilon * epsilon));
  return (m1 - m2) ** 2 + s1 * s1 + s2 * s2 - (epsilon / 2) * N + (epsilon / 2) * (1 - Math.log(2)) + (epsilon / 2) * Math.log(1 + N);
}

describe("gaussianW2", () => {
  it("gaussianW2 in 1-D is (m₁−m₂)² + (s₁−s₂)²", () => {
    // Dowson & Landau 1982; 1-D form in REFERENCES.md.
    expectNear(gaussianW2([1], [[4]], [-2], [[0.25]]), 9 + (2 - 0.5) ** 2, 1e-13);
  });

  it("gaussianW2 with commuting covariances is |Δm|² + ‖S₁^½ − S₂^½‖²_F", () => {
    // Commuting case of Dowson & Landau 1982 / Olkin & Pukelsheim 1982: common eigenvectors, so
    // tr((S₁^½S₂S₁^½)^½) = Σ √(λᵢμᵢ). Eigenvalues (1, 4) and (9, ¼) in the same rotated frame.
    const S1 = rotated([1, 4], 0.7);
    const S2 = rotated([9, 0.25], 0.7);
    expectNear(gaussianW2([0, 0], S1, [1, 2], S2), 5 + (1 - 3) ** 2 + (2 - 0.5) ** 2, 1e-12);
  });

  it("gaussianW2 of non-commuting 2×2 covariances matches tr√M = √(tr M + 2√det M)", () => {
    // For a 2×2 PSD M with eigenvalues λ₁, λ₂: (√λ₁ + √λ₂)² = tr M + 2√det M (elementary); M = S₁^½S₂S₁^½
    // has the spectrum of S₁S₂, so tr M = tr(S₁S₂) and det M = det S₁ det S₂.
    const S1 = [
      [2, 0.6],
      [0.6, 1],
    ];
    const S2 = [
      [0.5, -0.2],
      [-0.2, 3],
    ];
    const trS1S2 = 2 * 0.5 + 0.6 * -0.2 + 0.6 * -0.2 + 1 * 3;
    const det = (2 * 1 - 0.36) * (0.5 * 3 - 0.04);
    const cross = Math.sqrt(trS1S2 + 2 * Math.sqrt(det));
    expectNear(gaussianW2([1, 1], S1, [0, 3], S2), 1 + 4 + 3 + 3.5 - 2 * cross, 1e-12);
  });

  it("gaussianW2(N, N) is 0 and gaussianW2 is symmetric in its two Gaussians", () => {
    const S1 = [
      [2, 0.6, 0],
      [0.6, 1, 0.3],
      [0, 0.3, 0.5],
    ];
    const S2 = [
      [1, 0, 0.2],
      [0, 2, 0],
      [0.2, 0, 1],
    ];
    expect(gaussianW2([1, 2, 3], S1, [1, 2, 3], S1)).toBeLessThan(1e-13);
    expectNear(gaussianW2([1, 2, 3], S1, [0, 0, 0], S2), gaussianW2([0, 0, 0], S2, [1, 2, 3], S1), 1e-12);
  });

  it("gaussianW2 accepts singular covariances: Dirac vs N(m, S) is |Δm|² + tr S", () => {
    // W2²(δ_a, ν) = E|a − Y|² = |a − m|² + tr S (definition of W2 with a Dirac: one coupling).
    const zero = [
      [0, 0],
      [0, 0],
    ];
    const S = rotated([3, 0], 0.3); // rank one
    expectNear(gaussianW2([0, 0], zero, [1, 1], S), 2 + 3, 1e-12);
    expectNear(gaussianW2([0, 0], zero, [3, 4], zero), 25, 1e-12);
  });

  it("gaussianW2 of gaussianFit on 20 000 seeded samples per side is the true W2² within 0.12", () => {
    // Statistical tolerance: the dominant error is 2Δm·(δm₁ − δm₂) with sd
    // 2√(Δmᵀ(S₁+S₂)Δm / n) ≈ 0.028 (delta method); over 20 seeds the error had sd 0.028. 0.12 ≈ 4 sd.
    const S1 = [
      [1, 0.5],
      [0.5, 2],
    ];
    const S2 = [
      [2, -0.3],
      [-0.3, 0.5],
    ];
    const truth = gaussianW2([0, 0], S1, [1, 0.5], S2);
    const a = gaussianFit(gaussianMixture({ n: 20000, components: [{ mean: [0, 0], covariance: S1 }], random: 101 }));
    const b = gaussianFit(gaussianMixture({ n: 20000, components: [{ mean: [1, 0.5], covariance: S2 }], random: 202 }));
    expectNear(gaussianW2(a.mean, a.covariance, b.mean, b.covariance), truth, 0.12);
  });

  it("gaussianW2 does not modify its arguments", () => {
    const m = Float64Array.from([1, 2]);
    const S = rotated([1, 2], 0.4);
    const copy = Float64Array.from(S.data);
    gaussianW2(m, S, [0, 0], S);
    expect(Array.from(S.data)).toEqual(Array.from(copy));
    expect(Array.from(m)).toEqual([1, 2]);
  });
});

describe("gaussianW2 input errors", () => {
  const I = [
    [1, 0],
    [0, 1],
  ];

  it("gaussianW2 with a non-symmetric S1 throws naming the entry S1[0][1]", () => {
    const error = inputError(() => gaussianW2([0, 0], [[1, 0.5], [0.2, 1]], [0, 0], I));
    expect(error.field).toBe("S1[0][1]");
    expect(error.message).toMatch(/symmetric/);
  });

  it("gaussianW2 with an S2 that is not PSD throws naming S2", () => {
    const error = inputError(() => gaussianW2([0, 0], I, [0, 0], [[1, 2], [2, 1]]));
    expect(error.field).toBe("S2");
    expect(error.message).toMatch(/positive semidefinite/);
    expectNear(error.value as number, -1, 1e-12); // eigenvalues of [[1,2],[2,1]] are 3 and −1
  });

  it("gaussianW2 with mismatched dimensions throws naming m2, S1 or S2", () => {
    expect(inputError(() => gaussianW2([0, 0], I, [0, 0, 0], I)).field).toBe("m2");
    expect(inputError(() => gaussianW2([0, 0, 0], I, [0, 0, 0], I)).field).toBe("S1");
    expect(inputError(() => gaussianW2([0, 0], I, [0, 0], [[1]])).field).toBe("S2");
    expect(inputError(() => gaussianW2([0, 0], I, [0, 0], [[1, 0], [0]])).field).toBe("S2[1]");
  });

  it("gaussianW2 with NaN in a mean or covariance throws naming the entry", () => {
    expect(inputError(() => gaussianW2([0, Number.NaN], I, [0, 0], I)).field).toBe("m1[1]");
    expect(inputError(() => gaussianW2([0, 0], I, [0, 0], [[1, 0], [0, Number.POSITIVE_INFINITY]])).field).toBe("S2[1][1]");
    expect(inputError(() => gaussianW2([0, 0], { data: new Float64Array(3), rows: 2, cols: 2 }, [0, 0], I)).field).toBe("S1");
  });
});

describe("gaussianEntropicOT", () => {
  it("gaussianEntropicOT(N(0,1), N(1.5,2²), ε = 1) is 4.474357", () => {
    // REFERENCES.md check value (Janati, Muzellec, Peyré & Cuturi 2020, Thm 1, our convention;
    // confirmed there by a log-domain Sinkhorn on an 801-point grid to 5e-8).
    expectNear(gaussianEntropicOT([0], [[1]], [1.5], [[4]], 1), 4.474357, 5e-7);
  });

  it("gaussianEntropicOT in 1-D agrees with the 1-D formula over a range of ε", () => {
    for (const epsilon of [1e-3, 0.1, 1, 10, 1e3]) {
      const expected = entropic1d(0.3, 0.7, -1, 1.9, epsilon);
      expectNear(gaussianEntropicOT([0.3], [[0.49]], [-1], [[3.61]], epsilon), expected, 1e-12 * Math.max(1, Math.abs(expected)));
    }
  });

  it("gaussianEntropicOT with diagonal (then jointly rotated) covariances is the sum of 1-D formulas", () => {
    // Independent coordinates: the d-dimensional closed form splits per axis (Janati et al. 2020, Thm 1
    // with diagonal A, B), and a common rotation of both Gaussians changes nothing (the cost is invariant).
    const epsilon = 0.8;
    const expected = entropic1d(1, 1, 0, 3, epsilon) + entropic1d(-1, 2, 0.5, 0.5, epsilon);
    expectNear(gaussianEntropicOT([1, -1], [[1, 0], [0, 4]], [0, 0.5], [[9, 0], [0, 0.25]], epsilon), expected, 1e-12);
    const angle = 1.1;
    const c = Math.cos(angle);
    const s = Math.sin(angle);
    const rotate = (v: number[]) => [c * v[0] - s * v[1], s * v[0] + c * v[1]];
    const value = gaussianEntropicOT(rotate([1, -1]), rotated([1, 4], angle), rotate([0, 0.5]), rotated([9, 0.25], angle), epsilon);
    expectNear(value, expected, 1e-12);
  });

  it("gaussianEntropicOT tends to gaussianW2 as ε → 0 and of Diracs is |Δm|²", () => {
    // OT_ε − W2² → 0 like ε log(1/ε) (Chizat et al. 2020); with Diracs the only plan is the product.
    const S1 = rotated([1, 3], 0.2);
    const S2 = rotated([2, 0.5], 1.3);
    const w2 = gaussianW2([0, 1], S1, [2, 0], S2);
    expectNear(gaussianEntropicOT([0, 1], S1, [2, 0], S2, 1e-9), w2, 1e-7);
    const zero = [
      [0, 0],
      [0, 0],
    ];
    expectNear(gaussianEntropicOT([0, 0], zero, [3, 4], zero, 0.5), 25, 1e-12);
  });

  it("gaussianEntropicOT with epsilon 0 or NaN throws naming epsilon", () => {
    expect(inputError(() => gaussianEntropicOT([0], [[1]], [0], [[1]], 0)).field).toBe("epsilon");
    expect(inputError(() => gaussianEntropicOT([0], [[1]], [0], [[1]], Number.NaN)).field).toBe("epsilon");
  });
});

describe("gaussianSinkhornDivergence", () => {
  const S1 = rotated([1, 3], 0.2);
  const S2 = rotated([2, 0.5], 1.3);

  it("gaussianSinkhornDivergence is OT_ε(a,b) − ½OT_ε(a,a) − ½OT_ε(b,b) and 0 for equal Gaussians", () => {
    // Definition of the debiased divergence (Feydy et al. 2019), REFERENCES.md.
    const e = 0.7;
    const expected = gaussianEntropicOT([0, 1], S1, [2, 0], S2, e) - 0.5 * gaussianEntropicOT([0, 1], S1, [0, 1], S1, e) - 0.5 * gaussianEntropicOT([2, 0], S2, [2, 0], S2, e);
    expectNear(gaussianSinkhornDivergence([0, 1], S1, [2, 0], S2, e), expected, 1e-12);
    expect(Math.abs(gaussianSinkhornDivergence([0, 1], S1, [0, 1], S1, e))).toBeLessThan(1e-13);
  });

  it("gaussianSinkhornDivergence tends to W2² as ε → 0 and to |Δm|² as ε → ∞", () => {
    // Limits in REFERENCES.md (Feydy et al. 2019): ε → ∞ gives ½∫∫−C d(α−β)² = |mean(α) − mean(β)|² for C = |x−y|².
    const w2 = gaussianW2([0, 1], S1, [2, 0], S2);
    expectNear(gaussianSinkhornDivergence([0, 1], S1, [2, 0], S2, 1e-8), w2, 1e-6);
    expectNear(gaussianSinkhornDivergence([0, 1], S1, [2, 0], S2, 1e7), 5, 1e-5);
  });
});

describe("gaussianFit", () => {
  it("gaussianFit of δ0 w 3 and δ2 w 1 has mean ½ and variance ¾ (by hand)", () => {
    // Mean (3·0 + 1·2)/4 = ½; variance (3·¼ + 1·9/4)/4 = ¾: divides by total mass, not n − 1.
    const fit = gaussianFit(pointMeasure([0, 2], [3, 1]));
    expect(fit.mean[0]).toBeCloseTo(0.5, 15);
    expect(fit.covariance.data[0]).toBeCloseTo(0.75, 15);
  });

  it("gaussianFit of a 2-D grid uses cell centres: x along axis 0, y along axis 1", () => {
    // Cells (0,0) and (1,1) with equal mass at centres (0,10) and (2,11): mean (1, 10.5),
    // covariance [[1, 0.5], [0.5, 0.25]] (by hand).
    const fit = gaussianFit(gridMeasure([2, 2], [1, 0, 0, 1], { origin: [0, 10], spacing: [2, 1] }));
    expect(Array.from(fit.mean)).toEqual([1, 10.5]);
    expect(Array.from(fit.covariance.data)).toEqual([1, 0.5, 0.5, 0.25]);
  });

  it("gaussianFit of 20 000 seeded samples recovers mean and covariance within 4 standard errors", () => {
    // Standard errors of a sample mean √(Sₖₖ/n) and covariance √((SᵢᵢSⱼⱼ + Sᵢⱼ²)/n) for Gaussian
    // data (common practice, no source).
    const n = 20000;
    const S = [
      [1, 0.5],
      [0.5, 2],
    ];
    const fit = gaussianFit(gaussianMixture({ n, components: [{ mean: [3, -1], covariance: S }], random: 303 }));
    expectNear(fit.mean[0], 3, 4 * Math.sqrt(1 / n));
    expectNear(fit.mean[1], -1, 4 * Math.sqrt(2 / n));
    for (let i = 0; i < 2; i++) {
      for (let j = 0; j < 2; j++) {
        expectNear(fit.covariance.data[i * 2 + j], S[i][j], 4 * Math.sqrt((S[i][i] * S[j][j] + S[i][j] ** 2) / n));
      }
    }
  });
});
