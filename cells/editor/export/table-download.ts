/** Raw rows of a result table, for download: field names and one record per row. */
export interface TableRecords {
  readonly fields: readonly string[];
  readonly records: readonly Readonly<Record<string, unknown>>[];
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value) && !ArrayBuffer.isView(value);
}

function fieldOf(column: unknown): string | undefined {
  if (typeof column === "string") return column;
  if (isRecord(column) && typeof column.field === "string") return column.field;
  return undefined;
}

/**
 * The rows of a table-like cell value, unformatted: an array of records (fields in
 * order of first appearance), or `{columns, rows}` as sweep and table cells give
 * (columns as field names or `{field}` specs; rows as records or arrays in column
 * order). Undefined for anything else.
 */
export function tableRecords(value: unknown): TableRecords | undefined {
  let rows: readonly unknown[];
  let fields: string[] | undefined;
  if (Array.isArray(value)) rows = value;
  else if (isRecord(value) && Array.isArray(value.rows)) {
    rows = value.rows;
    if (Array.isArray(value.columns)) fields = value.columns.map(fieldOf).filter((f): f is string => f !== undefined);
  } else return undefined;
  if (!fields || fields.length === 0) {
    const seen = new Set<string>();
    for (const row of rows) if (isRecord(row)) for (const key of Object.keys(row)) seen.add(key);
    fields = [...seen];
  }
  if (fields.length === 0) return undefined;
  const names = fields;
  const records = rows.map((row) => {
    if (Array.isArray(row)) return Object.fromEntries(names.map((f, k) => [f, row[k] ?? null]));
    if (isRecord(row)) return Object.fromEntries(names.map((f) => [f, row[f] ?? null]));
    return Object.fromEntries(names.map((f) => [f, null]));
  });
  return { fields: names, records };
}

function csvField(value: unknown): string {
  let text: string;
  if (value === null || value === undefined) text = "";
  else if (typeof value === "number") text = Number.isFinite(value) ? String(value) : value > 0 ? "Infinity" : value < 0 ? "-Infinity" : "NaN";
  else if (typeof value === "string") text = value;
  else if (typeof value === "boolean") text = value ? "true" : "false";
  else text = JSON.stringify(value, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as unknown as ArrayLike<number>) : v)) ?? "";
  // RFC 4180: quote fields holding a comma, a quote or a line break; double the quotes.
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * The table as CSV (RFC 4180, Shafranovich 2005): a header of field names, one line
 * per record, CRLF line ends, numbers in their shortest exact form (so nothing is
 * lost to display rounding), empty fields for null.
 */
export function tableCsv(table: TableRecords): string {
  const lines = [table.fields.map(csvField).join(",")];
  for (const record of table.records) lines.push(table.fields.map((f) => csvField(record[f])).join(","));
  return `${lines.join("\r\n")}\r\n`;
}

/**
 * The table as JSON: an array of records, 2-space indented. Numbers JSON cannot
 * hold (NaN, ±Infinity) are written as the strings "NaN", "Infinity", "-Infinity".
 */
export function tableJson(table: TableRecords): string {
  const replacer = (_key: string, v: unknown) => {
    if (typeof v === "number" && !Number.isFinite(v)) return String(v);
    if (ArrayBuffer.isView(v)) return Array.from(v as unknown as ArrayLike<number>);
    return v;
  };
  return `${JSON.stringify(table.records, replacer, 2)}\n`;
}

/** A file name from a cell name and an extension: letters, digits, `-` and `_` kept. */
export function downloadName(base: string, extension: string): string {
  const clean = base.replace(/[^\p{L}\p{N}_-]+/gu, "-").replace(/^-+|-+$/g, "") || "table";
  return `${clean}.${extension}`;
}
