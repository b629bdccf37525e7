import * as Plot from "@observablehq/plot";
import { TransportInputError, describeValue } from "../../../core/errors";
import { FIGURE_WIDTH, PLOT_STYLE, SERIES_COLORS } from "../theme";
import type { CommonFigureOptions, FigureKeyEntry, FigureSpec } from "./figure-spec";
import { formatCount } from "./format-number";

/** One measurement of a sweep: setting `x` gave value `y` (in replicate `replicate` of `series`). */
export interface SweepRow {
  x: number;
  y: number;
  /** Replicate number (e.g. the seed index); only used to count replicates. */
  replicate?: number;
  /** Curve the row belongs to, e.g. "entropic" vs "debiased". Default: one unnamed series. */
  series?: string;
}

/** Input of {@link sweepCurveFigure}. */
export interface SweepCurveInput extends CommonFigureOptions {
  rows: readonly SweepRow[];
  xLabel: string;
  yLabel: string;
  /** Log scale on x; rows with x ≤ 0 are left out and counted. Default false. */
  logX?: boolean;
  /** Log scale on y; rows with y ≤ 0 are left out and counted. Default false. */
  logY?: boolean;
  /**
   * Spread drawn around the mean at each x: "min-max" (range of the replicates,
   * default) or "sd" (mean ± one sample standard deviation, divisor n − 1).
   */
  band?: "min-max" | "sd";
}

/** Numbers stated in the caption of {@link sweepCurveFigure}. */
export interface SweepCurveFacts {
  readonly series: number;
  /** Distinct x settings over all series. */
  readonly settings: number;
  /** Fewest and most replicates at one setting. */
  readonly minReplicates: number;
  readonly maxReplicates: number;
  /** Rows left out: not finite, or not positive on a log axis. */
  readonly rowsDropped: number;
  readonly band: "min-max" | "sd";
}

interface Summary {
  series: string;
  x: number;
  mean: number;
  lo: number;
  hi: number;
  count: number;
}

const UNNAMED = "";

/**
 * Sweep curve: how a result moves as one setting is swept. For each series, a line
 * through the mean of the replicates at each setting, a faint band for their spread
 * (min–max by default, or ±1 sd; the caption says which), and every replicate as a
 * faint dot. Optional log axes; rows that cannot be drawn are left out and counted.
 */
export function sweepCurveFigure(input: SweepCurveInput): FigureSpec<SweepCurveFacts> {
  const { rows, xLabel, yLabel, logX = false, logY = false, band = "min-max", title, cautions = [], width = FIGURE_WIDTH } = input;
  if (band !== "min-max" && band !== "sd") throw new TransportInputError("band", `must be "min-max" or "sd", got ${describeValue(band)}`, band);

  const kept: Array<{ x: number; y: number; series: string }> = [];
  let dropped = 0;
  for (const row of rows) {
    const ok = Number.isFinite(row.x) && Number.isFinite(row.y) && (!logX || row.x > 0) && (!logY || row.y > 0);
    if (ok) kept.push({ x: row.x, y: row.y, series: row.series ?? UNNAMED });
    else dropped++;
  }

  // Group by series (first-appearance order), then by x (ascending).
  const groups = new Map<string, Map<number, number[]>>();
  for (const r of kept) {
    let bySetting = groups.get(r.series);
    if (!bySetting) groups.set(r.series, (bySetting = new Map()));
    let ys = bySetting.get(r.x);
    if (!ys) bySetting.set(r.x, (ys = []));
    ys.push(r.y);
  }
  const summaries: Summary[] = [];
  let clipped = false;
  const settings = new Set<number>();
  for (const [series, bySetting] of groups) {
    for (const x of [...bySetting.keys()].sort((a, b) => a - b)) {
      settings.add(x);
      const ys = bySetting.get(x)!;
      const count = ys.length;
      const mean = ys.reduce((s, v) => s + v, 0) / count;
      let lo = Math.min(...ys);
      let hi = Math.max(...ys);
      if (band === "sd") {
        const sd = count > 1 ? Math.sqrt(ys.reduce((s, v) => s + (v - mean) ** 2, 0) / (count - 1)) : 0;
        const smallest = lo;
        lo = mean - sd;
        hi = mean + sd;
        if (logY && !(lo > 0)) {
          lo = smallest;
          clipped = true;
        }
      }
      summaries.push({ series, x, mean, lo, hi, count });
    }
  }

  const seriesNames = [...groups.keys()];
  const range = seriesNames.map((_, k) => SERIES_COLORS[k % SERIES_COLORS.length]);
  const counts = summaries.map((s) => s.count);
  const minReplicates = counts.length > 0 ? Math.min(...counts) : 0;
  const maxReplicates = counts.length > 0 ? Math.max(...counts) : 0;

  const bandWords = band === "min-max" ? "the range (min–max) of the replicates" : "mean ± 1 standard deviation of the replicates (sample sd, n − 1)";
  const replicateWords = minReplicates === maxReplicates ? `${formatCount(minReplicates)}` : `${formatCount(minReplicates)}–${formatCount(maxReplicates)}`;
  const notes = [
    maxReplicates > 1
      ? `Line: mean of ${replicateWords} replicates per setting; band: ${bandWords}; dots: single replicates.`
      : "Line: the value at each setting (one replicate each, so no band is drawn).",
  ];
  if (dropped > 0) notes.push(`${formatCount(dropped)} ${dropped === 1 ? "row" : "rows"} left out (not finite${logX || logY ? ", or not positive on a log axis" : ""}).`);
  const autoCautions: string[] = [];
  if (clipped) autoCautions.push("Where mean − 1 sd is not positive, the band's lower edge is cut at the smallest replicate (log axis).");

  const named = seriesNames.length > 1 || (seriesNames.length === 1 && seriesNames[0] !== UNNAMED);
  const key: FigureKeyEntry[] = named ? seriesNames.map((s, k) => ({ label: s, color: range[k], shape: "line" })) : [];
  if (maxReplicates > 1) key.push({ label: band === "min-max" ? "min–max band" : "±1 sd band", color: range[0] ?? SERIES_COLORS[0], shape: "band" });

  const options: Plot.PlotOptions = {
    width,
    height: 340,
    marginLeft: 60,
    style: PLOT_STYLE,
    x: { type: logX ? "log" : "linear", label: xLabel, nice: !logX, grid: true },
    y: { type: logY ? "log" : "linear", label: yLabel, nice: !logY, grid: true },
    color: { type: "ordinal", domain: seriesNames, range },
    marks: [
      ...(maxReplicates > 1 ? [Plot.areaY(summaries, { x: "x", y1: "lo", y2: "hi", z: "series", fill: "series", fillOpacity: 0.16, ariaDescription: "spread band" })] : []),
      Plot.dot(kept, { x: "x", y: "y", fill: "series", r: 1.8, fillOpacity: 0.35, ariaDescription: "replicate" }),
      Plot.line(summaries, { x: "x", y: "mean", z: "series", stroke: "series", strokeWidth: 1.8, ariaDescription: "mean curve" }),
      Plot.dot(summaries, { x: "x", y: "mean", fill: "series", r: 2.6, ariaDescription: "mean point" }),
    ],
  };
  return {
    figure: "sweep-curve",
    options,
    title,
    key,
    notes,
    cautions: [...cautions, ...autoCautions],
    facts: { series: seriesNames.length, settings: settings.size, minReplicates, maxReplicates, rowsDropped: dropped, band },
  };
}
