import { describeValue } from "../../../core/errors";
import { checkCellName } from "../../document/cell-name";
import { type NameMapper, type NumberOrParam, checkNumberOrParam, collectReferences, mapField, mapParamRef } from "../../document/references";
import { type SeedSetting, checkSeedSetting, usesStudySeed } from "../../document/seed";
import { type StudyIssue, childPath } from "../../document/study-issue";
import { type JsonObject, checkArray, checkNumber, checkObject, checkOneOf, checkPresent, isJsonObject, jsonTypeName } from "../../document/value-checks";

/**
 * The transport setting a sweep varies:
 * - `epsilon`: the epsilon number, keeping the cell's form (absolute or relative);
 * - `massPenalty`, `massPenalty.source`, `massPenalty.target`: ρ on both or one side;
 * - `sampleSize`, `sampleSize.source`, `sampleSize.target`: points drawn without
 *   replacement from the source and/or target measure;
 * - `tolerance`, `maxIterations`, `costExponent` (p of the cost |x−y|^p).
 */
export type SweepTarget =
  | "epsilon"
  | "massPenalty"
  | "massPenalty.source"
  | "massPenalty.target"
  | "sampleSize"
  | "sampleSize.source"
  | "sampleSize.target"
  | "tolerance"
  | "maxIterations"
  | "costExponent";

/** Values of `vary`, in the order the docs list them. */
export const SWEEP_TARGETS: readonly SweepTarget[] = [
  "epsilon",
  "massPenalty",
  "massPenalty.source",
  "massPenalty.target",
  "sampleSize",
  "sampleSize.source",
  "sampleSize.target",
  "tolerance",
  "maxIterations",
  "costExponent",
];

/**
 * What each run records: the result's values (`cost`, `objective`, `divergence`
 * — debiased only, else null — `mass`), how the solve went (`iterations`,
 * `marginalError`, `seconds`, `status`), and `energyDistance` between the
 * (subsampled) measures as a cheap comparator.
 */
export type SweepOutput = "cost" | "objective" | "divergence" | "mass" | "iterations" | "marginalError" | "seconds" | "status" | "energyDistance";

/** Values allowed in `record`, in the order the docs list them. */
export const SWEEP_OUTPUTS: readonly SweepOutput[] = ["cost", "objective", "divergence", "mass", "iterations", "marginalError", "seconds", "status", "energyDistance"];

/**
 * `count` values from `from` to `to` (both included), evenly spaced
 * (`linear`, default) or evenly spaced in log (`log`, needs from, to > 0).
 */
export interface SweepRange {
  readonly from: NumberOrParam;
  readonly to: NumberOrParam;
  /** Integer >= 2. */
  readonly count: number;
  readonly spacing?: "linear" | "log";
  readonly [extra: string]: unknown;
}

/** Settings of a sweep cell: one transport setting over a list or range of values, replicated with fresh seeds. */
export interface SweepSettings {
  /** Name of the transport cell to re-run. */
  readonly transport: string;
  readonly vary: SweepTarget;
  /** Explicit values (no repeats; `"balanced"` allowed for mass penalties) or a range. */
  readonly values: readonly (number | "balanced")[] | SweepRange;
  /** Runs per value, each with seed deriveSeed(seed, "replicate-<r>"). Positive integer, default 1. */
  readonly replicates?: NumberOrParam;
  /** Base seed of the replicates. Default "study". */
  readonly seed?: SeedSetting;
  /** Outputs recorded per run, no repeats. Default ["cost", "objective"]. */
  readonly record?: readonly SweepOutput[];
  readonly [extra: string]: unknown;
}

/** Default outputs when `record` is omitted. */
export const DEFAULT_SWEEP_RECORD: readonly SweepOutput[] = ["cost", "objective"];

interface ValueRule {
  readonly integer: boolean;
  readonly balanced: boolean;
}

function ruleFor(vary: SweepTarget): ValueRule {
  return {
    integer: vary.startsWith("sampleSize") || vary === "maxIterations",
    balanced: vary.startsWith("massPenalty"),
  };
}

function checkValue(value: unknown, rule: ValueRule, path: string, issues: StudyIssue[]): void {
  if (rule.balanced && value === "balanced") return;
  if (typeof value !== "number") {
    issues.push({ path, message: `must be a number${rule.balanced ? ' or "balanced"' : ""}, got ${jsonTypeName(value)}` });
    return;
  }
  checkNumber(value, path, issues, rule.integer ? { integer: true, atLeast: 1 } : { above: 0 });
}

