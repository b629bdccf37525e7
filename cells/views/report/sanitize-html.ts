import { parseHTML } from "linkedom";
import { escapeHtml } from "./escape-html";

/*
 * A strict allow-list sanitiser for the static report. It parses the input into a
 * tree (linkedom) and writes a new document from that tree itself: only listed
 * elements and attributes are written, every text node and attribute value is
 * escaped, comments are dropped, and no raw-text element (script, style, textarea,
 * …) is ever written. Because the output is generated rather than filtered, a
 * browser parses it into the tree that was checked (the usual defence against
 * parser-differential tricks).
 *
 * Not the browser editor's sanitiser: that one will use DOMPurify on live DOM.
 */

/** HTML elements written as they are (with their allowed attributes). */
const HTML_ELEMENTS = new Set([
  "a", "abbr", "article", "aside", "b", "blockquote", "br", "caption", "cite", "code", "col", "colgroup", "dd", "del", "details", "dfn",
  "div", "dl", "dt", "em", "figcaption", "figure", "footer", "h1", "h2", "h3", "h4", "h5", "h6", "header", "hr", "i", "img", "input",
  "ins", "kbd", "li", "mark", "ol", "p", "pre", "q", "s", "samp", "section", "small", "span", "strong", "sub", "summary", "sup",
  "table", "tbody", "td", "tfoot", "th", "thead", "time", "tr", "u", "ul", "var",
]);

/** HTML void elements: written without a closing tag. */
const VOID_ELEMENTS = new Set(["br", "col", "hr", "img", "input"]);

/** SVG elements, keyed by lower case (the parser lower-cases them), valued by their real spelling. */
const SVG_ELEMENTS = new Map(
  ["svg", "g", "path", "line", "rect", "circle", "ellipse", "polyline", "polygon", "text", "tspan", "title", "desc", "defs", "clipPath",
    "linearGradient", "radialGradient", "stop", "pattern", "marker", "symbol", "use", "mask"].map((name) => [name.toLowerCase(), name]),
);

/**
 * Elements removed together with everything inside them: code, styles, embedded
 * documents, forms and anything whose content is raw text in some parser.
 */
const DROP_WITH_CONTENT = new Set([
  "script", "style", "noscript", "template", "iframe", "frame", "frameset", "object", "embed", "applet", "param", "textarea", "select",
  "option", "optgroup", "button", "form", "title", "xmp", "plaintext", "noembed", "noframes", "math", "foreignobject", "link", "meta",
  "base", "head", "audio", "video", "source", "track", "canvas", "portal", "slot", "dialog", "animate", "animatemotion",
  "animatetransform", "set", "image", "feimage", "filter", "textpath", "listing", "handler",
]);

/** Attributes allowed on every element. */
const GLOBAL_ATTRIBUTES = new Set(["class", "id", "title", "lang", "dir", "role", "style"]);

/** Extra attributes per HTML element. */
const HTML_ATTRIBUTES: Record<string, ReadonlySet<string>> = {
  a: new Set(["href"]),
  img: new Set(["src", "alt", "width", "height"]),
  td: new Set(["colspan", "rowspan", "align"]),
  th: new Set(["colspan", "rowspan", "align", "scope"]),
  col: new Set(["span"]),
  ol: new Set(["start", "reversed"]),
  li: new Set(["value"]),
  time: new Set(["datetime"]),
  details: new Set(["open"]),
  input: new Set(["type", "checked", "disabled"]),
};

