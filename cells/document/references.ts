import { checkCellName } from "./cell-name";
import { type StudyIssue, childPath } from "./study-issue";
import { type JsonObject, type NumberBounds, checkNumber, isJsonObject, jsonTypeName } from "./value-checks";

/**
 * A number setting given by another cell instead: `{"param": "eps"}` stands
 * for the current value of the cell named `eps` (usually a parameter cell, but
 * any cell whose value is a number works). The runtime resolves it and checks
 * the resolved value against the same bounds as a literal.
 */
export interface ParamRef {
  readonly param: string;
}

/** A number written in place, or a {@link ParamRef} to a cell that supplies it. */
export type NumberOrParam = number | ParamRef;

/** True for `{"param": …}` objects (whatever the name's validity). */
export function isParamRef(value: unknown): value is ParamRef {
  return isJsonObject(value) && "param" in value;
}

/**
 * Checks a number-or-reference setting. A number is checked against `bounds`
 * (messages of {@link checkNumber}); a reference must hold a valid cell name;
 * anything else gives `must be a number or a reference {"param": name}, got …`.
 */
export function checkNumberOrParam(value: unknown, path: string, issues: StudyIssue[], bounds: NumberBounds = {}): boolean {
  if (typeof value === "number") return checkNumber(value, path, issues, bounds);
  if (isParamRef(value)) return checkCellName(value.param, childPath(path, "param"), issues);
  issues.push({ path, message: `must be ${bounds.integer ? "an integer" : "a number"} or a reference {"param": name}, got ${jsonTypeName(value)}` });
  return false;
}

/** Renames the cell a setting refers to; returns the value itself when nothing changes. */
export type NameMapper = (name: string) => string;

/** Applies `rename` to a {@link ParamRef}; numbers and other values pass through unchanged. */
export function mapParamRef<T>(value: T, rename: NameMapper): T {
  if (!isParamRef(value) || typeof value.param !== "string") return value;
  const next = rename(value.param);
  return next === value.param ? value : ({ ...value, param: next } as T);
}

/**
 * Replaces `object[key]` by `map(object[key])`, keeping key order and every
 * other field. Returns `object` itself when the value is unchanged (so callers
 * can tell by identity whether anything was renamed).
 */
export function mapField<T extends JsonObject>(object: T, key: string, map: (value: unknown) => unknown): T {
  if (!(key in object)) return object;
  const before = object[key];
  const after = map(before);
  return after === before ? object : ({ ...object, [key]: after } as T);
}

/** Maps every item of an array; returns the array itself when no item changes. */
export function mapItems<T>(items: readonly T[], map: (item: T) => T): readonly T[] {
  let out: T[] | undefined;
  items.forEach((item, i) => {
    const next = map(item);
    if (next !== item) {
      out ??= items.slice();
      out[i] = next;
    }
  });
  return out ?? items;
}

/**
 * Names a settings object refers to, in first-use order without repeats,
 * found by running its kind's reference mapper with a recording identity.
 */
export function collectReferences<S>(settings: S, mapReferences: (settings: S, rename: NameMapper) => S): string[] {
  const names: string[] = [];
  mapReferences(settings, (name) => {
    if (!names.includes(name)) names.push(name);
    return name;
  });
  return names;
}
