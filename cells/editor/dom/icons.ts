const SVG_NS = "http://www.w3.org/2000/svg";

/** Path data of the small tool icons (14 × 14 grid, stroked). */
const PATHS = {
  up: "M7 11.5V2.5M3 6.5l4-4 4 4",
  down: "M7 2.5v9M3 7.5l4 4 4-4",
  duplicate: "M4.5 4.5h7v7h-7zM2.5 9.5v-7h7",
  plus: "M7 2.5v9M2.5 7h9",
  cross: "M3 3l8 8M11 3l-8 8",
} as const;

/** Names of the tool icons. */
export type IconName = keyof typeof PATHS;

/**
 * A small stroked icon drawn in currentColor, hidden from assistive technology
 * (the button around it carries the label). Drawn as SVG so that it looks the
 * same whatever fonts the system has.
 */
export function icon(name: IconName): SVGSVGElement {
  const svg = document.createElementNS(SVG_NS, "svg");
  svg.setAttribute("viewBox", "0 0 14 14");
  svg.setAttribute("width", "14");
  svg.setAttribute("height", "14");
  svg.setAttribute("aria-hidden", "true");
  svg.setAttribute("focusable", "false");
  const path = document.createElementNS(SVG_NS, "path");
  path.setAttribute("d", PATHS[name]);
  path.setAttribute("fill", "none");
  path.setAttribute("stroke", "currentColor");
  path.setAttribute("stroke-width", "1.6");
  path.setAttribute("stroke-linecap", "round");
  path.setAttribute("stroke-linejoin", "round");
  svg.append(path);
  return svg;
}
