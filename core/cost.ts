import { TransportInputError, describeValue } from "./errors";
import type { Matrix } from "./matrix";
import { type Measure, measureDimension, measurePoints, supportSize } from "./measure";

/**
 * Ground cost between support points.
 * - `sqeuclidean`: |x−y|² (no ½ factor);
 * - `euclidean`: |x−y|;
 * - `power`: |x−y|^p for p > 0;
 * - `matrix`: a user matrix, rows = source points, cols = target points.
 */
export type CostSpec =
  | { readonly kind: "sqeuclidean" }
  | { readonly kind: "euclidean" }
  | { readonly kind: "power"; readonly p: number }
  | { readonly kind: "matrix"; readonly matrix: Matrix };

/** Exponent p such that the cost is |x−y|^p, or undefined for a user matrix. */
export function costExponent(cost: CostSpec): number | undefined {
  switch (cost.kind) {
    case "sqeuclidean":
      return 2;
    case "euclidean":
      return 1;
    case "power":
      return cost.p;
    case "matrix":
      return undefined;
  }
}

/** Checks a cost spec; throws a {@link TransportInputError} naming the field. */
export function checkCost(cost: CostSpec, field = "cost"): void {
  if (cost === null || typeof cost !== "object") throw new TransportInputError(field, `must be a cost description, got ${describeValue(cost)}`, cost);
  switch (cost.kind) {
    case "sqeuclidean":
    case "euclidean":
      return;
    case "power":
      if (!(cost.p > 0) || !Number.isFinite(cost.p)) throw new TransportInputError(`${field}.p`, `must be > 0 and finite, got ${describeValue(cost.p)}`, cost.p);
      return;
    case "matrix": {
      const { matrix } = cost;
      if (!matrix || !(matrix.data instanceof Float64Array)) throw new TransportInputError(`${field}.matrix`, "must be a matrix with a Float64Array `data`", matrix);
      if (matrix.data.length !== matrix.rows * matrix.cols) {
        throw new TransportInputError(`${field}.matrix`, `data length ${matrix.data.length} is not rows×cols = ${matrix.rows}×${matrix.cols}`, matrix.data.length);
      }
      for (let k = 0; k < matrix.data.length; k++) {
        const v = matrix.data[k];
        if (!Number.isFinite(v)) {
          throw new TransportInputError(`${field}.matrix[${Math.floor(k / matrix.cols)}][${k % matrix.cols}]`, `cost must be finite, got ${describeValue(v)}`, v);
        }
      }
      return;
    }
    default:
      throw new TransportInputError(`${field}.kind`, `unknown cost ${describeValue((cost as { kind: unknown }).kind)}; known: sqeuclidean, euclidean, power, matrix`, (cost as { kind: unknown }).kind);
  }
}

/** Cost between two points given as offsets into row-major arrays. */
export function pointCost(x: Float64Array, i: number, y: Float64Array, j: number, dim: number, p: number): number {
  let s = 0;
  for (let k = 0; k < dim; k++) {
    const d = x[i * dim + k] - y[j * dim + k];
    s += d * d;
  }
  if (p === 2) return s;
  if (p === 1) return Math.sqrt(s);
  return Math.pow(s, p / 2);
}

/**
 * The dense n×m cost matrix between the supports of `source` and `target`.
 * Throws when dimensions differ or a user matrix has the wrong shape.
 */
export function costMatrix(source: Measure, target: Measure, cost: CostSpec): Matrix {
  checkCost(cost);
  const n = supportSize(source);
  const m = supportSize(target);
  if (cost.kind === "matrix") {
    if (cost.matrix.rows !== n || cost.matrix.cols !== m) {
      throw new TransportInputError("cost.matrix", `shape ${cost.matrix.rows}×${cost.matrix.cols} does not match ${n} source × ${m} target points`, [cost.matrix.rows, cost.matrix.cols]);
    }
    return cost.matrix;
  }
  const dim = measureDimension(source);
  if (measureDimension(target) !== dim) {
    throw new TransportInputError("target.points", `dimension mismatch: source has ${dim} coordinates, target has ${measureDimension(target)}`, measureDimension(target));
  }
  const p = costExponent(cost)!;
  const x = measurePoints(source);
  const y = measurePoints(target);
  const data = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    const row = i * m;
    for (let j = 0; j < m; j++) data[row + j] = pointCost(x, i, y, j, dim, p);
  }
  return { data, rows: n, cols: m };
}

