import * as Plot from "@observablehq/plot";
import { TransportInputError } from "../../../core/errors";
import { type Measure, measureDimension, measurePoints, supportSize } from "../../../core/measure";
import { FIGURE_WIDTH, PAPER, PLOT_STYLE, POTENTIAL_RAMP, SOURCE_COLOR, TARGET_COLOR } from "../theme";
import type { CommonFigureOptions, FigureSpec } from "./figure-spec";
import { formatCount, formatNumber } from "./format-number";

/** Input of {@link potentialsFigure}. */
export interface PotentialsInput extends CommonFigureOptions {
  /** The measure the potential lives on (source for f, target for g). */
  measure: Measure;
  /** One value per support point, in the measure's order. */
  potential: Float64Array;
  /** What the potential is, e.g. "f (source potential)"; used as axis or legend label. */
  label: string;
  /** Which side the potential belongs to; picks the line colour in 1-D. Default "source". */
  side?: "source" | "target";
}

/** Numbers stated in the caption of {@link potentialsFigure}. */
export interface PotentialsFacts {
  /** 1: potential drawn as a line over position; 2: points coloured by potential. */
  readonly shownDim: 1 | 2;
  /** Values left out because they were not finite. */
  readonly pointsDropped: number;
  readonly min: number;
  readonly max: number;
}

/**
 * Potentials: a dual potential over the support of its measure. In 1-D the potential
 * is a line over position (dots at the support points); in 2-D each point (or grid
 * cell) is coloured by its value on a quantized 7-step scale with a legend; higher
 * dimensions use the first two coordinates and say so. Non-finite values (e.g. at
 * points without mass) are left out and counted in the caption.
 */
export function potentialsFigure(input: PotentialsInput): FigureSpec<PotentialsFacts> {
  const { measure, potential, label, side = "source", title, cautions = [], width = FIGURE_WIDTH } = input;
  const n = supportSize(measure);
  if (potential.length !== n) throw new TransportInputError("potential", `length mismatch: ${potential.length} values for ${n} points`, potential.length);
  const d = measureDimension(measure);
  const points = measurePoints(measure);
  const autoCautions: string[] = [];
  if (d > 2) autoCautions.push(`Points have ${d} coordinates; only the first two are drawn.`);

  const rows: Array<{ x: number; y: number; value: number; index: number }> = [];
  let dropped = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = potential[i];
    if (!Number.isFinite(v)) {
      dropped++;
      continue;
    }
    min = Math.min(min, v);
    max = Math.max(max, v);
    rows.push({ x: points[i * d], y: d > 1 ? points[i * d + 1] : 0, value: v, index: i });
  }
  const notes: string[] = [];
  if (rows.length > 0) notes.push(`${label} ranges from ${formatNumber(min, 3)} to ${formatNumber(max, 3)} over ${formatCount(rows.length)} points.`);
  if (dropped > 0) notes.push(`${formatCount(dropped)} ${dropped === 1 ? "value" : "values"} not finite left out.`);
  const facts = { pointsDropped: dropped, min, max };

  if (d === 1) {
    rows.sort((a, b) => a.x - b.x || a.index - b.index);
    const color = side === "source" ? SOURCE_COLOR : TARGET_COLOR;
    return {
      figure: "potentials",
      options: {
        width,
        height: 300,
        marginLeft: 56,
        style: PLOT_STYLE,
        x: { label: "position", nice: true },
        y: { label, nice: true, grid: true },
        marks: [
          Plot.line(rows, { x: "x", y: "value", stroke: color, strokeWidth: 1.6, ariaDescription: "potential line" }),
          Plot.dot(rows, { x: "x", y: "value", fill: color, r: 2, ariaDescription: "potential point" }),
        ],
      },
      title,
      key: [],
      notes,
      cautions: [...cautions, ...autoCautions],
      facts: { shownDim: 1, ...facts },
    };
  }

  const color: Plot.ScaleOptions & Plot.LegendOptions = {
    type: "quantize",
    domain: rows.length > 0 ? [min, max > min ? max : min + 1] : [0, 1],
    range: [...POTENTIAL_RAMP],
    legend: "ramp",
    label,
    tickFormat: (v: number) => formatNumber(v, 2),
    width: 400,
  };
  let mark: Plot.Markish;
  let aspect: Pick<Plot.PlotOptions, "aspectRatio" | "height" | "width" | "x" | "y">;
  if (measure.kind === "grid") {
    // Grid cells as rectangles centred on their cell centres, axes exactly spanning the grid
    // in equal units; a tall grid gets a narrower figure rather than a very tall one.
    const [h0, h1] = measure.spacing;
    const [n0, n1] = measure.shape;
    const x = [measure.origin[0] - h0 / 2, measure.origin[0] + (n0 - 0.5) * h0];
    const y = [measure.origin[1] - h1 / 2, measure.origin[1] + (n1 - 0.5) * h1];
    const ratio = (y[1] - y[0]) / (x[1] - x[0]);
    mark = Plot.rect(rows, { x1: (r) => r.x - h0 / 2, x2: (r) => r.x + h0 / 2, y1: (r) => r.y - h1 / 2, y2: (r) => r.y + h1 / 2, fill: "value", shapeRendering: "crispEdges", ariaDescription: "potential cell" });
    aspect = {
      aspectRatio: 1,
      width: ratio > 1 ? Math.max(320, Math.round(width / ratio)) : width,
      x: { label: "coordinate 1", domain: x },
      y: { label: "coordinate 2", domain: y },
    };
  } else {
    const r = Math.min(6, Math.max(2.5, 40 / Math.sqrt(Math.max(1, rows.length))));
    mark = Plot.dot(rows, { x: "x", y: "y", fill: "value", r, stroke: PAPER, strokeWidth: 0.5, ariaDescription: "potential point" });
    aspect = { height: Math.round(width * 0.62) };
  }
  return {
    figure: "potentials",
    options: {
      width,
      x: { label: "coordinate 1", nice: true },
      y: { label: "coordinate 2", nice: true },
      ...aspect,
      style: PLOT_STYLE,
      color,
      marks: [mark],
    },
    title,
    key: [],
    notes: [...notes, `Colour shows ${label} in ${POTENTIAL_RAMP.length} equal steps, low (warm) to high (cool).`],
    cautions: [...cautions, ...autoCautions],
    facts: { shownDim: 2, ...facts },
  };
}
