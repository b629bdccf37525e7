import * as Plot from "@observablehq/plot";
import { describe, expect, it } from "vitest";
import { orderByCoordinate, planMatrixFigure } from "../../../../cells/views/figures/plan-matrix";
import { renderSvg } from "../../../../cells/views/render-svg";
import { MASS_RAMP } from "../../../../cells/views/theme";
import { TransportInputError } from "../../../../core/errors";
import { gridMeasure, pointMeasure } from "../../../../core/measure";
import type { GibbsPlan, SparsePlan } from "../../../../core/result";
import { dataOf, markNamed, failOnPlotWarnings } from "./figure-helpers";

type Cell = { row: number; col: number; mass: number };

function permutationPlan(n: number, sigma: (i: number) => number): SparsePlan {
  return { kind: "sparse", rows: n, cols: n, from: Int32Array.from({ length: n }, (_, i) => i), to: Int32Array.from({ length: n }, (_, i) => sigma(i)), mass: new Float64Array(n).fill(1 / n) };
}

failOnPlotWarnings();

describe("planMatrixFigure", () => {
  it("planMatrixFigure(1-D optimal plan, both sides ordered by coordinate) puts all mass on the diagonal", () => {
    // The 1-D optimal plan between uniform equal-size samples is monotone (Villani 2003,
    // Thm 2.18): ordered by coordinate on both sides it is the identity permutation.
    const xs = [0.7, -1.1, 2.2, 0.1, 1.5, -0.3];
    const ys = [5.0, 3.1, 4.2, 2.0, 6.6, 3.9];
    const src = pointMeasure(xs), tgt = pointMeasure(ys);
    const so = orderByCoordinate(src), to = orderByCoordinate(tgt);
    const rank = new Int32Array(6);
    so.forEach((i, k) => (rank[i] = k));
    const plan = permutationPlan(6, (i) => to[rank[i]]);
    const spec = planMatrixFigure({ plan, sourceOrder: so, targetOrder: to });
    const cells = dataOf<Cell>(markNamed(spec, "plan cell"));
    expect(cells).toHaveLength(6);
    for (const c of cells) expect(c.col).toBe(c.row);
    expect(spec.facts.totalMass).toBeCloseTo(1, 14);
  });

  it("planMatrixFigure(plan) uses a quantized colour scale of the theme's 7 steps and renders its legend headless", () => {
    // Continuous legends draw on a canvas and fail under DOM shims (TOOLCHAIN.md): quantize instead.
    const spec = planMatrixFigure({ plan: permutationPlan(4, (i) => (i + 1) % 4) });
    const color = spec.options.color as { type: string; range: string[] };
    expect(color.type).toBe("quantize");
    expect(color.range).toEqual([...MASS_RAMP]);
    expect(spec.facts.colorSteps).toBe(7);
    const svg = renderSvg(spec);
    const legend = /<svg[^>]*class="plot-d6a7b5-ramp"[^>]*>(.*?)<\/svg>/s.exec(svg);
    expect(legend).not.toBeNull();
    expect(legend![1].match(/<rect /g)).toHaveLength(7);
    expect(svg).not.toMatch(/<canvas|<image|<foreignObject/i);
  });

  it("planMatrixFigure({maxCells: 50}) sums a 200-point plan into 4×4 blocks and says so", () => {
    const spec = planMatrixFigure({ plan: permutationPlan(200, (i) => i), maxCells: 50 });
    expect(spec.facts).toMatchObject({ cellRows: 50, cellCols: 50, pointsPerRow: 4, pointsPerCol: 4 });
    const cells = dataOf<Cell>(markNamed(spec, "plan cell"));
    expect(cells).toHaveLength(50);
    for (const c of cells) {
      expect(c.col).toBe(c.row);
      expect(c.mass).toBeCloseTo(4 / 200, 14); // four identity entries of 1/200 per diagonal block
    }
    expect(spec.notes.join(" ")).toContain("block of up to 4 × 4 point pairs (50 × 50 cells drawn)");
  });

  it("planMatrixFigure(gibbs plan) colours each cell by a_i b_j exp((f_i+g_j−C_ij)/ε)", () => {
    const f = Float64Array.of(0.3, -0.2), g = Float64Array.of(0.1, 0.4, -0.5);
    const a = Float64Array.of(0.4, 0.6), b = Float64Array.of(0.2, 0.3, 0.5);
    const C = Float64Array.of(0, 1, 4, 1, 0, 1);
    const plan: GibbsPlan = { kind: "gibbs", rows: 2, cols: 3, epsilon: 0.5, f, g, sourceMass: a, targetMass: b };
    const spec = planMatrixFigure({ plan, cost: { rows: 2, cols: 3, data: C } });
    const cells = dataOf<Cell>(markNamed(spec, "plan cell"));
    // Formula as documented in core/result.ts (REFERENCES.md conventions).
    const P = (i: number, j: number) => a[i] * b[j] * Math.exp((f[i] + g[j] - C[i * 3 + j]) / 0.5);
    for (const c of cells) expect(c.mass).toBeCloseTo(P(c.row, c.col), 14);
    expect(spec.facts.maxCellMass).toBeCloseTo(Math.max(...[0, 1].flatMap((i) => [0, 1, 2].map((j) => P(i, j)))), 14);
    // Every cell has mass, so the palest step is the background and only cells above it are
    // drawn; Plot's own scale (Plot.scale) must put every omitted cell in that palest step.
    expect(spec.facts.backgroundFilled).toBe(true);
    const color = Plot.scale({ color: spec.options.color as Plot.ScaleOptions });
    for (let i = 0; i < 2; i++) {
      for (let j = 0; j < 3; j++) {
        const shown = cells.some((c) => c.row === i && c.col === j);
        expect(color.apply(P(i, j)) === MASS_RAMP[0], `cell ${i},${j}`).toBe(!shown);
      }
    }
  });

  it("renderSvg(planMatrixFigure(plan with every cell positive)) paints the palest step once as background", () => {
    const n = 30;
    const plan: GibbsPlan = { kind: "gibbs", rows: n, cols: n, epsilon: 0.05, f: new Float64Array(n), g: new Float64Array(n), sourceMass: new Float64Array(n).fill(1 / n), targetMass: new Float64Array(n).fill(1 / n) };
    const data = Float64Array.from({ length: n * n }, (_, k) => ((Math.floor(k / n) - (k % n)) / n) ** 2);
    const spec = planMatrixFigure({ plan, cost: { rows: n, cols: n, data } });
    expect(spec.facts.cellsDrawn).toBeLessThan(n * n);
    expect(spec.notes[0]).toContain("every cell carries some mass");
    const svg = renderSvg(spec);
    expect(svg).toMatch(new RegExp(`aria-description="palest step"[^>]*>|<rect[^>]*fill="${MASS_RAMP[0]}"`));
    const drawnGroup = /<g[^>]*aria-description="plan cell"[^>]*>(.*?)<\/g>/s.exec(svg)![1];
    expect(drawnGroup.match(/<rect /g)).toHaveLength(spec.facts.cellsDrawn);
  });

  it("planMatrixFigure({sourceOrder: not a permutation}) throws a TransportInputError naming the entry", () => {
    const call = () => planMatrixFigure({ plan: permutationPlan(3, (i) => i), sourceOrder: [0, 0, 2] });
    expect(call).toThrow(TransportInputError);
    expect(call).toThrow(/^sourceOrder\[1\]:/);
  });

  it("planMatrixFigure(plan with an index out of range) throws naming plan.to[k]", () => {
    const plan: SparsePlan = { kind: "sparse", rows: 2, cols: 2, from: Int32Array.of(0, 1), to: Int32Array.of(0, 5), mass: Float64Array.of(0.5, 0.5) };
    expect(() => planMatrixFigure({ plan })).toThrow(/^plan\.to\[1\]:/);
  });

  it("orderByCoordinate(measure, axis) sorts by that coordinate and keeps ties in index order", () => {
    const m = pointMeasure([[2, 0], [1, 9], [2, -1], [0, 3]]);
    expect(Array.from(orderByCoordinate(m))).toEqual([3, 1, 0, 2]);
    expect(Array.from(orderByCoordinate(m, 1))).toEqual([2, 0, 3, 1]);
    expect(Array.from(orderByCoordinate(gridMeasure([3], [1, 1, 1], { origin: [5], spacing: [-1 + 3] })))).toEqual([0, 1, 2]);
    expect(() => orderByCoordinate(m, 2)).toThrow(/^axis:/);
  });
});
