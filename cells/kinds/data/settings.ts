import { describeValue } from "../../../core/errors";
import { checkCellName } from "../../document/cell-name";
import { type NameMapper, type NumberOrParam, checkNumberOrParam, collectReferences, mapField, mapItems, mapParamRef } from "../../document/references";
import { type SeedSetting, checkSeedSetting, usesStudySeed } from "../../document/seed";
import { type StudyIssue, childPath } from "../../document/study-issue";
import {
  type JsonObject,
  checkArray,
  checkNumber,
  checkNumberList,
  checkObject,
  checkOneOf,
  checkPresent,
  checkString,
  isJsonObject,
} from "../../document/value-checks";

/** Where a data cell's points come from. */
export type DataOrigin = "generator" | "file" | "inline";

/** The synthetic measures a data cell can draw (core/generators.ts). */
export type GeneratorName = "gaussian-mixture" | "uniform-box" | "ring" | "two-moons" | "grid-histogram";

/** File formats a data cell can read (cells/data). */
export type DataFileFormat = "csv" | "tsv" | "json" | "npy";

/** Values of `from`, in the order the docs list them. */
export const DATA_ORIGINS: readonly DataOrigin[] = ["generator", "file", "inline"];
/** Values of `generator`, in the order the docs list them. */
export const GENERATOR_NAMES: readonly GeneratorName[] = ["gaussian-mixture", "uniform-box", "ring", "two-moons", "grid-histogram"];
/** Values of a file's `format`. */
export const DATA_FILE_FORMATS: readonly DataFileFormat[] = ["csv", "tsv", "json", "npy"];

/** Fields every data cell accepts. */
interface DataCommon {
  /**
   * Keep only this many points, drawn without replacement with the cell's seed
   * (a positive integer or a reference). Default: all points.
   */
  readonly subsample?: NumberOrParam;
  /** Seed of the generator and of the subsample. Default "study" (derived from the study seed and cell id). */
  readonly seed?: SeedSetting;
  readonly [extra: string]: unknown;
}

/** One Gaussian of a mixture (core `MixtureComponent`). */
export interface MixtureComponentSettings {
  /** Relative weight >= 0 (normalised over components). Default 1. */
  readonly weight?: NumberOrParam;
  /** Mean, d coordinates; all components have the same d. */
  readonly mean: readonly number[];
  /** d×d symmetric positive semi-definite covariance. Give this or `scale`. */
  readonly covariance?: readonly (readonly number[])[];
  /** Standard deviation >= 0: one number (all axes) or d numbers. Default 1 when no covariance. */
  readonly scale?: NumberOrParam | readonly number[];
  readonly [extra: string]: unknown;
}

/** n draws from a Gaussian mixture. */
export interface GaussianMixtureData extends DataCommon {
  readonly from: "generator";
  readonly generator: "gaussian-mixture";
  readonly n: NumberOrParam;
  readonly components: readonly MixtureComponentSettings[];
}

/** n uniform points in the box [lower, upper). */
export interface UniformBoxData extends DataCommon {
  readonly from: "generator";
  readonly generator: "uniform-box";
  readonly n: NumberOrParam;
  readonly lower: readonly number[];
  readonly upper: readonly number[];
}

/** n points on a circle in the plane plus Gaussian noise. */
export interface RingData extends DataCommon {
  readonly from: "generator";
  readonly generator: "ring";
  readonly n: NumberOrParam;
  /** Default [0, 0]. */
  readonly center?: readonly number[];
  /** >= 0, default 1. */
  readonly radius?: NumberOrParam;
  /** Standard deviation of the noise, >= 0, default 0. */
  readonly noise?: NumberOrParam;
}

/** n points on two interleaved half circles in the plane plus Gaussian noise. */
export interface TwoMoonsData extends DataCommon {
  readonly from: "generator";
  readonly generator: "two-moons";
  readonly n: NumberOrParam;
  /** >= 0, default 0. */
  readonly noise?: NumberOrParam;
}

