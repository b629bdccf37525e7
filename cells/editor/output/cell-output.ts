import DOMPurify from "dompurify";
import type { Cell } from "../../document";
import { describeCell } from "../../kinds/registry";
import { isMeasure } from "../../kinds/measure-input";
import { isSweepValue } from "../../kinds/sweep/sweep-value";
import type { TableCellValue } from "../../kinds/table/define";
import { tableFrom, transportResultOf, transportTable } from "../../study/report-model";
import { isFigureSpec } from "../../views/figures/figure-spec";
import type { ReportTable } from "../../views/report/report-model";
import { el } from "../dom/element";
import { tableRecords } from "../export/table-download";
import { WARM_START_NOTE } from "../run/warm-start-note";
import { figureElement } from "./figure-view";
import { measurePreview } from "./measure-preview";
import { tableElement } from "./table-view";

/** Longest JSON preview of a code cell's value, in characters. */
export const PREVIEW_CHARACTERS = 4000;

/**
 * Prose HTML made safe for the page with DOMPurify (Heiderich et al., cure53):
 * the prose kind already sanitises its Markdown, and the page sanitises again
 * with a DOM-based sanitiser before anything reaches innerHTML, because a study
 * may come from anyone. Forms, styles and SVG are not allowed in prose.
 */
export function safeProseHtml(html: string): DocumentFragment {
  return DOMPurify.sanitize(html, {
    USE_PROFILES: { html: true },
    FORBID_TAGS: ["style", "form", "input", "button", "textarea", "select", "iframe", "object", "embed"],
    FORBID_ATTR: ["style"],
    RETURN_DOM_FRAGMENT: true,
  });
}

function cautionsBlock(cautions: readonly string[]): HTMLElement | null {
  if (cautions.length === 0) return null;
  return el(
    "div",
    { class: "cp-cautions", role: "note", "data-testid": "cell-cautions" },
    el("p", { class: "cp-cautions-label", text: cautions.length === 1 ? "Keep in mind" : "Keep in mind" }),
    el("ul", {}, ...cautions.map((c) => el("li", { text: c }))),
  );
}

function isTableValue(value: unknown): value is TableCellValue {
  return typeof value === "object" && value !== null && Array.isArray((value as TableCellValue).columns) && Array.isArray((value as TableCellValue).text);
}

function jsonPreview(value: unknown): HTMLElement {
  let text: string;
  try {
    text =
      JSON.stringify(
        value,
        (_k, v) => {
          if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
            const items = Array.from(v as unknown as ArrayLike<number>);
            return items.length > 40 ? [...items.slice(0, 40), `… ${items.length - 40} more`] : items;
          }
          if (typeof v === "number" && !Number.isFinite(v)) return String(v);
          if (typeof v === "function") return `function ${v.name || ""}`.trim();
          return v;
        },
        2,
      ) ?? String(value);
  } catch {
    text = String(value);
  }
  if (text.length > PREVIEW_CHARACTERS) text = `${text.slice(0, PREVIEW_CHARACTERS)}\n… ${text.length - PREVIEW_CHARACTERS} more characters`;
  return el("pre", { class: "cp-preview", text });
}

/** Options of {@link cellOutput}. */
export interface CellOutputOptions {
  /** Width available for pictures, CSS pixels. */
  readonly width: number;
  /** Whether the value is partial (a sweep still running). */
  readonly partial?: boolean;
  /** The solve started from the cell's previous potentials (warm start while tuning). */
  readonly warmStarted?: boolean;
}


/**
 * What a computed cell shows under its header: its headline and cautions (from
 * its kind's `describe`), then by kind — prose as sanitised HTML; a data cell a
 * small picture of its points; a transport its numbers; a sweep or table its rows
 * (with CSV/JSON downloads); a figure its picture; a code cell a figure, a table,
 * a line or a JSON preview of what it returned.
 */
