import * as Plot from "@observablehq/plot";
import { TransportInputError, describeValue } from "../../../core/errors";
import type { Matrix } from "../../../core/matrix";
import { type Measure, measureDimension, measurePoints, supportSize } from "../../../core/measure";
import type { TransportPlan } from "../../../core/result";
import { FIGURE_WIDTH, MASS_RAMP, PLOT_STYLE, RULE } from "../theme";
import type { CommonFigureOptions, FigureSpec } from "./figure-spec";
import { formatCount, formatNumber } from "./format-number";
import { densePlan } from "./plan-entries";

/** Input of {@link planMatrixFigure}. */
export interface PlanMatrixInput extends CommonFigureOptions {
  plan: TransportPlan;
  /** Cost matrix (rows × cols); required for an entropic (gibbs) plan. */
  cost?: Matrix;
  /**
   * Display order of the source points: `sourceOrder[k]` is the index of the point
   * drawn in row k (a permutation of 0..rows−1). Default: index order. See
   * {@link orderByCoordinate}.
   */
  sourceOrder?: ArrayLike<number>;
  /** Display order of the target points (columns), as `sourceOrder`. */
  targetOrder?: ArrayLike<number>;
  /**
   * Most cells per side (integer ≥ 1, default 80). Larger plans are summed over
   * contiguous blocks of the display order so the SVG stays small.
   */
  maxCells?: number;
  /** Axis label for rows. Default "source (ordered)" with an order, else "source index". */
  sourceLabel?: string;
  /** Axis label for columns. Default "target (ordered)" with an order, else "target index". */
  targetLabel?: string;
}

/** Numbers stated in the caption of {@link planMatrixFigure}. */
export interface PlanMatrixFacts {
  /** Rows and columns of cells drawn. */
  readonly cellRows: number;
  readonly cellCols: number;
  /** Largest number of source (target) points summed into one row (column) of cells. */
  readonly pointsPerRow: number;
  readonly pointsPerCol: number;
  /** Largest cell mass (the top of the colour scale). */
  readonly maxCellMass: number;
  /** Σ P_ij. */
  readonly totalMass: number;
  /** Number of colour steps of the quantized scale. */
  readonly colorSteps: number;
  /** Cells drawn as rectangles. */
  readonly cellsDrawn: number;
  /**
   * True when every cell has mass (entropic plans): the palest step is then painted as
   * the background and cells in it are not drawn one by one.
   */
  readonly backgroundFilled: boolean;
}

interface Cell {
  row: number;
  col: number;
  mass: number;
}

/**
 * Plan matrix: the plan as a heatmap, source points down the rows and target points
 * along the columns (row 1 at the top, as a matrix is written), in a chosen order
 * (e.g. by first coordinate, which makes a monotone 1-D plan a staircase on the
 * diagonal). Colour is a quantized scale of 7 steps from pale (little mass) to dark;
 * cells without mass are left blank. Plans larger than `maxCells` per side are
 * summed over contiguous blocks and the caption says how many points a cell holds.
 */