/**
 * How a grid histogram's mass is set: `values` row-major over the shape (>= 0,
 * some > 0); `components`, a sum of weighted Gaussian bumps evaluated at cell
 * centres; or `cell`, a cell whose value is a function (x, y?) → density >= 0.
 */
export type GridDensity =
  | { readonly values: readonly number[]; readonly [extra: string]: unknown }
  | { readonly components: readonly MixtureComponentSettings[]; readonly [extra: string]: unknown }
  | { readonly cell: string; readonly [extra: string]: unknown };

/** A histogram on a regular 1-D or 2-D grid (no randomness). */
export interface GridHistogramData extends DataCommon {
  readonly from: "generator";
  readonly generator: "grid-histogram";
  /** [cells] or [rows, cols]. */
  readonly shape: readonly number[];
  /** Centre of the first cell per axis. Default 0 per axis. */
  readonly origin?: readonly number[];
  /** Cell width per axis, > 0. Default 1 per axis. */
  readonly spacing?: readonly number[];
  readonly density: GridDensity;
}

/** Points read from a file next to the study. */
export interface FileData extends DataCommon {
  readonly from: "file";
  /** Path relative to the study file's folder, with "/" separators. */
  readonly path: string;
  /** Default: from the file extension (.csv, .tsv, .json, .npy). */
  readonly format?: DataFileFormat;
  /** Coordinate columns, in order (for .npy the indices as text: "0", "1"). Default: all but the mass column. */
  readonly columns?: readonly string[];
  /** Column of point masses. Default: the column named "mass" when there is one; else uniform 1/n. */
  readonly mass?: string;
}

/** Points written in the study itself. */
export interface InlineData extends DataCommon {
  readonly from: "inline";
  /** One row of coordinates per point; all rows the same length. */
  readonly points: readonly (readonly number[])[];
  /** One mass >= 0 per point, total > 0. Default uniform 1/n. */
  readonly mass?: readonly number[];
}

/** Settings of a data cell: a measure from a generator, a file or inline rows. */
export type DataSettings = GaussianMixtureData | UniformBoxData | RingData | TwoMoonsData | GridHistogramData | FileData | InlineData;

/** The format a file path implies by its extension, if any. */
export function formatFromPath(path: string): DataFileFormat | undefined {
  const dot = path.lastIndexOf(".");
  const ext = dot < 0 ? "" : path.slice(dot + 1).toLowerCase();
  return (DATA_FILE_FORMATS as readonly string[]).includes(ext) ? (ext as DataFileFormat) : undefined;
}

const SYMMETRY_TOLERANCE = 1e-12;

/** Checks components of a mixture (also used by grid densities); returns the common dimension or undefined. */
function checkComponents(value: unknown, path: string, issues: StudyIssue[]): number | undefined {
  if (!checkArray(value, path, issues, 1)) return undefined;
  let dim: number | undefined;
  let dimOk = true;
  let literalWeightSum = 0;
  let allLiteral = true;
  value.forEach((component, i) => {
    const p = childPath(path, i);
    if (!checkObject(component, p, issues)) {
      dimOk = false;
      return;
    }
    if (component.weight !== undefined) {
      checkNumberOrParam(component.weight, childPath(p, "weight"), issues, { atLeast: 0 });
      if (typeof component.weight === "number") literalWeightSum += Math.max(0, component.weight);
      else allLiteral = false;
    } else literalWeightSum += 1;
    let d: number | undefined;
    if (checkPresent(component, "mean", p, issues) && checkNumberList(component.mean, childPath(p, "mean"), issues)) {
      d = component.mean.length;
      if (dim === undefined) dim = d;
      else if (d !== dim) {
        issues.push({ path: childPath(p, "mean"), message: `dimension mismatch: components[0].mean has ${dim} coordinates, this one ${d}` });
        dimOk = false;
      }
    } else dimOk = false;
    if (component.covariance !== undefined && component.scale !== undefined) {
      issues.push({ path: p, message: 'give either "covariance" or "scale", not both' });
    }
    if (component.covariance !== undefined) checkCovariance(component.covariance, d, childPath(p, "covariance"), issues);
    if (component.scale !== undefined) {
      const sp = childPath(p, "scale");
      if (Array.isArray(component.scale)) {
        checkNumberList(component.scale, sp, issues, { length: d, bounds: { atLeast: 0 } });
      } else checkNumberOrParam(component.scale, sp, issues, { atLeast: 0 });
    }
  });
  if (allLiteral && value.every(isJsonObject) && !(literalWeightSum > 0)) {
    issues.push({ path, message: "weights sum to zero: at least one component needs a positive weight" });
  }
  return dimOk ? dim : undefined;
}

