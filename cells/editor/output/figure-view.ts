import * as Plot from "@observablehq/plot";
import { type FigureKeyEntry, type FigureSpec, isFigureSpec } from "../../views/figures/figure-spec";
import { FIGURE_WIDTH, PLOT_STYLE } from "../../views/theme";
import { el } from "../dom/element";

const SVG_NS = "http://www.w3.org/2000/svg";

function swatch(entry: FigureKeyEntry): SVGSVGElement {
  const svg = document.createElementNS(SVG_NS, "svg");
  svg.setAttribute("width", "14");
  svg.setAttribute("height", "10");
  svg.setAttribute("viewBox", "0 0 14 10");
  svg.setAttribute("aria-hidden", "true");
  const shape = document.createElementNS(SVG_NS, entry.shape === "dot" ? "circle" : entry.shape === "band" ? "rect" : "line");
  const set = (name: string, value: string) => shape.setAttribute(name, value);
  if (entry.shape === "dot") {
    set("cx", "7");
    set("cy", "5");
    set("r", "4");
    set("fill", entry.color);
  } else if (entry.shape === "band") {
    set("x", "0");
    set("y", "1");
    set("width", "14");
    set("height", "8");
    set("fill", entry.color);
    set("fill-opacity", "0.25");
  } else {
    set("x1", "0");
    set("y1", "5");
    set("x2", "14");
    set("y2", "5");
    set("stroke", entry.color);
    set("stroke-width", entry.shape === "dash" ? "1.5" : "2");
    if (entry.shape === "dash") set("stroke-dasharray", "3,2");
  }
  svg.append(shape);
  return svg;
}

/**
 * Draws a figure value in the page: a FigureSpec (the ready views, or code that
 * built one) with its title, colour key, picture and caption (notes, then cautions
 * in the caution style), or bare Plot options from a code figure. `width` caps
 * the picture's width to the column. Plot draws with the page's document; the
 * figure's text is set as text, never parsed.
 */
export function figureElement(value: unknown, width = FIGURE_WIDTH): HTMLElement {
  const spec = isFigureSpec(value) ? (value as FigureSpec<object>) : undefined;
  const options = (spec ? spec.options : value) as Plot.PlotOptions;
  const requested = typeof options.width === "number" ? options.width : FIGURE_WIDTH;
  const plot = Plot.plot({ style: PLOT_STYLE, ...options, width: Math.min(requested, width), document });
  const figure = el("figure", { class: "cp-figure", "data-testid": "figure", "data-figure": spec?.figure ?? "plot" });
  if (spec?.title) figure.append(el("p", { class: "cp-figure-title", text: spec.title }));
  if (spec && spec.key.length > 0) {
    const key = el("div", { class: "cp-key", role: "list", "aria-label": "colour key" });
    for (const entry of spec.key) {
      const item = el("span", { class: "cp-key-item", role: "listitem" });
      item.append(swatch(entry), document.createTextNode(entry.label));
      key.append(item);
    }
    figure.append(key);
  }
  figure.append(plot);
  if (spec && (spec.notes.length > 0 || spec.cautions.length > 0)) {
    const caption = el("figcaption");
    for (const note of spec.notes) caption.append(el("p", { class: "cp-note", text: note }));
    for (const caution of spec.cautions) caption.append(el("p", { class: "cp-figure-caution" }, el("strong", { text: "Caution " }), caution));
    figure.append(caption);
  }
  return figure;
}
