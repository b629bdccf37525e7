import Papa from "papaparse";
import { DataImportError, quoteCell } from "./import-error";
import { type ColumnSelection, type NumericTable, listNames, selectColumns } from "./numeric-table";

/** Options of {@link parseDelimited}. */
export interface ParseDelimitedOptions extends ColumnSelection {
  /**
   * Cell separator. "auto" (default) picks a tab when the header line holds
   * one and a comma otherwise — predictable, and right for one-column files,
   * which have no separator to detect.
   */
  delimiter?: "," | "\t" | "auto";
  /** File name for messages. Default "delimited text". */
  name?: string;
}

/**
 * A decimal number as written by people and by printf-style writers: sign,
 * digits with an optional point, optional exponent. Nothing else — no
 * thousands separators, decimal commas, hex, "NaN" or "inf" — because
 * guessing at such cells silently changes the data (common practice, no source).
 */
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Parses CSV or TSV text with a header row into numbers (quoting rules of
 * RFC 4180, read by `papaparse`). A leading byte-order mark is dropped; CRLF,
 * LF and CR line ends all work; blank lines are skipped; spaces around a
 * number are ignored.
 *
 * Throws a {@link DataImportError} naming file, row (line of the file,
 * header = line 1), column and cell on: no header, a header made only of
 * numbers (it is data, so the header is missing), empty or repeated column
 * names, a row with more or fewer cells than the header, unbalanced quotes, and
 * a kept cell that is not a finite decimal number.
 */
export function parseDelimited(text: string, options: ParseDelimitedOptions = {}): NumericTable {
  const { delimiter = "auto", name: file = "delimited text" } = options;
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const records = splitRecords(text, delimiter === "auto" ? guessDelimiter(text) : delimiter, file);
  const first = records.findIndex((r) => !isBlank(r.cells));
  if (first < 0) throw new DataImportError({ file, reason: "no header row: the text is empty; the first line must name the columns" });
  const headerRecord = records[first];
  const header = headerRecord.cells.map((c) => c.trim());
  checkHeader(header, headerRecord.line, file);
  const { names, indices } = selectColumns(header, options, file);
  const rows: number[][] = [];
  const rowNumbers: number[] = [];
  for (let r = first + 1; r < records.length; r++) {
    const { cells, line } = records[r];
    if (isBlank(cells)) continue;
    if (cells.length !== header.length) {
      const reason = `the row has ${cells.length} cells, the header ${header.length} (${listNames(header)})`;
      const column = cells.length < header.length ? header[cells.length] : undefined;
      throw new DataImportError({ file, row: line, column, reason: column === undefined ? reason : `missing cell: ${reason}` });
    }
    const values = indices.map((k, j) => parseCell(cells[k], file, line, names[j]));
    rows.push(values);
    rowNumbers.push(line);
  }
  return { columns: names, rows, rowNumbers };
}

interface RawRecord {
  readonly cells: string[];
  /** 1-based line where the record starts (a quoted cell may span lines). */
  readonly line: number;
}

function guessDelimiter(text: string): "," | "\t" {
  // The first non-blank line is the header.
  let start = 0;
  while (start < text.length) {
    let end = start;
    while (end < text.length && text[end] !== "\n" && text[end] !== "\r") end++;
    const line = text.slice(start, end);
    if (line.trim() !== "") return line.includes("\t") ? "\t" : ",";
    start = end + 1;
  }
  return ",";
}

function splitRecords(text: string, delimiter: "," | "\t", file: string): RawRecord[] {
  // Line numbers are counted from papaparse's cursor (end of each record), so
  // a quoted cell spanning lines does not shift the numbers of later rows.
  const lineBreak = text.includes("\n") ? 10 : 13;
  const records: RawRecord[] = [];
  let line = 1;
  let scanned = 0;
  let start = 0;
  let quoteProblem: DataImportError | undefined;
  Papa.parse<string[]>(text, {
    delimiter,
    quoteChar: '"',
    header: false,
    dynamicTyping: false,
    skipEmptyLines: false,
    step(result) {
      while (scanned < start) {
        if (text.charCodeAt(scanned) === lineBreak) line++;
        scanned++;
      }
      const error = result.errors[0];
      if (error !== undefined && quoteProblem === undefined) {
        quoteProblem = new DataImportError({ file, row: line, reason: `malformed quotes: ${error.message.toLowerCase()}` });
      }
      records.push({ cells: result.data, line });
      start = result.meta.cursor;
    },
  });
  if (quoteProblem !== undefined) throw quoteProblem;
  return records;
}

function isBlank(cells: readonly string[]): boolean {
  return cells.length === 1 && cells[0].trim() === "";
}

function checkHeader(header: readonly string[], line: number, file: string): void {
  const seen = new Map<string, number>();
  header.forEach((name, k) => {
    if (name === "") throw new DataImportError({ file, row: line, reason: `header cell ${k + 1} is empty: every column needs a name` });
    const before = seen.get(name);
    if (before !== undefined) throw new DataImportError({ file, row: line, column: name, reason: `column name used twice (header cells ${before + 1} and ${k + 1})` });
    seen.set(name, k);
  });
  if (header.every((name) => DECIMAL.test(name))) {
    throw new DataImportError({
      file,
      row: line,
      reason: `header row missing: the first row holds only numbers (${header.slice(0, 4).join(", ")}${header.length > 4 ? ", ..." : ""}); add a first line naming the columns, e.g. ${header.map((_, k) => `x${k + 1}`).join(",")}`,
    });
  }
}

function parseCell(cell: string, file: string, row: number, column: string): number {
  const text = cell.trim();
  if (text === "") throw new DataImportError({ file, row, column, reason: "empty cell: a number is needed" });
  if (!DECIMAL.test(text)) throw new DataImportError({ file, row, column, reason: `not a number: ${quoteCell(cell)}` });
  const value = Number(text);
  if (!Number.isFinite(value)) throw new DataImportError({ file, row, column, reason: `number out of range: ${quoteCell(cell)}` });
  return value;
}
