import { CORE_VERSION } from "../../core/version";
import type { Measure } from "../../core/measure";
import type { TransportResult } from "../../core/result";
import type { Receipt } from "../document";
import type { CellOutcome } from "./cell-outcome";
import { isFigureSpec } from "../views/figures/figure-spec";
import { formatNumber } from "../views/figures/format-number";
import { renderSvg } from "../views/render-svg";
import { escapeHtml } from "../views/report/escape-html";
import type { ColumnFormat, ReportCell, ReportModel, ReportParameter, ReportReceipt, ReportTable, TableValue } from "../views/report/report-model";

/**
 * What the report reads of one cell's outcome: the fields of the study run's
 * CellOutcome (cells/study/cell-outcome.ts) that a static report shows.
 */
export type ReportableOutcome = CellOutcome;

/** What the report reads of a study run (cells/study/run-study.ts StudyRun). */
export interface ReportableRun {
  readonly study: { readonly title: string; readonly about?: string; readonly seed?: number };
  readonly outcomes: readonly ReportableOutcome[];
  readonly seconds: number;
  readonly parameters: ReadonlyArray<{ readonly name: string; readonly value: unknown; readonly control: string }>;
}

/** Options of {@link studyReportModel}. */
export interface StudyReportOptions {
  /** When the run happened, shown as given (the model never reads the clock), e.g. an ISO 8601 time. */
  readonly generatedAt: string;
  /** Version of the core that computed the numbers. Default: the receipts' version, else CORE_VERSION. */
  readonly coreVersion?: string;
  /**
   * Parameter values given on the command line (`--set`), by name, with the value
   * the file holds: the parameter table says "set for this run (file: 0.05)".
   */
  readonly overridden?: ReadonlyMap<string, unknown>;
  /** Longest JSON preview of a code cell's value, in characters. Default 2000. */
  readonly previewLength?: number;
}

/**
 * Turns a headless study run into the plain model renderReport draws:
 * - parameters: the values used (command-line values marked), in study order;
 * - cells in study order; parameter cells that ran appear only in the parameter
 *   table; prose shows its rendered HTML; data and transport cells their headline
 *   (transport also a small table of its numbers); sweeps and tables a table;
 *   figures inline SVG drawn with renderSvg (ids prefixed by the cell id, so
 *   several figures share one page); code cells by what they return (a number or
 *   text as the headline, an array of records as a table, Plot options or an SVG
 *   node as a figure, anything else as a JSON preview);
 * - failed cells their message and cause, held cells why;
 * - one receipt per computing cell that recorded one.
 * Pure apart from drawing figures; the same run gives the same model.
 */
export function studyReportModel(run: ReportableRun, options: StudyReportOptions): ReportModel {
  const { generatedAt, overridden = new Map(), previewLength = 2000 } = options;
  const receiptVersion = run.outcomes.find((o) => o.receipt)?.receipt?.coreVersion;
  const parameters: ReportParameter[] = run.parameters.map((p) => {
    const value = parameterValue(p.value);
    const control = overridden.has(p.name) ? `${p.control} · set for this run (file: ${String(parameterValue(overridden.get(p.name)))})` : p.control;
    return { name: p.name, value, control };
  });
  const cells: ReportCell[] = [];
  for (const outcome of run.outcomes) {
    if (outcome.kind === "parameter" && outcome.status === "done") continue;
    cells.push(reportCell(outcome, previewLength));
  }
  const receipts: ReportReceipt[] = run.outcomes
    .filter((o): o is ReportableOutcome & { receipt: Receipt } => o.receipt !== undefined)
    .map((o) => ({ cellId: o.cellId, fingerprint: shortFingerprint(o.receipt.fingerprint), summary: receiptSummary(o.receipt.summary), seconds: o.receipt.seconds }));
  return {
    title: run.study.title.trim() === "" ? "Untitled study" : run.study.title,
    ...(run.study.about ? { about: run.study.about } : {}),
    generatedAt,
    coreVersion: options.coreVersion ?? receiptVersion ?? CORE_VERSION,
    seed: run.study.seed ?? 0,
    parameters,
    cells,
    receipts,
  };
}

function parameterValue(value: unknown): number | string | boolean {
  if (typeof value === "number" || typeof value === "string" || typeof value === "boolean") return value;
  return value === undefined ? "—" : JSON.stringify(value);
}

