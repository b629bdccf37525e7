import { describeValue } from "../../core/errors";
import { type NumberOrParam, isParamRef } from "../document/references";
import { MAX_SEED, type SeedSetting, deriveCellSeed } from "../document/seed";
import type { StudyIssue } from "../document/study-issue";
import { type NumberBounds, checkNumber } from "../document/value-checks";
import { CellSettingError } from "./cell-error";

/** Input values of one computation, by cell name (what the engine hands `compute`). */
export type CellInputs = Readonly<Record<string, unknown>>;

/**
 * The number a number-or-reference setting stands for: the number itself, or the
 * value of the referenced cell, checked against the same `bounds` as a written
 * number (docs/format.md, "References to other cells"). Throws a
 * {@link CellSettingError} at `path` naming the reference and the value:
 * `epsilon.relative (from eps): must be > 0, got -1`.
 */
export function resolveNumber(setting: NumberOrParam | undefined, inputs: CellInputs, path: string, bounds: NumberBounds = {}): number {
  const issues: StudyIssue[] = [];
  if (isParamRef(setting)) {
    const value = inputs[setting.param];
    if (checkNumber(value, path, issues, bounds)) return value;
    throw new CellSettingError(`${path} (from ${setting.param})`, issues[0].message.replace(/^must be a number, got .*$/, `must be a number, got ${shortDescription(value)}`));
  }
  if (checkNumber(setting, path, issues, bounds)) return setting;
  throw new CellSettingError(path, issues[0].message);
}

/** Like {@link resolveNumber} for an optional setting: `fallback` when it is omitted. */
export function resolveOptionalNumber(setting: NumberOrParam | undefined, fallback: number, inputs: CellInputs, path: string, bounds: NumberBounds = {}): number {
  return setting === undefined ? fallback : resolveNumber(setting, inputs, path, bounds);
}

/**
 * The seed a cell uses (docs/format.md, "Seeds"): omitted or "study" →
 * FNV-1a-32("<study seed>:<cell id>"); a number as written; a reference → the
 * referenced value, an integer in [0, 4294967295].
 */
export function resolveSeed(setting: SeedSetting | undefined, inputs: CellInputs, studySeed: number, cellId: string, path = "seed"): number {
  if (setting === undefined || setting === "study") return deriveCellSeed(studySeed, cellId);
  return resolveNumber(setting, inputs, path, { integer: true, atLeast: 0, atMost: MAX_SEED });
}

/** A value described for an error message: kind of object rather than its whole text. */
export function shortDescription(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return `an array of ${value.length}`;
  if (ArrayBuffer.isView(value)) return `a ${value.constructor.name}`;
  if (typeof value === "function") return "a function";
  if (typeof value === "object") return "an object";
  return describeValue(value);
}
