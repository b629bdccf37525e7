import { TransportInputError, describeValue } from "./errors";
import type { Matrix } from "./matrix";
import { type Measure, measureDimension, measurePoints } from "./measure";
import { type SymmetricEigen, symmetricEigen, symmetricFunction } from "./symmetric-eigen";

/** A mean vector: d finite numbers. */
export type MeanInput = ArrayLike<number>;

/**
 * A covariance: a d×d row-major {@link Matrix}, or d rows of d numbers.
 * Must be finite, symmetric (to 1e-10 of its largest entry) and positive
 * semidefinite (smallest eigenvalue ≥ −1e-10 × largest |eigenvalue|).
 */
export type CovarianceInput = Matrix | ReadonlyArray<ArrayLike<number>>;

/** Relative tolerance for symmetry and for eigenvalues just below zero (rounding in user-built matrices). */
const SHAPE_TOLERANCE = 1e-10;

/**
 * Squared 2-Wasserstein distance between N(m1, S1) and N(m2, S2), cost |x−y|²:
 * W2² = |m₁−m₂|² + tr S₁ + tr S₂ − 2 tr((S₁^½ S₂ S₁^½)^½)
 * (Dowson & Landau 1982, J. Multivariate Anal. 12; Olkin & Pukelsheim 1982,
 * Linear Algebra Appl. 48). Square roots through a Jacobi eigen-decomposition;
 * the result is clamped at 0 against rounding. Singular covariances are allowed.
 *
 * Throws a {@link TransportInputError} naming "m1", "S1", "m2" or "S2" on
 * non-finite entries, dimension mismatch, non-symmetric or non-PSD covariance.
 */
export function gaussianW2(m1: MeanInput, S1: CovarianceInput, m2: MeanInput, S2: CovarianceInput): number {
  const pair = gaussianPair(m1, S1, m2, S2);
  let cross = 0;
  for (const lambda of pair.crossEigenvalues) cross += Math.sqrt(Math.max(lambda, 0));
  return Math.max(0, pair.meanGap + pair.traceA + pair.traceB - 2 * cross);
}

/**
 * Entropic OT between N(m1, S1) and N(m2, S2) in Couplet's convention
 * OT_ε = min_P ⟨|x−y|², P⟩ + ε·KL(P ‖ α⊗β) (docs REFERENCES.md), closed form of
 * Janati, Muzellec, Peyré & Cuturi (2020, NeurIPS 33, Thm 1) with σ² = ε/2,
 * D = (4 S₁^½ S₂ S₁^½ + σ⁴ I)^½:
 * OT_ε = |m₁−m₂|² + tr S₁ + tr S₂ − tr D + dσ²(1 − log 2σ²) + σ² log det(D + σ² I).
 * Evaluated per eigenvalue λ of S₁^½ S₂ S₁^½ as Σ −u + σ² log1p(u/2σ²) with
 * u = 4λ/(√(4λ+σ⁴) + σ²), which avoids cancellation for large ε. Tends to
 * {@link gaussianW2} as ε → 0. `epsilon` > 0 in squared-distance units.
 *
 * Throws a {@link TransportInputError} naming the bad argument (as gaussianW2, plus "epsilon").
 */
export function gaussianEntropicOT(m1: MeanInput, S1: CovarianceInput, m2: MeanInput, S2: CovarianceInput, epsilon: number): number {
  checkEpsilon(epsilon);
  const pair = gaussianPair(m1, S1, m2, S2);
  return pair.meanGap + pair.traceA + pair.traceB + entropicCrossTerm(pair.crossEigenvalues, epsilon / 2);
}

/**
 * Debiased Sinkhorn divergence between two Gaussians from the entropic closed
 * form: S_ε = OT_ε(α,β) − ½OT_ε(α,α) − ½OT_ε(β,β) (Feydy et al. 2019, AISTATS;
 * closed form as in {@link gaussianEntropicOT}). Same units, checks and errors.
 */
export function gaussianSinkhornDivergence(m1: MeanInput, S1: CovarianceInput, m2: MeanInput, S2: CovarianceInput, epsilon: number): number {
  checkEpsilon(epsilon);
  const pair = gaussianPair(m1, S1, m2, S2);
  const sigma2 = epsilon / 2;
  // Self terms: the eigenvalues of A^½ A A^½ are the squared eigenvalues of A.
  const selfA = pair.eigenA.values.map((l) => Math.max(l, 0) ** 2);
  const selfB = pair.eigenB.values.map((l) => Math.max(l, 0) ** 2);
  const cross = entropicCrossTerm(pair.crossEigenvalues, sigma2);
  return pair.meanGap + cross - 0.5 * entropicCrossTerm(selfA, sigma2) - 0.5 * entropicCrossTerm(selfB, sigma2);
}