/** SVG attributes, keyed by lower case, valued by their real spelling. */
const SVG_ATTRIBUTES = new Map(
  ["viewBox", "preserveAspectRatio", "width", "height", "x", "y", "x1", "x2", "y1", "y2", "cx", "cy", "r", "rx", "ry", "d", "points",
    "dx", "dy", "transform", "fill", "fill-opacity", "fill-rule", "stroke", "stroke-width", "stroke-opacity", "stroke-dasharray",
    "stroke-dashoffset", "stroke-linecap", "stroke-linejoin", "stroke-miterlimit", "opacity", "paint-order", "clip-path", "clip-rule",
    "mask", "font-family", "font-size", "font-weight", "font-style", "font-variant", "text-anchor", "dominant-baseline",
    "alignment-baseline", "letter-spacing", "text-decoration", "vector-effect", "shape-rendering", "offset", "stop-color",
    "stop-opacity", "gradientUnits", "gradientTransform", "patternUnits", "patternContentUnits", "patternTransform", "clipPathUnits",
    "markerWidth", "markerHeight", "markerUnits", "refX", "refY", "orient", "href", "xlink:href", "aria-label", "aria-hidden",
    "aria-description", "marker-start", "marker-mid", "marker-end", "visibility", "display", "color"].map((name) => [name.toLowerCase(), name]),
);

const MAX_DEPTH = 256;

/** Options of {@link sanitizeHtml}. */
export interface SanitizeOptions {
  /** Allow inline SVG (the report's figures). Default true. */
  svg?: boolean;
}

/**
 * Returns a safe HTML fragment for embedding in the static report: only allow-listed
 * HTML and SVG elements and attributes survive; no scripts, styles, event handlers,
 * embedded documents, forms or comments. Links keep only http(s):, mailto: and
 * relative targets; images keep only inline `data:image/(png|jpeg|gif|webp)` sources
 * (anything else is replaced by its alt text, so the report makes no requests); SVG
 * references must point inside the document (`#id`, `url(#id)`); `style` values
 * must be plain declarations without `url(`, `@`, `\`, `expression` or `<`.
 * SVG `xmlns` attributes are dropped: inside an HTML document the parser sets the
 * namespace itself.
 */
export function sanitizeHtml(html: string, options: SanitizeOptions = {}): string {
  const { svg = true } = options;
  const { document } = parseHTML("<!DOCTYPE html><html><head></head><body><div></div></body></html>");
  const root = document.querySelector("div") as unknown as Element;
  root.innerHTML = String(html);
  const out: string[] = [];
  writeChildren(root, false, svg, 0, out);
  return out.join("");
}

function writeChildren(parent: Node, inSvg: boolean, svgAllowed: boolean, depth: number, out: string[]): void {
  for (const node of Array.from(parent.childNodes)) writeNode(node, inSvg, svgAllowed, depth, out);
}

function writeNode(node: Node, inSvg: boolean, svgAllowed: boolean, depth: number, out: string[]): void {
  if (node.nodeType === 3) {
    out.push(escapeHtml(node.textContent ?? ""));
    return;
  }
  if (node.nodeType !== 1 || depth > MAX_DEPTH) return; // comments, doctypes, CDATA, processing instructions
  const element = node as Element;
  const lower = element.localName.toLowerCase();
  if (lower === "svg" && !inSvg) {
    if (!svgAllowed) return;
    writeElement(element, "svg", true, svgAllowed, depth, out);
    return;
  }
  if (inSvg) {
    const name = SVG_ELEMENTS.get(lower);
    if (name && lower !== "svg") writeElement(element, name, true, svgAllowed, depth, out);
    // Anything else inside SVG (foreignObject, script, HTML) goes with its content.
    return;
  }
  if (DROP_WITH_CONTENT.has(lower)) return;
  if (HTML_ELEMENTS.has(lower)) {
    if (lower === "img") {
      writeImage(element, out);
      return;
    }
    // Only the read-only checkboxes of task lists survive; other inputs are dropped.
    if (lower === "input" && (element.getAttribute("type") ?? "").trim().toLowerCase() !== "checkbox") return;
    writeElement(element, lower, false, svgAllowed, depth, out);
    return;
  }
  // Unknown but harmless wrappers (font, center, custom tags): keep the content only.
  writeChildren(element, false, svgAllowed, depth + 1, out);
}

function writeElement(element: Element, name: string, inSvg: boolean, svgAllowed: boolean, depth: number, out: string[]): void {
  const attributes = inSvg ? svgAttributes(element) : htmlAttributes(element, name);
  out.push(`<${name}${attributes}>`);
  if (!inSvg && VOID_ELEMENTS.has(name)) return;
  writeChildren(element, inSvg, svgAllowed, depth + 1, out);
  out.push(`</${name}>`);
}

