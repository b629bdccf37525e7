import { describeValue } from "../../core/errors";
import { StudyFormatError, childPath } from "./study-issue";
import type { StudyDocument } from "./study-types";

function isPlainObject(value: object): boolean {
  const proto = Object.getPrototypeOf(value);
  return proto === Object.prototype || proto === null;
}

function isFiniteNumber(value: unknown): boolean {
  return typeof value === "number" && Number.isFinite(value);
}

/** Like Array.prototype.every, but visits holes of sparse arrays too (as undefined). */
function everyItem(items: readonly unknown[], test: (item: unknown) => boolean): boolean {
  for (let i = 0; i < items.length; i++) if (!test(items[i])) return false;
  return true;
}

function isScalar(value: unknown): boolean {
  return value === null || typeof value === "number" || typeof value === "string" || typeof value === "boolean";
}

/** Writes canonical JSON into `out`; `at` is the path as keys, turned into text only for an error. */
function write(value: unknown, indent: string, at: (string | number)[], out: string[]): void {
  const fail = (message: string): never => {
    throw new StudyFormatError([{ path: at.reduce<string>((p, k) => childPath(p, k), ""), message }]);
  };
  if (value === null) {
    out.push("null");
    return;
  }
  switch (typeof value) {
    case "string":
      out.push(JSON.stringify(value));
      return;
    case "boolean":
      out.push(value ? "true" : "false");
      return;
    case "number":
      if (!Number.isFinite(value)) fail(`cannot be saved: JSON holds finite numbers only, got ${describeValue(value)}`);
      out.push(String(value));
      return;
    case "object":
      break;
    default:
      fail(`cannot be saved: not JSON data (${typeof value})`);
  }
  const inner = `${indent}  `;
  if (Array.isArray(value)) {
    if (value.length === 0) {
      out.push("[]");
      return;
    }
    // Numbers only (inline points, covariances): the engine's JSON.stringify of the
    // whole array turns doubles into text several times faster than one by one, and
    // number text holds no "," or "]", so the layout can be made by replacing those.
    if (everyItem(value, isFiniteNumber)) {
      out.push(JSON.stringify(value).replaceAll(",", ", "));
      return;
    }
    if (everyItem(value, (row) => Array.isArray(row) && row.length > 0 && everyItem(row, isFiniteNumber))) {
      const text = JSON.stringify(value).replaceAll(",", ", ").replaceAll("], [", `],\n${inner}[`);
      out.push(`[\n${inner}`, text.slice(1, -1), `\n${indent}]`);
      return;
    }
    const flat = everyItem(value, isScalar);
    out.push(flat ? "[" : "[\n");
    for (let i = 0; i < value.length; i++) {
      if (i > 0) out.push(flat ? ", " : ",\n");
      if (!flat) out.push(inner);
      at.push(i);
      if (value[i] === undefined) fail("cannot be saved: an array item is undefined");
      write(value[i], inner, at, out);
      at.pop();
    }
    out.push(flat ? "]" : `\n${indent}]`);
    return;
  }
  if (!isPlainObject(value as object)) fail(`cannot be saved: not plain JSON data (${Object.prototype.toString.call(value)})`);
  const entries = Object.entries(value as object).filter(([, v]) => v !== undefined);
  if (entries.length === 0) {
    out.push("{}");
    return;
  }
  out.push("{\n");
  entries.forEach(([key, item], i) => {
    if (i > 0) out.push(",\n");
    out.push(inner, JSON.stringify(key), ": ");
    at.push(key);
    write(item, inner, at, out);
    at.pop();
  });
  out.push(`\n${indent}}`);
}

/**
 * The canonical text of a study: JSON with 2-space indentation, object keys in
 * the study's own order (as loaded, or as created), arrays of plain values
 * (numbers, strings, booleans, null) on one line as `[1, 2, 3]`, other arrays
 * one item per line, numbers in JavaScript's shortest round-trip form, and a
 * final newline. Deterministic: parsing this text and serializing again gives
 * the same bytes. Fields whose value is undefined are left out.
 *
 * Throws a {@link StudyFormatError} for values JSON cannot hold (NaN, Infinity,
 * functions, typed arrays, class instances), naming their path.
 */
export function serializeStudy(study: StudyDocument): string {
  const out: string[] = [];
  write(study, "", [], out);
  out.push("\n");
  return out.join("");
}
