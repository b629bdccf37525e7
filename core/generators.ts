import { TransportInputError, describeValue } from "./errors";
import { type CovarianceInput, checkCovariance, checkMean } from "./gaussian";
import { type GridMeasure, type Measure, type PointMeasure, gridMeasure, measureDimension, measurePoints, pointMeasure } from "./measure";
import { type RandomSource, normalDraw, randomSource } from "./random";

// Seeded synthetic measures. Every generator takes `random`: a RandomSource
// (shared with the caller, so successive calls continue its stream) or a seed
// (a fresh seededRandom). The draw order is part of the contract — same seed,
// same bits — and is stated on each generator. Points get uniform mass 1/n.

/** One Gaussian component of {@link gaussianMixture}. */
export interface MixtureComponent {
  /** Relative weight ≥ 0 (normalised over components). Default 1. */
  readonly weight?: number;
  /** Mean, d coordinates; every component has the same d. */
  readonly mean: ArrayLike<number>;
  /** Covariance, d×d symmetric PSD (singular allowed). Give this or `scale`. */
  readonly covariance?: CovarianceInput;
  /** Standard deviation: one number (isotropic) or d per-axis values, ≥ 0. Default 1 when no covariance. */
  readonly scale?: number | ArrayLike<number>;
}

/** Options of {@link gaussianMixture}. */
export interface GaussianMixtureOptions {
  /** Number of points (positive integer). */
  readonly n: number;
  /** At least one component. */
  readonly components: readonly MixtureComponent[];
  readonly random: RandomSource | number;
}

/**
 * n i.i.d. draws from a Gaussian mixture, uniform masses 1/n. Draw order per point:
 * one uniform picks the component (by cumulative weight), then d standard normals z
 * (Box–Muller, core/random.ts) give mean + F·z, where F = V·diag(√λ) from the
 * covariance's eigen-decomposition (so singular covariances work) or F = diag(scale).
 * Throws a {@link TransportInputError} naming the option, e.g. "components[1].weight".
 */
export function gaussianMixture(options: GaussianMixtureOptions): PointMeasure {
  checkOptions(options);
  const n = checkCount(options.n, "n");
  const { components } = options;
  if (!Array.isArray(components) || components.length === 0) {
    throw new TransportInputError("components", `must be a non-empty array of components, got ${describeValue(components)}`, components);
  }
  const random = randomSource(options.random, "random");
  const prepared = components.map((c, i) => prepareComponent(c, i));
  const d = prepared[0].mean.length;
  prepared.forEach((c, i) => {
    if (c.mean.length !== d) {
      throw new TransportInputError(`components[${i}].mean`, `dimension mismatch: components[0] has ${d} coordinates, this one ${c.mean.length}`, c.mean.length);
    }
  });
  const factors = prepared.map((c, i) => componentFactor(components[i], c.mean.length, i));
  let totalWeight = 0;
  for (const c of prepared) totalWeight += c.weight;
  if (!(totalWeight > 0)) throw new TransportInputError("components", "weights sum to zero: at least one component needs a positive weight", totalWeight);
  const cumulative = new Float64Array(prepared.length);
  let acc = 0;
  prepared.forEach((c, i) => {
    acc += c.weight / totalWeight;
    cumulative[i] = acc;
  });

  const points = new Float64Array(n * d);
  const z = new Float64Array(d);
  for (let i = 0; i < n; i++) {
    const u = random();
    let c = 0;
    // Last positive-weight component catches u ≥ rounded total (cumulative may end at 1 − ulp).
    while (c < prepared.length - 1 && (u >= cumulative[c] || prepared[c].weight === 0)) c++;
    while (prepared[c].weight === 0) c--;
    for (let k = 0; k < d; k++) z[k] = normalDraw(random);
    const { mean } = prepared[c];
    const F = factors[c];
    for (let k = 0; k < d; k++) {
      let s = mean[k];
      for (let l = 0; l < d; l++) s += F[k * d + l] * z[l];
      points[i * d + k] = s;
    }
  }
  return pointMeasure(points, undefined, { dim: d, name: "gaussianMixture" });
}

/** Options of {@link uniformBox}. */
export interface UniformBoxOptions {
  readonly n: number;
  /** Lower corner, d finite values. */
  readonly lower: ArrayLike<number>;
  /** Upper corner, d finite values, upper[k] ≥ lower[k]. */
  readonly upper: ArrayLike<number>;
  readonly random: RandomSource | number;
}

