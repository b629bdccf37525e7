// Shared by the study and editor benchmarks (study-bench.ts, editor-bench.ts): their
// command-line options, one result row, the printed table and the JSON file. The
// core benchmark has its own (bench-options.ts, bench-report.ts): its rows compare
// against numpy/scipy, these compare against Couplet's own core called directly.
import { writeFileSync } from "node:fs";
import type { MachineDescription } from "./machine-description";

/** Options of `npm run bench:studies` and `npm run bench:editor`. */
export interface RowBenchOptions {
  /** Fewer repetitions (and, for the editor, a ~1.5 s solve instead of ~5 s): a smoke check. */
  readonly quick: boolean;
  /** Where to write the results as JSON: a path, "-" for stdout, or undefined for none. */
  readonly json: string | undefined;
  readonly help: boolean;
}

/** Thrown for an unknown flag; the entry prints it with the usage. */
export class RowBenchUsageError extends Error {}

/** Usage text of one of the two harnesses. */
export function rowBenchUsage(script: string, what: string): string {
  return `Usage: npm run ${script} -- [--quick] [--json [FILE]]

  ${what}
  --quick           fewer repetitions: a smoke check that every row runs
  --json [FILE]     also write the results as JSON to FILE (stdout when FILE is
                    omitted or "-"; the readable table then goes to stderr)
  --help            this text`;
}

/** Parses argv (without the node and script paths). */
export function parseRowBenchOptions(argv: readonly string[]): RowBenchOptions {
  let quick = false;
  let json: string | undefined;
  let help = false;
  for (let k = 0; k < argv.length; k++) {
    const arg = argv[k];
    const eq = arg.startsWith("--") ? arg.indexOf("=") : -1;
    const [flag, inline] = eq > 0 ? [arg.slice(0, eq), arg.slice(eq + 1)] : [arg, undefined];
    switch (flag) {
      case "--quick":
        quick = true;
        break;
      case "--help":
      case "-h":
        help = true;
        break;
      case "--json":
        if (inline !== undefined) json = inline;
        else if (k + 1 < argv.length && !argv[k + 1].startsWith("--")) json = argv[++k];
        else json = "-";
        break;
      default:
        throw new RowBenchUsageError(`unknown option ${JSON.stringify(arg)}`);
    }
  }
  return { quick, json, help };
}

/** A target of a row: the test it must pass and how the issue states it. */
export interface RowTarget {
  /** As printed, e.g. "< 50 ms" or "recomputed = dependents". */
  readonly text: string;
  readonly met: (row: { readonly value: number; readonly ratio?: number }) => boolean;
}

/** One measured line of a table. */
export interface BenchRow {
  /** Section heading it prints under ("Studies", "Editor"). */
  readonly section: string;
  /** Stable id for the JSON, e.g. "study.evaluate". */
  readonly id: string;
  readonly label: string;
  /** The measured number (NaN when it could not be measured). */
  readonly value: number;
  /** "ms", "KiB", "cells", … */
  readonly unit: string;
  /** What the value is compared with, measured in the same run. */
  readonly reference?: { readonly label: string; readonly value: number };
  readonly target?: RowTarget;
  /** Lines printed under the table for this row (diagnosis, breakdown, samples). */
  readonly notes: string[];
  /** Raw samples behind a median, in the row's unit. */
  readonly samples?: readonly number[];
  /** 1-minute load average when the row was measured. */
  readonly load: number;
}

/** A row with its ratio and verdict worked out. */
export interface JudgedRow extends BenchRow {
  /** value ÷ reference.value, when both are positive numbers. */
  readonly ratio?: number;
  readonly verdict: "met" | "missed" | "—" | "not measured";
}

/** Ratio and verdict of a row. */
export function judgeRow(row: BenchRow): JudgedRow {
  const ref = row.reference?.value;
  const ratio = ref !== undefined && ref > 0 && Number.isFinite(ref) && Number.isFinite(row.value) ? row.value / ref : undefined;
  const verdict = !row.target ? "—" : !Number.isFinite(row.value) ? "not measured" : row.target.met({ value: row.value, ...(ratio === undefined ? {} : { ratio }) }) ? "met" : "missed";
  return { ...row, ...(ratio === undefined ? {} : { ratio }), verdict };
}

/** A number in the row's unit, 3 significant digits for times. */
export function formatValue(value: number, unit: string): string {
  if (!Number.isFinite(value)) return "n/a";
  if (unit === "cells" || unit === "count" || unit === "bytes") return `${Math.round(value)} ${unit}`;
  let text: string;
  if (Math.abs(value) >= 100) text = value.toFixed(0);
  else if (Math.abs(value) >= 10) text = value.toFixed(1);
  else if (Math.abs(value) >= 1) text = value.toFixed(2);
  else text = value.toPrecision(3);
  return `${text} ${unit}`;
}

function alignColumns(rows: readonly (readonly string[])[]): string[] {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows.map((r) => r.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join("   ").trimEnd());
}

/** The readable table, one block per section, notes under it, then the target summary. */
export function formatRows(rows: readonly JudgedRow[]): string {
  const out: string[] = [];
  for (const section of [...new Set(rows.map((r) => r.section))]) {
    const lines = rows.filter((r) => r.section === section);
    out.push("", section);
    const header = ["row", "value", "reference (same run)", "ratio", "target", "verdict", "load"];
    const table = lines.map((r) => [
      r.label,
      formatValue(r.value, r.unit),
      r.reference ? `${r.reference.label} ${formatValue(r.reference.value, r.unit)}` : "—",
      r.ratio === undefined ? "—" : r.ratio.toFixed(r.ratio < 0.1 ? 3 : 2),
      r.target?.text ?? "—",
      r.verdict,
      r.load.toFixed(2),
    ]);
    out.push(...alignColumns([header, ...table]).map((l) => `  ${l}`));
    for (const r of lines) for (const note of r.notes) out.push(`    ${r.label}: ${note}`);
  }
  const targeted = rows.filter((r) => r.target);
  out.push("", "Targets:");
  if (targeted.length === 0) out.push("  (no row with a target in this run)");
  for (const r of targeted) out.push(`  ${r.verdict.toUpperCase().padEnd(12)} ${r.label}: ${formatValue(r.value, r.unit)}${r.ratio === undefined ? "" : ` (ratio ${r.ratio.toFixed(2)})`}, target ${r.target!.text}`);
  return out.join("\n");
}

/** Writes the JSON report (to stdout for "-"). */
export function writeRowsJson(json: string, header: Record<string, unknown>, machine: MachineDescription, rows: readonly JudgedRow[]): void {
  const report = {
    ...header,
    machine,
    rows: rows.map(({ target, ...r }) => ({ ...r, target: target?.text ?? null })),
  };
  const text = `${JSON.stringify(report, null, 2)}\n`;
  if (json === "-") process.stdout.write(text);
  else writeFileSync(json, text);
}

/** Median of a non-empty list (mean of the middle two for even length). */
export function middle(values: readonly number[]): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((x, y) => x - y);
  const h = sorted.length;
  return h % 2 ? sorted[(h - 1) / 2] : 0.5 * (sorted[h / 2 - 1] + sorted[h / 2]);
}

/** Samples as "12.3 / 14.0 / 15.2 ms" for a note. */
export function sampleList(samples: readonly number[], unit = "ms"): string {
  return `${samples.map((s) => formatValue(s, "").trim()).join(" / ")} ${unit}`;
}