/** One cell of the report from its outcome. */
export function reportCell(outcome: ReportableOutcome, previewLength = 2000): ReportCell {
  const { cellId, kind, name, status, value } = outcome;
  let cautions = [...outcome.cautions];
  const cell: { -readonly [K in keyof ReportCell]: ReportCell[K] } = { id: cellId, kind, status, cautions };
  if (name !== undefined) cell.name = name;
  if (outcome.headline) cell.headline = outcome.headline;
  if (status === "done" || outcome.seconds > 0) cell.seconds = outcome.seconds;
  if (status === "failed") cell.error = failureText(outcome.error);
  else if (status === "held" && outcome.error) cell.error = outcome.error.message;
  if (status !== "done") return cell;

  switch (kind) {
    case "prose":
      if (isRecord(value) && typeof value.html === "string") cell.html = value.html;
      break;
    case "parameter":
      cell.headline ??= `${name ?? cellId} = ${String(parameterValue(value))}`;
      break;
    case "data":
      cell.headline ??= describeMeasure(value);
      break;
    case "transport": {
      const result = transportResultOf(value);
      if (result) cell.table = transportTable(result);
      break;
    }
    case "sweep": {
      // Several replicates: one row per value (mean and spread), not one per run.
      // One replicate: the replicate column would only hold zeros.
      const replicates = isRecord(value) && typeof value.replicates === "number" ? value.replicates : undefined;
      const table = replicates !== undefined && replicates > 1 ? sweepSummaryTable(value as Record<string, unknown>) : tableFrom(replicates === 1 && isRecord(value) && Array.isArray(value.columns) ? { ...value, columns: value.columns.filter((c) => c !== "replicate") } : value);
      if (table) cell.table = table;
      break;
    }
    case "table": {
      const table = tableFrom(value);
      if (table) cell.table = table;
      break;
    }
    case "figure":
    case "code": {
      const figure = figureFrom(value, cellId);
      if (figure) {
        cell.svg = figure.svg;
        // The figure draws its own title: a headline repeating it, or only naming the view, is dropped.
        if (cell.headline !== undefined && (cell.headline === figure.title || cell.headline === figure.view)) delete cell.headline;
        // A figure spec draws its own cautions under the picture: do not repeat them above it.
        cautions = cautions.filter((c) => !figure.cautions.includes(c));
        cell.cautions = cautions;
        break;
      }
      if (kind === "figure") {
        cell.cautions = [...cautions, "this figure's value is not a picture the static report can draw"];
        break;
      }
      describeCodeValue(value, cell, previewLength);
      break;
    }
  }
  return cell;
}

/**
 * A failure's message, with its cause when the cause adds something: not for the
 * cell's own error, nor when the message already names the failed input.
 */
function failureText(error: ReportableOutcome["error"]): string {
  if (!error) return "no message was recorded";
  const cause = error.cause.trim();
  const quoted = /"([^"]+)"/.exec(cause)?.[1];
  const adds = cause !== "" && cause !== "own error" && !error.message.includes(cause) && !(cause.startsWith("failed input") && quoted !== undefined && error.message.includes(quoted));
  return adds ? `${error.message}\n(cause: ${cause})` : error.message;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function isMeasure(value: unknown): value is Measure {
  return isRecord(value) && (value.kind === "points" || value.kind === "grid") && value.mass instanceof Float64Array;
}

/** "300 points in 2-D, total mass 1" or "a 20 × 30 grid histogram, total mass 1". */
export function describeMeasure(value: unknown): string | undefined {
  if (!isMeasure(value)) return undefined;
  let total = 0;
  for (const m of value.mass) total += m;
  const mass = `total mass ${formatNumber(total)}`;
  if (value.kind === "points") return `${value.n} point${value.n === 1 ? "" : "s"} in ${value.dim}-D, ${mass}`;
  return `a ${value.shape.join(" × ")} grid histogram, ${mass}`;
}

function isTransportResult(value: unknown): value is TransportResult {
  return isRecord(value) && typeof value.method === "string" && isRecord(value.values) && isRecord(value.diagnostics);
}

/** The TransportResult inside a transport cell's value: the value itself, or its `result`. */
export function transportResultOf(value: unknown): TransportResult | undefined {
  if (isTransportResult(value)) return value;
  if (isRecord(value) && isTransportResult(value.result)) return value.result;
  return undefined;
}