/**
 * n i.i.d. uniform points in the box [lower, upper) ⊂ R^d, masses 1/n.
 * Draw order: d uniforms per point, coordinate 0 first.
 */
export function uniformBox(options: UniformBoxOptions): PointMeasure {
  checkOptions(options);
  const n = checkCount(options.n, "n");
  const lower = checkMean(options.lower, "lower");
  const upper = checkMean(options.upper, "upper");
  const d = lower.length;
  if (upper.length !== d) throw new TransportInputError("upper", `dimension mismatch: lower has ${d} values, upper ${upper.length}`, upper.length);
  upper.forEach((u, k) => {
    if (!(u >= lower[k])) throw new TransportInputError(`upper[${k}]`, `must be >= lower[${k}] = ${lower[k]}, got ${u}`, u);
  });
  const random = randomSource(options.random, "random");
  const points = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < d; k++) points[i * d + k] = lower[k] + (upper[k] - lower[k]) * random();
  }
  return pointMeasure(points, undefined, { dim: d, name: "uniformBox" });
}

/** Options of {@link ring}. */
export interface RingOptions {
  readonly n: number;
  /** Centre in the plane. Default [0, 0]. */
  readonly center?: ArrayLike<number>;
  /** Radius ≥ 0. Default 1. */
  readonly radius?: number;
  /** Standard deviation of isotropic Gaussian noise added to each point, ≥ 0. Default 0. */
  readonly noise?: number;
  readonly random: RandomSource | number;
}

/**
 * n points on a circle in R², angle uniform, plus isotropic Gaussian noise.
 * Draw order per point: one uniform (angle), then two normals (noise). The normals
 * are drawn even when noise = 0, so changing `noise` only rescales the same
 * perturbation — a sweep over noise keeps the angles.
 */
export function ring(options: RingOptions): PointMeasure {
  checkOptions(options);
  const n = checkCount(options.n, "n");
  const center = checkMean(options.center ?? [0, 0], "center");
  if (center.length !== 2) throw new TransportInputError("center", `a ring lives in the plane: needs 2 coordinates, got ${center.length}`, center.length);
  const radius = checkNonNegative(options.radius ?? 1, "radius");
  const noise = checkNonNegative(options.noise ?? 0, "noise");
  const random = randomSource(options.random, "random");
  const points = new Float64Array(n * 2);
  for (let i = 0; i < n; i++) {
    const angle = 2 * Math.PI * random();
    const zx = normalDraw(random);
    const zy = normalDraw(random);
    points[2 * i] = center[0] + radius * Math.cos(angle) + noise * zx;
    points[2 * i + 1] = center[1] + radius * Math.sin(angle) + noise * zy;
  }
  return pointMeasure(points, undefined, { dim: 2, name: "ring" });
}

/** Options of {@link twoMoons}. */
export interface TwoMoonsOptions {
  /** Number of points; the first ⌈n/2⌉ lie on the upper arc, the rest on the lower. */
  readonly n: number;
  /** Standard deviation of isotropic Gaussian noise, ≥ 0. Default 0. */
  readonly noise?: number;
  readonly random: RandomSource | number;
}

/**
 * Two interleaved half circles of radius 1 in R²: the upper arc (cos t, sin t) and
 * the lower arc (1 − cos t, ½ − sin t), t uniform on [0, π], both shifted by
 * (−½, −¼) so the pair is centred near the origin, plus isotropic noise.
 * Draw order per point: one uniform (t), then two normals (drawn even when noise = 0).
 */
export function twoMoons(options: TwoMoonsOptions): PointMeasure {
  checkOptions(options);
  const n = checkCount(options.n, "n");
  const noise = checkNonNegative(options.noise ?? 0, "noise");
  const random = randomSource(options.random, "random");
  const upper = Math.ceil(n / 2);
  const points = new Float64Array(n * 2);
  for (let i = 0; i < n; i++) {
    const t = Math.PI * random();
    const zx = normalDraw(random);
    const zy = normalDraw(random);
    const x = i < upper ? Math.cos(t) : 1 - Math.cos(t);
    const y = i < upper ? Math.sin(t) : 0.5 - Math.sin(t);
    points[2 * i] = x - 0.5 + noise * zx;
    points[2 * i + 1] = y - 0.25 + noise * zy;
  }
  return pointMeasure(points, undefined, { dim: 2, name: "twoMoons" });
}

