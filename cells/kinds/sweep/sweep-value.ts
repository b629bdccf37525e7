import type { TransportCellValue } from "../transport/transport-value";
import type { SweepOutput, SweepTarget } from "./settings";

/**
 * One run of a sweep: the varied setting's value (under `value` and under the
 * setting's own name, e.g. `epsilon` or `sampleSize.source`), the replicate number
 * (from 0), and each recorded output (`divergence` is null unless debiased).
 */
export interface SweepRowValue {
  readonly value: number | "balanced";
  readonly replicate: number;
  readonly [field: string]: unknown;
}

/**
 * The value of a sweep cell. While the sweep runs, the cell yields this value
 * after each run with `complete: false` and the rows so far; the last value has
 * `complete: true`. Rows are ordered by value (as listed or ranged), then replicate.
 */
export interface SweepCellValue {
  readonly vary: SweepTarget;
  /** The values swept, ranges expanded (sample sizes rounded, repeats dropped). */
  readonly values: readonly (number | "balanced")[];
  readonly replicates: number;
  /** The base seed of the replicates (replicate r uses FNV-1a-32("<seed>:replicate-<r>")). */
  readonly seed: number;
  readonly record: readonly SweepOutput[];
  /** Table columns: the varied setting, "replicate", then the recorded outputs. */
  readonly columns: readonly string[];
  readonly rows: readonly SweepRowValue[];
  /** values × replicates. */
  readonly planned: number;
  readonly complete: boolean;
  /** Runs so far whose solve did not converge (whether or not `status` is recorded). */
  readonly notConverged: number;
  /** True when the values come from a log-spaced range (sweep-curve figures then default to a log x axis). */
  readonly logSpaced: boolean;
  /** The transport cell re-run, and its value as the base of every run. */
  readonly transportName: string;
  readonly transport: TransportCellValue;
}

/** True for a sweep cell's value (see {@link SweepCellValue}). */
export function isSweepValue(value: unknown): value is SweepCellValue {
  if (typeof value !== "object" || value === null) return false;
  const v = value as Partial<SweepCellValue>;
  return typeof v.vary === "string" && Array.isArray(v.rows) && Array.isArray(v.columns) && typeof v.complete === "boolean";
}