/** Summary of a cost matrix's scale, used to state epsilon relative to the data. */
export interface CostScale {
  readonly max: number;
  readonly median: number;
  readonly mean: number;
}

/**
 * Max, median and mean of all entries of C. The median is exact for up to
 * 250 000 entries and otherwise taken on a fixed stride sample of that many
 * entries (deterministic, no randomness).
 */
export function costScale(C: Matrix): CostScale {
  const { data } = C;
  const total = data.length;
  let max = -Infinity;
  let sum = 0;
  for (let k = 0; k < total; k++) {
    const v = data[k];
    if (v > max) max = v;
    sum += v;
  }
  const limit = 250_000;
  let sample: Float64Array;
  if (total <= limit) sample = Float64Array.from(data);
  else {
    sample = new Float64Array(limit);
    const stride = total / limit;
    for (let s = 0; s < limit; s++) sample[s] = data[Math.floor(s * stride)];
  }
  // Order statistics by selection, O(h) on average instead of a full sort (the sort was
  // a third of a warm re-solve at n = m = 1000; docs/benchmarks.md, Editor).
  const h = sample.length;
  const upper = selectInPlace(sample, Math.floor(h / 2));
  let median = upper;
  if (h % 2 === 0) {
    let lower = -Infinity;
    for (let k = 0; k < h / 2; k++) if (sample[k] > lower) lower = sample[k];
    median = 0.5 * (lower + upper);
  }
  return { max, median, mean: sum / total };
}

/**
 * Rearranges `values` so that `values[k]` is the k-th smallest (0-based), everything
 * before it ≤ it and everything after ≥ it, and returns it (Hoare's selection with a
 * median-of-three pivot; deterministic). Mutates `values`: callers pass their own copy.
 */
function selectInPlace(values: Float64Array, k: number): number {
  let lo = 0;
  let hi = values.length - 1;
  while (hi > lo) {
    const mid = (lo + hi) >>> 1;
    const a = values[lo];
    const b = values[mid];
    const c = values[hi];
    const pivot = a < b ? (b < c ? b : a < c ? c : a) : a < c ? a : b < c ? c : b;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (values[i] < pivot) i++;
      while (values[j] > pivot) j--;
      if (i <= j) {
        const t = values[i];
        values[i] = values[j];
        values[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return values[k];
}

/** Which cost-scale statistic a relative epsilon multiplies. */
export type ScaleReference = "max" | "median" | "mean";

/**
 * Epsilon given either absolutely or relative to the cost scale
 * (`relative × scale[reference]`, reference default "max").
 */
export type EpsilonSpec = { readonly absolute: number } | { readonly relative: number; readonly reference?: ScaleReference };

/** Epsilon in both forms, as results report it. */
export interface ResolvedEpsilon {
  readonly absolute: number;
  readonly relative: number;
  readonly reference: ScaleReference;
}

/** Turns an epsilon spec into absolute and relative values for a given cost scale. */
export function resolveEpsilon(spec: EpsilonSpec, scale: CostScale, field = "epsilon"): ResolvedEpsilon {
  if (spec === null || typeof spec !== "object") {
    throw new TransportInputError(field, `must be {absolute} or {relative, reference?}, got ${describeValue(spec)}`, spec);
  }
  if ("absolute" in spec) {
    const e = spec.absolute;
    if (!(e > 0) || !Number.isFinite(e)) throw new TransportInputError(field, `must be > 0 and finite, got ${describeValue(e)}`, e);
    return { absolute: e, relative: scale.max > 0 ? e / scale.max : Infinity, reference: "max" };
  }
  const reference = spec.reference ?? "max";
  if (!["max", "median", "mean"].includes(reference)) {
    throw new TransportInputError(`${field}.reference`, `must be max, median or mean, got ${describeValue(reference)}`, reference);
  }
  const r = spec.relative;
  if (!(r > 0) || !Number.isFinite(r)) throw new TransportInputError(`${field}.relative`, `must be > 0 and finite, got ${describeValue(r)}`, r);
  const base = scale[reference];
  if (!(base > 0)) {
    throw new TransportInputError(`${field}.relative`, `the ${reference} cost is ${base}, so a relative epsilon has no scale; give epsilon absolutely`, base);
  }
  return { absolute: r * base, relative: r, reference };
}
