import type { TableSettings } from "../../kinds/table/settings";
import { el } from "../dom/element";
import { fieldGroup, selectField, textField } from "./fields";
import type { CellFormContext } from "./form-context";

function jsonCommit(context: CellFormContext, path: string, label: string, example: string) {
  return (v: unknown) => {
    if (v === undefined) return context.set(path, undefined, label);
    try {
      return context.set(path, JSON.parse(String(v)), label);
    } catch (error) {
      return `not JSON (${(error as Error).message}); e.g. ${example}`;
    }
  };
}

/**
 * The settings form of a table: rows from another cell (a sweep, or any cell
 * whose value is a list of records) or written here as JSON, and the columns
 * (field, heading, digits, notation) as JSON.
 */
export function tableForm(context: CellFormContext): HTMLElement {
  const s = context.cell.settings as TableSettings;
  const form = el("div", { class: "cp-form cp-form-table" });
  const fromCell = s.of !== undefined;
  const sources = [...context.names("sweep"), ...context.names("code")];
  form.append(
    fieldGroup(
      "Rows",
      selectField({
        label: "Rows come from",
        key: "rows.origin",
        value: fromCell ? "cell" : "here",
        choices: [
          { value: "cell", label: "another cell" },
          { value: "here", label: "written here" },
        ],
        commit: (v) => {
          const { of: _of, rows: _rows, ...rest } = s;
          return context.replace(v === "cell" ? { ...rest, of: sources[sources.length - 1] ?? "sweep" } : { ...rest, rows: [{ case: "first", value: 1 }] }, `rows ${v === "cell" ? "from a cell" : "written here"}`);
        },
      }),
      fromCell
        ? selectField({ label: "Cell", key: "of", value: s.of, choices: sources.map((n) => ({ value: n, label: n })), commit: (v) => context.set("of", v, "table rows cell") })
        : textField({ label: "Rows (JSON list of records)", key: "rows", value: JSON.stringify(s.rows ?? [], null, 1), multiline: true, mono: true, commit: jsonCommit(context, "rows", "table rows", '[{"case": "a", "value": 1}]') }),
    ),
  );
  form.append(
    fieldGroup(
      "Columns",
      textField({
        label: "Columns (JSON; empty: every field of the first row)",
        key: "columns",
        value: s.columns ? JSON.stringify(s.columns) : "",
        optional: true,
        multiline: true,
        mono: true,
        placeholder: '[{"field": "cost", "label": "cost", "digits": 4, "notation": "significant"}]',
        commit: jsonCommit(context, "columns", "table columns", '[{"field": "cost", "digits": 4}]'),
      }),
    ),
  );
  return form;
}