/** Weighted mean and covariance of a measure: what {@link gaussianFit} returns. */
export interface GaussianFit {
  /** Mass-weighted mean, length d. */
  readonly mean: Float64Array;
  /**
   * Mass-weighted covariance Σ wᵢ(xᵢ−m)(xᵢ−m)ᵀ / Σ wᵢ, d×d row-major. Divides by
   * the total mass (the measure's own second moment), not by n−1.
   */
  readonly covariance: Matrix;
}

/**
 * The Gaussian with the same mean and covariance as `measure` (masses need not
 * sum to 1; they are normalised). Grid measures use their cell centres.
 * Two passes (mean first) to avoid the cancellation of E[xxᵀ] − mmᵀ.
 */
export function gaussianFit(measure: Measure): GaussianFit {
  const d = measureDimension(measure);
  const x = measurePoints(measure);
  const w = measure.mass;
  const n = w.length;
  let total = 0;
  for (let i = 0; i < n; i++) total += w[i];
  if (!(total > 0)) throw new TransportInputError("measure.mass", "total mass is zero", total);
  const mean = new Float64Array(d);
  for (let i = 0; i < n; i++) for (let k = 0; k < d; k++) mean[k] += w[i] * x[i * d + k];
  for (let k = 0; k < d; k++) mean[k] /= total;
  const cov = new Float64Array(d * d);
  const dx = new Float64Array(d);
  for (let i = 0; i < n; i++) {
    const wi = w[i];
    if (wi === 0) continue;
    for (let k = 0; k < d; k++) dx[k] = x[i * d + k] - mean[k];
    for (let k = 0; k < d; k++) for (let l = k; l < d; l++) cov[k * d + l] += wi * dx[k] * dx[l];
  }
  for (let k = 0; k < d; k++) {
    for (let l = k; l < d; l++) {
      cov[k * d + l] /= total;
      cov[l * d + k] = cov[k * d + l];
    }
  }
  return { mean, covariance: { data: cov, rows: d, cols: d } };
}

/**
 * A validated, symmetrised copy of a covariance with its eigen-decomposition.
 * Exported for generators and tests; throws a {@link TransportInputError} naming
 * `field` (or `field[i][j]`) when S is not d×d, not finite, not symmetric or not PSD.
 */
export function checkCovariance(S: CovarianceInput, d: number, field: string): { matrix: Matrix; eigen: SymmetricEigen } {
  const matrix = toMatrix(S, field);
  if (matrix.rows !== d || matrix.cols !== d) {
    throw new TransportInputError(field, `dimension mismatch: expected ${d}×${d}, got ${matrix.rows}×${matrix.cols}`, [matrix.rows, matrix.cols]);
  }
  const a = matrix.data;
  let scale = 0;
  for (let k = 0; k < a.length; k++) {
    if (!Number.isFinite(a[k])) {
      throw new TransportInputError(`${field}[${Math.floor(k / d)}][${k % d}]`, `entry must be finite, got ${describeValue(a[k])}`, a[k]);
    }
    scale = Math.max(scale, Math.abs(a[k]));
  }
  const sym = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) {
      const aij = a[i * d + j];
      const aji = a[j * d + i];
      if (Math.abs(aij - aji) > SHAPE_TOLERANCE * scale) {
        throw new TransportInputError(`${field}[${i}][${j}]`, `covariance must be symmetric: entry (${i},${j}) = ${aij} but (${j},${i}) = ${aji}`, aij);
      }
      sym[i * d + j] = 0.5 * (aij + aji);
    }
  }
  const symmetric = { data: sym, rows: d, cols: d };
  const eigen = symmetricEigen(symmetric);
  const lowest = eigen.values[0];
  const largest = Math.max(Math.abs(eigen.values[0]), Math.abs(eigen.values[d - 1]));
  if (lowest < -SHAPE_TOLERANCE * largest) {
    throw new TransportInputError(field, `covariance must be positive semidefinite: smallest eigenvalue is ${lowest}`, lowest);
  }
  return { matrix: symmetric, eigen };
}

/** A validated copy of a mean vector; throws naming `field[k]`. */
export function checkMean(m: MeanInput, field: string): Float64Array {
  if (m === null || typeof m !== "object" || typeof (m as ArrayLike<number>).length !== "number") {
    throw new TransportInputError(field, `must be an array of numbers, got ${describeValue(m)}`, m);
  }
  if (m.length < 1) throw new TransportInputError(field, "needs at least one coordinate", m.length);
  const out = Float64Array.from(m);
  out.forEach((v, k) => {
    if (!Number.isFinite(v)) throw new TransportInputError(`${field}[${k}]`, `must be finite, got ${describeValue(m[k])}`, m[k]);
  });
  return out;
}