function checkCovariance(value: unknown, d: number | undefined, path: string, issues: StudyIssue[]): void {
  if (!checkArray(value, path, issues, 1)) return;
  const size = d ?? value.length;
  if (value.length !== size) {
    issues.push({ path, message: `must be ${size}×${size} to match the mean, got ${value.length} rows` });
    return;
  }
  let ok = true;
  value.forEach((row, i) => {
    if (!checkNumberList(row, childPath(path, i), issues, { length: size })) ok = false;
  });
  if (!ok) return;
  const S = value as readonly (readonly number[])[];
  for (let i = 0; i < size; i++) {
    if (S[i][i] < 0) {
      issues.push({ path: childPath(childPath(path, i), i), message: `a variance must be >= 0, got ${S[i][i]}` });
      return;
    }
    for (let j = i + 1; j < size; j++) {
      const a = S[i][j];
      const b = S[j][i];
      if (Math.abs(a - b) > SYMMETRY_TOLERANCE * Math.max(1, Math.abs(a), Math.abs(b))) {
        issues.push({ path: childPath(childPath(path, i), j), message: `must equal covariance[${j}][${i}] (${b}): a covariance is symmetric, got ${a}` });
        return;
      }
    }
  }
}

function checkGenerator(s: JsonObject, path: string, issues: StudyIssue[]): void {
  const genPath = childPath(path, "generator");
  if (!checkPresent(s, "generator", path, issues) || !checkOneOf(s.generator, GENERATOR_NAMES, genPath, issues)) return;
  const at = (key: string) => childPath(path, key);
  if (s.generator !== "grid-histogram") {
    if (checkPresent(s, "n", path, issues)) checkNumberOrParam(s.n, at("n"), issues, { integer: true, atLeast: 1 });
  }
  switch (s.generator) {
    case "gaussian-mixture":
      if (checkPresent(s, "components", path, issues)) checkComponents(s.components, at("components"), issues);
      break;
    case "uniform-box": {
      const lower = checkPresent(s, "lower", path, issues) && checkNumberList(s.lower, at("lower"), issues);
      const upper = checkPresent(s, "upper", path, issues) && checkNumberList(s.upper, at("upper"), issues);
      if (lower && upper) {
        const lo = s.lower as readonly number[];
        const hi = s.upper as readonly number[];
        if (lo.length !== hi.length) issues.push({ path: at("upper"), message: `dimension mismatch: lower has ${lo.length} values, upper ${hi.length}` });
        else {
          hi.forEach((u, k) => {
            if (!(u >= lo[k])) issues.push({ path: childPath(at("upper"), k), message: `must be >= lower[${k}] (${lo[k]}), got ${u}` });
          });
        }
      }
      break;
    }
    case "ring":
      if (s.center !== undefined) checkNumberList(s.center, at("center"), issues, { length: 2 });
      if (s.radius !== undefined) checkNumberOrParam(s.radius, at("radius"), issues, { atLeast: 0 });
      if (s.noise !== undefined) checkNumberOrParam(s.noise, at("noise"), issues, { atLeast: 0 });
      break;
    case "two-moons":
      if (s.noise !== undefined) checkNumberOrParam(s.noise, at("noise"), issues, { atLeast: 0 });
      break;
    case "grid-histogram":
      checkGrid(s, path, issues);
      break;
  }
}

