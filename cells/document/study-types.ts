import type { CellKindName, SettingsByKind } from "../kinds/settings-registry";

/** Kind names and settings types, defined by the kinds' registry. */
export type { CellKindName, SettingsByKind } from "../kinds/settings-registry";

/** Value of the `format` field: marks a JSON file as a Couplet study. */
export const STUDY_FORMAT = "couplet-study";

/** The format version this code reads natively and writes. Older versions are migrated on load. */
export const CURRENT_FORMAT_VERSION = 2;

/**
 * One cell of a study. `id` is stable for the cell's life (receipts and the
 * editor refer to it); `name` is how other cells refer to its value (a
 * JavaScript identifier; required for parameter, data, transport and sweep
 * cells). Fields this version does not know are kept as they are.
 */
export interface CellOf<K extends CellKindName> {
  readonly id: string;
  readonly kind: K;
  readonly name?: string;
  readonly settings: SettingsByKind[K];
  readonly [extra: string]: unknown;
}

/** A cell of any kind; narrow on `kind`. */
export type Cell = { [K in CellKindName]: CellOf<K> }[CellKindName];

/**
 * What a run recorded for one computing cell. Written and read by the
 * runtime; the document only checks this outer shape and keeps the contents.
 */
export interface Receipt {
  /** Hash of the cell's resolved inputs (settings and input data). */
  readonly fingerprint: string;
  /** The settings as resolved for the run (references replaced by values). */
  readonly settings: { readonly [key: string]: unknown };
  /** The core version that computed it (core/version.ts). */
  readonly coreVersion: string;
  /** The result's summary numbers, as the runtime chose them. */
  readonly summary: { readonly [key: string]: unknown };
  /** Wall-clock seconds of the run, >= 0. */
  readonly seconds: number;
  /** When it ran: an ISO 8601 date-time with a time zone, e.g. "2026-12-01T09:30:00Z". */
  readonly recordedAt: string;
  readonly [extra: string]: unknown;
}

/**
 * A study: one JSON file of cells. Immutable: change it with `updateStudy`.
 * Fields this version does not know are kept, in their place, on save.
 */
export interface StudyDocument {
  readonly format: typeof STUDY_FORMAT;
  readonly formatVersion: typeof CURRENT_FORMAT_VERSION;
  /** Title shown at the top; may be empty. */
  readonly title: string;
  /** Free text about the study (plain text). Default "". */
  readonly about?: string;
  /** Seed from which cells with seed "study" derive theirs, an integer in [0, 4294967295]. Default 0. */
  readonly seed?: number;
  /** Cells in display order. */
  readonly cells: readonly Cell[];
  /** Receipts of the last recorded run, by cell id. */
  readonly receipts?: { readonly [cellId: string]: Receipt };
  readonly [extra: string]: unknown;
}

/** The study seed, 0 when omitted. */
export function studySeed(study: StudyDocument): number {
  return study.seed ?? 0;
}
