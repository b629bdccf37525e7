/**
 * Stands in for `linkedom` in the browser bundle (build.mjs aliases the package
 * here). The views draw static SVG and sanitise report HTML on a document of their
 * own (cells/views/render-svg.ts, report/sanitize-html.ts); in Node that document
 * is linkedom's, in the browser an inert one from DOMParser: no browsing context,
 * so nothing in it loads, runs or touches the page.
 */
export function parseHTML(html: string): { document: Document; window: { document: Document } } {
  const document = new DOMParser().parseFromString(html, "text/html");
  return { document, window: { document } };
}