function checkGrid(s: JsonObject, path: string, issues: StudyIssue[]): void {
  const at = (key: string) => childPath(path, key);
  let axes: number | undefined;
  let cells: number | undefined;
  if (checkPresent(s, "shape", path, issues) && checkNumberList(s.shape, at("shape"), issues, { bounds: { integer: true, atLeast: 1 } })) {
    const shape = s.shape as readonly number[];
    if (shape.length > 2) issues.push({ path: at("shape"), message: `a grid has 1 or 2 axes, got ${shape.length}` });
    else {
      axes = shape.length;
      cells = shape.reduce((a, b) => a * b, 1);
    }
  }
  if (s.origin !== undefined) checkNumberList(s.origin, at("origin"), issues, { length: axes });
  if (s.spacing !== undefined) checkNumberList(s.spacing, at("spacing"), issues, { length: axes, bounds: { above: 0 } });
  const dp = at("density");
  if (!checkPresent(s, "density", path, issues) || !checkObject(s.density, dp, issues)) return;
  const density = s.density;
  const given = ["values", "components", "cell"].filter((k) => density[k] !== undefined);
  if (given.length !== 1) {
    issues.push({ path: dp, message: given.length === 0 ? 'must hold one of "values", "components" or "cell"' : `give only one of "values", "components" or "cell", got ${given.map((g) => `"${g}"`).join(" and ")}` });
    return;
  }
  if (density.values !== undefined) {
    const vp = childPath(dp, "values");
    if (checkNumberList(density.values, vp, issues, { length: cells, bounds: { atLeast: 0 } })) {
      if (!((density.values as readonly number[]).some((v) => v > 0))) issues.push({ path: vp, message: "total is zero: at least one cell needs positive mass" });
    }
  } else if (density.components !== undefined) {
    const dim = checkComponents(density.components, childPath(dp, "components"), issues);
    if (dim !== undefined && axes !== undefined && dim !== axes) {
      issues.push({ path: childPath(dp, "components"), message: `dimension mismatch: the grid has ${axes} ${axes === 1 ? "axis" : "axes"}, the components ${dim} coordinates` });
    }
  } else checkCellName(density.cell, childPath(dp, "cell"), issues);
}

function checkFile(s: JsonObject, path: string, issues: StudyIssue[]): void {
  const at = (key: string) => childPath(path, key);
  let inferred: DataFileFormat | undefined;
  if (checkPresent(s, "path", path, issues) && checkString(s.path, at("path"), issues, { nonEmpty: true })) {
    const p = s.path;
    if (p.startsWith("/") || /^[A-Za-z]:/.test(p)) issues.push({ path: at("path"), message: `must be relative to the study file's folder, got ${describeValue(p)}` });
    else if (p.includes("\\")) issues.push({ path: at("path"), message: `must use "/" between folders (the same on every system), got ${describeValue(p)}` });
    inferred = formatFromPath(p);
    if (s.format === undefined && !inferred) {
      issues.push({ path: at("format"), message: `missing (required: the extension of ${describeValue(p)} does not tell; use one of "csv", "tsv", "json", "npy")` });
    }
  }
  if (s.format !== undefined) checkOneOf(s.format, DATA_FILE_FORMATS, at("format"), issues);
  let columns: readonly string[] | undefined;
  if (s.columns !== undefined && checkArray(s.columns, at("columns"), issues, 1)) {
    const seen = new Map<string, number>();
    let ok = true;
    s.columns.forEach((c, i) => {
      const cp = childPath(at("columns"), i);
      if (!checkString(c, cp, issues, { nonEmpty: true })) ok = false;
      else if (seen.has(c)) issues.push({ path: cp, message: `repeats columns[${seen.get(c)}] (${describeValue(c)})` });
      else seen.set(c, i);
    });
    if (ok) columns = s.columns as readonly string[];
  }
  if (s.mass !== undefined && checkString(s.mass, at("mass"), issues, { nonEmpty: true }) && columns?.includes(s.mass)) {
    issues.push({ path: at("mass"), message: `${describeValue(s.mass)} is also listed in columns: a column is either a coordinate or the mass` });
  }
}

