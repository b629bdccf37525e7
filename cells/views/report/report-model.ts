/**
 * The plain data a static report is drawn from. Everything is already computed and
 * formatted by the caller (the CLI's headless run); {@link renderReport} only lays it
 * out, escapes it and sanitises the HTML and SVG it is handed.
 */
export interface ReportModel {
  /** Study title (plain text). */
  readonly title: string;
  /** What the study is about: plain text; blank lines separate paragraphs. */
  readonly about?: string;
  /** When the run happened, as the caller wants it shown (e.g. ISO 8601); the renderer never reads the clock. */
  readonly generatedAt: string;
  /** Version of the transport core that computed the numbers. */
  readonly coreVersion: string;
  /** The study's seed. */
  readonly seed: number | string;
  /** Parameter values of this run, in study order. */
  readonly parameters: readonly ReportParameter[];
  /** Cells in study order. */
  readonly cells: readonly ReportCell[];
  /** One receipt per computing cell, shown in the appendix. */
  readonly receipts: readonly ReportReceipt[];
}

/** One parameter as run. */
export interface ReportParameter {
  readonly name: string;
  /** Numbers are shown exactly (shortest round-trip form), so the run can be repeated. */
  readonly value: number | string | boolean;
  /** The control and its range in words, e.g. "log range 0.001 – 1". */
  readonly control: string;
}

/**
 * How a cell ended: computed ("done"), failed with an error, or "held" (not
 * computed, e.g. waiting on a failed input; `error` may say why).
 */
export type ReportCellStatus = "done" | "failed" | "held";

/** One cell's output. */
export interface ReportCell {
  readonly id: string;
  /** Cell kind, e.g. "prose", "transport", "figure"; prose cells are shown without a heading. */
  readonly kind: string;
  readonly name?: string;
  readonly status: ReportCellStatus;
  /** The one line a reader should take away, e.g. "S_ε = 0.0412 (ε = 0.05 × median cost)". Plain text. */
  readonly headline?: string;
  /** Rendered prose (e.g. from renderMarkdown). Sanitised again when written. */
  readonly html?: string;
  /** Rendered figure (e.g. from renderSvg). Sanitised when written. */
  readonly svg?: string;
  readonly table?: ReportTable;
  /** Failure message (failed) or the reason a cell is held. Plain text. */
  readonly error?: string;
  /** Cautions shown in the caution style, e.g. "not converged after 5000 iterations". Plain text. */
  readonly cautions: readonly string[];
  /** Compute time in seconds. */
  readonly seconds?: number;
}

/** A value in a report table cell; null shows as an em dash. */
export type TableValue = number | string | boolean | null;

/**
 * How a table column is written:
 * - "text": as given;
 * - "integer": rounded, thousands separated;
 * - "percent": a share in [0, 1] as "12.3 %";
 * - "scientific": 3 significant digits, always with exponent;
 * - `{significant: k}`: k significant digits (the default for numbers is 4);
 * - `{fixed: k}`: k decimals.
 */
export type ColumnFormat = "text" | "integer" | "percent" | "scientific" | { readonly significant: number } | { readonly fixed: number };

/** A small result table. `rows[r][c]` belongs to `columns[c]`. */
export interface ReportTable {
  readonly columns: readonly string[];
  readonly rows: ReadonlyArray<ReadonlyArray<TableValue>>;
  /** Format per column (same length as columns, or shorter: missing entries use the default). */
  readonly formats?: ReadonlyArray<ColumnFormat | undefined>;
  /** Caption under the table. Plain text. */
  readonly caption?: string;
}

/** What a run recorded for one computing cell. */
export interface ReportReceipt {
  readonly cellId: string;
  /** Hash of the cell's inputs and settings. */
  readonly fingerprint: string;
  /** Result summary in words, e.g. "value 0.0412, 310 iterations, converged". */
  readonly summary: string;
  readonly seconds: number;
}
