import { TransportInputError, describeValue } from "./errors";

/**
 * A discrete measure in R^d: n points stored row-major in `points`
 * (point i is `points[i*dim .. i*dim+dim-1]`) with non-negative `mass`
 * (length n, total > 0). Built and validated by {@link pointMeasure}.
 */
export interface PointMeasure {
  readonly kind: "points";
  readonly n: number;
  readonly dim: number;
  readonly points: Float64Array;
  readonly mass: Float64Array;
}

/**
 * A histogram on a regular 1-D or 2-D grid. Cell (i) or (i, j) has centre
 * origin + index·spacing per axis; `mass` is row-major over `shape`
 * (for 2-D, index i·shape[1] + j, axis 0 first). Built by {@link gridMeasure}.
 */
export interface GridMeasure {
  readonly kind: "grid";
  readonly shape: readonly number[];
  readonly origin: readonly number[];
  readonly spacing: readonly number[];
  readonly mass: Float64Array;
}

export type Measure = PointMeasure | GridMeasure;

/** Input accepted for points: row-major flat numbers (needs `dim`) or an array of rows. */
export type PointsInput = ArrayLike<number> | ReadonlyArray<ArrayLike<number>>;

export interface PointMeasureOptions {
  /** Coordinates per point; required when `points` is flat, checked when it is rows. */
  dim?: number;
  /** Name used in error messages, e.g. "source". Default "measure". */
  name?: string;
}

function isRows(points: PointsInput): points is ReadonlyArray<ArrayLike<number>> {
  return points.length > 0 && typeof (points as ArrayLike<unknown>)[0] === "object" && (points as ArrayLike<unknown>)[0] !== null;
}

/**
 * Validates and copies a point cloud with masses. `mass` defaults to uniform 1/n.
 * Throws {@link TransportInputError} naming the field on: empty measure, NaN or
 * infinite coordinates or masses, negative mass, zero total mass, rows of unequal
 * dimension, and a mass array whose length differs from the number of points.
 */
export function pointMeasure(points: PointsInput, mass?: ArrayLike<number>, options: PointMeasureOptions = {}): PointMeasure {
  const { name = "measure" } = options;
  let dim = options.dim;
  let flat: Float64Array;
  if (points === null || typeof points !== "object" || typeof points.length !== "number") {
    throw new TransportInputError(`${name}.points`, `must be an array of coordinates or of rows, got ${describeValue(points)}`, points);
  }
  if (points.length === 0) throw new TransportInputError(`${name}.points`, "empty measure: at least one point is needed", 0);
  if (isRows(points)) {
    const rows = points;
    const first = rows[0].length;
    if (dim !== undefined && dim !== first) {
      throw new TransportInputError(`${name}.points[0]`, `dimension mismatch: expected ${dim} coordinates, got ${first}`, first);
    }
    dim = first;
    if (!(dim >= 1)) throw new TransportInputError(`${name}.points[0]`, "a point needs at least one coordinate", dim);
    flat = new Float64Array(rows.length * dim);
    for (let i = 0; i < rows.length; i++) {
      const row = rows[i];
      if (row === null || typeof row !== "object" || row.length !== dim) {
        throw new TransportInputError(`${name}.points[${i}]`, `dimension mismatch: expected ${dim} coordinates, got ${describeValue(row?.length)}`, row?.length);
      }
      for (let k = 0; k < dim; k++) flat[i * dim + k] = row[k];
    }
  } else {
    if (dim === undefined) dim = 1;
    if (!Number.isInteger(dim) || dim < 1) throw new TransportInputError(`${name}.dim`, `must be a positive integer, got ${describeValue(dim)}`, dim);
    if (points.length % dim !== 0) {
      throw new TransportInputError(`${name}.points`, `length ${points.length} is not a multiple of dimension ${dim}`, points.length);
    }
    flat = Float64Array.from(points as ArrayLike<number>);
  }
  const n = flat.length / dim;
  for (let idx = 0; idx < flat.length; idx++) {
    const v = flat[idx];
    if (!Number.isFinite(v)) {
      const i = Math.floor(idx / dim);
      throw new TransportInputError(`${name}.points[${i}][${idx % dim}]`, `coordinate must be finite, got ${describeValue(v)}`, v);
    }
  }
  const masses = mass === undefined ? new Float64Array(n).fill(1 / n) : checkMass(mass, n, `${name}.mass`);
  return { kind: "points", n, dim, points: flat, mass: masses };
}

