import * as Plot from "@observablehq/plot";
import { TransportInputError, describeValue } from "../../../core/errors";
import { FIGURE_WIDTH, PLOT_STYLE, SERIES_COLORS } from "../theme";
import type { CommonFigureOptions, FigureKeyEntry, FigureSpec } from "./figure-spec";
import { formatCount, formatNumber } from "./format-number";

/** One solve's error history, as in a result's `diagnostics.historyIterations` / `history`. */
export interface ConvergenceHistory {
  /** Name in the key, e.g. "ε = 0.05". Labels must be distinct. */
  label: string;
  /** Iteration number of each entry. */
  iterations: Int32Array;
  /** Marginal error after each of those iterations (relative L1, ≥ 0). */
  errors: Float64Array;
  /** Stopping tolerance of this solve, drawn as a dashed rule. */
  tolerance?: number;
}

/** Input of {@link convergenceFigure}. */
export interface ConvergenceInput extends CommonFigureOptions {
  histories: readonly ConvergenceHistory[];
}

/** Numbers stated in the caption of {@link convergenceFigure}. */
export interface ConvergenceFacts {
  readonly lines: number;
  /** Points left out because the error was 0, negative or not finite (no place on a log axis). */
  readonly pointsDropped: number;
  /** Solves whose last error is above their tolerance. */
  readonly aboveTolerance: number;
}

interface ErrorPoint {
  label: string;
  iteration: number;
  error: number;
}

/**
 * Convergence: marginal error against iteration on a log10 axis, one line per solve
 * in its own colour, with each solve's tolerance as a dashed rule in the same colour
 * and a dot on its last recorded error. Errors that are 0 or not finite cannot sit on
 * a log axis: they are left out and the caption counts them. A solve whose last
 * error is above its tolerance gets a caution.
 */
export function convergenceFigure(input: ConvergenceInput): FigureSpec<ConvergenceFacts> {
  const { histories, title, cautions = [], width = FIGURE_WIDTH } = input;
  const labels = new Set<string>();
  histories.forEach((h, k) => {
    if (h.iterations.length !== h.errors.length) {
      throw new TransportInputError(`histories[${k}].errors`, `length mismatch: ${h.errors.length} errors for ${h.iterations.length} iterations`, h.errors.length);
    }
    if (labels.has(h.label)) throw new TransportInputError(`histories[${k}].label`, `duplicate label ${describeValue(h.label)}`, h.label);
    labels.add(h.label);
    if (h.tolerance !== undefined && !(h.tolerance > 0 && Number.isFinite(h.tolerance))) {
      throw new TransportInputError(`histories[${k}].tolerance`, `must be > 0 and finite, got ${describeValue(h.tolerance)}`, h.tolerance);
    }
  });

  const points: ErrorPoint[] = [];
  const finals: ErrorPoint[] = [];
  const rules: Array<{ label: string; tolerance: number }> = [];
  const notes: string[] = [];
  const autoCautions: string[] = [];
  let dropped = 0;
  let above = 0;
  for (const h of histories) {
    let last: ErrorPoint | undefined;
    for (let k = 0; k < h.errors.length; k++) {
      const e = h.errors[k];
      if (e > 0 && Number.isFinite(e)) {
        last = { label: h.label, iteration: h.iterations[k], error: e };
        points.push(last);
      } else dropped++;
    }
    if (last) finals.push(last);
    if (h.tolerance !== undefined) rules.push({ label: h.label, tolerance: h.tolerance });
    const n = h.errors.length;
    const finalError = n > 0 ? h.errors[n - 1] : NaN;
    const finalIteration = n > 0 ? h.iterations[n - 1] : 0;
    notes.push(
      `${h.label}: ${formatCount(finalIteration)} iterations, last error ${formatNumber(finalError, 2)}` +
        (h.tolerance !== undefined ? ` (tolerance ${formatNumber(h.tolerance, 2)}).` : "."),
    );
    if (h.tolerance !== undefined && n > 0 && !(finalError <= h.tolerance)) {
      above++;
      autoCautions.push(`${h.label}: last error ${formatNumber(finalError, 2)} is above the tolerance ${formatNumber(h.tolerance, 2)}.`);
    }
  }
  if (dropped > 0) notes.push(`${formatCount(dropped)} recorded ${dropped === 1 ? "error" : "errors"} of 0 or not finite left out (no place on a log axis).`);

  const domain = histories.map((h) => h.label);
  const range = domain.map((_, k) => SERIES_COLORS[k % SERIES_COLORS.length]);
  const key: FigureKeyEntry[] = domain.map((label, k) => ({ label, color: range[k], shape: "line" }));
  if (rules.length > 0) key.push({ label: "tolerance", color: "#5c6670", shape: "dash" });

  const decades = decadeTicks([...points.map((p) => p.error), ...rules.map((r) => r.tolerance)]);
  const options: Plot.PlotOptions = {
    width,
    height: 320,
    marginLeft: 56,
    style: PLOT_STYLE,
    x: { label: "iteration", nice: true },
    y: { type: "log", label: "marginal error (log scale)", grid: true, ...(decades.length > 1 ? { domain: [decades[0], decades[decades.length - 1]] } : {}), ticks: decades, tickFormat: (v: number) => formatNumber(v, 1) },
    color: { type: "ordinal", domain, range },
    marks: [
      Plot.ruleY(rules, { y: "tolerance", stroke: "label", strokeDasharray: "4,3", strokeOpacity: 0.8, ariaDescription: "tolerance" }),
      Plot.line(points, { x: "iteration", y: "error", z: "label", stroke: "label", strokeWidth: 1.6, ariaDescription: "error history" }),
      Plot.dot(finals, { x: "iteration", y: "error", fill: "label", r: 2.5, ariaDescription: "last error" }),
    ],
  };
  return {
    figure: "convergence",
    options,
    title,
    key,
    notes,
    cautions: [...cautions, ...autoCautions],
    facts: { lines: histories.length, pointsDropped: dropped, aboveTolerance: above },
  };
}

/**
 * Powers of ten covering the values (every second or third power when the span is
 * wide), used both as the log axis's domain and its ticks so that the axis starts
 * and ends on a labelled decade.
 */
function decadeTicks(values: readonly number[]): number[] {
  if (values.length === 0) return [];
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    const e = Math.log10(v);
    lo = Math.min(lo, e);
    hi = Math.max(hi, e);
  }
  const first = Math.floor(lo);
  const last = Math.ceil(hi);
  const step = Math.max(1, Math.ceil((last - first) / 8));
  const ticks: number[] = [];
  // Step from the top so the largest decade is always a tick; the bottom is extended to a whole step.
  let k = Math.max(last, first + 1);
  for (; k > first; k -= step) ticks.push(Number(`1e${k}`));
  ticks.push(Number(`1e${k}`));
  return ticks.reverse();
}