/** Options of {@link gridHistogram}. */
export interface GridHistogramOptions {
  /** [cells] or [cells along axis 0, cells along axis 1], positive integers. */
  readonly shape: readonly number[];
  /** Centre of the first cell per axis. Default 0 per axis. */
  readonly origin?: readonly number[];
  /** Cell width per axis, > 0. Default 1 per axis. */
  readonly spacing?: readonly number[];
  /**
   * Unnormalised density at a cell centre: (x) in 1-D, (x, y) in 2-D with x along
   * axis 0 and y along axis 1. Must return a finite number ≥ 0.
   */
  readonly density: (x: number, y?: number) => number;
}

/**
 * A histogram on a regular grid with mass ∝ density(cell centre), normalised to
 * total 1 (no randomness). Layout as {@link gridMeasure}: row-major, axis 0 first.
 * Throws a {@link TransportInputError} naming "density[i]" / "density[i][j]" when the
 * formula gives a negative, NaN or infinite value there, "density" when it is zero
 * on every cell, and "shape", "origin", "spacing" for bad grids.
 */
export function gridHistogram(options: GridHistogramOptions): GridMeasure {
  checkOptions(options);
  const { shape, density } = options;
  if (!Array.isArray(shape) || (shape.length !== 1 && shape.length !== 2)) {
    throw new TransportInputError("shape", `must be [cells] or [rows, cols], got ${describeValue(shape)}`, shape);
  }
  shape.forEach((s, k) => {
    if (typeof s !== "number" || !Number.isInteger(s) || s < 1) throw new TransportInputError(`shape[${k}]`, `must be a positive integer, got ${describeValue(s)}`, s);
  });
  const origin = options.origin ?? shape.map(() => 0);
  const spacing = options.spacing ?? shape.map(() => 1);
  checkAxes(origin, shape.length, "origin", (v) => Number.isFinite(v), "finite");
  checkAxes(spacing, shape.length, "spacing", (v) => v > 0 && Number.isFinite(v), "> 0 and finite");
  if (typeof density !== "function") throw new TransportInputError("density", `must be a function of the cell centre, got ${describeValue(density)}`, density);

  const rows = shape[0];
  const cols = shape.length === 2 ? shape[1] : 1;
  const mass = new Float64Array(rows * cols);
  let total = 0;
  for (let i = 0; i < rows; i++) {
    const x = origin[0] + i * spacing[0];
    for (let j = 0; j < cols; j++) {
      const y = shape.length === 2 ? origin[1] + j * spacing[1] : undefined;
      const value = y === undefined ? density(x) : density(x, y);
      if (typeof value !== "number" || !Number.isFinite(value) || value < 0) {
        const cell = shape.length === 2 ? `[${i}][${j}]` : `[${i}]`;
        const where = y === undefined ? `x = ${x}` : `x = ${x}, y = ${y}`;
        throw new TransportInputError(`density${cell}`, `must be a finite number >= 0 at cell ${cell} (${where}), got ${describeValue(value)}`, value);
      }
      mass[i * cols + j] = value;
      total += value;
    }
  }
  if (!(total > 0)) throw new TransportInputError("density", "is zero on every cell: nothing to normalise", total);
  for (let k = 0; k < mass.length; k++) mass[k] /= total;
  return gridMeasure(shape, mass, { origin, spacing, name: "gridHistogram" });
}

/**
 * `count` distinct indices from 0 … size−1, uniformly (partial Fisher–Yates shuffle,
 * Durstenfeld 1964, CACM 7), in draw order. One uniform per index drawn; the first k
 * indices do not depend on `count`, so with the same seed a smaller sample is a
 * prefix of a larger one (nested sample-size sweeps).
 */
export function sampleWithoutReplacement(size: number, count: number, random: RandomSource | number): Int32Array {
  const total = checkCount(size, "size");
  if (typeof count !== "number" || !Number.isInteger(count) || count < 0 || count > total) {
    throw new TransportInputError("count", `must be an integer in [0, ${total}], got ${describeValue(count)}`, count);
  }
  const source = randomSource(random, "random");
  const pool = new Int32Array(total);
  for (let i = 0; i < total; i++) pool[i] = i;
  for (let k = 0; k < count; k++) {
    const r = k + Math.min(total - k - 1, Math.floor(source() * (total - k)));
    const t = pool[k];
    pool[k] = pool[r];
    pool[r] = t;
  }
  return pool.slice(0, count);
}

/**
 * A subsample of n support points of `measure`, drawn uniformly without replacement
 * among points with positive mass (grid cells become points at their centres).
 * Chosen points keep their original order and relative masses, rescaled so the
 * total mass equals the measure's. For a weighted measure this is an index subsample,
 * not a draw proportional to mass. Nested: with the same seed, the points for a
 * smaller n are a subset of those for a larger n.
 */
