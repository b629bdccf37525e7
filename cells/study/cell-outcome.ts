import type { CellKindName, Receipt } from "../document/study-types";

/**
 * How one cell of a run ended, in plain data for the CLI and reports.
 * - `done`: computed; `value` holds its value;
 * - `failed`: not computed; `error.message` says why, `error.cause` names the cause
 *   in words: "own error", `failed input "x"`, "cycle through a, b",
 *   `unknown name "q"`, `name "x" is defined twice (cells a, b)`;
 * - `held`: a code cell (or code figure) not run because code was held, or a cell
 *   waiting on one (`error` says which).
 */
export interface CellOutcome {
  readonly cellId: string;
  readonly kind: CellKindName;
  readonly name?: string;
  readonly status: "done" | "failed" | "held";
  /**
   * The cell's value (docs/cells.md): a parameter's value, a Measure, a
   * TransportCellValue, a SweepCellValue, a FigureSpec or Plot options, a code
   * value, a TableCellValue, a ProseCellValue ({html, missing}).
   */
  readonly value?: unknown;
  readonly error?: { readonly message: string; readonly cause: string };
  /** Wall-clock seconds of the computation that gave the value (0 when not computed). */
  readonly seconds: number;
  /** One short line for summaries, e.g. "S_ε = 0.0123 (debiased, ε = 0.041, converged, 212 it)". */
  readonly headline?: string;
  /** Things to keep in mind, plain text (not converged, regularised value, small sample …). */
  readonly cautions: readonly string[];
  /** For computing cells (data, transport, sweep) that are done: what a check compares. */
  readonly receipt?: Receipt;
}
