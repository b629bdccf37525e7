import { describe, expect, it } from "vitest";
import { potentialsFigure } from "../../../../cells/views/figures/potentials";
import { renderSvg } from "../../../../cells/views/render-svg";
import { POTENTIAL_RAMP, TARGET_COLOR } from "../../../../cells/views/theme";
import { TransportInputError } from "../../../../core/errors";
import { gridMeasure, pointMeasure } from "../../../../core/measure";
import { dataOf, marksOf, markNamed, failOnPlotWarnings } from "./figure-helpers";

failOnPlotWarnings();

describe("potentialsFigure", () => {
  it("potentialsFigure(1-D measure) draws the potential as a line over position, sorted by position", () => {
    const measure = pointMeasure([2, -1, 0.5]);
    const spec = potentialsFigure({ measure, potential: Float64Array.of(4, 1, 0.25), label: "g", side: "target" });
    const line = dataOf<{ x: number; value: number }>(markNamed(spec, "potential line"));
    expect(line.map((r) => [r.x, r.value])).toEqual([[-1, 1], [0.5, 0.25], [2, 4]]);
    expect(spec.facts).toMatchObject({ shownDim: 1, min: 0.25, max: 4, pointsDropped: 0 });
    expect((spec.options.y as { label: string }).label).toBe("g");
    expect(renderSvg(spec)).toContain(`stroke="${TARGET_COLOR}"`);
  });

  it("potentialsFigure(2-D points) colours each point on a quantized 7-step scale with a legend", () => {
    const measure = pointMeasure([[0, 0], [1, 0], [0, 1], [1, 1]]);
    const spec = potentialsFigure({ measure, potential: Float64Array.of(-1, 0, 1, 2), label: "f" });
    const color = spec.options.color as { type: string; range: string[]; domain: number[] };
    expect(color.type).toBe("quantize");
    expect(color.range).toEqual([...POTENTIAL_RAMP]);
    expect(color.domain).toEqual([-1, 2]);
    expect(dataOf(markNamed(spec, "potential point"))).toHaveLength(4);
    const svg = renderSvg(spec);
    expect(svg).toContain("plot-d6a7b5-ramp");
    // The lowest and highest potentials get the two ends of the ramp.
    expect(svg).toContain(`fill="${POTENTIAL_RAMP[0]}"`);
    expect(svg).toContain(`fill="${POTENTIAL_RAMP[6]}"`);
  });

  it("potentialsFigure(2-D grid) draws one rectangle per cell, as wide as the grid spacing", () => {
    const measure = gridMeasure([2, 3], [1, 1, 1, 1, 1, 1], { origin: [0, 0], spacing: [0.5, 2] });
    const spec = potentialsFigure({ measure, potential: Float64Array.of(0, 1, 2, 3, 4, 5), label: "f" });
    const cells = dataOf<{ x: number; y: number }>(markNamed(spec, "potential cell"));
    expect(cells).toHaveLength(6);
    expect(cells[5]).toMatchObject({ x: 0.5, y: 4 });
    expect(marksOf(spec)).toHaveLength(1);
  });

  it("potentialsFigure(values not finite) leaves them out and counts them", () => {
    const spec = potentialsFigure({ measure: pointMeasure([0, 1, 2]), potential: Float64Array.of(0, -Infinity, NaN), label: "f" });
    expect(spec.facts.pointsDropped).toBe(2);
    expect(spec.notes).toContain("2 values not finite left out.");
  });

  it("potentialsFigure(potential of the wrong length) throws a TransportInputError naming potential", () => {
    const call = () => potentialsFigure({ measure: pointMeasure([0, 1]), potential: Float64Array.of(0), label: "f" });
    expect(call).toThrow(TransportInputError);
    expect(call).toThrow(/^potential:/);
  });
});
