import { isParamRef, type ParamRef, checkNumberOrParam } from "./references";
import { type StudyIssue } from "./study-issue";
import { jsonTypeName } from "./value-checks";

/** Largest seed: seeds are 32-bit unsigned integers (the core's generators use 32 bits). */
export const MAX_SEED = 4294967295;

/**
 * Where a cell's random seed comes from: a whole number in [0, {@link MAX_SEED}],
 * a reference to a cell holding one (`{"param": "s"}`), or `"study"` — derived
 * from the study's seed and the cell's id by {@link deriveCellSeed}, so each cell
 * draws differently yet the whole study re-runs from one number. Omitted = "study".
 */
export type SeedSetting = number | ParamRef | "study";

/**
 * Checks a seed setting: `must be an integer, got 2.5`, `must be >= 0, got -1`,
 * `must be <= 4294967295, got …`, or for other values
 * `must be an integer seed, a reference {"param": name} or "study", got …`.
 */
export function checkSeedSetting(value: unknown, path: string, issues: StudyIssue[]): boolean {
  if (value === "study") return true;
  if (typeof value === "number" || isParamRef(value)) return checkNumberOrParam(value, path, issues, { integer: true, atLeast: 0, atMost: MAX_SEED });
  issues.push({ path, message: `must be an integer seed, a reference {"param": name} or "study", got ${jsonTypeName(value)}` });
  return false;
}

/** True when a seed setting (possibly omitted) is derived from the study seed. */
export function usesStudySeed(seed: SeedSetting | undefined): boolean {
  return seed === undefined || seed === "study";
}

/**
 * FNV-1a, 32-bit, over the UTF-8 bytes of `text` (Fowler, Noll & Vo; parameters
 * as in the IETF draft "The FNV Non-Cryptographic Hash Algorithm", Eastlake et al.):
 * h = 2166136261; for each byte: h = (h XOR byte) × 16777619 mod 2³².
 */
export function fnv1a32(text: string): number {
  const bytes = new TextEncoder().encode(text);
  let h = 0x811c9dc5;
  for (const byte of bytes) {
    h ^= byte;
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/**
 * A seed derived from a base seed and a label: FNV-1a 32 of `"<base>:<label>"`,
 * e.g. `deriveSeed(20261201, "k7q2")` hashes the text "20261201:k7q2". Stable
 * across platforms and versions: it is part of the file format (docs/format.md).
 * Sweeps label replicate r (0-based) as `"replicate-<r>"`.
 */
export function deriveSeed(base: number, label: string): number {
  return fnv1a32(`${base}:${label}`);
}

/** The seed a cell with seed "study" uses: {@link deriveSeed}(study seed, cell id). */
export function deriveCellSeed(studySeed: number, cellId: string): number {
  return deriveSeed(studySeed, cellId);
}
