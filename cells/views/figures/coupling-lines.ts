import * as Plot from "@observablehq/plot";
import { TransportInputError, describeValue } from "../../../core/errors";
import type { Matrix } from "../../../core/matrix";
import type { PointMeasure } from "../../../core/measure";
import type { TransportPlan } from "../../../core/result";
import { FIGURE_WIDTH, LINK_COLOR, PAPER, PLOT_STYLE, RULE, SOURCE_COLOR, TARGET_COLOR } from "../theme";
import type { CommonFigureOptions, FigureSpec } from "./figure-spec";
import { formatCount, formatPercent } from "./format-number";
import { topPlanEntries } from "./plan-entries";

/** Input of {@link couplingLinesFigure}. */
export interface CouplingLinesInput extends CommonFigureOptions {
  source: PointMeasure;
  target: PointMeasure;
  /** The plan to draw; rows index source points, cols target points. */
  plan: TransportPlan;
  /** Cost matrix (rows × cols); required for an entropic (gibbs) plan, unused otherwise. */
  cost?: Matrix;
  /** Most segments to draw: the heaviest entries are kept. Default 400, integer ≥ 0. */
  maxLines?: number;
}

/** Numbers stated in the caption of {@link couplingLinesFigure}. */
export interface CouplingLinesFacts {
  /** Segments drawn. */
  readonly linesDrawn: number;
  /** Entries of the plan with positive mass. */
  readonly pairsWithMass: number;
  /** Share of the plan's total mass carried by the drawn segments, in [0, 1]. */
  readonly massShare: number;
  /** Σ P_ij over the whole plan. */
  readonly totalMass: number;
  /** Coordinates shown: 1 (points on two parallel lines) or 2. */
  readonly shownDim: 1 | 2;
}

interface Dot {
  x: number;
  y: number | string;
  mass: number;
}

interface Segment {
  x1: number;
  y1: number | string;
  x2: number;
  y2: number | string;
  mass: number;
  opacity: number;
  width: number;
}

const SOURCE_ROW = "source";
const TARGET_ROW = "target";

/**
 * Coupling lines: the source and target clouds as dots sized by mass (area ∝ mass)
 * in two colours, and a segment between each paired source and target point whose
 * opacity and width grow with the mass it carries. Only the `maxLines` heaviest
 * entries are drawn; the caption says how many of how many and what share of the
 * transported mass they carry.
 *
 * 1-D clouds are drawn on two parallel lines (source above, target below); clouds of
 * dimension ≥ 2 are drawn in their first two coordinates (a caution says so when
 * d > 2). Throws {@link TransportInputError} when the plan does not match the
 * measures or a gibbs plan comes without its cost.
 */
