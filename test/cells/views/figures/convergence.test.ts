import { describe, expect, it } from "vitest";
import { convergenceFigure } from "../../../../cells/views/figures/convergence";
import { renderSvg } from "../../../../cells/views/render-svg";
import { TransportInputError } from "../../../../core/errors";
import { dataOf, markNamed, failOnPlotWarnings } from "./figure-helpers";

const iterations = (n: number) => Int32Array.from({ length: n }, (_, k) => k + 1);

failOnPlotWarnings();

describe("convergenceFigure", () => {
  it("convergenceFigure(two histories) draws one line per solve and one tolerance rule per stated tolerance", () => {
    const spec = convergenceFigure({
      histories: [
        { label: "ε = 0.1", iterations: iterations(4), errors: Float64Array.of(1, 0.1, 0.01, 0.001), tolerance: 0.01 },
        { label: "ε = 1", iterations: iterations(3), errors: Float64Array.of(0.5, 0.05, 0.005) },
      ],
    });
    const points = dataOf<{ label: string }>(markNamed(spec, "error history"));
    expect(new Set(points.map((p) => p.label))).toEqual(new Set(["ε = 0.1", "ε = 1"]));
    expect(dataOf(markNamed(spec, "tolerance"))).toHaveLength(1);
    expect(spec.key.map((k) => k.label)).toEqual(["ε = 0.1", "ε = 1", "tolerance"]);
    expect(spec.facts).toEqual({ lines: 2, pointsDropped: 0, aboveTolerance: 0 });
    expect(spec.cautions).toEqual([]);
    const svg = renderSvg(spec);
    expect(svg.match(/<path [^>]*stroke="#[0-9a-f]{6}"/g)?.length ?? 0).toBeGreaterThanOrEqual(2);
  });

  it("convergenceFigure(history) puts error on a log axis labelled by decades", () => {
    const spec = convergenceFigure({ histories: [{ label: "a", iterations: iterations(3), errors: Float64Array.of(0.3, 2e-4, 4e-7), tolerance: 1e-6 }] });
    const y = spec.options.y as { type: string; ticks: number[]; domain: number[] };
    expect(y.type).toBe("log");
    expect(y.ticks).toEqual([1e-7, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 1e-1, 1]);
    expect(y.domain).toEqual([1e-7, 1]);
    const svg = renderSvg(spec);
    expect(svg).toContain(">1e\u22126<");
    expect(svg).toContain(">0.01<");
  });

  it("renderSvg(convergenceFigure(geometric errors)) draws a straight line: equal steps on the log axis", () => {
    // Sinkhorn's error decays geometrically (linear convergence, Franklin & Lorenz 1989);
    // on a log10 axis e_k = 2^−k must plot as equally spaced heights.
    const errors = Float64Array.from({ length: 12 }, (_, k) => 2 ** -(k + 1));
    const svg = renderSvg(convergenceFigure({ histories: [{ label: "a", iterations: iterations(12), errors }] }));
    const d = /<g[^>]*aria-description="error history"[^>]*><path[^>]*\sd="([^"]+)"/.exec(svg)![1];
    const ys = [...d.matchAll(/[ML][^,]+,([-\d.]+)/g)].map((m) => Number(m[1]));
    expect(ys).toHaveLength(12);
    const steps = ys.slice(1).map((v, k) => v - ys[k]);
    for (const s of steps) expect(s).toBeCloseTo(steps[0], 1); // 0.01-px rounding in the output
    expect(steps[0]).toBeGreaterThan(0); // smaller errors lower on the page
  });

  it("convergenceFigure(errors with zeros) leaves them out and counts them in the caption", () => {
    const spec = convergenceFigure({ histories: [{ label: "a", iterations: iterations(4), errors: Float64Array.of(0.1, 0.01, 0, NaN) }] });
    expect(spec.facts.pointsDropped).toBe(2);
    expect(dataOf(markNamed(spec, "error history"))).toHaveLength(2);
    expect(spec.notes).toContain("2 recorded errors of 0 or not finite left out (no place on a log axis).");
  });

  it("convergenceFigure(last error above tolerance) adds a caution after the caller's", () => {
    const spec = convergenceFigure({
      histories: [{ label: "ε = 0.01", iterations: Int32Array.of(10, 5000), errors: Float64Array.of(0.2, 3e-4), tolerance: 1e-6 }],
      cautions: ["not converged after 5000 iterations"],
    });
    expect(spec.facts.aboveTolerance).toBe(1);
    expect(spec.cautions).toEqual(["not converged after 5000 iterations", "ε = 0.01: last error 3e\u22124 is above the tolerance 1e\u22126."]);
    expect(spec.notes[0]).toBe("ε = 0.01: 5,000 iterations, last error 3e\u22124 (tolerance 1e\u22126).");
  });

  it("convergenceFigure(mismatched lengths or duplicate labels) throws a TransportInputError naming the history", () => {
    expect(() => convergenceFigure({ histories: [{ label: "a", iterations: iterations(3), errors: Float64Array.of(1, 2) }] })).toThrow(/^histories\[0\]\.errors:/);
    const h = { label: "a", iterations: iterations(1), errors: Float64Array.of(1) };
    expect(() => convergenceFigure({ histories: [h, h] })).toThrow(TransportInputError);
    expect(() => convergenceFigure({ histories: [h, h] })).toThrow(/^histories\[1\]\.label:/);
  });
});
