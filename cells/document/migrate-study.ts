import { CURRENT_FORMAT_VERSION } from "./study-types";
import { type JsonObject, isJsonObject } from "./value-checks";

/**
 * Rebuilds `object` with its entries passed through `edit`, keeping their
 * order: `edit` returns the entries that replace one entry ([] drops it).
 */
function rewriteEntries(object: JsonObject, edit: (key: string, value: unknown) => [string, unknown][]): JsonObject {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(object)) {
    for (const [k, v] of edit(key, value)) Object.defineProperty(out, k, { value: v, enumerable: true, writable: true, configurable: true });
  }
  return out;
}

/** v1 transport settings → v2: epsilon as an object, Infinity-free mass penalties. */
function transportV1toV2(settings: JsonObject): JsonObject {
  const relative = settings.epsilonIsRelative === true;
  const reference = settings.epsilonReference;
  return rewriteEntries(settings, (key, value) => {
    if (key === "epsilonIsRelative" && typeof value === "boolean") return [];
    if (key === "epsilonReference" && relative) return [];
    if (key === "epsilon" && typeof value === "number") {
      return [["epsilon", relative ? (reference === undefined ? { relative: value } : { relative: value, reference }) : { absolute: value }]];
    }
    if (key === "massPenalty" && value === null) return [["massPenalty", "balanced"]];
    return [[key, value]];
  });
}

function cellV1toV2(cell: unknown): unknown {
  if (!isJsonObject(cell) || !isJsonObject(cell.settings)) return cell;
  const settings = cell.settings;
  let next: JsonObject = settings;
  if (cell.kind === "transport") next = transportV1toV2(settings);
  else if (cell.kind === "data" && settings.source !== undefined && settings.from === undefined) {
    next = rewriteEntries(settings, (key, value) => [[key === "source" ? "from" : key, value]]);
  }
  return next === settings ? cell : rewriteEntries(cell, (key, value) => [[key, key === "settings" ? next : value]]);
}

/**
 * Format version 1 → 2. Version 1 differed in four places:
 * - the top-level free text was called `description` (now `about`);
 * - data cells named their origin `source` (now `from`, as `source` reads as a transport side);
 * - transport epsilon was a number plus `epsilonIsRelative` (boolean) and, when
 *   relative, an optional `epsilonReference` (now one object: `{"absolute": x}`
 *   or `{"relative": x, "reference": r}`);
 * - a balanced side's mass penalty was `null` (now the word `"balanced"`).
 * Fields with unexpected shapes are left as they are, for validation to report.
 */
function migrateV1toV2(study: JsonObject): JsonObject {
  return rewriteEntries(study, (key, value) => {
    if (key === "formatVersion") return [["formatVersion", 2]];
    if (key === "description" && study.about === undefined) return [["about", value]];
    if (key === "cells" && Array.isArray(value)) return [["cells", value.map(cellV1toV2)]];
    return [[key, value]];
  });
}

/** Each step turns a study of version `from` into one of version `from + 1`. */
export const MIGRATIONS: readonly { readonly from: number; readonly migrate: (study: JsonObject) => JsonObject }[] = [{ from: 1, migrate: migrateV1toV2 }];

/** The `formatVersion` of raw parsed JSON, or undefined when it has none that is an integer. */
export function rawFormatVersion(raw: unknown): number | undefined {
  if (!isJsonObject(raw)) return undefined;
  const v = raw.formatVersion;
  return typeof v === "number" && Number.isInteger(v) ? v : undefined;
}

/**
 * Brings raw parsed JSON of an older format version up to the current one,
 * step by step, without mutating the input and keeping key order and unknown
 * fields. Anything else (current version, newer, missing or malformed) is
 * returned unchanged for validation to report. The result is not validated.
 */
export function migrateStudy(raw: unknown): unknown {
  let version = rawFormatVersion(raw);
  if (version === undefined || version >= CURRENT_FORMAT_VERSION) return raw;
  let study = raw as JsonObject;
  while (version < CURRENT_FORMAT_VERSION) {
    const step = MIGRATIONS.find((m) => m.from === version);
    if (!step) return study;
    study = step.migrate(study);
    version++;
  }
  return study;
}