/** The numbers of one solve as a two-column table (quantity, value). */
export function transportTable(result: TransportResult): ReportTable {
  const { values: v, diagnostics: d } = result;
  const rows: Array<[string, TableValue]> = [["method", `${result.method} (${result.algorithm})`]];
  if (v.divergence !== undefined) rows.push(["divergence S_ε", v.divergence]);
  rows.push(["transport cost ⟨C, P⟩", v.cost]);
  if (result.method !== "exact") rows.push([result.method === "debiased" ? "cross term OT_ε" : "objective", v.objective]);
  if (v.penalties) rows.push(["penalty terms ρ·KL (source, target)", `${formatNumber(v.penalties.source)}, ${formatNumber(v.penalties.target)}`]);
  rows.push(["mass transported", v.mass]);
  if (result.epsilon) {
    const e = result.epsilon;
    rows.push(["epsilon", `${formatNumber(e.absolute)} = ${formatNumber(e.relative)} × ${e.reference} cost`]);
  }
  if (result.massPenalty) {
    const side = (rho: number) => (Number.isFinite(rho) ? formatNumber(rho) : "balanced");
    rows.push(["mass penalty ρ (source, target)", `${side(result.massPenalty.source)}, ${side(result.massPenalty.target)}`]);
  }
  rows.push(["status", d.status === "converged" ? "converged" : d.status === "cancelled" ? "cancelled" : "not converged"]);
  if (result.method !== "exact" || d.iterations > 0) rows.push(["iterations", d.iterations]);
  if (result.method !== "exact") rows.push(["marginal error", d.marginalError]);
  return { columns: ["quantity", "value"], rows, formats: ["text", { significant: 6 }] };
}

/** A table column as the table cell kind describes it. */
interface ColumnSpec {
  readonly field: string;
  readonly label?: string;
  readonly digits?: number;
  readonly notation?: string;
}

function columnSpecOf(column: unknown): ColumnSpec | undefined {
  if (typeof column === "string") return { field: column };
  if (isRecord(column) && typeof column.field === "string") {
    return {
      field: column.field,
      ...(typeof column.label === "string" ? { label: column.label } : {}),
      ...(typeof column.digits === "number" ? { digits: column.digits } : {}),
      ...(typeof column.notation === "string" ? { notation: column.notation } : {}),
    };
  }
  return undefined;
}

/**
 * The report's format for a table column written as in the study format
 * (docs/format.md, table): fixed and significant keep their digits; auto with
 * digits is significant; scientific is drawn here when its digits are not the
 * report's own (2 after the point), see {@link cellText}.
 */
function columnFormat(spec: ColumnSpec): ColumnFormat | undefined {
  const { notation = "auto", digits } = spec;
  if (digits === undefined) return notation === "scientific" ? "scientific" : undefined;
  if (notation === "fixed") return { fixed: digits };
  if (notation === "significant" || notation === "auto") return { significant: Math.max(1, digits) };
  return digits === 2 ? "scientific" : undefined;
}

/** Scientific notation with `digits` after the point, in the report's typography (− for minus). */
function scientificText(value: number, digits: number): string {
  if (!Number.isFinite(value)) return formatNumber(value);
  const [m, e] = value.toExponential(Math.min(20, Math.max(0, digits))).split("e");
  return `${m.replace("-", "\u2212")}e${e.replace("+", "").replace("-", "\u2212")}`;
}

function tableValue(value: unknown): TableValue {
  if (value === null || value === undefined) return null;
  if (typeof value === "number" || typeof value === "string" || typeof value === "boolean") return value;
  return JSON.stringify(value, typedArrayReplacer) ?? null;
}

/**
 * A report table from a sweep's or table cell's value `{columns, rows}` (columns as
 * field names or column specs; rows as records or arrays), or from an array of
 * records (columns: every field of the rows, in order of first appearance). A table
 * cell's value also holds `text`, each cell written in its column's notation: that
 * text is shown as it is.
 */
