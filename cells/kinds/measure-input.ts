import { type Measure, type PointMeasure, measureDimension, measurePoints, pointMeasure, supportSize } from "../../core/measure";
import { CellSettingError } from "./cell-error";
import { shortDescription } from "./resolve-number";

/**
 * True for a value of the core's Measure shape: a point measure
 * `{kind: "points", n, dim, points: Float64Array, mass: Float64Array}` or a grid
 * `{kind: "grid", shape, origin, spacing, mass: Float64Array}` (data cells give
 * these; so do `core.pointMeasure` and `core.gridMeasure` in code cells).
 */
export function isMeasure(value: unknown): value is Measure {
  if (typeof value !== "object" || value === null) return false;
  const m = value as Partial<Record<string, unknown>>;
  if (!(m.mass instanceof Float64Array)) return false;
  if (m.kind === "points") return m.points instanceof Float64Array && typeof m.n === "number" && typeof m.dim === "number";
  return m.kind === "grid" && Array.isArray(m.shape) && Array.isArray(m.origin) && Array.isArray(m.spacing);
}

/**
 * The measure a setting names, or a {@link CellSettingError} at `setting` saying
 * what the named cell gave instead: `source: "depots" gives a number, not a measure; …`.
 */
export function measureInput(value: unknown, setting: string, name: string): Measure {
  if (isMeasure(value)) return value;
  throw new CellSettingError(setting, `"${name}" gives ${shortDescription(value)}, not a measure; name a data cell, or a code cell returning core.pointMeasure(...)`);
}

/** The measure as points (grid cells become points at their centres, same masses). */
export function asPointMeasure(measure: Measure): PointMeasure {
  if (measure.kind === "points") return measure;
  return pointMeasure(measurePoints(measure), measure.mass, { dim: measureDimension(measure) });
}

/** A measure in words: "300 points in 2-D" or "grid 20 × 30 (600 cells)". */
export function describeMeasure(measure: Measure): string {
  if (measure.kind === "grid") {
    const cells = supportSize(measure);
    return measure.shape.length === 1 ? `grid of ${cells} cells in 1-D` : `grid ${measure.shape.join(" × ")} (${cells} cells)`;
  }
  return `${measure.n} ${measure.n === 1 ? "point" : "points"} in ${measure.dim}-D`;
}
