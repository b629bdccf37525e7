import { Marked, type Tokens } from "marked";
import { escapeHtml } from "./escape-html";
import { sanitizeHtml } from "./sanitize-html";

/**
 * The inline-value syntax in prose: `{{ name }}`, where name is an identifier or a
 * dotted path (`{{ shift.value }}`), spaces inside the braces optional. Capture
 * group 1 is the name. This is the one place the syntax is written down; the document
 * model owns the syntax and may change it here. Not global, not anchored.
 */
export const INLINE_VALUE_PATTERN = /\{\{\s*([A-Za-z_$][\w$]*(?:\.[A-Za-z_$][\w$]*)*)\s*\}\}/;

/**
 * Formats the value named in prose as plain text (it is escaped when written).
 * Called once per occurrence, in document order; it decides what a missing name shows.
 */
export type InlineValueFormatter = (name: string) => string;

interface InlineValueToken extends Tokens.Generic {
  type: "inlineValue";
  raw: string;
  name: string;
}

/**
 * Renders prose to safe HTML for the static report: Markdown (GitHub flavour) by
 * `marked`, every `{{ name }}` outside code replaced by `inlineValue(name)` as escaped
 * text in `<span class="cf-value" data-name="name">`, and the whole result passed
 * through {@link sanitizeHtml} (no scripts, event handlers, `javascript:` links or
 * remote images survive raw HTML in the prose). A fresh `Marked` instance per call:
 * no global configuration is touched.
 */
export function renderMarkdown(text: string, inlineValue: InlineValueFormatter): string {
  const anchored = new RegExp(`^${INLINE_VALUE_PATTERN.source}`);
  const marked = new Marked({ gfm: true, breaks: false, async: false });
  marked.use({
    extensions: [
      {
        name: "inlineValue",
        level: "inline",
        start(src: string) {
          const match = INLINE_VALUE_PATTERN.exec(src);
          return match ? match.index : undefined;
        },
        tokenizer(src: string): InlineValueToken | undefined {
          const match = anchored.exec(src);
          return match ? { type: "inlineValue", raw: match[0], name: match[1] } : undefined;
        },
        renderer(token: Tokens.Generic) {
          const name = String((token as InlineValueToken).name);
          return `<span class="cf-value" data-name="${escapeHtml(name)}">${escapeHtml(String(inlineValue(name)))}</span>`;
        },
      },
    ],
  });
  const html = marked.parse(String(text)) as string;
  return sanitizeHtml(html, { svg: false });
}
