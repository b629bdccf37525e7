import { describe, expect, it } from "vitest";
import { pointMeasure } from "../../../core/measure";
import { defineFigureCell, describeFigure } from "../../../cells/kinds/figure/define";
import type { SweepCellValue } from "../../../cells/kinds/sweep/sweep-value";
import { defineTransportCell } from "../../../cells/kinds/transport/define";
import type { TransportCellValue } from "../../../cells/kinds/transport/transport-value";
import type { FigureSpec } from "../../../cells/views/figures/figure-spec";
import { renderSvg } from "../../../cells/views/render-svg";
import { makeStudy, outcome, run, valueOf } from "../study/study-helpers";
import { cellOf, computeContext, defineContext } from "./define-helpers";

// Figures are checked for wiring (the right inputs reach the view functions, which
// have their own tests) and against facts of the trade: an exact plan between n
// uniform points and n uniform points is a permutation (Birkhoff 1946; von Neumann 1953).

const n = 6;
const a = pointMeasure(Array.from({ length: n }, (_, i) => [i, (i * 7) % n]));
const b = pointMeasure(Array.from({ length: n }, (_, i) => [i + 0.5, (i * 5) % n]));

async function transport(settings: object): Promise<TransportCellValue> {
  const study = makeStudy([{ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", ...settings } }]);
  return (await defineTransportCell(cellOf(study, "t1", "transport"), defineContext(study)).compute({ a, b }, computeContext())) as TransportCellValue;
}

async function figure(settings: object, inputs: Record<string, unknown>): Promise<FigureSpec<any>> {
  const study = makeStudy([{ id: "f1", kind: "figure", settings }]);
  const def = defineFigureCell(cellOf(study, "f1", "figure"), defineContext(study));
  expect(def.inputs).toEqual((settings as { of: string[] }).of);
  return (await def.compute(inputs, computeContext())) as FigureSpec<any>;
}

describe("defineFigureCell", () => {
  it("defineFigureCell(coupling-lines of an exact plan) draws n lines carrying all the mass (a permutation plan)", async () => {
    const plan = await transport({ method: "exact" });
    const spec = await figure({ view: "coupling-lines", of: ["plan"], options: { title: "Routes", maxLines: 50 } }, { plan });
    expect(spec.figure).toBe("coupling-lines");
    expect(spec.title).toBe("Routes");
    expect(spec.facts).toMatchObject({ linesDrawn: n, pairsWithMass: n });
    expect(spec.facts.massShare).toBeCloseTo(1, 12);
    expect(renderSvg(spec)).toContain("<svg");
  });

  it("defineFigureCell(coupling-lines of an entropic plan) evaluates the plan from the recomputed cost matrix", async () => {
    const plan = await transport({ method: "entropic", epsilon: { absolute: 0.5 }, tolerance: 1e-10 });
    const spec = await figure({ view: "coupling-lines", of: ["plan"], options: { maxLines: 5 } }, { plan });
    expect(spec.facts.linesDrawn).toBe(5);
    expect(spec.facts.totalMass).toBeCloseTo(plan.values.mass, 9);
  });

  it("defineFigureCell(plan-matrix) orders both sides by their first coordinate", async () => {
    const plan = await transport({ method: "exact" });
    const spec = await figure({ view: "plan-matrix", of: ["plan"] }, { plan });
    expect(spec.figure).toBe("plan-matrix");
    expect(spec.facts.totalMass).toBeCloseTo(1, 12);
    expect(renderSvg(spec)).toContain("<svg");
  });

  it("defineFigureCell(potentials, side both by default) draws f and g on one colour scale spanning both", async () => {
    const plan = await transport({ method: "entropic", epsilon: { absolute: 0.5 } });
    const both = await figure({ view: "potentials", of: ["plan"] }, { plan });
    const f = await figure({ view: "potentials", of: ["plan"], options: { side: "source" } }, { plan });
    const g = await figure({ view: "potentials", of: ["plan"], options: { side: "target" } }, { plan });
    expect(both.options.marks).toHaveLength((f.options.marks as unknown[]).length + (g.options.marks as unknown[]).length);
    expect(both.facts.min).toBe(Math.min(f.facts.min, g.facts.min));
    expect(both.facts.max).toBe(Math.max(f.facts.max, g.facts.max));
    expect((both.options.color as { domain: number[] }).domain).toEqual([both.facts.min, both.facts.max]);
    expect(renderSvg(both)).toContain("<svg");
  });

  it("defineFigureCell(convergence) labels each history by its cell name, with the transport's tolerance; logScale false gives a linear axis", async () => {
    const x = await transport({ method: "entropic", epsilon: { absolute: 0.5 }, tolerance: 1e-8 });
    const y = await transport({ method: "entropic", epsilon: { absolute: 0.1 }, tolerance: 1e-4 });
    const spec = await figure({ view: "convergence", of: ["coarse", "fine"] }, { coarse: x, fine: y });
    expect(spec.notes[0]).toMatch(/^coarse: .* \(tolerance 1e−8\)\.$/);
    expect(spec.notes[1]).toMatch(/^fine: .* \(tolerance 1e−4\)\.$/);
    expect((spec.options.y as { type?: string }).type).toBe("log");
    const linear = await figure({ view: "convergence", of: ["coarse"], options: { logScale: false } }, { coarse: x });
    expect((linear.options.y as { type?: string }).type).toBeUndefined();
  });

  it("defineFigureCell(sweep-curve) draws the chosen output against the varied value, leaving 'balanced' runs out with a caution", async () => {
    const sweep = {
      vary: "massPenalty",
      values: [0.1, 1, "balanced"],
      rows: [
        { value: 0.1, replicate: 0, cost: 1, mass: 0.5 },
        { value: 1, replicate: 0, cost: 2, mass: 0.9 },
        { value: "balanced", replicate: 0, cost: 3, mass: 1 },
      ],
      columns: ["massPenalty", "replicate", "cost", "mass"],
      record: ["cost", "mass"],
      complete: true,
      planned: 3,
      logSpaced: false,
    } as unknown as SweepCellValue;
    const spec = await figure({ view: "sweep-curve", of: ["penalties"], options: { output: "mass", logX: true } }, { penalties: sweep });
    expect(spec.facts).toMatchObject({ series: 1, settings: 2, rowsDropped: 1 });
    expect(spec.cautions).toEqual(['1 run with a balanced ("balanced" = ∞) penalty cannot be placed on the axis.']);
    await expect(figure({ view: "sweep-curve", of: ["penalties"], options: { output: "divergence" } }, { penalties: sweep })).rejects.toThrow(
      'options.output: sweep "penalties" does not record "divergence" (it records cost, mass)',
    );
  });

  it("defineFigureCell(of a cell that is not a transport) fails saying what it gave", async () => {
    await expect(figure({ view: "plan-matrix", of: ["plan"] }, { plan: [1, 2] })).rejects.toThrow('of[0]: "plan" gives an array of 2, not a transport result');
  });

  it("runStudy(code figure) keeps Plot.plot()/mark.plot() as options that renderSvg draws headless", async () => {
    const study = makeStudy([
      { id: "d1", kind: "data", name: "kiosks", settings: { from: "inline", points: [[0, 0], [1, 0.5], [2, 1.5]] } },
      { id: "f1", kind: "figure", settings: { view: "code", code: "const rows = [0, 1, 2].map((i) => ({x: kiosks.points[2 * i], y: kiosks.points[2 * i + 1]}));\nreturn Plot.dot(rows, {x: 'x', y: 'y'}).plot({width: 300});" } },
      { id: "f2", kind: "figure", settings: { view: "code", code: "Plot.plot({marks: [Plot.ruleY([0])], height: 100})" } },
      { id: "f3", kind: "figure", settings: { view: "code", code: "Plot.lineY([1, 3, 2])" } },
      { id: "f4", kind: "figure", settings: { view: "code", code: "42" } },
    ]);
    const result = await run(study);
    const f1 = valueOf(result, "f1");
    expect(f1).toMatchObject({ width: 300, marks: [expect.anything()] });
    expect(renderSvg(f1)).toMatch(/<svg[^>]*>.*<circle/s);
    expect(valueOf(result, "f2")).toMatchObject({ height: 100 });
    expect(valueOf(result, "f3").marks).toHaveLength(1);
    expect(outcome(result, "f4")).toMatchObject({ status: "failed", error: { message: expect.stringContaining("a figure's code must return Plot options"), cause: "own error" } });
  });

  it("describeFigure(cell, spec) gives the title and the figure's cautions", () => {
    const study = makeStudy([{ id: "f1", kind: "figure", settings: { view: "plan-matrix", of: ["p"] } }]);
    const spec = { figure: "plan-matrix", options: {}, key: [], notes: [], cautions: ["p is not converged"], facts: {}, title: "Plan" };
    expect(describeFigure(cellOf(study, "f1", "figure"), spec)).toEqual({ headline: "Plan", cautions: ["p is not converged"] });
  });
});