export function subsample(measure: Measure, n: number, random: RandomSource | number): PointMeasure {
  const dim = measureDimension(measure);
  const x = measurePoints(measure);
  const w = measure.mass;
  const positive: number[] = [];
  let total = 0;
  for (let i = 0; i < w.length; i++) {
    total += w[i];
    if (w[i] > 0) positive.push(i);
  }
  if (typeof n !== "number" || !Number.isInteger(n) || n < 1 || n > positive.length) {
    throw new TransportInputError("n", `must be an integer in [1, ${positive.length}] (points with positive mass), got ${describeValue(n)}`, n);
  }
  const picks = sampleWithoutReplacement(positive.length, n, random).sort();
  const points = new Float64Array(n * dim);
  const mass = new Float64Array(n);
  let chosen = 0;
  picks.forEach((p, k) => {
    const i = positive[p];
    for (let c = 0; c < dim; c++) points[k * dim + c] = x[i * dim + c];
    mass[k] = w[i];
    chosen += w[i];
  });
  for (let k = 0; k < n; k++) mass[k] *= total / chosen;
  return pointMeasure(points, mass, { dim, name: "subsample" });
}

function checkOptions(options: unknown): void {
  if (options === null || typeof options !== "object") throw new TransportInputError("options", `must be an options object, got ${describeValue(options)}`, options);
}

function checkCount(n: unknown, field: string): number {
  if (typeof n !== "number" || !Number.isInteger(n) || n < 1) throw new TransportInputError(field, `must be a positive integer, got ${describeValue(n)}`, n);
  return n;
}

function checkNonNegative(v: unknown, field: string): number {
  if (typeof v !== "number" || !(v >= 0) || !Number.isFinite(v)) throw new TransportInputError(field, `must be >= 0 and finite, got ${describeValue(v)}`, v);
  return v;
}

function checkAxes(values: unknown, axes: number, field: string, ok: (v: number) => boolean, rule: string): void {
  if (!Array.isArray(values) || values.length !== axes) {
    throw new TransportInputError(field, `dimension mismatch: expected ${axes} values, got ${describeValue(values)}`, values);
  }
  values.forEach((v, k) => {
    if (typeof v !== "number" || !ok(v)) throw new TransportInputError(`${field}[${k}]`, `must be ${rule}, got ${describeValue(v)}`, v);
  });
}

interface PreparedComponent {
  readonly weight: number;
  readonly mean: Float64Array;
}

function prepareComponent(c: MixtureComponent, i: number): PreparedComponent {
  if (c === null || typeof c !== "object") throw new TransportInputError(`components[${i}]`, `must be a component object, got ${describeValue(c)}`, c);
  const weight = c.weight ?? 1;
  if (typeof weight !== "number" || !(weight >= 0) || !Number.isFinite(weight)) {
    throw new TransportInputError(`components[${i}].weight`, `must be >= 0 and finite, got ${describeValue(weight)}`, weight);
  }
  return { weight, mean: checkMean(c.mean, `components[${i}].mean`) };
}

/** d×d row-major F with F·Fᵀ = covariance (or F = diag(scale)). */
function componentFactor(c: MixtureComponent, d: number, i: number): Float64Array {
  const F = new Float64Array(d * d);
  if (c.covariance !== undefined) {
    if (c.scale !== undefined) throw new TransportInputError(`components[${i}].scale`, "give either covariance or scale, not both", c.scale);
    const { eigen } = checkCovariance(c.covariance, d, `components[${i}].covariance`);
    const V = eigen.vectors.data;
    for (let k = 0; k < d; k++) {
      const root = Math.sqrt(Math.max(eigen.values[k], 0));
      for (let r = 0; r < d; r++) F[r * d + k] = V[r * d + k] * root;
    }
    return F;
  }
  const scale = c.scale ?? 1;
  const field = `components[${i}].scale`;
  if (typeof scale === "number") {
    checkNonNegative(scale, field);
    for (let k = 0; k < d; k++) F[k * d + k] = scale;
    return F;
  }
  const s = checkMean(scale, field);
  if (s.length !== d) throw new TransportInputError(field, `dimension mismatch: expected ${d} per-axis values, got ${s.length}`, s.length);
  s.forEach((v, k) => {
    if (v < 0) throw new TransportInputError(`${field}[${k}]`, `must be >= 0, got ${v}`, v);
    F[k * d + k] = v;
  });
  return F;
}
