import type { ReportTable } from "../../views/report/report-model";
import { formatTableValue } from "../../views/report/format-value";
import { el } from "../dom/element";
import { type TableRecords, downloadName, tableCsv, tableJson } from "../export/table-download";
import { downloadText } from "../export/download-file";

/** Most rows drawn in the page; all of them go into the downloads. */
export const MAX_SHOWN_ROWS = 200;

/**
 * A result table in the page: headings, numbers right-aligned in tabular figures,
 * at most {@link MAX_SHOWN_ROWS} rows (a note says how many more), and — when
 * `records` are given — buttons that download every row as CSV or JSON, unrounded.
 */
export function tableElement(table: ReportTable, records?: TableRecords, baseName = "table"): HTMLElement {
  const { columns, rows, formats = [], caption } = table;
  const numeric = columns.map((_, c) => formats[c] !== "text" && rows.some((r) => typeof r[c] === "number"));
  const head = el("tr", {}, ...columns.map((c, k) => el("th", { scope: "col", class: numeric[k] ? "cp-num" : "", text: c })));
  const body = el("tbody");
  for (const row of rows.slice(0, MAX_SHOWN_ROWS)) {
    body.append(el("tr", {}, ...columns.map((_, k) => el("td", { class: numeric[k] ? "cp-num" : "", text: formatTableValue(k < row.length ? row[k] : null, formats[k]) }))));
  }
  const wrap = el("div", { class: "cp-table-wrap", "data-testid": "result-table" }, el("table", { class: "cp-table" }, caption ? el("caption", { text: caption }) : null, el("thead", {}, head), body));
  if (rows.length > MAX_SHOWN_ROWS) wrap.append(el("p", { class: "cp-note", text: `Showing ${MAX_SHOWN_ROWS} of ${rows.length} rows; the downloads hold them all.` }));
  if (records) wrap.append(downloadButtons(records, baseName));
  return wrap;
}

/** "Download CSV" and "Download JSON" buttons for a table's raw rows. */
export function downloadButtons(records: TableRecords, baseName: string): HTMLElement {
  return el(
    "div",
    { class: "cp-downloads" },
    el("button", {
      type: "button",
      class: "cp-small-button",
      "data-testid": "download-csv",
      text: "Download CSV",
      "aria-label": `Download ${baseName} as CSV`,
      on: { click: () => downloadText(downloadName(baseName, "csv"), tableCsv(records), "text/csv") },
    }),
    el("button", {
      type: "button",
      class: "cp-small-button",
      "data-testid": "download-json",
      text: "Download JSON",
      "aria-label": `Download ${baseName} as JSON`,
      on: { click: () => downloadText(downloadName(baseName, "json"), tableJson(records), "application/json") },
    }),
  );
}
