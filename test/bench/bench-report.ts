import type { RowName } from "./bench-options";
import { type BenchCase, ROWS } from "./bench-cases";

/** One side's measurement of a case (times in ms; per iteration for the Sinkhorn iteration rows). */
export interface SideMeasurement {
  readonly ms: number;
  readonly samples: readonly number[];
  /** Median CPU time of the same runs (ms): insensitive to waiting for a core on a busy machine. */
  readonly cpuMs?: number;
  readonly singleRun: boolean;
  /** The value compared between the sides (see `valueName` of the case result). */
  readonly value?: number;
  readonly iterations?: number;
  readonly status?: string;
  readonly marginalError?: number;
  /** Algorithm or domain that actually ran, when the solver says. */
  readonly algorithm?: string;
  /** Sinkhorn iteration rows: median time of the whole k-iteration solve, setup included (ms). */
  readonly totalMs?: number;
}

/** A side that failed or was skipped: why. */
export interface SideFailure {
  readonly error: string;
}

/** Everything measured for one case, ready for the table and the JSON. */
export interface CaseResult {
  readonly case: BenchCase;
  readonly couplet: SideMeasurement | SideFailure;
  readonly reference: SideMeasurement | SideFailure;
  /** What `value` means for this row, e.g. "assignment cost Σ C[i, σ(i)]". */
  readonly valueName: string;
  /** Couplet ÷ reference wall time, when both ran. The targets are judged on this. */
  readonly ratio?: number;
  /** Couplet ÷ reference CPU time: a cross-check that holds up better on a busy machine. */
  readonly cpuRatio?: number;
  readonly verdict: "met" | "missed" | "no target" | "not measured";
  readonly valueCheck?: { readonly relativeDifference: number; readonly ok: boolean };
  /** Notes worth printing under the row (e.g. a value mismatch). */
  readonly notes: readonly string[];
  /** 1-minute load average when the case started (other processes competing for the cores). */
  loadAverage?: number;
}

/** Relative agreement required between Couplet's and the reference's values. */
export const VALUE_TOLERANCE = 1e-6;

export function isMeasured(side: SideMeasurement | SideFailure): side is SideMeasurement {
  return !("error" in side);
}

/** Ratio, verdict and value check of a case from its two sides. */
export function judgeCase(benchCase: BenchCase, couplet: SideMeasurement | SideFailure, reference: SideMeasurement | SideFailure, valueName: string, notes: string[] = []): CaseResult {
  let ratio: number | undefined;
  let cpuRatio: number | undefined;
  let valueCheck: CaseResult["valueCheck"];
  for (const [name, side] of [["Couplet", couplet], ["reference", reference]] as const) {
    if (isMeasured(side) && !(side.ms > 0)) notes.push(`${name} time ${side.ms} ms is not positive: timing noise (t(2k) ≤ t(k) under load); no ratio`);
  }
  if (isMeasured(couplet) && isMeasured(reference) && couplet.ms > 0 && reference.ms > 0) {
    ratio = couplet.ms / reference.ms;
    if (couplet.cpuMs !== undefined && reference.cpuMs !== undefined && couplet.cpuMs > 0 && reference.cpuMs > 0) cpuRatio = couplet.cpuMs / reference.cpuMs;
    if (couplet.value !== undefined && reference.value !== undefined && Number.isFinite(reference.value)) {
      const relativeDifference = Math.abs(couplet.value - reference.value) / Math.max(Math.abs(reference.value), Number.MIN_VALUE);
      const ok = relativeDifference <= VALUE_TOLERANCE;
      valueCheck = { relativeDifference, ok };
      if (!ok) notes.push(`VALUE MISMATCH: Couplet ${valueName} = ${couplet.value} vs reference ${reference.value} (relative difference ${relativeDifference.toExponential(2)} > ${VALUE_TOLERANCE})`);
    }
  }
  const verdict = benchCase.target === undefined ? "no target" : ratio === undefined ? "not measured" : ratio <= benchCase.target.maxRatio ? "met" : "missed";
  return { case: benchCase, couplet, reference, valueName, ratio, cpuRatio, verdict, valueCheck, notes };
}

