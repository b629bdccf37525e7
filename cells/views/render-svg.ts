import * as Plot from "@observablehq/plot";
import { parseHTML } from "linkedom";
import { type FigureKeyEntry, type FigureSpec, isFigureSpec } from "./figures/figure-spec";
import { escapeHtml } from "./report/escape-html";

/** Options of {@link renderSvg}. */
export interface RenderSvgOptions {
  /**
   * Prefix for element ids inside the output (clip paths and the like), renumbered
   * `${idPrefix}-1`, `${idPrefix}-2`, … in order of appearance, so that output does
   * not depend on how many plots were drawn before and several figures can share a
   * page. Default "cf".
   */
  idPrefix?: string;
}

const SVG_NS = "http://www.w3.org/2000/svg";

/**
 * Draws Plot options, or a {@link FigureSpec}, headless (linkedom's document) and
 * returns an HTML fragment with inline SVG: every `<svg>` carries `xmlns`, geometry
 * attributes are rounded to 2 decimals and ids renumbered, so equal input gives
 * byte-equal output.
 *
 * - Bare Plot options: Plot's own output, an `<svg>` or, when Plot adds legends, a
 *   title or a caption, its `<figure>` wrapper with the svgs inside.
 * - A FigureSpec: a `<figure class="cf-figure">` of our own holding the title, the
 *   colour key, Plot's svg(s) (Plot's wrapper removed) and a `<figcaption>` with the
 *   notes and the cautions (class `cf-caution`). All text is escaped.
 */
export function renderSvg(input: FigureSpec<object> | Plot.PlotOptions, renderOptions: RenderSvgOptions = {}): string {
  const { idPrefix = "cf" } = renderOptions;
  const spec = isFigureSpec(input) ? input : undefined;
  const options = spec ? spec.options : (input as Plot.PlotOptions);
  const { document } = parseHTML("<!DOCTYPE html><html><head></head><body></body></html>");
  const element = Plot.plot({ ...options, document: document as unknown as Document }) as unknown as Element;
  const svgs = element.localName === "svg" ? [element] : Array.from(element.querySelectorAll("svg"));
  for (const svg of svgs) svg.setAttribute("xmlns", SVG_NS);
  let html: string;
  if (spec) {
    // Keep Plot's inner content (legend ramps and the chart) without its figure wrapper.
    html = element.localName === "figure" ? element.innerHTML : element.outerHTML;
    html = wrapFigure(spec, html);
  } else {
    html = element.outerHTML;
  }
  return renumberIds(roundGeometry(html), idPrefix);
}

function wrapFigure(spec: FigureSpec<object>, plotHtml: string): string {
  const parts = [`<figure class="cf-figure" data-figure="${escapeHtml(spec.figure)}">`];
  if (spec.title) parts.push(`<p class="cf-figure-title">${escapeHtml(spec.title)}</p>`);
  if (spec.key.length > 0) parts.push(`<div class="cf-key">${spec.key.map(keyItem).join("")}</div>`);
  parts.push(plotHtml);
  if (spec.notes.length > 0 || spec.cautions.length > 0) {
    parts.push("<figcaption>");
    for (const note of spec.notes) parts.push(`<p class="cf-note">${escapeHtml(note)}</p>`);
    for (const caution of spec.cautions) parts.push(`<p class="cf-caution"><strong>Caution</strong> ${escapeHtml(caution)}</p>`);
    parts.push("</figcaption>");
  }
  parts.push("</figure>");
  return parts.join("");
}

function keyItem(entry: FigureKeyEntry): string {
  const color = escapeHtml(entry.color);
  let swatch: string;
  switch (entry.shape) {
    case "dot":
      swatch = `<circle cx="7" cy="5" r="4" fill="${color}" />`;
      break;
    case "line":
      swatch = `<line x1="0" y1="5" x2="14" y2="5" stroke="${color}" stroke-width="2" />`;
      break;
    case "dash":
      swatch = `<line x1="0" y1="5" x2="14" y2="5" stroke="${color}" stroke-width="1.5" stroke-dasharray="3,2" />`;
      break;
    case "band":
      swatch = `<rect x="0" y="1" width="14" height="8" fill="${color}" fill-opacity="0.25" />`;
      break;
  }
  return `<span class="cf-key-item"><svg xmlns="${SVG_NS}" width="14" height="10" viewBox="0 0 14 10" aria-hidden="true">${swatch}</svg>${escapeHtml(entry.label)}</span>`;
}

const GEOMETRY_ATTRIBUTE = /(\s(?:d|transform|x|y|x1|x2|y1|y2|cx|cy|r|rx|ry|dx|dy|width|height|points|viewBox)=")([^"]*)"/g;
const NUMBER = /-?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?/gi;

/**
 * Rounds numbers inside geometry attributes to 2 decimals (a hundredth of a CSS
 * pixel is invisible), the way Plot's own snapshot tests compare output. Only the
 * inside of tags is touched, never text content.
 */
export function roundGeometry(html: string): string {
  return html.replace(/<[^>]*>/g, (tag) =>
    tag.replace(GEOMETRY_ATTRIBUTE, (_, head: string, value: string) => `${head}${value.replace(NUMBER, roundNumber)}"`),
  );
}

function roundNumber(text: string): string {
  const v = Number(text);
  if (!Number.isFinite(v)) return text;
  const r = Math.round(v * 100) / 100;
  return String(Object.is(r, -0) ? 0 : r);
}

/** Renames every id (and its `url(#…)` / `href="#…"` references) to `${prefix}-k`. */
function renumberIds(html: string, prefix: string): string {
  const names = new Map<string, string>();
  for (const match of html.matchAll(/\sid="([^"]+)"/g)) {
    if (!names.has(match[1])) names.set(match[1], `${prefix}-${names.size + 1}`);
  }
  if (names.size === 0) return html;
  return html
    .replace(/(\sid=")([^"]+)"/g, (_, head: string, id: string) => `${head}${names.get(id) ?? id}"`)
    .replace(/url\(#([^)]+)\)/g, (whole, id: string) => (names.has(id) ? `url(#${names.get(id)})` : whole))
    .replace(/(href=")#([^"]+)"/g, (whole, head: string, id: string) => (names.has(id) ? `${head}#${names.get(id)}"` : whole));
}
