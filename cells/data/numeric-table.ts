import { DataImportError } from "./import-error";

/**
 * A parsed table of numbers: `rows[i][k]` is the value of column `columns[k]`
 * in data row i (header excluded). Every row has `columns.length` finite numbers.
 * `rowNumbers[i]`, when present, is where row i came from in the file (the
 * `row` of {@link DataImportError}), so later checks can point at the right line.
 */
export interface NumericTable {
  readonly columns: string[];
  readonly rows: number[][];
  readonly rowNumbers?: number[];
}

/** Which columns a parser keeps (and therefore checks for numbers). */
export interface ColumnSelection {
  /**
   * Keep only these columns, in this order; each must exist. Cells of other
   * columns are not read, so a label column does not stop the import.
   * Default: every column, in file order.
   */
  columns?: readonly string[];
  /** Also keep these columns, after `columns`, when the file has them (e.g. "mass"). */
  optionalColumns?: readonly string[];
}

/**
 * Positions in `header` of the selected columns (see {@link ColumnSelection}).
 * Throws a {@link DataImportError} naming a requested column the header lacks.
 */
export function selectColumns(header: readonly string[], selection: ColumnSelection, file: string): { names: string[]; indices: number[] } {
  const { columns, optionalColumns = [] } = selection;
  if (columns === undefined && optionalColumns.length === 0) return { names: [...header], indices: header.map((_, k) => k) };
  const names: string[] = [];
  const indices: number[] = [];
  const wanted = columns ?? header;
  for (const name of wanted) {
    const k = header.indexOf(name);
    if (k < 0) throw new DataImportError({ file, column: name, reason: `no such column; the columns are ${listNames(header)}` });
    if (names.includes(name)) throw new DataImportError({ file, column: name, reason: "column requested twice" });
    names.push(name);
    indices.push(k);
  }
  for (const name of optionalColumns) {
    const k = header.indexOf(name);
    if (k >= 0 && !names.includes(name)) {
      names.push(name);
      indices.push(k);
    }
  }
  return { names, indices };
}

/** `"x", "y", "mass"` for messages. */
export function listNames(names: readonly string[]): string {
  return names.length === 0 ? "(none)" : names.map((n) => JSON.stringify(n)).join(", ");
}