function checkRange(range: JsonObject, rule: ValueRule, path: string, issues: StudyIssue[]): void {
  const spacing = range.spacing === undefined ? "linear" : checkOneOf(range.spacing, ["linear", "log"], childPath(path, "spacing"), issues) ? range.spacing : undefined;
  const ends: (number | undefined)[] = [];
  for (const key of ["from", "to"]) {
    if (!checkPresent(range, key, path, issues)) continue;
    const ok = checkNumberOrParam(range[key], childPath(path, key), issues, rule.integer ? { atLeast: 1 } : { above: 0 });
    ends.push(ok && typeof range[key] === "number" ? (range[key] as number) : undefined);
  }
  if (checkPresent(range, "count", path, issues)) checkNumber(range.count, childPath(path, "count"), issues, { integer: true, atLeast: 2 });
  const [from, to] = ends;
  if (spacing && from !== undefined && to !== undefined && from === to) {
    issues.push({ path: childPath(path, "to"), message: `must differ from "from" (${from}): a range of one value is a list of one` });
  }
}

/**
 * Validates sweep settings at `path`: the transport name, `vary`, values that
 * suit the varied setting (positive; whole numbers for sample sizes and
 * iteration caps; "balanced" only for mass penalties; no repeats) or a range
 * (from ≠ to, count >= 2; every varied setting is positive, so log spacing
 * always has positive ends), replicates, seed,
 * and outputs (`record`, known names, no repeats).
 */
export function validateSweepSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  const s = settings;
  const at = (key: string) => childPath(path, key);
  if (checkPresent(s, "transport", path, issues)) checkCellName(s.transport, at("transport"), issues);
  const vary = checkPresent(s, "vary", path, issues) && checkOneOf(s.vary, SWEEP_TARGETS, at("vary"), issues) ? s.vary : undefined;
  if (checkPresent(s, "values", path, issues)) {
    const vp = at("values");
    if (Array.isArray(s.values)) {
      if (checkArray(s.values, vp, issues, 1) && vary) {
        const rule = ruleFor(vary);
        const seen = new Map<unknown, number>();
        s.values.forEach((v, i) => {
          const ip = childPath(vp, i);
          if (seen.has(v)) issues.push({ path: ip, message: `repeats values[${seen.get(v)}] (${describeValue(v)})` });
          else {
            seen.set(v, i);
            checkValue(v, rule, ip, issues);
          }
        });
      }
    } else if (isJsonObject(s.values)) {
      if (vary) checkRange(s.values, ruleFor(vary), vp, issues);
    } else issues.push({ path: vp, message: `must be a list of values or a range {from, to, count}, got ${jsonTypeName(s.values)}` });
  }
  if (s.replicates !== undefined) checkNumberOrParam(s.replicates, at("replicates"), issues, { integer: true, atLeast: 1 });
  if (s.seed !== undefined) checkSeedSetting(s.seed, at("seed"), issues);
  if (s.record !== undefined && checkArray(s.record, at("record"), issues, 1)) {
    const seen = new Map<unknown, number>();
    s.record.forEach((o, i) => {
      const ip = childPath(at("record"), i);
      if (!checkOneOf(o, SWEEP_OUTPUTS, ip, issues)) return;
      if (seen.has(o)) issues.push({ path: ip, message: `repeats record[${seen.get(o)}] (${describeValue(o)})` });
      else seen.set(o, i);
    });
  }
  return issues;
}

/**
 * The values of a range whose ends are numbers: linear `from + (to − from)·k/(count − 1)`
 * or log `from·(to/from)^(k/(count − 1))`, k = 0 … count−1, with both ends exact.
 * With `integer`, values are rounded and repeats dropped (sample sizes).
 */
export function expandSweepRange(from: number, to: number, count: number, spacing: "linear" | "log" = "linear", integer = false): number[] {
  const out: number[] = [];
  for (let k = 0; k < count; k++) {
    const t = k / (count - 1);
    let v = k === 0 ? from : k === count - 1 ? to : spacing === "log" ? from * Math.pow(to / from, t) : from + (to - from) * t;
    if (integer) v = Math.round(v);
    if (!integer || !out.includes(v)) out.push(v);
  }
  return out;
}

/** Renames the transport cell and references in the range ends and replicates. */
export function mapSweepReferences(settings: SweepSettings, rename: NameMapper): SweepSettings {
  const ref = (v: unknown) => mapParamRef(v, rename);
  let out: JsonObject = mapField(settings, "transport", (t) => (typeof t === "string" ? rename(t) : t));
  out = mapField(out, "values", (v) => (isJsonObject(v) ? mapField(mapField(v, "from", ref), "to", ref) : v));
  out = mapField(out, "replicates", ref);
  out = mapField(out, "seed", ref);
  return out as SweepSettings;
}

/** Names the sweep depends on: its transport cell, then references (range ends, replicates, seed). */
export function sweepDependencies(settings: SweepSettings): string[] {
  return collectReferences(settings, mapSweepReferences);
}

/** True when the replicates' seeds derive from the study seed (seed omitted or "study"). */
export function sweepUsesStudySeed(settings: SweepSettings): boolean {
  return usesStudySeed(settings.seed);
}