export interface GridMeasureOptions {
  /** Centre of the first cell per axis. Default 0 on each axis. */
  origin?: readonly number[];
  /** Cell width per axis (> 0). Default 1 on each axis. */
  spacing?: readonly number[];
  name?: string;
}

/**
 * Validates and copies a histogram on a regular 1-D or 2-D grid of `shape`
 * (e.g. [n] or [rows, cols]). `mass` is row-major over `shape`.
 */
export function gridMeasure(shape: readonly number[], mass: ArrayLike<number>, options: GridMeasureOptions = {}): GridMeasure {
  const { name = "measure" } = options;
  if (shape.length !== 1 && shape.length !== 2) {
    throw new TransportInputError(`${name}.shape`, `a grid has 1 or 2 axes, got ${shape.length}`, shape);
  }
  shape.forEach((s, k) => {
    if (!Number.isInteger(s) || s < 1) throw new TransportInputError(`${name}.shape[${k}]`, `must be a positive integer, got ${describeValue(s)}`, s);
  });
  const origin = options.origin ?? shape.map(() => 0);
  const spacing = options.spacing ?? shape.map(() => 1);
  if (origin.length !== shape.length) throw new TransportInputError(`${name}.origin`, `dimension mismatch: expected ${shape.length} values, got ${origin.length}`, origin);
  if (spacing.length !== shape.length) throw new TransportInputError(`${name}.spacing`, `dimension mismatch: expected ${shape.length} values, got ${spacing.length}`, spacing);
  origin.forEach((o, k) => {
    if (!Number.isFinite(o)) throw new TransportInputError(`${name}.origin[${k}]`, `must be finite, got ${describeValue(o)}`, o);
  });
  spacing.forEach((h, k) => {
    if (!(h > 0) || !Number.isFinite(h)) throw new TransportInputError(`${name}.spacing[${k}]`, `must be > 0 and finite, got ${describeValue(h)}`, h);
  });
  const size = shape.reduce((p, s) => p * s, 1);
  return { kind: "grid", shape: [...shape], origin: [...origin], spacing: [...spacing], mass: checkMass(mass, size, `${name}.mass`) };
}

/** Copies masses after checking length, finiteness, sign and positive total. */
export function checkMass(mass: ArrayLike<number>, expected: number, field: string): Float64Array {
  if (mass.length !== expected) {
    throw new TransportInputError(field, `length mismatch: ${mass.length} masses for ${expected} points`, mass.length);
  }
  const out = new Float64Array(expected);
  let total = 0;
  for (let i = 0; i < expected; i++) {
    const w = mass[i];
    if (!Number.isFinite(w)) throw new TransportInputError(`${field}[${i}]`, `mass must be finite, got ${describeValue(w)}`, w);
    if (w < 0) throw new TransportInputError(`${field}[${i}]`, `mass must be >= 0, got ${w}`, w);
    out[i] = w;
    total += w;
  }
  if (!(total > 0)) throw new TransportInputError(field, "total mass is zero: at least one point needs positive mass", total);
  return out;
}

/** Number of support points (grid cells count as points). */
export function supportSize(measure: Measure): number {
  return measure.mass.length;
}

/** Dimension of the space the measure lives in. */
export function measureDimension(measure: Measure): number {
  return measure.kind === "points" ? measure.dim : measure.shape.length;
}

/** Total mass Σ mass_i. */
export function totalMass(measure: Measure): number {
  let s = 0;
  for (const w of measure.mass) s += w;
  return s;
}

/**
 * Support points as a row-major n×d array. For a grid, the cell centres in the
 * same order as its masses. Returns the measure's own array for point measures
 * (callers must not mutate it).
 */
export function measurePoints(measure: Measure): Float64Array {
  if (measure.kind === "points") return measure.points;
  const { shape, origin, spacing } = measure;
  if (shape.length === 1) {
    const out = new Float64Array(shape[0]);
    for (let i = 0; i < shape[0]; i++) out[i] = origin[0] + i * spacing[0];
    return out;
  }
  const [r, c] = shape;
  const out = new Float64Array(r * c * 2);
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < c; j++) {
      const k = (i * c + j) * 2;
      out[k] = origin[0] + i * spacing[0];
      out[k + 1] = origin[1] + j * spacing[1];
    }
  }
  return out;
}

/** The same support with masses scaled to total 1. */
export function normalizeMeasure<M extends Measure>(measure: M): M {
  const total = totalMass(measure);
  const mass = measure.mass.map((w) => w / total);
  return { ...measure, mass };
}