function toMatrix(S: CovarianceInput, field: string): Matrix {
  if (S === null || typeof S !== "object") throw new TransportInputError(field, `must be a matrix or an array of rows, got ${describeValue(S)}`, S);
  if ("data" in S && "rows" in S && "cols" in S) {
    const { rows, cols } = S;
    if (!Number.isInteger(rows) || !Number.isInteger(cols) || rows < 1 || cols < 1 || S.data.length !== rows * cols) {
      throw new TransportInputError(field, `matrix data length ${S.data.length} is not rows×cols = ${rows}×${cols}`, S.data.length);
    }
    return { data: Float64Array.from(S.data), rows, cols };
  }
  const rowsIn = S as ReadonlyArray<ArrayLike<number>>;
  const rows = rowsIn.length;
  if (!(rows >= 1)) throw new TransportInputError(field, "needs at least one row", rows);
  const cols = rowsIn[0]?.length;
  const data = new Float64Array(rows * (cols ?? 0));
  for (let i = 0; i < rows; i++) {
    const row = rowsIn[i];
    if (row === null || typeof row !== "object" || row.length !== cols) {
      throw new TransportInputError(`${field}[${i}]`, `every row needs ${cols} entries, got ${describeValue(row?.length)}`, row);
    }
    for (let j = 0; j < cols; j++) data[i * cols + j] = row[j];
  }
  return { data, rows, cols };
}

interface GaussianPair {
  readonly meanGap: number;
  readonly traceA: number;
  readonly traceB: number;
  readonly eigenA: SymmetricEigen;
  readonly eigenB: SymmetricEigen;
  /** Eigenvalues of A^½ B A^½ (may be a few ulps below zero). */
  readonly crossEigenvalues: Float64Array;
}

function gaussianPair(m1: MeanInput, S1: CovarianceInput, m2: MeanInput, S2: CovarianceInput): GaussianPair {
  const a = checkMean(m1, "m1");
  const d = a.length;
  const A = checkCovariance(S1, d, "S1");
  const b = checkMean(m2, "m2");
  if (b.length !== d) throw new TransportInputError("m2", `dimension mismatch: m1 has ${d} coordinates, m2 has ${b.length}`, b.length);
  const B = checkCovariance(S2, d, "S2");
  let meanGap = 0;
  let traceA = 0;
  let traceB = 0;
  for (let k = 0; k < d; k++) {
    meanGap += (a[k] - b[k]) ** 2;
    traceA += A.matrix.data[k * d + k];
    traceB += B.matrix.data[k * d + k];
  }
  const rootA = symmetricFunction(A.eigen, (l) => Math.sqrt(Math.max(l, 0)));
  const M = multiply(multiply(rootA, B.matrix), rootA);
  return { meanGap, traceA, traceB, eigenA: A.eigen, eigenB: B.eigen, crossEigenvalues: symmetricEigen(M).values };
}

/** Σ_k [σ² − D_k + σ² log((D_k + σ²)/2σ²)], D_k = √(4λ_k + σ⁴), in cancellation-free form. */
function entropicCrossTerm(lambdas: Float64Array, sigma2: number): number {
  let s = 0;
  for (const raw of lambdas) {
    const lambda = Math.max(raw, 0);
    if (lambda === 0) continue; // D_k = σ²: the term is exactly 0
    const u = (4 * lambda) / (Math.sqrt(4 * lambda + sigma2 * sigma2) + sigma2);
    const ratio = u / (2 * sigma2);
    // ε so small that σ² underflows: σ²·log(1/σ²) → 0, the W2 limit.
    s += -u + (Number.isFinite(ratio) ? sigma2 * Math.log1p(ratio) : 0);
  }
  return s;
}

function checkEpsilon(epsilon: number): void {
  if (typeof epsilon !== "number" || !(epsilon > 0) || !Number.isFinite(epsilon)) {
    throw new TransportInputError("epsilon", `must be > 0 and finite, got ${describeValue(epsilon)}`, epsilon);
  }
}

function multiply(X: Matrix, Y: Matrix): Matrix {
  const n = X.rows;
  const m = Y.cols;
  const inner = X.cols;
  const out = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < inner; k++) {
      const xik = X.data[i * inner + k];
      if (xik === 0) continue;
      for (let j = 0; j < m; j++) out[i * m + j] += xik * Y.data[k * m + j];
    }
  }
  return { data: out, rows: n, cols: m };
}
