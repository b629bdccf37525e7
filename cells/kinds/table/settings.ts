import { describeValue } from "../../../core/errors";
import { checkCellName } from "../../document/cell-name";
import { NUMBER_NOTATIONS, type NumberNotation, checkDigits } from "../../document/number-format";
import { type NameMapper, collectReferences, mapField } from "../../document/references";
import { type StudyIssue, childPath } from "../../document/study-issue";
import { checkArray, checkObject, checkOneOf, checkPresent, checkString, jsonTypeName } from "../../document/value-checks";

/** One column of a table: which field of each row, its heading and number format. */
export interface TableColumn {
  /** Field of each row shown in this column. */
  readonly field: string;
  /** Heading. Default: the field. */
  readonly label?: string;
  /** Digits for numbers (meaning set by `notation`; see NumberNotation). Default: shortest exact text. */
  readonly digits?: number;
  /** Default "auto". */
  readonly notation?: NumberNotation;
  readonly [extra: string]: unknown;
}

/** A cell of an inline row: text, number, true/false, or null for an empty cell. */
export type TableValue = string | number | boolean | null;

/**
 * Settings of a table cell: rows from another cell (`of`: a sweep, or any cell
 * whose value is an array of objects) or written inline (`rows`), exactly one
 * of the two; `columns` choose and format them (default: every field of the
 * first row, in its order).
 */
export interface TableSettings {
  readonly of?: string;
  readonly rows?: readonly { readonly [field: string]: TableValue }[];
  readonly columns?: readonly TableColumn[];
  readonly [extra: string]: unknown;
}

/**
 * Validates table settings at `path`: exactly one of `of` (a cell name) and
 * `rows` (objects of text, numbers, booleans or null); columns with a field
 * (no repeats), optional label, notation and digits valid for that notation.
 */
export function validateTableSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  const s = settings;
  const at = (key: string) => childPath(path, key);
  if (s.of !== undefined && s.rows !== undefined) issues.push({ path, message: 'give either "of" (a cell name) or "rows" (inline), not both' });
  else if (s.of === undefined && s.rows === undefined) issues.push({ path, message: 'must hold "of" (the name of a cell giving rows) or "rows" (inline rows)' });
  if (s.of !== undefined) checkCellName(s.of, at("of"), issues);
  if (s.rows !== undefined && checkArray(s.rows, at("rows"), issues)) {
    s.rows.forEach((row, i) => {
      const rp = childPath(at("rows"), i);
      if (!checkObject(row, rp, issues)) return;
      for (const [field, value] of Object.entries(row)) {
        if (value === null || typeof value === "string" || typeof value === "boolean" || typeof value === "number") continue;
        issues.push({ path: childPath(rp, field), message: `must be text, a number, true/false or null, got ${jsonTypeName(value)}` });
      }
    });
  }
  if (s.columns !== undefined && checkArray(s.columns, at("columns"), issues, 1)) {
    const seen = new Map<string, number>();
    s.columns.forEach((column, i) => {
      const cp = childPath(at("columns"), i);
      if (!checkObject(column, cp, issues)) return;
      if (checkPresent(column, "field", cp, issues) && checkString(column.field, childPath(cp, "field"), issues, { nonEmpty: true })) {
        if (seen.has(column.field)) issues.push({ path: childPath(cp, "field"), message: `repeats columns[${seen.get(column.field)}].field (${describeValue(column.field)})` });
        else seen.set(column.field, i);
      }
      if (column.label !== undefined) checkString(column.label, childPath(cp, "label"), issues);
      let notation: NumberNotation | undefined = "auto";
      if (column.notation !== undefined) notation = checkOneOf(column.notation, NUMBER_NOTATIONS, childPath(cp, "notation"), issues) ? column.notation : undefined;
      if (column.digits !== undefined && notation) checkDigits(column.digits, notation, childPath(cp, "digits"), issues);
    });
  }
  return issues;
}

/** Renames the cell the rows come from (`of`). */
export function mapTableReferences(settings: TableSettings, rename: NameMapper): TableSettings {
  return mapField(settings, "of", (of) => (typeof of === "string" ? rename(of) : of));
}

/** The cell the rows come from, if any: `[of]` or `[]`. */
export function tableDependencies(settings: TableSettings): string[] {
  return collectReferences(settings, mapTableReferences);
}