export function tableFrom(value: unknown): ReportTable | undefined {
  let columnsIn: unknown[];
  let rowsIn: unknown[];
  if (Array.isArray(value)) {
    if (!value.every(isRecord)) return undefined;
    rowsIn = value;
    const fields = new Set<string>();
    for (const row of value) for (const key of Object.keys(row)) fields.add(key);
    columnsIn = [...fields];
  } else if (isRecord(value) && Array.isArray(value.rows)) {
    rowsIn = value.rows;
    if (Array.isArray(value.columns)) columnsIn = value.columns;
    else {
      const fields = new Set<string>();
      for (const row of rowsIn) if (isRecord(row)) for (const key of Object.keys(row)) fields.add(key);
      columnsIn = [...fields];
    }
  } else return undefined;
  const specs = columnsIn.map(columnSpecOf).filter((s): s is ColumnSpec => s !== undefined);
  if (specs.length === 0) return undefined;
  // A table cell's value carries every cell already written in the notation the study
  // asks for (`text`, row by row): show exactly that.
  if (isRecord(value) && Array.isArray(value.text) && value.text.length === rowsIn.length && specs.length === columnsIn.length) {
    const text = value.text as unknown[];
    if (text.every((row) => Array.isArray(row) && row.length === specs.length && row.every((t) => typeof t === "string"))) {
      return { columns: specs.map((s) => s.label ?? s.field), rows: text as string[][], formats: specs.map(() => "text" as const) };
    }
  }
  const formats = specs.map(columnFormat);
  const rows = rowsIn.map((row) =>
    specs.map((spec, c) => {
      const raw = Array.isArray(row) ? row[c] : isRecord(row) ? row[spec.field] : undefined;
      // A scientific column with digits other than the report's own is written here.
      if (typeof raw === "number" && spec.notation === "scientific" && spec.digits !== undefined && spec.digits !== 2) return scientificText(raw, spec.digits);
      return tableValue(raw);
    }),
  );
  return { columns: specs.map((s) => s.label ?? s.field), rows, formats };
}

/**
 * A sweep run with several replicates, one row per swept value: for each recorded
 * number its mean and sample standard deviation (n − 1) over the replicates; for
 * text outputs (status) how many runs gave each text. Rows keep the sweep's order.
 */
export function sweepSummaryTable(value: Readonly<Record<string, unknown>>): ReportTable | undefined {
  if (!Array.isArray(value.rows) || !Array.isArray(value.columns)) return undefined;
  const vary = typeof value.vary === "string" ? value.vary : "value";
  const outputs = (value.columns as unknown[]).filter((c): c is string => typeof c === "string" && c !== vary && c !== "replicate");
  const groups = new Map<unknown, Record<string, unknown>[]>();
  for (const row of value.rows as unknown[]) {
    if (!isRecord(row)) continue;
    const key = row.value ?? row[vary];
    if (!groups.has(key)) groups.set(key, []);
    groups.get(key)!.push(row);
  }
  const numeric = outputs.filter((o) => (value.rows as unknown[]).some((r) => isRecord(r) && typeof r[o] === "number"));
  const columns = [vary, "runs"];
  const formats: Array<ColumnFormat | undefined> = [undefined, "integer"];
  for (const o of outputs) {
    if (numeric.includes(o)) {
      columns.push(`${o} (mean)`, `${o} (sd)`);
      formats.push(undefined, { significant: 2 });
    } else {
      columns.push(o);
      formats.push("text");
    }
  }
  const rows: TableValue[][] = [];
  for (const [key, runs] of groups) {
    const row: TableValue[] = [tableValue(key), runs.length];
    for (const o of outputs) {
      if (numeric.includes(o)) {
        const xs = runs.map((r) => r[o]).filter((x): x is number => typeof x === "number" && Number.isFinite(x));
        const mean = xs.length > 0 ? xs.reduce((a, b) => a + b, 0) / xs.length : null;
        const sd = mean !== null && xs.length > 1 ? Math.sqrt(xs.reduce((a, x) => a + (x - mean) ** 2, 0) / (xs.length - 1)) : null;
        row.push(mean, sd);
      } else {
        const counts = new Map<string, number>();
        for (const r of runs) counts.set(String(r[o] ?? "—"), (counts.get(String(r[o] ?? "—")) ?? 0) + 1);
        row.push([...counts].map(([text, n]) => (counts.size === 1 ? text : `${n} ${text}`)).join(", "));
      }
    }
    rows.push(row);
  }
  const replicates = typeof value.replicates === "number" ? value.replicates : undefined;
  return { columns, rows, formats, caption: `Mean and sample standard deviation over ${replicates ?? "the"} replicates per value.` };
}

