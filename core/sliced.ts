import { TransportInputError, describeValue } from "./errors";
import type { Matrix } from "./matrix";
import { type Measure, measureDimension, measurePoints } from "./measure";
import { type RandomSource, normalDraw, randomSource } from "./random";

/** Settings of {@link slicedWasserstein}. */
export interface SlicedOptions {
  /** Number of random directions L (positive integer). Cost O(L·(n log n + m log m + (n+m)·d)). */
  readonly projections: number;
  /** Exponent of the ground cost |x−y|^p, p ≥ 1. Default 2. */
  readonly p?: number;
  /** Seeded generator, or a seed for `seededRandom` (core/random.ts); each direction uses d normal draws. */
  readonly random: RandomSource | number;
}

/** What {@link slicedWasserstein} returns. */
export interface SlicedResult {
  /** Sliced W_p^p: the mean of `perDirection` (units of |x−y|^p; not its p-th root). */
  readonly value: number;
  /** W_p^p of the two projections on each direction, in draw order (length L). */
  readonly perDirection: Float64Array;
  /**
   * Monte Carlo standard error of `value` over directions: sample standard
   * deviation of `perDirection` / √L. 0 in 1-D (every direction gives the same
   * value); NaN when L = 1 (no spread to estimate).
   */
  readonly standardError: number;
  /** The unit directions used, L×d row-major (direction k is row k). */
  readonly directions: Matrix;
}

/**
 * Sliced Wasserstein comparison (Rabin, Peyré, Delon & Bernot 2011, SSVM; Bonneel,
 * Rabin, Peyré & Pfister 2015, J. Math. Imaging Vis. 51): the average over L random
 * unit directions θ, uniform on the sphere, of W_p^p(θ#source, θ#target), each 1-D
 * problem solved exactly by matching quantile functions,
 * W_p^p = ∫₀¹ |F⁻¹(t) − G⁻¹(t)|^p dt (Villani 2003, Topics in OT, Thm 2.18).
 * Masses are normalised to probabilities. In 1-D it is the exact W_p^p.
 * Same seed, same directions, same bits.
 *
 * Throws a {@link TransportInputError} naming "options", "projections", "p",
 * "random" or "target.points" (dimension mismatch).
 */
export function slicedWasserstein(source: Measure, target: Measure, options: SlicedOptions): SlicedResult {
  if (options === null || typeof options !== "object") throw new TransportInputError("options", `must be an options object, got ${describeValue(options)}`, options);
  const { projections, p = 2 } = options;
  if (typeof projections !== "number" || !Number.isInteger(projections) || projections < 1) {
    throw new TransportInputError("projections", `must be a positive integer, got ${describeValue(projections)}`, projections);
  }
  if (typeof p !== "number" || !(p >= 1) || !Number.isFinite(p)) {
    // For p < 1 the cost is concave and the sorted (monotone) coupling is no longer optimal.
    throw new TransportInputError("p", `must be >= 1 and finite (sorting solves 1-D transport only for convex costs), got ${describeValue(p)}`, p);
  }
  const random = randomSource(options.random, "random");
  const dim = measureDimension(source);
  const other = measureDimension(target);
  if (other !== dim) throw new TransportInputError("target.points", `dimension mismatch: source has ${dim} coordinates, target has ${other}`, other);

  const x = measurePoints(source);
  const y = measurePoints(target);
  const a = normalised(source.mass);
  const b = normalised(target.mass);
  const n = a.length;
  const m = b.length;
  const px = new Float64Array(n);
  const py = new Float64Array(m);
  const ox = new Uint32Array(n);
  const oy = new Uint32Array(m);
  const directions = new Float64Array(projections * dim);
  const perDirection = new Float64Array(projections);
  const theta = new Float64Array(dim);

  for (let l = 0; l < projections; l++) {
    drawDirection(random, theta);
    directions.set(theta, l * dim);
    project(x, theta, px);
    project(y, theta, py);
    sortOrder(px, ox);
    sortOrder(py, oy);
    perDirection[l] = sortedTransportCost(px, ox, a, py, oy, b, p);
  }

  let sum = 0;
  for (const v of perDirection) sum += v;
  const value = sum / projections;
  let squares = 0;
  for (const v of perDirection) squares += (v - value) * (v - value);
  const standardError = projections > 1 ? Math.sqrt(squares / (projections - 1) / projections) : NaN;
  return { value, perDirection, standardError, directions: { data: directions, rows: projections, cols: dim } };
}

/** A uniform direction on the unit sphere: a normalised standard normal vector (Muller 1959). */
function drawDirection(random: RandomSource, theta: Float64Array): void {
  for (;;) {
    let norm2 = 0;
    for (let k = 0; k < theta.length; k++) {
      theta[k] = normalDraw(random);
      norm2 += theta[k] * theta[k];
    }
    if (norm2 > 0) {
      const inv = 1 / Math.sqrt(norm2);
      for (let k = 0; k < theta.length; k++) theta[k] *= inv;
      return;
    }
  }
}

function project(points: Float64Array, theta: Float64Array, out: Float64Array): void {
  const d = theta.length;
  for (let i = 0; i < out.length; i++) {
    let s = 0;
    for (let k = 0; k < d; k++) s += points[i * d + k] * theta[k];
    out[i] = s;
  }
}

function sortOrder(values: Float64Array, order: Uint32Array): void {
  for (let i = 0; i < order.length; i++) order[i] = i;
  order.sort((i, j) => values[i] - values[j]);
}

function normalised(mass: Float64Array): Float64Array {
  let total = 0;
  for (const w of mass) total += w;
  return mass.map((w) => w / total);
}

/**
 * 1-D W_p^p between Σ a_i δ_{x_i} and Σ b_j δ_{y_j} (both of total mass 1) by
 * merging the two cumulative distributions: on each interval of t where both
 * quantile functions are constant, add (interval length)·|x − y|^p. Stops when
 * either side is exhausted, so rounding in the cumulative sums drops at most a
 * few ulps of mass.
 */
function sortedTransportCost(x: Float64Array, ox: Uint32Array, a: Float64Array, y: Float64Array, oy: Uint32Array, b: Float64Array, p: number): number {
  const n = ox.length;
  const m = oy.length;
  let i = 0;
  let j = 0;
  let ca = a[ox[0]];
  let cb = b[oy[0]];
  let t = 0;
  let total = 0;
  for (;;) {
    const next = Math.min(ca, cb);
    if (next > t) {
      const gap = Math.abs(x[ox[i]] - y[oy[j]]);
      const cost = p === 2 ? gap * gap : p === 1 ? gap : Math.pow(gap, p);
      total += (next - t) * cost;
      t = next;
    }
    const advanceA = ca <= next;
    const advanceB = cb <= next;
    if (advanceA) {
      if (++i === n) break;
      ca += a[ox[i]];
    }
    if (advanceB) {
      if (++j === m) break;
      cb += b[oy[j]];
    }
  }
  return total;
}
