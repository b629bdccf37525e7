import type { Matrix } from "./matrix";

/**
 * Eigen-decomposition A = V·diag(values)·Vᵀ of a real symmetric matrix.
 * `values` ascending; `vectors` is d×d row-major with eigenvector k in
 * column k (entry (i, k) = `data[i*d + k]`), orthonormal columns.
 */
export interface SymmetricEigen {
  readonly values: Float64Array;
  readonly vectors: Matrix;
  /** Jacobi sweeps used (a sweep visits every off-diagonal pair once). */
  readonly sweeps: number;
}

/** Sweep cap of {@link symmetricEigen}; cyclic Jacobi converges quadratically and needs ~5–10. */
const MAX_SWEEPS = 100;

/**
 * Cyclic Jacobi eigen-decomposition of a symmetric matrix (Jacobi 1846; the
 * rotation formulas as in Golub & Van Loan, Matrix Computations, §8.5, with
 * t = sign(θ)/(|θ| + √(θ²+1)) for stability). Meant for the small matrices of
 * covariances (d up to a few dozen): O(d³) per sweep, accurate to a few ulps
 * of ‖A‖ even for tiny eigenvalues, which is what PSD square roots need.
 *
 * Only the upper triangle's symmetric part is meaningful: the input is read as
 * (A + Aᵀ)/2 and never mutated. Does not validate (callers check finiteness and
 * symmetry and name their own arguments).
 */
export function symmetricEigen(matrix: Matrix): SymmetricEigen {
  const d = matrix.rows;
  const a = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) a[i * d + j] = 0.5 * (matrix.data[i * d + j] + matrix.data[j * d + i]);
  }
  const v = new Float64Array(d * d);
  for (let i = 0; i < d; i++) v[i * d + i] = 1;

  let norm2 = 0;
  for (let k = 0; k < a.length; k++) norm2 += a[k] * a[k];
  // Stop when the off-diagonal part is below rounding level of the whole matrix.
  const stop = norm2 * 1e-32;

  let sweeps = 0;
  while (sweeps < MAX_SWEEPS) {
    let off = 0;
    for (let p = 0; p < d; p++) for (let q = p + 1; q < d; q++) off += a[p * d + q] * a[p * d + q];
    if (off <= stop) break;
    sweeps++;
    for (let p = 0; p < d - 1; p++) {
      for (let q = p + 1; q < d; q++) {
        const apq = a[p * d + q];
        if (apq === 0) continue;
        const app = a[p * d + p];
        const aqq = a[q * d + q];
        const theta = (aqq - app) / (2 * apq);
        // Smaller root of t² + 2θt − 1 = 0: rotation angle ≤ π/4 keeps it stable.
        const t = Number.isFinite(theta * theta)
          ? (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1))
          : 1 / (2 * theta);
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        // A ← Pᵀ A P with P the rotation in the (p, q) plane: columns, then rows.
        for (let k = 0; k < d; k++) {
          const akp = a[k * d + p];
          const akq = a[k * d + q];
          a[k * d + p] = c * akp - s * akq;
          a[k * d + q] = s * akp + c * akq;
        }
        for (let k = 0; k < d; k++) {
          const apk = a[p * d + k];
          const aqk = a[q * d + k];
          a[p * d + k] = c * apk - s * aqk;
          a[q * d + k] = s * apk + c * aqk;
        }
        a[p * d + q] = 0;
        a[q * d + p] = 0;
        for (let k = 0; k < d; k++) {
          const vkp = v[k * d + p];
          const vkq = v[k * d + q];
          v[k * d + p] = c * vkp - s * vkq;
          v[k * d + q] = s * vkp + c * vkq;
        }
      }
    }
  }

  const order = Array.from({ length: d }, (_, i) => i).sort((i, j) => a[i * d + i] - a[j * d + j]);
  const values = new Float64Array(d);
  const vectors = new Float64Array(d * d);
  order.forEach((src, k) => {
    values[k] = a[src * d + src];
    for (let i = 0; i < d; i++) vectors[i * d + k] = v[i * d + src];
  });
  return { values, vectors: { data: vectors, rows: d, cols: d }, sweeps };
}

/**
 * f(A) = V·diag(f(λ))·Vᵀ for a symmetric A with eigen-decomposition `eigen`
 * (from {@link symmetricEigen}). The result is exactly symmetric.
 * E.g. the PSD square root is `symmetricFunction(eigen, (x) => Math.sqrt(Math.max(x, 0)))`.
 */
export function symmetricFunction(eigen: SymmetricEigen, f: (value: number) => number): Matrix {
  const { values, vectors } = eigen;
  const d = values.length;
  const fv = values.map(f);
  const out = new Float64Array(d * d);
  const V = vectors.data;
  for (let i = 0; i < d; i++) {
    for (let j = i; j < d; j++) {
      let s = 0;
      for (let k = 0; k < d; k++) s += V[i * d + k] * fv[k] * V[j * d + k];
      out[i * d + j] = s;
      out[j * d + i] = s;
    }
  }
  return { data: out, rows: d, cols: d };
}
