import * as Plot from "@observablehq/plot";
import type { Measure } from "../../../core/measure";
import { MASS_RAMP, PLOT_STYLE, SOURCE_COLOR } from "../../views/theme";

/** Most points drawn in a preview (the first ones; a preview, not a figure). */
export const PREVIEW_POINTS = 2000;

/**
 * A small picture of a data cell's measure, so a change of generator or noise is
 * seen at once: points in their first two coordinates (1-D points on a line),
 * dot area by mass; a 1-D grid as bars and a 2-D grid as shaded cells.
 */
export function measurePreview(measure: Measure, width = 300): Element {
  const style = { ...PLOT_STYLE, fontSize: "10px" };
  if (measure.kind === "grid") {
    const { shape, origin, spacing, mass } = measure;
    if (shape.length === 1) {
      const bars = Array.from(mass, (m, i) => ({ x: origin[0] + i * spacing[0], m }));
      return Plot.plot({ width, height: 120, style, x: { label: null }, y: { label: "mass", grid: true }, marks: [Plot.rectY(bars, { x: "x", y: "m", interval: spacing[0], fill: SOURCE_COLOR, fillOpacity: 0.8 })], document }) as Element;
    }
    const cells: { i: number; j: number; m: number }[] = [];
    for (let i = 0; i < shape[0]; i++) for (let j = 0; j < shape[1]; j++) cells.push({ i, j, m: mass[i * shape[1] + j] });
    return Plot.plot({
      width,
      height: Math.round((width * shape[0]) / Math.max(shape[1], 1)),
      style,
      axis: null,
      color: { type: "quantize", range: [...MASS_RAMP], n: MASS_RAMP.length },
      marks: [Plot.cell(cells, { x: "j", y: "i", fill: "m", inset: 0 })],
      document,
    }) as Element;
  }
  const { n, dim, points, mass } = measure;
  const shown = Math.min(n, PREVIEW_POINTS);
  const rows = Array.from({ length: shown }, (_, i) => ({ x: points[i * dim], y: dim > 1 ? points[i * dim + 1] : 0, m: mass[i] }));
  return Plot.plot({
    width,
    height: dim > 1 ? Math.round(width * 0.72) : 70,
    style,
    x: { label: null, nice: true },
    y: dim > 1 ? { label: null, nice: true } : { axis: null },
    r: { range: [1, 4] },
    marks: [Plot.dot(rows, { x: "x", y: "y", r: "m", fill: SOURCE_COLOR, fillOpacity: 0.7, stroke: null })],
    document,
  }) as Element;
}