/** The readable tables, one per row, as printed by `npm run bench`. */
export function formatTables(results: readonly CaseResult[]): string {
  const out: string[] = [];
  const rows = [...new Set(results.map((r) => r.case.row))] as RowName[];
  for (const row of rows) {
    const description = ROWS[row];
    const lines = results.filter((r) => r.case.row === row);
    out.push(
      "",
      `${description.title}`,
      `  times in ${description.unit} (wall clock, median); reference: ${description.reference}`,
      "  ratio = Couplet ÷ reference (wall); CPU ratio = the same with process CPU time; load = 1-minute load average when the line started",
    );
    const header = ["case", "Couplet", "reference", "ratio", "target", "verdict", "CPU ratio", "value check", "iterations C / ref", "load"];
    const table = lines.map((r) => [
      r.case.label,
      formatSide(r.couplet),
      formatSide(r.reference),
      r.ratio === undefined ? "—" : formatRatio(r.ratio),
      r.case.target?.text ?? "—",
      r.verdict === "no target" ? "—" : r.verdict,
      r.cpuRatio === undefined ? "—" : formatRatio(r.cpuRatio),
      r.valueCheck === undefined ? "—" : `${r.valueCheck.ok ? "ok" : "MISMATCH"} ${r.valueCheck.relativeDifference.toExponential(1)}`,
      `${iterationsOf(r.couplet)} / ${iterationsOf(r.reference)}`,
      r.loadAverage === undefined ? "—" : r.loadAverage.toFixed(2),
    ]);
    out.push(...alignColumns([header, ...table]).map((l) => `  ${l}`));
    for (const r of lines) {
      for (const side of [["Couplet", r.couplet], ["reference", r.reference]] as const) {
        if (!isMeasured(side[1])) out.push(`    ${r.case.label}: ${side[0]} not measured: ${side[1].error}`);
        else if (side[1].singleRun) out.push(`    ${r.case.label}: ${side[0]} timed once (the run was too long to repeat)`);
      }
      for (const note of r.notes) out.push(`    ${r.case.label}: ${note}`);
    }
  }
  return out.join("\n");
}

function formatRatio(ratio: number): string {
  return ratio.toFixed(ratio < 0.1 ? 3 : 2);
}

function formatSide(side: SideMeasurement | SideFailure): string {
  if (!isMeasured(side)) return "n/a";
  return formatMs(side.ms);
}

/** Milliseconds with 3 significant digits (at least one decimal below 100). */
export function formatMs(ms: number): string {
  if (!Number.isFinite(ms)) return String(ms);
  if (ms >= 100) return ms.toFixed(0);
  if (ms >= 10) return ms.toFixed(1);
  if (ms >= 1) return ms.toFixed(2);
  return ms.toPrecision(3);
}

function iterationsOf(side: SideMeasurement | SideFailure): string {
  return isMeasured(side) && side.iterations !== undefined ? String(side.iterations) : "—";
}

function alignColumns(rows: readonly (readonly string[])[]): string[] {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows.map((r) => r.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join("   ").trimEnd());
}

/** The summary lines: each target met or missed, and every value mismatch. */
export function formatSummary(results: readonly CaseResult[]): string {
  const out = ["", "Targets:"];
  const targeted = results.filter((r) => r.case.target !== undefined);
  if (targeted.length === 0) out.push("  (no row with a target in this run)");
  for (const r of targeted) {
    const ratio = r.ratio === undefined ? "not measured" : `ratio ${r.ratio.toFixed(3)}${r.cpuRatio === undefined ? "" : ` (CPU ratio ${r.cpuRatio.toFixed(3)})`}`;
    out.push(`  ${r.verdict.toUpperCase().padEnd(12)} ${r.case.row} ${r.case.label}: ${ratio}, target ${r.case.target!.text}`);
  }
  const mismatches = results.filter((r) => r.valueCheck !== undefined && !r.valueCheck.ok);
  out.push("", mismatches.length === 0 ? "Values: every compared value agrees with the reference to 1e-6 relative." : `Values: ${mismatches.length} MISMATCH(ES), see the notes above.`);
  return out.join("\n");
}
