/** Where an import problem was found and why; the fields of a {@link DataImportError}. */
export interface DataImportProblem {
  /** The file (or the label given for in-memory text), as the user named it. */
  readonly file: string;
  /**
   * 1-based row. CSV/TSV: the line of the file where the record starts (the
   * header is line 1, as a text editor or spreadsheet shows it). JSON: the
   * record number (first record = 1). NPY: the array row (first row = 1).
   */
  readonly row?: number;
  /** Column header; for a .npy array the column index as text ("0", "1", …). */
  readonly column?: string;
  /** What is wrong, in words a user can act on (e.g. `not a number: "12,5"`). */
  readonly reason: string;
}

/**
 * A data file (or text) could not be turned into a table or a measure.
 * The message reads `file: row R, column "C": reason`, leaving out the parts
 * that do not apply, e.g. `depots.csv: row 7, column "x": not a number: "12,5"`.
 * This is the caller's-input tier of trouble (like core's TransportInputError):
 * a file that parses is never half-imported.
 */
export class DataImportError extends Error {
  readonly file: string;
  readonly row?: number;
  readonly column?: string;
  readonly reason: string;

  constructor(problem: DataImportProblem, options?: { cause?: unknown }) {
    super(formatProblem(problem), options);
    this.name = "DataImportError";
    this.file = problem.file;
    this.row = problem.row;
    this.column = problem.column;
    this.reason = problem.reason;
  }
}

function formatProblem({ file, row, column, reason }: DataImportProblem): string {
  const where: string[] = [];
  if (row !== undefined) where.push(`row ${row}`);
  if (column !== undefined) where.push(`column ${JSON.stringify(column)}`);
  return where.length > 0 ? `${file}: ${where.join(", ")}: ${reason}` : `${file}: ${reason}`;
}

/** Quotes a cell or value for a message, cutting long text so one bad cell cannot flood the terminal. */
export function quoteCell(text: string): string {
  const shown = text.length > 40 ? `${text.slice(0, 37)}...` : text;
  return JSON.stringify(shown);
}
