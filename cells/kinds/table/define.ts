import type { NumberNotation } from "../../document/number-format";
import type { CellOf } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import { CellSettingError } from "../cell-error";
import type { DefineContext } from "../define-context";
import { formatNotation } from "../format-notation";
import { type CellDescription, versionKey } from "../kind-runtime";
import { shortDescription } from "../resolve-number";
import { valueText } from "../value-text";
import { type TableColumn, type TableSettings, type TableValue, tableDependencies } from "./settings";

/** One column of a table cell's value: the field shown, its heading and number format. */
export interface TableColumnValue {
  readonly field: string;
  readonly label: string;
  readonly notation: NumberNotation;
  readonly digits?: number;
}

/**
 * The value of a table cell: the columns (defaults filled in), the rows reduced
 * to those columns (values that are not text, numbers, true/false or null become
 * their one-line text; a missing field is null), and `text`, every cell written
 * out by its column's notation (docs/format.md, "table"; null as "—").
 */
export interface TableCellValue {
  readonly columns: readonly TableColumnValue[];
  readonly rows: readonly { readonly [field: string]: TableValue }[];
  readonly text: readonly (readonly string[])[];
}

/**
 * A table cell's definition: depends on the cell named by `of` (if any). Rows come
 * from that cell — a sweep's rows, an array of objects, or any object with a
 * `rows` array (and then its `columns` as the default columns) — or are written
 * inline. Default columns: the source's columns, else every field of the first row.
 */
export function defineTableCell(cell: CellOf<"table">, _context: DefineContext): CellDefinition {
  const { settings } = cell;
  return {
    id: cell.id,
    name: cell.name ?? null,
    inputs: tableDependencies(settings),
    version: versionKey(cell),
    compute: (inputs): TableCellValue => buildTable(settings, settings.of === undefined ? undefined : inputs[settings.of]),
  };
}

function buildTable(settings: TableSettings, source: unknown): TableCellValue {
  let rows: readonly Record<string, unknown>[];
  let fields: readonly string[] | undefined;
  if (settings.of === undefined) rows = settings.rows ?? [];
  else {
    const given = rowsOf(source);
    if (!given) throw new CellSettingError("of", `"${settings.of}" gives ${shortDescription(source)}, not rows (an array of objects, or a sweep)`);
    ({ rows, fields } = given);
  }
  const written: readonly TableColumn[] = settings.columns ?? (fields ?? Object.keys(rows[0] ?? {})).map((field) => ({ field }));
  const columns: TableColumnValue[] = written.map((c) => ({
    field: c.field,
    label: c.label ?? c.field,
    notation: c.notation ?? "auto",
    ...(c.digits === undefined ? {} : { digits: c.digits }),
  }));
  const shown = rows.map((row) => Object.fromEntries(columns.map((c) => [c.field, tableValue(row[c.field])])));
  const text = shown.map((row) => columns.map((c) => cellText(row[c.field], c)));
  return { columns, rows: shown, text };
}

function rowsOf(value: unknown): { rows: readonly Record<string, unknown>[]; fields?: readonly string[] } | undefined {
  const isRow = (r: unknown) => typeof r === "object" && r !== null && !Array.isArray(r);
  if (Array.isArray(value) && value.every(isRow)) return { rows: value };
  if (typeof value === "object" && value !== null && Array.isArray((value as { rows?: unknown }).rows)) {
    const { rows, columns } = value as { rows: unknown[]; columns?: unknown };
    if (!rows.every(isRow)) return undefined;
    const fields = Array.isArray(columns) && columns.every((c) => typeof c === "string") ? (columns as string[]) : undefined;
    return { rows: rows as Record<string, unknown>[], ...(fields ? { fields } : {}) };
  }
  return undefined;
}

function tableValue(value: unknown): TableValue {
  if (value === undefined || value === null) return null;
  if (typeof value === "number" || typeof value === "string" || typeof value === "boolean") return value;
  return valueText(value);
}

function cellText(value: TableValue, column: TableColumnValue): string {
  if (value === null) return "—";
  if (typeof value === "number") return formatNotation(value, column.notation, column.digits);
  return String(value);
}

/** Headline "12 rows × 3 columns"; no cautions. */
export function describeTable(_cell: CellOf<"table">, value: unknown): CellDescription {
  const t = value as Partial<TableCellValue> | undefined;
  if (!t || !Array.isArray(t.rows) || !Array.isArray(t.columns)) return { cautions: [] };
  return { headline: `${t.rows.length} ${t.rows.length === 1 ? "row" : "rows"} × ${t.columns.length} ${t.columns.length === 1 ? "column" : "columns"}`, cautions: [] };
}
