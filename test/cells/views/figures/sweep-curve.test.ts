import { describe, expect, it } from "vitest";
import { sweepCurveFigure, type SweepRow } from "../../../../cells/views/figures/sweep-curve";
import { renderSvg } from "../../../../cells/views/render-svg";
import { dataOf, markNamed, failOnPlotWarnings } from "./figure-helpers";

type Summary = { series: string; x: number; mean: number; lo: number; hi: number; count: number };

const rows: SweepRow[] = [
  { x: 10, y: 1, replicate: 0 },
  { x: 10, y: 2, replicate: 1 },
  { x: 10, y: 6, replicate: 2 },
  { x: 100, y: 0.5, replicate: 0 },
  { x: 100, y: 0.5, replicate: 1 },
  { x: 100, y: 0.8, replicate: 2 },
];

failOnPlotWarnings();

describe("sweepCurveFigure", () => {
  it("sweepCurveFigure(replicates) draws the mean per setting with a min–max band and says so", () => {
    const spec = sweepCurveFigure({ rows, xLabel: "n", yLabel: "value" });
    const means = dataOf<Summary>(markNamed(spec, "mean curve"));
    expect(means.map((s) => [s.x, s.mean, s.lo, s.hi, s.count])).toEqual([
      [10, 3, 1, 6, 3],
      [100, 0.6, 0.5, 0.8, 3],
    ]);
    expect(dataOf(markNamed(spec, "replicate"))).toHaveLength(6);
    expect(dataOf(markNamed(spec, "spread band"))).toHaveLength(2);
    expect(spec.notes[0]).toBe("Line: mean of 3 replicates per setting; band: the range (min–max) of the replicates; dots: single replicates.");
    expect(spec.facts).toMatchObject({ series: 1, settings: 2, minReplicates: 3, maxReplicates: 3, band: "min-max" });
  });

  it("sweepCurveFigure({band: \"sd\"}) uses mean ± one sample standard deviation and says so", () => {
    // Sample sd with divisor n − 1 (Bessel's correction; common practice, no source):
    // {1, 2, 6}: mean 3, squared deviations 4 + 1 + 9 = 14, sd = √7.
    const spec = sweepCurveFigure({ rows, xLabel: "n", yLabel: "value", band: "sd" });
    const first = dataOf<Summary>(markNamed(spec, "mean curve"))[0];
    expect(first.lo).toBeCloseTo(3 - Math.sqrt(7), 14);
    expect(first.hi).toBeCloseTo(3 + Math.sqrt(7), 14);
    expect(spec.notes[0]).toContain("mean ± 1 standard deviation of the replicates (sample sd, n − 1)");
  });

  it("sweepCurveFigure({logY, band: \"sd\"}) cuts a non-positive lower band edge at the smallest replicate and cautions", () => {
    // {0.1, 0.1, 5}: mean 1.733, sample sd 2.829 > mean, so mean − sd < 0 has no place on a log axis.
    const skewed = [0.1, 0.1, 5].map((y, replicate) => ({ x: 1, y, replicate }));
    const spec = sweepCurveFigure({ rows: [...skewed, ...rows], xLabel: "n", yLabel: "value", band: "sd", logY: true });
    const [cut, kept] = dataOf<Summary>(markNamed(spec, "mean curve"));
    expect(cut.lo).toBe(0.1);
    expect(kept.lo).toBeCloseTo(3 - Math.sqrt(7), 14); // positive: left as it is
    expect(spec.cautions).toEqual(["Where mean − 1 sd is not positive, the band's lower edge is cut at the smallest replicate (log axis)."]);
  });

  it("sweepCurveFigure({logX, logY}) sets log scales and leaves out non-positive rows", () => {
    const spec = sweepCurveFigure({ rows: [...rows, { x: 0, y: 1 }, { x: 10, y: -1 }, { x: 10, y: NaN }], xLabel: "n", yLabel: "value", logX: true, logY: true });
    expect((spec.options.x as { type: string }).type).toBe("log");
    expect((spec.options.y as { type: string }).type).toBe("log");
    expect(spec.facts.rowsDropped).toBe(3);
    expect(spec.notes).toContain("3 rows left out (not finite, or not positive on a log axis).");
    const svg = renderSvg(spec);
    expect(svg).toContain(">10<");
    expect(svg).toContain(">100<");
  });

  it("sweepCurveFigure(two series) draws one curve each and names them in the key", () => {
    const two = [...rows.map((r) => ({ ...r, series: "exact" })), ...rows.map((r) => ({ ...r, y: r.y * 2, series: "entropic" }))];
    const spec = sweepCurveFigure({ rows: two, xLabel: "n", yLabel: "value" });
    expect(spec.facts.series).toBe(2);
    expect(spec.key.map((k) => k.label)).toEqual(["exact", "entropic", "min–max band"]);
    const svg = renderSvg(spec);
    const curves = /<g[^>]*aria-description="mean curve"[^>]*>(.*?)<\/g>/s.exec(svg)![1];
    expect(curves.match(/<path /g)).toHaveLength(2);
  });

  it("sweepCurveFigure(one replicate per setting) draws no band and says why", () => {
    const spec = sweepCurveFigure({ rows: [{ x: 1, y: 1 }, { x: 2, y: 3 }], xLabel: "ε", yLabel: "value" });
    expect(() => markNamed(spec, "spread band")).toThrow(/no mark/);
    expect(spec.notes[0]).toBe("Line: the value at each setting (one replicate each, so no band is drawn).");
  });
});