/** The SVG of a figure-like value, with the cautions and title it draws itself, or undefined. */
export function figureFrom(value: unknown, cellId: string): { svg: string; cautions: readonly string[]; title?: string; view?: string } | undefined {
  const idPrefix = `f-${cellId.replace(/[^A-Za-z0-9_-]/g, "_")}`;
  if (isFigureSpec(value)) return { svg: renderSvg(value, { idPrefix }), cautions: value.cautions, view: value.figure, ...(value.title === undefined ? {} : { title: value.title }) };
  if (isRecord(value) && Array.isArray(value.marks)) {
    try {
      return { svg: renderSvg(value as never, { idPrefix }), cautions: [] };
    } catch {
      return undefined;
    }
  }
  const node = value as { outerHTML?: unknown; localName?: unknown } | null;
  if (typeof node === "object" && node !== null && typeof node.outerHTML === "string" && (node.localName === "svg" || node.localName === "figure")) {
    let svg = node.outerHTML;
    if (!/xmlns=/.test(svg)) svg = svg.replace(/<svg\b/g, '<svg xmlns="http://www.w3.org/2000/svg"');
    return { svg, cautions: [] };
  }
  return undefined;
}

function typedArrayReplacer(_key: string, value: unknown): unknown {
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    const items = Array.from(value as unknown as ArrayLike<number>);
    return items.length > 50 ? [...items.slice(0, 50), `… ${items.length - 50} more`] : items;
  }
  if (typeof value === "number" && !Number.isFinite(value)) return String(value);
  if (typeof value === "bigint") return value.toString();
  if (typeof value === "function") return `function ${(value as { name?: string }).name || "(anonymous)"}`;
  return value;
}

/** Fills a code cell's report from its value (a figure was handled before). */
function describeCodeValue(value: unknown, cell: { headline?: string; table?: ReportTable; html?: string }, previewLength: number): void {
  if (typeof value === "number") {
    cell.headline ??= formatNumber(value, 6);
    return;
  }
  if (typeof value === "string" || typeof value === "boolean") {
    cell.headline ??= typeof value === "string" ? value : value ? "true" : "false";
    return;
  }
  if (value === undefined || value === null) {
    cell.headline ??= String(value);
    return;
  }
  if (typeof value === "function") {
    cell.headline ??= "a function";
    return;
  }
  const table = Array.isArray(value) && value.length > 0 ? tableFrom(value) : undefined;
  if (table) {
    cell.table = table;
    return;
  }
  let text: string;
  try {
    text = JSON.stringify(value, typedArrayReplacer, 2) ?? String(value);
  } catch {
    text = String(value);
  }
  if (text.length > previewLength) text = `${text.slice(0, previewLength)}\n… (${text.length - previewLength} more characters)`;
  cell.html = `<pre class="cf-preview">${escapeHtml(text)}</pre>`;
}

/** A receipt's summary in words: `cost 1.2841, mass 0.9713, iterations 412, status converged`. */
export function receiptSummary(summary: Readonly<Record<string, unknown>>): string {
  const parts = Object.entries(summary).map(([key, value]) => `${key} ${summaryValue(value)}`);
  return parts.length === 0 ? "no summary recorded" : parts.join(", ");
}

/**
 * One summary value, short: numbers to 6 significant digits, short lists of numbers
 * as `(1.04624, 0.112146)`, lists of records (a sweep's rows) by their count,
 * anything else as JSON cut at 60 characters.
 */
function summaryValue(value: unknown): string {
  if (typeof value === "number") return formatNumber(value, 6);
  if (typeof value === "string" || typeof value === "boolean") return String(value);
  if (value === null || value === undefined) return "—";
  if (Array.isArray(value)) {
    if (value.length <= 6 && value.every((v) => typeof v === "number")) return `(${value.map((v) => formatNumber(v, 6)).join(", ")})`;
    if (value.every(isRecord)) return `${value.length} records`;
  }
  const text = JSON.stringify(value, typedArrayReplacer) ?? "";
  return text.length > 60 ? `${text.slice(0, 57)}…` : text;
}

/** A fingerprint as the appendix shows it: the method and the first 16 hex digits are plenty to tell runs apart. */
export function shortFingerprint(fingerprint: string): string {
  const match = /^([a-z0-9-]+:)?([0-9a-f]{20,})$/i.exec(fingerprint);
  return match ? `${match[1] ?? ""}${match[2].slice(0, 16)}…` : fingerprint;
}
