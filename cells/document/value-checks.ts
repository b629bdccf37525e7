import { describeValue } from "../../core/errors";
import { type StudyIssue, childPath } from "./study-issue";

// Small checks shared by the study validator and the cell kinds' settings
// validators. Each pushes at most one issue (with the shared wording below) and
// returns whether the value passed, so callers can skip checks that depend on it.

/** A plain JSON object (not an array, not null). */
export type JsonObject = { readonly [key: string]: unknown };

/** True for a JSON object: not null, not an array. */
export function isJsonObject(value: unknown): value is JsonObject {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

/** Human name of a JSON value's type, for "got an array" style messages. */
export function jsonTypeName(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "an array";
  if (typeof value === "object") return "an object";
  if (typeof value === "string") return describeValue(value);
  return describeValue(value);
}

/** Checks that `value` is a JSON object; message `must be an object, got …`. */
export function checkObject(value: unknown, path: string, issues: StudyIssue[]): value is JsonObject {
  if (isJsonObject(value)) return true;
  issues.push({ path, message: `must be an object, got ${jsonTypeName(value)}` });
  return false;
}

/**
 * Checks that `object[key]` is present (not undefined). Message
 * `missing (required)` or `missing (required <condition>)`.
 */
export function checkPresent(object: JsonObject, key: string, path: string, issues: StudyIssue[], condition?: string): boolean {
  if (object[key] !== undefined) return true;
  issues.push({ path: childPath(path, key), message: condition ? `missing (required ${condition})` : "missing (required)" });
  return false;
}

/** Bounds for {@link checkNumber}; every bound is optional. */
export interface NumberBounds {
  /** Value must be > this. */
  readonly above?: number;
  /** Value must be >= this. */
  readonly atLeast?: number;
  /** Value must be <= this. */
  readonly atMost?: number;
  /** Value must be a whole number. */
  readonly integer?: boolean;
}

/**
 * Checks a JSON number against bounds: `must be a number, got "x"`,
 * `must be an integer, got 2.5`, `must be > 0, got -1`, `must be >= 0, got -1`,
 * `must be <= 1, got 3`. JSON holds no NaN or Infinity, but values built in
 * code may: they fail with `must be a finite number, got NaN`.
 */
export function checkNumber(value: unknown, path: string, issues: StudyIssue[], bounds: NumberBounds = {}): value is number {
  if (typeof value !== "number") {
    issues.push({ path, message: `must be ${bounds.integer ? "an integer" : "a number"}, got ${jsonTypeName(value)}` });
    return false;
  }
  const fail = (message: string) => {
    issues.push({ path, message: `${message}, got ${describeValue(value)}` });
    return false;
  };
  if (!Number.isFinite(value)) return fail("must be a finite number");
  if (bounds.integer && !Number.isInteger(value)) return fail("must be an integer");
  if (bounds.above !== undefined && !(value > bounds.above)) return fail(`must be > ${bounds.above}`);
  if (bounds.atLeast !== undefined && !(value >= bounds.atLeast)) return fail(`must be >= ${bounds.atLeast}`);
  if (bounds.atMost !== undefined && !(value <= bounds.atMost)) return fail(`must be <= ${bounds.atMost}`);
  return true;
}

/** Checks a string; with `nonEmpty`, also that it has a character: `must not be empty`. */
export function checkString(value: unknown, path: string, issues: StudyIssue[], options: { nonEmpty?: boolean } = {}): value is string {
  if (typeof value !== "string") {
    issues.push({ path, message: `must be a string, got ${jsonTypeName(value)}` });
    return false;
  }
  if (options.nonEmpty && value.length === 0) {
    issues.push({ path, message: "must not be empty" });
    return false;
  }
  return true;
}

/** Checks `true`/`false`: `must be true or false, got "yes"`. */
export function checkBoolean(value: unknown, path: string, issues: StudyIssue[]): value is boolean {
  if (typeof value === "boolean") return true;
  issues.push({ path, message: `must be true or false, got ${jsonTypeName(value)}` });
  return false;
}

/** Checks one of a fixed list of strings: `must be one of "a", "b", got "c"`. */
export function checkOneOf<T extends string>(value: unknown, options: readonly T[], path: string, issues: StudyIssue[]): value is T {
  if (typeof value === "string" && (options as readonly string[]).includes(value)) return true;
  issues.push({ path, message: `must be one of ${options.map((o) => JSON.stringify(o)).join(", ")}, got ${jsonTypeName(value)}` });
  return false;
}

/** Checks an array with at least `minLength` items: `must be an array, got …`, `must have at least 1 item`. */
export function checkArray(value: unknown, path: string, issues: StudyIssue[], minLength = 0): value is readonly unknown[] {
  if (!Array.isArray(value)) {
    issues.push({ path, message: `must be an array, got ${jsonTypeName(value)}` });
    return false;
  }
  if (value.length < minLength) {
    issues.push({ path, message: `must have at least ${minLength} ${minLength === 1 ? "item" : "items"}, got ${value.length}` });
    return false;
  }
  return true;
}

/**
 * Checks an array of finite numbers (a point, a corner, a shape), optionally of
 * a given length: `must have 2 values, got 3`; a bad item is reported at its index.
 */
export function checkNumberList(value: unknown, path: string, issues: StudyIssue[], options: { length?: number; minLength?: number; bounds?: NumberBounds } = {}): value is readonly number[] {
  if (!checkArray(value, path, issues, options.minLength ?? 1)) return false;
  if (options.length !== undefined && value.length !== options.length) {
    issues.push({ path, message: `must have ${options.length} ${options.length === 1 ? "value" : "values"}, got ${value.length}` });
    return false;
  }
  let ok = true;
  const bounds = options.bounds ?? {};
  for (let i = 0; i < value.length; i++) {
    const item = value[i];
    // Fast path for the common case (large inline data): build the item's path only on failure.
    if (typeof item === "number" && Number.isFinite(item) && bounds.integer === undefined && bounds.above === undefined && bounds.atLeast === undefined && bounds.atMost === undefined) continue;
    if (!checkNumber(item, childPath(path, i), issues, bounds)) ok = false;
  }
  return ok;
}
