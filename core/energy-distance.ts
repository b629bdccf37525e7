import { TransportInputError, describeValue } from "./errors";
import { type Measure, measureDimension, measurePoints } from "./measure";

/**
 * Kernel of a maximum mean discrepancy.
 * - `energy`: k(x, y) = −|x − y| (conditionally positive definite; gives the energy distance);
 * - `gaussian`: k(x, y) = exp(−|x − y|² / (2·bandwidth²)), bandwidth > 0 in the units of the points.
 */
export type MmdKernel = { readonly kind: "energy" } | { readonly kind: "gaussian"; readonly bandwidth: number };

/**
 * Energy distance E = 2E|X−Y| − E|X−X'| − E|Y−Y'| with X, X' ~ source and
 * Y, Y' ~ target independent (Székely & Rizzo 2013, J. Stat. Plann. Inference 143),
 * masses normalised to probabilities. Equals MMD² with kernel −|x−y| and is the
 * square of what `scipy.stats.energy_distance` reports. Units: those of the points
 * (not squared). Always ≥ 0 (clamped against rounding); 0 iff the measures agree.
 *
 * 1-D measures use E = 2∫(F − G)² dx on the merged sorted supports: O(N log N).
 * Otherwise O(n·m + n² + m²) pairwise sums (points with zero mass are skipped).
 * Throws a {@link TransportInputError} naming "target.points" when dimensions differ.
 */
export function energyDistance(source: Measure, target: Measure): number {
  const dim = checkDimensions(source, target);
  const a = positiveSupport(source, dim);
  const b = positiveSupport(target, dim);
  if (dim === 1) return Math.max(0, energy1d(a, b));
  const distance = (x: Float64Array, i: number, y: Float64Array, j: number) => Math.sqrt(squaredDistance(x, i, y, j, dim));
  const cross = crossSum(a, b, distance);
  const self = selfSum(a, distance) + selfSum(b, distance);
  return Math.max(0, 2 * cross - self);
}

/**
 * Squared maximum mean discrepancy MMD² = E k(X,X') + E k(Y,Y') − 2E k(X,Y)
 * (Gretton, Borgwardt, Rasch, Schölkopf & Smola 2012, JMLR 13), as the biased
 * V-statistic of the weighted measures: every pair, including i = i', with
 * masses normalised to probabilities. With `{kind: "energy"}` this is
 * {@link energyDistance}. Always ≥ 0 (clamped against rounding).
 *
 * Throws a {@link TransportInputError} naming "kernel", "kernel.kind",
 * "kernel.bandwidth" or "target.points".
 */
export function mmd(source: Measure, target: Measure, kernel: MmdKernel): number {
  if (kernel === null || typeof kernel !== "object") throw new TransportInputError("kernel", `must be a kernel description, got ${describeValue(kernel)}`, kernel);
  if (kernel.kind === "energy") return energyDistance(source, target);
  if (kernel.kind !== "gaussian") {
    const kind = (kernel as { kind: unknown }).kind;
    throw new TransportInputError("kernel.kind", `unknown kernel ${describeValue(kind)}; known: energy, gaussian`, kind);
  }
  const h = kernel.bandwidth;
  if (typeof h !== "number" || !(h > 0) || !Number.isFinite(h)) {
    throw new TransportInputError("kernel.bandwidth", `must be > 0 and finite, got ${describeValue(h)}`, h);
  }
  const dim = checkDimensions(source, target);
  const a = positiveSupport(source, dim);
  const b = positiveSupport(target, dim);
  const scale = -1 / (2 * h * h);
  const k = (x: Float64Array, i: number, y: Float64Array, j: number) => Math.exp(scale * squaredDistance(x, i, y, j, dim));
  return Math.max(0, selfSum(a, k) + selfSum(b, k) - 2 * crossSum(a, b, k));
}

/** Support points with positive mass and their masses normalised to 1. */
interface Support {
  readonly n: number;
  readonly points: Float64Array;
  readonly weights: Float64Array;
}

type PairFunction = (x: Float64Array, i: number, y: Float64Array, j: number) => number;

function checkDimensions(source: Measure, target: Measure): number {
  const dim = measureDimension(source);
  const other = measureDimension(target);
  if (other !== dim) throw new TransportInputError("target.points", `dimension mismatch: source has ${dim} coordinates, target has ${other}`, other);
  return dim;
}

function positiveSupport(measure: Measure, dim: number): Support {
  const x = measurePoints(measure);
  const w = measure.mass;
  let total = 0;
  let count = 0;
  for (let i = 0; i < w.length; i++) {
    total += w[i];
    if (w[i] > 0) count++;
  }
  const points = new Float64Array(count * dim);
  const weights = new Float64Array(count);
  let c = 0;
  for (let i = 0; i < w.length; i++) {
    if (!(w[i] > 0)) continue;
    weights[c] = w[i] / total;
    for (let k = 0; k < dim; k++) points[c * dim + k] = x[i * dim + k];
    c++;
  }
  return { n: count, points, weights };
}

function squaredDistance(x: Float64Array, i: number, y: Float64Array, j: number, dim: number): number {
  let s = 0;
  for (let k = 0; k < dim; k++) {
    const t = x[i * dim + k] - y[j * dim + k];
    s += t * t;
  }
  return s;
}

/** Σ_ij a_i b_j f(x_i, y_j), summed row by row to limit rounding growth. */
function crossSum(a: Support, b: Support, f: PairFunction): number {
  let total = 0;
  for (let i = 0; i < a.n; i++) {
    let row = 0;
    for (let j = 0; j < b.n; j++) row += b.weights[j] * f(a.points, i, b.points, j);
    total += a.weights[i] * row;
  }
  return total;
}

/** Σ_ii' a_i a_i' f(x_i, x_i') over all ordered pairs, using symmetry of f. */
function selfSum(a: Support, f: PairFunction): number {
  let diagonal = 0;
  let upper = 0;
  for (let i = 0; i < a.n; i++) {
    diagonal += a.weights[i] * a.weights[i] * f(a.points, i, a.points, i);
    let row = 0;
    for (let j = i + 1; j < a.n; j++) row += a.weights[j] * f(a.points, i, a.points, j);
    upper += a.weights[i] * row;
  }
  return diagonal + 2 * upper;
}

/**
 * 1-D energy distance 2∫(F − G)² dx (Székely & Rizzo 2013, §2; the identity behind
 * scipy's implementation): sort the pooled support with signed masses +a, −b; F − G
 * is constant between consecutive pooled points.
 */
function energy1d(a: Support, b: Support): number {
  const total = a.n + b.n;
  const values = new Float64Array(total);
  const signed = new Float64Array(total);
  values.set(a.points, 0);
  values.set(b.points, a.n);
  signed.set(a.weights, 0);
  for (let j = 0; j < b.n; j++) signed[a.n + j] = -b.weights[j];
  const order = new Uint32Array(total);
  for (let k = 0; k < total; k++) order[k] = k;
  order.sort((i, j) => values[i] - values[j]);
  let gap = 0; // F − G just right of the current pooled point
  let integral = 0;
  for (let k = 0; k < total - 1; k++) {
    gap += signed[order[k]];
    const width = values[order[k + 1]] - values[order[k]];
    if (width > 0) integral += gap * gap * width;
  }
  return 2 * integral;
}
