import { describeValue } from "../../core/errors";
import { type StudyIssue, childPath } from "./study-issue";

/**
 * A deep copy of plain JSON data (null, booleans, finite numbers, strings,
 * arrays, plain objects), keeping key order, or the first issue that makes it
 * unfit for a study file (NaN, undefined array items, functions, typed arrays,
 * class instances). Keys such as "__proto__" are copied as ordinary keys.
 */
export function copyJsonData(value: unknown, path: string): { value: unknown } | { issue: StudyIssue } {
  try {
    return { value: copy(value, path) };
  } catch (issue) {
    if (issue instanceof NotJson) return { issue: { path: issue.path, message: issue.message } };
    throw issue;
  }
}

class NotJson {
  constructor(
    readonly path: string,
    readonly message: string,
  ) {}
}

function copy(value: unknown, path: string): unknown {
  if (value === null || typeof value === "string" || typeof value === "boolean") return value;
  if (typeof value === "number") {
    if (!Number.isFinite(value)) throw new NotJson(path, `must be a finite number (JSON has no ${describeValue(value)})`);
    return value;
  }
  if (typeof value !== "object") throw new NotJson(path, `must be JSON data, got ${value === undefined ? "undefined" : `a ${typeof value}`}`);
  if (Array.isArray(value)) {
    return value.map((item, i) => {
      if (item === undefined) throw new NotJson(childPath(path, i), "must be JSON data, got undefined");
      return copy(item, childPath(path, i));
    });
  }
  const proto = Object.getPrototypeOf(value);
  if (proto !== Object.prototype && proto !== null) throw new NotJson(path, `must be plain JSON data, got ${Object.prototype.toString.call(value)}`);
  const out: Record<string, unknown> = {};
  for (const [key, item] of Object.entries(value)) {
    if (item === undefined) continue;
    Object.defineProperty(out, key, { value: copy(item, childPath(path, key)), enumerable: true, writable: true, configurable: true });
  }
  return out;
}

/** Deep equality of JSON data, key order ignored (two settings that save the same values). */
export function jsonEqual(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as unknown[];
    return a.length === bb.length && a.every((item, i) => jsonEqual(item, bb[i]));
  }
  const ka = Object.keys(a).filter((k) => (a as Record<string, unknown>)[k] !== undefined);
  const kb = Object.keys(b).filter((k) => (b as Record<string, unknown>)[k] !== undefined);
  if (ka.length !== kb.length) return false;
  return ka.every((k) => Object.prototype.hasOwnProperty.call(b, k) && jsonEqual((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

/**
 * A copy of `object` with `key` set to `value`: in place when the key exists,
 * else inserted before the first existing key that follows it in `order`
 * (or at the end). `value` undefined removes the key. Never mutates `object`.
 */
export function withKey<T extends object>(object: T, key: string, value: unknown, order: readonly string[] = []): T {
  const entries = Object.entries(object);
  const at = entries.findIndex(([k]) => k === key);
  if (value === undefined) {
    if (at >= 0) entries.splice(at, 1);
  } else if (at >= 0) entries[at] = [key, value];
  else {
    const rank = order.indexOf(key);
    const before = rank < 0 ? -1 : entries.findIndex(([k]) => order.indexOf(k) > rank);
    entries.splice(before < 0 ? entries.length : before, 0, [key, value]);
  }
  const out = {} as T;
  for (const [k, v] of entries) Object.defineProperty(out, k, { value: v, enumerable: true, writable: true, configurable: true });
  return out;
}
