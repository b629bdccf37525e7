import { describe, expect, it } from "vitest";
import { couplingLinesFigure } from "../../../../cells/views/figures/coupling-lines";
import { renderSvg } from "../../../../cells/views/render-svg";
import { TransportInputError } from "../../../../core/errors";
import { pointMeasure } from "../../../../core/measure";
import type { GibbsPlan, SparsePlan } from "../../../../core/result";
import { dataOf, markNamed, failOnPlotWarnings } from "./figure-helpers";

function sparse(rows: number, cols: number, entries: Array<[number, number, number]>): SparsePlan {
  return {
    kind: "sparse",
    rows,
    cols,
    from: Int32Array.from(entries, (e) => e[0]),
    to: Int32Array.from(entries, (e) => e[1]),
    mass: Float64Array.from(entries, (e) => e[2]),
  };
}

/** Group of marks with the given aria-description in rendered SVG. */
function group(svg: string, description: string): string {
  const match = new RegExp(`<g[^>]*aria-description="${description}"[^>]*>(.*?)</g>`, "s").exec(svg);
  if (!match) throw new Error(`no group ${description}`);
  return match[1];
}

failOnPlotWarnings();

describe("couplingLinesFigure", () => {
  it("couplingLinesFigure(1-D monotone plan) draws one line per pair and states 100 % of the mass", () => {
    // In 1-D the optimal coupling of uniform equal-size samples pairs them in sorted
    // order (Villani 2003, Topics in OT, Thm 2.18): a permutation plan with n entries.
    const xs = [0.3, -1.2, 2.5, 0.9, -0.4];
    const ys = [1.1, 0.2, -0.7, 3.0, 1.9];
    const sortIdx = (v: number[]) => v.map((_, i) => i).sort((a, b) => v[a] - v[b]);
    const fi = sortIdx(xs), gj = sortIdx(ys);
    const plan = sparse(5, 5, fi.map((i, k) => [i, gj[k], 0.2] as [number, number, number]));
    const spec = couplingLinesFigure({ source: pointMeasure(xs), target: pointMeasure(ys), plan });
    expect(spec.facts).toMatchObject({ linesDrawn: 5, pairsWithMass: 5, shownDim: 1 });
    expect(spec.facts.massShare).toBeCloseTo(1, 12);
    expect(spec.notes[0]).toBe("Drew 5 of 5 pairs with positive mass, carrying 100.0 % of the transported mass.");
    const segments = dataOf<{ x1: number; x2: number; y1: string; y2: string }>(markNamed(spec, "coupling line"));
    // Each segment runs from the source line to the target line and joins k-th smallest to k-th smallest.
    const pairs = segments.map((s) => [s.x1, s.x2]).sort((a, b) => a[0] - b[0]);
    expect(pairs.map((p) => p[1])).toEqual([...ys].sort((a, b) => a - b));
    expect(new Set(segments.map((s) => `${s.y1}>${s.y2}`))).toEqual(new Set(["source>target"]));
  });

  it("couplingLinesFigure({maxLines: 2}) keeps the two heaviest entries and states their mass share", () => {
    const src = pointMeasure([[0, 0], [1, 0], [2, 0], [3, 0]]);
    const tgt = pointMeasure([[0, 1], [1, 1], [2, 1], [3, 1]]);
    const plan = sparse(4, 4, [[0, 0, 0.1], [1, 2, 0.4], [2, 1, 0.2], [3, 3, 0.3]]);
    const spec = couplingLinesFigure({ source: src, target: tgt, plan, maxLines: 2 });
    expect(spec.facts.linesDrawn).toBe(2);
    expect(spec.facts.massShare).toBeCloseTo(0.7, 12); // (0.4 + 0.3) / 1.0, arithmetic
    expect(spec.notes[0]).toBe("Drew 2 of 4 pairs with positive mass, carrying 70.0 % of the transported mass.");
    const segments = dataOf<{ mass: number; opacity: number; width: number; x1: number }>(markNamed(spec, "coupling line"));
    // Lightest first so the heaviest is painted on top; opacity and width grow with mass.
    expect(segments.map((s) => s.mass)).toEqual([0.3, 0.4]);
    expect(segments[0].opacity).toBeLessThan(segments[1].opacity);
    expect(segments[0].width).toBeLessThan(segments[1].width);
    expect(segments.map((s) => s.x1)).toEqual([3, 1]);
  });

  it("couplingLinesFigure(gibbs plan) evaluates P_ij = a_i b_j exp((f_i+g_j−C_ij)/ε) for the lines and the share", () => {
    // f = g = 0, a = b = (½, ½), C = [[0,1],[1,0]], ε = 1: P = ¼[[1, e⁻¹],[e⁻¹, 1]] (formula in
    // core/result.ts); the two diagonal entries carry 1/(1+e⁻¹) ≈ 0.7311 of the mass (hand computation).
    const plan: GibbsPlan = {
      kind: "gibbs", rows: 2, cols: 2, epsilon: 1,
      f: new Float64Array(2), g: new Float64Array(2),
      sourceMass: Float64Array.of(0.5, 0.5), targetMass: Float64Array.of(0.5, 0.5),
    };
    const cost = { rows: 2, cols: 2, data: Float64Array.of(0, 1, 1, 0) };
    const spec = couplingLinesFigure({ source: pointMeasure([[0, 0], [1, 0]]), target: pointMeasure([[0, 1], [1, 1]]), plan, cost, maxLines: 2 });
    expect(spec.facts.totalMass).toBeCloseTo(0.5 * (1 + Math.exp(-1)), 14);
    expect(spec.facts.massShare).toBeCloseTo(1 / (1 + Math.exp(-1)), 14);
    expect(spec.facts.pairsWithMass).toBe(4);
    expect(spec.notes[0]).toContain("Drew 2 of 4 pairs");
    expect(spec.notes[0]).toContain("73.1 %");
    const segments = dataOf<{ x1: number; x2: number; mass: number }>(markNamed(spec, "coupling line"));
    expect(segments.map((s) => [s.x1, s.x2])).toEqual([[1, 1], [0, 0]]);
    expect(segments[1].mass).toBeCloseTo(0.25, 15);
  });

  it("couplingLinesFigure(gibbs plan without cost) throws a TransportInputError naming cost", () => {
    const plan: GibbsPlan = { kind: "gibbs", rows: 1, cols: 1, epsilon: 1, f: new Float64Array(1), g: new Float64Array(1), sourceMass: Float64Array.of(1), targetMass: Float64Array.of(1) };
    const call = () => couplingLinesFigure({ source: pointMeasure([0]), target: pointMeasure([1]), plan });
    expect(call).toThrow(TransportInputError);
    expect(call).toThrow(/^cost:/);
  });

  it("couplingLinesFigure(plan with the wrong number of rows) throws naming plan.rows", () => {
    const plan = sparse(3, 2, [[0, 0, 1]]);
    expect(() => couplingLinesFigure({ source: pointMeasure([0, 1]), target: pointMeasure([0, 1]), plan })).toThrow(/^plan\.rows:/);
  });

  it("couplingLinesFigure(3-D clouds, cautions) keeps the caller's cautions first and adds one about the dropped coordinate", () => {
    const src = pointMeasure([[0, 0, 5], [1, 1, 5]]);
    const tgt = pointMeasure([[0, 1, 0], [1, 2, 0]]);
    const spec = couplingLinesFigure({ source: src, target: tgt, plan: sparse(2, 2, [[0, 0, 0.5], [1, 1, 0.5]]), cautions: ["regularised value: not a distance"] });
    expect(spec.cautions).toEqual(["regularised value: not a distance", "Points have 3 coordinates; only the first two are drawn."]);
    expect(spec.facts.shownDim).toBe(2);
  });

  it("renderSvg(couplingLinesFigure(2-D)) draws each segment from a source dot centre to a target dot centre", () => {
    const src = pointMeasure([[0, 0], [1, 0.5], [2, 0.2]]);
    const tgt = pointMeasure([[0.5, 2], [1.5, 1.8], [2.5, 2.4]]);
    const spec = couplingLinesFigure({ source: src, target: tgt, plan: sparse(3, 3, [[0, 1, 0.2], [1, 0, 0.3], [2, 2, 0.5]]) });
    const svg = renderSvg(spec);
    const centres = (description: string) =>
      [...group(svg, description).matchAll(/<circle[^>]*>/g)].map((m) => [Number(/cx="([^"]+)"/.exec(m[0])![1]), Number(/cy="([^"]+)"/.exec(m[0])![1])]);
    const sources = centres("source point");
    const targets = centres("target point");
    const paths = [...group(svg, "coupling line").matchAll(/d="M([^,]+),([^L]+)L([^,]+),([^"]+)"/g)].map((m) => m.slice(1).map(Number));
    expect(sources).toHaveLength(3);
    expect(targets).toHaveLength(3);
    expect(paths).toHaveLength(3);
    for (const [x1, y1, x2, y2] of paths) {
      // Plot offsets 1-px strokes by half a pixel for crispness; output is rounded to 0.01 px.
      expect(sources.some(([cx, cy]) => Math.hypot(cx - x1, cy - y1) < 1)).toBe(true);
      expect(targets.some(([cx, cy]) => Math.hypot(cx - x2, cy - y2) < 1)).toBe(true);
    }
    expect(svg).not.toMatch(/warning/i);
  });
});