export function planMatrixFigure(input: PlanMatrixInput): FigureSpec<PlanMatrixFacts> {
  const { plan, cost, sourceOrder, targetOrder, maxCells = 80, title, cautions = [], width = FIGURE_WIDTH } = input;
  if (!Number.isInteger(maxCells) || maxCells < 1) throw new TransportInputError("maxCells", `must be an integer >= 1, got ${describeValue(maxCells)}`, maxCells);
  const { rows, cols } = plan;
  const rowOrder = checkOrder(sourceOrder, rows, "sourceOrder");
  const colOrder = checkOrder(targetOrder, cols, "targetOrder");
  const dense = densePlan(plan, cost);

  const cellRows = Math.min(rows, maxCells);
  const cellCols = Math.min(cols, maxCells);
  // Block of display position k: floor(k·B/n) gives contiguous, near-equal blocks.
  const rowBlock = new Int32Array(rows);
  rowOrder.forEach((i, k) => (rowBlock[i] = Math.floor((k * cellRows) / rows)));
  const colBlock = new Int32Array(cols);
  colOrder.forEach((j, k) => (colBlock[j] = Math.floor((k * cellCols) / cols)));

  const sums = new Float64Array(cellRows * cellCols);
  let totalMass = 0;
  for (let i = 0; i < rows; i++) {
    const base = rowBlock[i] * cellCols;
    for (let j = 0; j < cols; j++) {
      const p = dense.data[i * cols + j];
      sums[base + colBlock[j]] += p;
      totalMass += p;
    }
  }
  const cells: Cell[] = [];
  let maxCellMass = 0;
  for (let r = 0; r < cellRows; r++) {
    for (let c = 0; c < cellCols; c++) {
      const m = sums[r * cellCols + c];
      if (m > 0) {
        cells.push({ row: r, col: c, mass: m });
        maxCellMass = Math.max(maxCellMass, m);
      }
    }
  }

  // An entropic plan puts mass in every cell. Then the palest colour step is painted once
  // as the background and only cells above it are drawn: the picture is identical (the
  // first threshold is computed as Plot's quantize scale does, max·(1/steps)) and the
  // SVG is several times smaller.
  const steps = MASS_RAMP.length;
  const backgroundFilled = cells.length === cellRows * cellCols && cells.length > 0;
  const firstThreshold = maxCellMass * (1 / steps);
  const drawn = backgroundFilled ? cells.filter((c) => !(c.mass < firstThreshold)) : cells;

  const blockStart = (k: number, n: number, b: number) => Math.ceil((k * n) / b);
  const pointsPerRow = maxBlockSize(rows, cellRows);
  const pointsPerCol = maxBlockSize(cols, cellCols);
  const ticks = (b: number) => {
    const step = Math.max(1, Math.ceil(b / 8));
    return Array.from({ length: Math.ceil(b / step) }, (_, k) => k * step);
  };

  const marginLeft = 56;
  const marginRight = 12;
  const marginTop = 12;
  const marginBottom = 40;
  const cellSize = (width - marginLeft - marginRight) / cellCols;
  const height = Math.round(Math.min(760, Math.max(160, cellRows * cellSize + marginTop + marginBottom)));

  const rowLabel = input.sourceLabel ?? (sourceOrder ? "source (ordered)" : "source index");
  const colLabel = input.targetLabel ?? (targetOrder ? "target (ordered)" : "target index");
  const options: Plot.PlotOptions = {
    width,
    height,
    marginLeft,
    marginRight,
    marginTop,
    marginBottom,
    style: PLOT_STYLE,
    x: {
      type: "band",
      domain: range(cellCols),
      padding: 0,
      round: false,
      ticks: ticks(cellCols),
      tickFormat: (k: number) => String(blockStart(k, cols, cellCols) + 1),
      label: colLabel,
      labelAnchor: "center",
    },
    y: {
      type: "band",
      domain: range(cellRows),
      padding: 0,
      round: false,
      ticks: ticks(cellRows),
      tickFormat: (k: number) => String(blockStart(k, rows, cellRows) + 1),
      label: rowLabel,
      labelAnchor: "center",
    },
    color: legendScale({
      type: "quantize",
      domain: [0, maxCellMass > 0 ? maxCellMass : 1],
      range: [...MASS_RAMP],
      legend: "ramp",
      label: pointsPerRow * pointsPerCol > 1 ? "mass per cell (block sum)" : "mass per cell",
      tickFormat: (v: number) => formatNumber(v, 2),
      width: 400,
    }),
    marks: [
      ...(backgroundFilled ? [Plot.frame({ fill: MASS_RAMP[0], stroke: null, ariaDescription: "palest step" })] : []),
      Plot.frame({ stroke: RULE, ariaDescription: "matrix frame" }),
      Plot.cell(drawn, { x: "col", y: "row", fill: "mass", inset: 0, shapeRendering: "crispEdges", ariaDescription: "plan cell" }),
    ],
  };

  const notes = [
    `${formatCount(rows)} source × ${formatCount(cols)} target points; colour shows transported mass in ${steps} equal steps up to ${formatNumber(maxCellMass, 3)}` +
      (backgroundFilled ? "; every cell carries some mass." : "; blank cells carry no mass."),
  ];
  if (pointsPerRow > 1 || pointsPerCol > 1) {
    notes.push(`Each cell sums a block of up to ${pointsPerRow} × ${pointsPerCol} point pairs (${cellRows} × ${cellCols} cells drawn); tick labels give the first position in the block.`);
  }
  return {
    figure: "plan-matrix",
    options,
    title,
    key: [],
    notes,
    cautions: [...cautions],
    facts: { cellRows, cellCols, pointsPerRow, pointsPerCol, maxCellMass, totalMass, colorSteps: steps, cellsDrawn: drawn.length, backgroundFilled },
  };
}

/**
 * A display order sorting the support points of `measure` by coordinate `axis`
 * (default 0), ties kept in index order: `order[k]` is the index of the k-th point.
 * For a plan matrix this shows 1-D monotone couplings as a diagonal staircase.
 */
export function orderByCoordinate(measure: Measure, axis = 0): Int32Array {
  const d = measureDimension(measure);
  if (!Number.isInteger(axis) || axis < 0 || axis >= d) throw new TransportInputError("axis", `must be an integer in [0, ${d}), got ${describeValue(axis)}`, axis);
  const points = measurePoints(measure);
  const n = supportSize(measure);
  const order = Array.from({ length: n }, (_, i) => i);
  order.sort((a, b) => points[a * d + axis] - points[b * d + axis] || a - b);
  return Int32Array.from(order);
}

function checkOrder(order: ArrayLike<number> | undefined, n: number, field: string): Int32Array {
  if (order === undefined) return Int32Array.from({ length: n }, (_, i) => i);
  if (order.length !== n) throw new TransportInputError(field, `length mismatch: expected ${n} indices, got ${order.length}`, order.length);
  const seen = new Uint8Array(n);
  const out = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const i = order[k];
    if (!Number.isInteger(i) || i < 0 || i >= n || seen[i]) {
      throw new TransportInputError(`${field}[${k}]`, `must be a permutation of 0..${n - 1}; got ${describeValue(i)}`, i);
    }
    seen[i] = 1;
    out[k] = i;
  }
  return out;
}

function maxBlockSize(n: number, blocks: number): number {
  let most = 0;
  for (let k = 0; k < blocks; k++) most = Math.max(most, Math.ceil(((k + 1) * n) / blocks) - Math.ceil((k * n) / blocks));
  return most;
}

function range(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i);
}

/** Scale options with legend options (Plot reads legend width from the scale; its types do not say so). */
function legendScale(options: Plot.ScaleOptions & Plot.LegendOptions): Plot.ScaleOptions {
  return options;
}