export function couplingLinesFigure(input: CouplingLinesInput): FigureSpec<CouplingLinesFacts> {
  const { source, target, plan, cost, maxLines = 400, title, cautions = [], width = FIGURE_WIDTH } = input;
  if (source.dim !== target.dim) {
    throw new TransportInputError("target.dim", `dimension mismatch: source has ${source.dim} coordinates, target ${target.dim}`, target.dim);
  }
  if (plan.rows !== source.n) throw new TransportInputError("plan.rows", `must equal the ${source.n} source points, got ${describeValue(plan.rows)}`, plan.rows);
  if (plan.cols !== target.n) throw new TransportInputError("plan.cols", `must equal the ${target.n} target points, got ${describeValue(plan.cols)}`, plan.cols);

  const top = topPlanEntries(plan, maxLines, cost);
  const oneD = source.dim === 1;
  const d = source.dim;
  const at = (m: PointMeasure, i: number, row: string): { x: number; y: number | string } =>
    oneD ? { x: m.points[i], y: row } : { x: m.points[i * d], y: m.points[i * d + 1] };

  const dots = (m: PointMeasure, row: string): Dot[] => Array.from({ length: m.n }, (_, i) => ({ ...at(m, i, row), mass: m.mass[i] }));
  const sourceDots = dots(source, SOURCE_ROW);
  const targetDots = dots(target, TARGET_ROW);

  const heaviest = top.mass.length > 0 ? top.mass[0] : 0;
  const segments: Segment[] = [];
  // Lightest first so that heavy segments are drawn on top.
  for (let k = top.mass.length - 1; k >= 0; k--) {
    const s = at(source, top.from[k], SOURCE_ROW);
    const t = at(target, top.to[k], TARGET_ROW);
    const rel = heaviest > 0 ? top.mass[k] / heaviest : 0;
    segments.push({ x1: s.x, y1: s.y, x2: t.x, y2: t.y, mass: top.mass[k], opacity: round3(0.12 + 0.78 * rel), width: round3(0.4 + 2.4 * rel) });
  }

  let drawnMass = 0;
  for (const m of top.mass) drawnMass += m;
  const massShare = top.totalMass > 0 ? drawnMass / top.totalMass : 0;

  let maxPointMass = 0;
  for (const w of source.mass) maxPointMass = Math.max(maxPointMass, w);
  for (const w of target.mass) maxPointMass = Math.max(maxPointMass, w);
  // Radius for the heaviest point: smaller when there are many points so clouds stay legible.
  const rMax = clamp(36 / Math.sqrt(Math.max(source.n, target.n)), 2.5, 8);

  const autoCautions: string[] = [];
  if (d > 2) autoCautions.push(`Points have ${d} coordinates; only the first two are drawn.`);

  const dotOptions = (fill: string, label: string) =>
    ({ x: "x", y: "y", r: "mass", fill, fillOpacity: 0.85, stroke: PAPER, strokeWidth: 0.6, ariaDescription: label }) as const;
  const marks: Plot.Markish[] = [
    Plot.link(segments, {
      x1: "x1",
      y1: "y1",
      x2: "x2",
      y2: "y2",
      stroke: LINK_COLOR,
      strokeOpacity: { value: "opacity", scale: null },
      strokeWidth: "width",
      strokeLinecap: "round",
      ariaDescription: "coupling line",
    }),
    Plot.dot(sourceDots, dotOptions(SOURCE_COLOR, "source point")),
    Plot.dot(targetDots, dotOptions(TARGET_COLOR, "target point")),
  ];

  const options: Plot.PlotOptions = oneD
    ? {
        width,
        height: 200,
        marginLeft: 60,
        style: PLOT_STYLE,
        x: { label: "position", nice: true },
        y: { type: "point", domain: [SOURCE_ROW, TARGET_ROW], label: null, padding: 0.6 },
        r: { type: "sqrt", domain: [0, maxPointMass], range: [0, rMax] },
        marks: [Plot.ruleY([SOURCE_ROW, TARGET_ROW], { stroke: RULE, ariaDescription: "baseline" }), ...marks],
      }
    : {
        width,
        ...shape2d(source, target, width),
        style: PLOT_STYLE,
        x: { label: "coordinate 1", nice: true },
        y: { label: "coordinate 2", nice: true },
        r: { type: "sqrt", domain: [0, maxPointMass], range: [0, rMax] },
        marks,
      };

  const pairs = formatCount(top.positiveCount);
  const notes = [
    `Drew ${formatCount(segments.length)} of ${pairs} ${top.positiveCount === 1 ? "pair" : "pairs"} with positive mass, carrying ${formatPercent(massShare)} of the transported mass.`,
    "Dot area is proportional to point mass; line opacity and width grow with transported mass.",
  ];
  return {
    figure: "coupling-lines",
    options,
    title,
    key: [
      { label: "source", color: SOURCE_COLOR, shape: "dot" },
      { label: "target", color: TARGET_COLOR, shape: "dot" },
      { label: "transported mass", color: LINK_COLOR, shape: "line" },
    ],
    notes,
    cautions: [...cautions, ...autoCautions],
    facts: { linesDrawn: segments.length, pairsWithMass: top.positiveCount, massShare, totalMass: top.totalMass, shownDim: oneD ? 1 : 2 },
  };
}

/** Equal units on both axes when the clouds are not too elongated; else a fixed height. */
function shape2d(source: PointMeasure, target: PointMeasure, width: number): { aspectRatio?: number; height?: number } {
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (const m of [source, target]) {
    for (let i = 0; i < m.n; i++) {
      const x = m.points[i * m.dim], y = m.points[i * m.dim + 1];
      x0 = Math.min(x0, x); x1 = Math.max(x1, x);
      y0 = Math.min(y0, y); y1 = Math.max(y1, y);
    }
  }
  const dx = x1 - x0, dy = y1 - y0;
  const ratio = dx > 0 ? dy / dx : Infinity;
  if (ratio >= 0.4 && ratio <= 1) return { aspectRatio: 1 };
  return { height: Math.round(width * 0.62) };
}

function clamp(v: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, v));
}

function round3(v: number): number {
  return Math.round(v * 1000) / 1000;
}