export function cellOutput(cell: Cell, value: unknown, options: CellOutputOptions): HTMLElement {
  const out = el("div", { class: "cp-output", "data-testid": "cell-output" });
  let headline: string | undefined;
  let cautions: readonly string[] = [];
  try {
    ({ headline, cautions } = describeCell(cell, value));
  } catch {
    // A description is a courtesy; the value is still shown below.
  }
  const base = cell.name ?? cell.id;
  switch (cell.kind) {
    case "prose": {
      const html = typeof value === "object" && value !== null && typeof (value as { html?: unknown }).html === "string" ? (value as { html: string }).html : "";
      out.append(el("div", { class: "cp-prose", "data-testid": "prose" }, safeProseHtml(html)), cautionsBlock(cautions) ?? "");
      return out;
    }
    case "parameter":
      return out;
    case "data":
      if (headline) out.append(el("p", { class: "cp-headline", "data-testid": "headline", text: headline }));
      out.append(cautionsBlock(cautions) ?? "");
      if (isMeasure(value)) out.append(el("div", { class: "cp-preview-plot" }, measurePreview(value, Math.min(320, options.width))));
      return out;
    case "transport": {
      if (headline) out.append(el("p", { class: "cp-headline", "data-testid": "headline", text: headline }));
      out.append(cautionsBlock(cautions) ?? "");
      if (options.warmStarted) out.append(el("p", { class: "cp-note", "data-testid": "warm-note", text: WARM_START_NOTE }));
      const result = transportResultOf(value);
      if (result) {
        const table = transportTable(result);
        const records = { fields: ["quantity", "value"], records: table.rows.map(([quantity, v]) => ({ quantity, value: v })) };
        out.append(el("details", { class: "cp-numbers" }, el("summary", { text: "All numbers of this solve" }), tableElement(table, records, `${base}-numbers`)));
      }
      return out;
    }
    case "sweep": {
      if (isSweepValue(value)) {
        const line = value.complete ? `${value.rows.length} runs over ${value.vary}${value.notConverged > 0 ? `, ${value.notConverged} not converged` : ""}` : `${value.rows.length} of ${value.planned} runs done`;
        out.append(el("p", { class: "cp-headline", "data-testid": "headline", text: headline && value.complete ? headline : line }));
      } else if (headline) out.append(el("p", { class: "cp-headline", text: headline }));
      out.append(cautionsBlock(cautions) ?? "");
      const table = tableFrom(value);
      if (table) out.append(tableElement(table, tableRecords(value), base));
      return out;
    }
    case "table": {
      if (isTableValue(value)) {
        const table: ReportTable = { columns: value.columns.map((c) => c.label), rows: value.text.map((row) => [...row]), formats: value.columns.map(() => "text" as const) };
        out.append(tableElement(table, { fields: value.columns.map((c) => c.field), records: value.rows }, base));
      }
      out.append(cautionsBlock(cautions) ?? "");
      return out;
    }
    case "figure":
    case "code": {
      const figureLike = isFigureSpec(value) || (typeof value === "object" && value !== null && Array.isArray((value as { marks?: unknown }).marks));
      if (figureLike) {
        try {
          out.append(figureElement(value, options.width));
        } catch (error) {
          out.append(el("div", { class: "cp-failure", role: "alert", text: `could not draw this figure: ${(error as Error).message}` }));
        }
        // A figure spec states its own cautions in its caption.
        if (!isFigureSpec(value)) out.append(cautionsBlock(cautions) ?? "");
        return out;
      }
      if (cell.kind === "figure") return out;
      const table = Array.isArray(value) && value.length > 0 ? tableFrom(value) : undefined;
      if (table) {
        out.append(tableElement(table, tableRecords(value), base));
        return out;
      }
      if (value !== null && typeof value === "object") {
        if (headline) out.append(el("p", { class: "cp-headline", "data-testid": "headline", text: headline }));
        out.append(el("details", { class: "cp-numbers" }, el("summary", { text: "The value as JSON" }), jsonPreview(value)));
      } else out.append(el("p", { class: "cp-headline cp-mono", "data-testid": "headline", text: headline ?? String(value) }));
      out.append(cautionsBlock(cautions) ?? "");
      return out;
    }
  }
}
