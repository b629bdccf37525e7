import { Marked } from "marked";
import { type LiveValue, splitProse } from "../../kinds/prose/settings";
import { escapeHtml } from "./escape-html";
import { sanitizeHtml } from "./sanitize-html";

/**
 * The live-value syntax of prose (docs/format.md, "prose"): `@{name}`,
 * `@{name.field.0}`, `@{name:3f}` / `@{name:4}` / `@{name:2e}`, spaces allowed
 * inside the braces. Group 1 is the reference (name and path), group 2 the format.
 * A quick scan for editors and tests; the document's parser, `splitProse`
 * (cells/kinds/prose/settings.ts), is what rendering uses and is authoritative
 * (it also handles `\@{` escapes and reports malformed values). Not global, not anchored.
 */
export const INLINE_VALUE_PATTERN =
  /@\{[ \t]*([\p{ID_Start}$_][\p{ID_Continue}$\u200c\u200d]*(?:\.(?:[\p{ID_Start}$_][\p{ID_Continue}$\u200c\u200d]*|\d+))*)[ \t]*(?::[ \t]*(\d+[fse]?)[ \t]*)?\}/u;

/**
 * Formats one live value as plain text (it is escaped when written). Called once
 * per live value, in document order, with the reference as written
 * (`"plan.values.cost"`) and the parsed value (name, path, format); it decides
 * what a missing name or field shows.
 */
export type InlineValueFormatter = (reference: string, live: LiveValue) => string;

// Private-use characters: Markdown gives them no meaning, so a placeholder made of
// them survives parsing anywhere (text, emphasis, code spans, code blocks).
const OPEN = "\uE000";
const CLOSE = "\uE001";
const PLACEHOLDER = /\uE000(\d+)\uE001/g;
const ENCODED_PLACEHOLDER = /%EE%80%80(\d+)%EE%80%81/g; // inside URLs marked percent-encodes them

/**
 * Renders prose to safe HTML for the static report: live values are found with
 * the document's parser (so they count everywhere, code spans included, and
 * `\@{` is a literal `@{`), the Markdown (GitHub flavour) is rendered by `marked`,
 * and every live value becomes `inlineValue(reference, live)` as escaped text in
 * `<span class="cf-value" data-name="reference">` (inside a tag, e.g. a link
 * target, as escaped text alone). The whole result passes through
 * {@link sanitizeHtml} (no scripts, event handlers, `javascript:` links or remote
 * images survive raw HTML in the prose). Malformed live values stay as written.
 * A fresh `Marked` instance per call: no global configuration is touched.
 */
export function renderMarkdown(text: string, inlineValue: InlineValueFormatter): string {
  const { segments } = splitProse(String(text));
  const values: { reference: string; text: string }[] = [];
  let source = "";
  for (const segment of segments) {
    if (segment.kind === "text") source += segment.text;
    else {
      const live = segment.value;
      const reference = [live.name, ...live.path].join(".");
      source += `${OPEN}${values.length}${CLOSE}`;
      values.push({ reference, text: String(inlineValue(reference, live)) });
    }
  }
  const marked = new Marked({ gfm: true, breaks: false, async: false });
  const html = marked.parse(source) as string;
  // Tags and text apart: a value inside a tag (an attribute) gets no span.
  const filled = html.replace(/<[^>]*>|[^<]+/g, (part) => {
    if (part.startsWith("<")) {
      return part
        .replace(PLACEHOLDER, (_, k) => escapeHtml(values[Number(k)].text))
        .replace(ENCODED_PLACEHOLDER, (_, k) => escapeHtml(encodeURIComponent(values[Number(k)].text)));
    }
    return part.replace(PLACEHOLDER, (_, k) => {
      const { reference, text: shown } = values[Number(k)];
      return `<span class="cf-value" data-name="${escapeHtml(reference)}">${escapeHtml(shown)}</span>`;
    });
  });
  return sanitizeHtml(filled, { svg: false });
}
