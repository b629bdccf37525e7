import { DataImportError, quoteCell } from "./import-error";
import { findJsonSyntaxError } from "./json-syntax-error";
import { type ColumnSelection, type NumericTable, listNames, selectColumns } from "./numeric-table";

/** Options of {@link parseJsonTable}. */
export interface ParseJsonTableOptions extends ColumnSelection {
  /** File name for messages. Default "JSON text". */
  name?: string;
}

/**
 * Parses a JSON table in one of two shapes:
 * - records: `[{"x": 1, "y": 2, "mass": 0.5}, …]` — the columns are the keys of
 *   the first record, in its order, and every record has exactly those keys
 *   (only the kept ones when `columns` is given);
 * - columns and rows: `{"columns": ["x", "y"], "rows": [[1, 2], …]}` — no other keys.
 *
 * Kept values must be JSON numbers (not strings, not null) and finite.
 * Errors are {@link DataImportError}s whose `row` is the 1-based record number;
 * the reason also shows the JSON path, e.g. `(at rows[2][1])`.
 * A leading byte-order mark is dropped.
 */
export function parseJsonTable(text: string, options: ParseJsonTableOptions = {}): NumericTable {
  const { name: file = "JSON text" } = options;
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (error) {
    throw new DataImportError({ file, reason: `malformed JSON: ${describeSyntaxError(text, error)}` }, { cause: error });
  }
  if (Array.isArray(value)) return fromRecords(value, options, file);
  if (isPlainObject(value)) return fromColumnsAndRows(value, options, file);
  throw new DataImportError({ file, reason: `expected an array of records or an object {"columns": [...], "rows": [[...]]}, got ${kindOf(value)}` });
}

function fromRecords(records: unknown[], selection: ColumnSelection, file: string): NumericTable {
  if (records.length === 0) return { columns: [], rows: [], rowNumbers: [] };
  const first = records[0];
  if (Array.isArray(first)) {
    throw new DataImportError({ file, row: 1, reason: 'an array of arrays has no column names; write {"columns": ["x", "y"], "rows": [[...], ...]} or an array of objects' });
  }
  if (!isPlainObject(first)) throw new DataImportError({ file, row: 1, reason: `a record must be an object like {"x": 1, "y": 2}, got ${kindOf(first)} (at [0])` });
  const header = Object.keys(first);
  if (header.length === 0) throw new DataImportError({ file, row: 1, reason: "the first record has no keys, so the table has no columns (at [0])" });
  const { names } = selectColumns(header, selection, file);
  const strictKeys = selection.columns === undefined && (selection.optionalColumns ?? []).length === 0;
  const rows: number[][] = [];
  const rowNumbers: number[] = [];
  records.forEach((record, i) => {
    const row = i + 1;
    if (!isPlainObject(record)) throw new DataImportError({ file, row, reason: `a record must be an object, got ${kindOf(record)} (at [${i}])` });
    for (const column of names) {
      if (!Object.hasOwn(record, column)) {
        throw new DataImportError({ file, row, column, reason: `missing: the record has no key ${JSON.stringify(column)} (at [${i}])` });
      }
    }
    if (strictKeys) {
      for (const key of Object.keys(record)) {
        if (!names.includes(key)) {
          throw new DataImportError({ file, row, column: key, reason: `not a column of the first record (columns are ${listNames(names)}) (at [${i}])` });
        }
      }
    }
    rows.push(names.map((column) => numberAt(record[column], file, row, column, `[${i}].${column}`)));
    rowNumbers.push(row);
  });
  return { columns: names, rows, rowNumbers };
}

function fromColumnsAndRows(object: Record<string, unknown>, selection: ColumnSelection, file: string): NumericTable {
  for (const key of Object.keys(object)) {
    if (key !== "columns" && key !== "rows") throw new DataImportError({ file, reason: `unexpected key ${JSON.stringify(key)}: a table object has only "columns" and "rows"` });
  }
  const { columns, rows } = object;
  if (!Array.isArray(columns)) throw new DataImportError({ file, reason: `"columns" must be an array of column names, got ${kindOf(columns)}` });
  if (!Array.isArray(rows)) throw new DataImportError({ file, reason: `"rows" must be an array of rows (arrays of numbers), got ${kindOf(rows)}` });
  const header: string[] = [];
  columns.forEach((name, k) => {
    if (typeof name !== "string" || name === "") throw new DataImportError({ file, reason: `columns[${k}] must be a non-empty string, got ${kindOf(name)}` });
    if (header.includes(name)) throw new DataImportError({ file, column: name, reason: `column name used twice (columns[${header.indexOf(name)}] and columns[${k}])` });
    header.push(name);
  });
  const { names, indices } = selectColumns(header, selection, file);
  const out: number[][] = [];
  const rowNumbers: number[] = [];
  rows.forEach((cells, i) => {
    const row = i + 1;
    if (!Array.isArray(cells)) throw new DataImportError({ file, row, reason: `a row must be an array of ${header.length} numbers, got ${kindOf(cells)} (at rows[${i}])` });
    if (cells.length !== header.length) {
      throw new DataImportError({ file, row, reason: `the row has ${cells.length} values, "columns" names ${header.length} (${listNames(header)}) (at rows[${i}])` });
    }
    out.push(indices.map((k, j) => numberAt(cells[k], file, row, names[j], `rows[${i}][${k}]`)));
    rowNumbers.push(row);
  });
  return { columns: names, rows: out, rowNumbers };
}

function numberAt(value: unknown, file: string, row: number, column: string, path: string): number {
  if (typeof value === "number") {
    // JSON.parse turns 1e999 into Infinity.
    if (!Number.isFinite(value)) throw new DataImportError({ file, row, column, reason: `number out of range (at ${path})` });
    return value;
  }
  if (value === null) throw new DataImportError({ file, row, column, reason: `missing value (null) (at ${path})` });
  if (typeof value === "string") throw new DataImportError({ file, row, column, reason: `not a number: ${quoteCell(value)} is a JSON string; write numbers without quotes (at ${path})` });
  throw new DataImportError({ file, row, column, reason: `not a number: got ${kindOf(value)} (at ${path})` });
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

function kindOf(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "an array";
  if (typeof value === "object") return "an object";
  if (typeof value === "string") return `the string ${quoteCell(value)}`;
  return `${typeof value} ${String(value)}`;
}

/** Line, column and what was expected, found by our own scan: engines differ in what their message says. */
function describeSyntaxError(text: string, error: unknown): string {
  const problem = findJsonSyntaxError(text);
  if (problem === undefined) return error instanceof Error ? error.message : String(error);
  const found = problem.offset < text.length ? `found ${JSON.stringify(text[problem.offset])}` : "found the end of the text";
  return `line ${problem.line}, column ${problem.column}: expected ${problem.expected}, ${found}`;
}
