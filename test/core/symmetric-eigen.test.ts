import { describe, expect, it } from "vitest";
import type { Matrix } from "../../core/matrix";
import { seededRandom } from "../../core/random";
import { symmetricEigen, symmetricFunction } from "../../core/symmetric-eigen";

/** A random symmetric d×d matrix with entries in [−1, 1). */
function randomSymmetric(d: number, seed: number): Matrix {
  const r = seededRandom(seed);
  const data = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = i; j < d; j++) {
      data[i * d + j] = 2 * r() - 1;
      data[j * d + i] = data[i * d + j];
    }
  }
  return { data, rows: d, cols: d };
}

function maxAbsDiff(a: Float64Array, b: Float64Array): number {
  let m = 0;
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k] - b[k]));
  return m;
}

describe("symmetricEigen", () => {
  it("symmetricEigen([[2,1],[1,2]]) has eigenvalues 1 and 3 (by hand)", () => {
    const { values } = symmetricEigen({ data: Float64Array.from([2, 1, 1, 2]), rows: 2, cols: 2 });
    expect(values[0]).toBeCloseTo(1, 14);
    expect(values[1]).toBeCloseTo(3, 14);
  });

  it("symmetricEigen of the n×n second-difference matrix gives 2 − 2cos(kπ/(n+1))", () => {
    // Eigenvalues of tridiag(−1, 2, −1) (common practice, no source; e.g. any numerical-analysis text).
    const n = 12;
    const data = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      data[i * n + i] = 2;
      if (i > 0) data[i * n + i - 1] = data[(i - 1) * n + i] = -1;
    }
    const { values } = symmetricEigen({ data, rows: n, cols: n });
    for (let k = 1; k <= n; k++) expect(Math.abs(values[k - 1] - (2 - 2 * Math.cos((k * Math.PI) / (n + 1))))).toBeLessThan(1e-13);
  });

  it("symmetricEigen(A) reconstructs A = VΛVᵀ with orthonormal V on random 20×20 matrices", () => {
    for (let seed = 1; seed <= 3; seed++) {
      const A = randomSymmetric(20, seed);
      const eigen = symmetricEigen(A);
      const back = symmetricFunction(eigen, (x) => x);
      expect(maxAbsDiff(back.data, A.data)).toBeLessThan(1e-13);
      const V = eigen.vectors.data;
      for (let p = 0; p < 20; p++) {
        for (let q = 0; q < 20; q++) {
          let dot = 0;
          for (let k = 0; k < 20; k++) dot += V[k * 20 + p] * V[k * 20 + q];
          expect(Math.abs(dot - (p === q ? 1 : 0))).toBeLessThan(1e-13);
        }
      }
      for (let k = 1; k < 20; k++) expect(eigen.values[k]).toBeGreaterThanOrEqual(eigen.values[k - 1]);
      expect(eigen.sweeps).toBeLessThan(20);
    }
  });

  it("symmetricEigen handles the zero matrix, the identity and a 1×1 matrix and leaves input unchanged", () => {
    expect(Array.from(symmetricEigen({ data: new Float64Array(9), rows: 3, cols: 3 }).values)).toEqual([0, 0, 0]);
    const I = Float64Array.from([1, 0, 0, 1]);
    expect(Array.from(symmetricEigen({ data: I, rows: 2, cols: 2 }).values)).toEqual([1, 1]);
    expect(Array.from(I)).toEqual([1, 0, 0, 1]);
    expect(Array.from(symmetricEigen({ data: Float64Array.from([-4]), rows: 1, cols: 1 }).values)).toEqual([-4]);
  });

  it("symmetricFunction(eigen, √) squares back to a PSD matrix, tiny eigenvalues included", () => {
    // A = B Bᵀ with eigenvalues spread over 12 orders of magnitude.
    const d = 4;
    const Q = symmetricEigen(randomSymmetric(d, 9)).vectors.data;
    const lambdas = [1e-12, 1e-6, 1, 7];
    const A = symmetricFunction({ values: Float64Array.from(lambdas), vectors: { data: Q, rows: d, cols: d }, sweeps: 0 }, (x) => x);
    const root = symmetricFunction(symmetricEigen(A), (x) => Math.sqrt(Math.max(x, 0)));
    const square = new Float64Array(d * d);
    for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) for (let k = 0; k < d; k++) square[i * d + j] += root.data[i * d + k] * root.data[k * d + j];
    expect(maxAbsDiff(square, A.data)).toBeLessThan(1e-13);
  });
});
