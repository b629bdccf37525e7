import type { CellOf } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import { renderMarkdown } from "../../views/report/render-markdown";
import type { DefineContext } from "../define-context";
import { defaultNumberText, formatNotation } from "../format-notation";
import { type CellDescription, versionKey } from "../kind-runtime";
import type { CellInputs } from "../resolve-number";
import { valueText } from "../value-text";
import { type LiveValue, proseDependencies } from "./settings";

/**
 * The value of a prose cell: its Markdown rendered to sanitised HTML with live
 * values filled in, and the live values whose field was missing (shown as "—").
 */
export interface ProseCellValue {
  readonly html: string;
  readonly missing: readonly string[];
}

/**
 * A prose cell's definition: depends on every cell its live values name; its
 * value is a {@link ProseCellValue}. A live value follows its path into the
 * named value (fields, or array items by index); numbers use the value's format
 * (`:3f` fixed, `:4` significant, `:2e` scientific) or, without one,
 * {@link defaultNumberText}; other values show as one line of text (see valueText).
 */
export function defineProseCell(cell: CellOf<"prose">, _context: DefineContext): CellDefinition {
  const { text } = cell.settings;
  return {
    id: cell.id,
    name: cell.name ?? null,
    inputs: proseDependencies(cell.settings),
    version: versionKey(cell),
    compute: (inputs): ProseCellValue => {
      const missing: string[] = [];
      const html = renderMarkdown(text, (reference, live) => {
        const found = follow(inputs, live);
        if (!found.ok) {
          missing.push(reference);
          return "—";
        }
        return liveText(found.value, live);
      });
      return { html, missing };
    },
  };
}

function follow(inputs: CellInputs, live: LiveValue): { ok: true; value: unknown } | { ok: false } {
  let value: unknown = inputs[live.name];
  for (const key of live.path) {
    // Text has fields too (`@{note.length}`); other primitives have none worth showing.
    const holder = typeof value === "string" ? Object(value) : value;
    if (holder === null || (typeof holder !== "object" && typeof holder !== "function")) return { ok: false };
    if (!(key in (holder as object))) return { ok: false };
    value = (holder as Record<string, unknown>)[key];
  }
  return { ok: true, value };
}

function liveText(value: unknown, live: LiveValue): string {
  if (typeof value !== "number") return valueText(value);
  return live.format ? formatNotation(value, live.format.notation, live.format.digits) : defaultNumberText(value);
}

/** No headline; a caution per live value whose field is missing. */
export function describeProse(_cell: CellOf<"prose">, value: unknown): CellDescription {
  const missing = (value as Partial<ProseCellValue> | undefined)?.missing ?? [];
  return { cautions: missing.map((reference) => `@{${reference}}: no such field; shown as "—".`) };
}