function htmlAttributes(element: Element, name: string): string {
  const extra = HTML_ATTRIBUTES[name];
  const parts: string[] = [];
  for (const attr of Array.from(element.attributes)) {
    const key = attr.name.toLowerCase();
    if (!(GLOBAL_ATTRIBUTES.has(key) || extra?.has(key) || isAriaOrData(key))) continue;
    let value = attr.value;
    if (key === "href") {
      if (!safeLink(value)) continue;
    } else if (key === "style") {
      if (!safeStyle(value)) continue;
    } else if (hasUrlFunction(value)) {
      continue;
    }
    if (name === "input" && key === "type") value = "checkbox";
    if (name === "input" && key === "disabled") continue;
    parts.push(` ${key}="${escapeHtml(value)}"`);
  }
  // A task-list checkbox in a static page must not look editable.
  if (name === "input") parts.push(` disabled=""`);
  return parts.join("");
}

function svgAttributes(element: Element): string {
  const parts: string[] = [];
  for (const attr of Array.from(element.attributes)) {
    const lower = attr.name.toLowerCase();
    const key = SVG_ATTRIBUTES.get(lower) ?? (GLOBAL_ATTRIBUTES.has(lower) || isAriaOrData(lower) ? lower : undefined);
    if (!key) continue;
    const value = attr.value;
    if (key === "href" || key === "xlink:href") {
      if (!/^#[A-Za-z_][\w.:-]*$/.test(value.trim())) continue;
    } else if (key === "style") {
      if (!safeStyle(value)) continue;
    } else if (hasUrlFunction(value) && !onlyLocalUrls(value)) {
      continue;
    }
    parts.push(` ${key}="${escapeHtml(value)}"`);
  }
  return parts.join("");
}

function writeImage(element: Element, out: string[]): void {
  const src = element.getAttribute("src") ?? "";
  const alt = element.getAttribute("alt") ?? "";
  if (/^data:image\/(?:png|jpeg|gif|webp);base64,[A-Za-z0-9+/=\s]+$/i.test(src.trim())) {
    out.push(`<img src="${escapeHtml(src.trim())}" alt="${escapeHtml(alt)}">`);
  } else {
    // The report must open offline and make no requests: show what the image was.
    out.push(`<span class="cf-image-omitted">[image${alt ? `: ${escapeHtml(alt)}` : ""}]</span>`);
  }
}

function isAriaOrData(key: string): boolean {
  return /^aria-[a-z]+$/.test(key) || /^data-[a-z0-9-]+$/.test(key);
}

/** Strips what browsers ignore inside a URL's scheme (controls, spaces) before looking at it. */
function normaliseUrl(value: string): string {
  // eslint-disable-next-line no-control-regex
  return value.replace(/[\u0000-\u0020\u007f-\u009f\u00ad\u200b-\u200f\u2028\u2029\ufeff]/g, "");
}

/** http(s), mailto, in-page anchors and relative paths only. */
export function safeLink(value: string): boolean {
  const url = normaliseUrl(value);
  const scheme = /^([A-Za-z][A-Za-z0-9+.-]*):/.exec(url);
  if (!scheme) return !url.startsWith("//") && !url.startsWith("\\\\") && !/^[/\\]{2}/.test(url); // protocol-relative would fetch another host
  return ["http", "https", "mailto"].includes(scheme[1].toLowerCase());
}

function hasUrlFunction(value: string): boolean {
  return /url\s*\(/i.test(value) || /javascript\s*:/i.test(normaliseUrl(value));
}

function onlyLocalUrls(value: string): boolean {
  const rest = value.replace(/url\(\s*#[A-Za-z_][\w.:-]*\s*\)/g, "");
  return !hasUrlFunction(rest);
}

/** Plain CSS declarations: no functions that fetch, no at-rules, no escapes, no markup. */
function safeStyle(value: string): boolean {
  if (/[\\<>@]/.test(value)) return false;
  if (/url\s*\(|expression\s*\(|image-set|image\s*\(|behavior|-moz-binding|javascript\s*:/i.test(value)) return false;
  return true;
}