function checkInline(s: JsonObject, path: string, issues: StudyIssue[]): void {
  const at = (key: string) => childPath(path, key);
  let count: number | undefined;
  if (checkPresent(s, "points", path, issues) && checkArray(s.points, at("points"), issues, 1)) {
    let dim: number | undefined;
    s.points.forEach((row, i) => {
      const rp = childPath(at("points"), i);
      if (!checkNumberList(row, rp, issues, { length: dim })) return;
      dim ??= (row as readonly number[]).length;
    });
    count = s.points.length;
  }
  if (s.mass !== undefined) {
    const mp = at("mass");
    if (checkNumberList(s.mass, mp, issues, { length: count, bounds: { atLeast: 0 } })) {
      if (!(s.mass as readonly number[]).some((m) => m > 0)) issues.push({ path: mp, message: "total mass is zero: at least one point needs positive mass" });
    }
  }
}

/**
 * Validates data settings at `path`: the origin (`from`), the generator and its
 * fields (counts, dimensions that agree, symmetric covariances, box corners in
 * order, grid shapes), file paths (relative, "/"-separated, a known format),
 * inline rows of one length with non-negative masses, `subsample` and `seed`.
 */
export function validateDataSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  const s = settings;
  if (s.subsample !== undefined) checkNumberOrParam(s.subsample, childPath(path, "subsample"), issues, { integer: true, atLeast: 1 });
  if (s.seed !== undefined) checkSeedSetting(s.seed, childPath(path, "seed"), issues);
  if (!checkPresent(s, "from", path, issues) || !checkOneOf(s.from, DATA_ORIGINS, childPath(path, "from"), issues)) return issues;
  if (s.from === "generator") checkGenerator(s, path, issues);
  else if (s.from === "file") checkFile(s, path, issues);
  else checkInline(s, path, issues);
  return issues;
}

function mapComponents(components: unknown, rename: NameMapper): unknown {
  if (!Array.isArray(components)) return components;
  return mapItems(components, (c: unknown) => {
    if (!isJsonObject(c)) return c;
    let out = mapField(c, "weight", (w) => mapParamRef(w, rename));
    out = mapField(out, "scale", (v) => mapParamRef(v, rename));
    return out;
  });
}

/** Renames the cells the settings refer to: number references, the seed reference and a grid density cell. */
export function mapDataReferences(settings: DataSettings, rename: NameMapper): DataSettings {
  const ref = (v: unknown) => mapParamRef(v, rename);
  let out: JsonObject = settings;
  for (const key of ["n", "radius", "noise", "subsample", "seed"]) out = mapField(out, key, ref);
  out = mapField(out, "components", (c) => mapComponents(c, rename));
  out = mapField(out, "density", (d) => {
    if (!isJsonObject(d)) return d;
    const withCell = mapField(d, "cell", (name) => (typeof name === "string" ? rename(name) : name));
    return mapField(withCell, "components", (c) => mapComponents(c, rename));
  });
  return out as DataSettings;
}

/** Names of the cells the settings refer to (number and seed references, density cell). */
export function dataDependencies(settings: DataSettings): string[] {
  return collectReferences(settings, mapDataReferences);
}

/**
 * True when the cell draws random numbers with a seed derived from the study
 * seed: a random generator (not grid-histogram) or a subsample, with seed
 * omitted or "study".
 */
export function dataUsesStudySeed(settings: DataSettings): boolean {
  const random = (settings.from === "generator" && settings.generator !== "grid-histogram") || settings.subsample !== undefined;
  return random && usesStudySeed(settings.seed);
}
