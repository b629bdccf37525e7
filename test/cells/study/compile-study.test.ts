import { describe, expect, it } from "vitest";
import * as Plot from "@observablehq/plot";
import { updateStudy } from "../../../cells/document/update-study";
import { createStudyMemory } from "../../../cells/kinds/define-context";
import type { TransportCellValue } from "../../../cells/kinds/transport/transport-value";
import { StudyEngine } from "../../../cells/runtime/study-engine";
import { compileStudy, studyGlobals } from "../../../cells/study/compile-study";
import { makeStudy } from "./study-helpers";

// Reactive recomputation is checked against the engine's contract (cells/runtime):
// a cell recomputes when its definition or an input changes, and only then.
const cells = [
  { id: "p1", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.1, min: 0.001, max: 1 } },
  { id: "d1", kind: "data", name: "a", settings: { from: "generator", generator: "ring", n: 40, noise: 0.1 } },
  { id: "d2", kind: "data", name: "b", settings: { from: "generator", generator: "two-moons", n: 30 } },
  { id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "entropic", epsilon: { relative: { param: "eps" } }, warmStart: true, tolerance: 1e-9 } },
  { id: "c1", kind: "code", name: "doubled", settings: { code: "plan.values.cost * 2" } },
];

describe("compileStudy", () => {
  it("compileStudy(study) gives one definition per cell, in order, with names and inputs from the settings", () => {
    const defs = compileStudy(makeStudy(cells));
    expect(defs.map((d) => [d.id, d.name, d.inputs])).toEqual([
      ["p1", "eps", []],
      ["d1", "a", []],
      ["d2", "b", []],
      ["t1", "plan", ["a", "b", "eps"]],
      ["c1", "doubled", ["plan"]],
    ]);
  });

  it("compileStudy(study, new study seed) changes only the versions of cells that draw from it", () => {
    const before = compileStudy(makeStudy(cells, 1));
    const after = compileStudy(makeStudy(cells, 2));
    const changed = before.filter((d, k) => d.version !== after[k].version).map((d) => d.id);
    expect(changed).toEqual(["d1", "d2"]);
  });

  it("StudyEngine.update(compileStudy(changed study)) recomputes the changed cell and its dependents only, warm-starting the transport", async () => {
    const memory = createStudyMemory();
    const engine = new StudyEngine({ globals: studyGlobals() });
    try {
      const study = makeStudy(cells);
      engine.update(compileStudy(study, { memory }));
      await engine.settled();
      const cold = engine.state("t1");
      const { study: next } = updateStudy(study, [{ type: "set-setting", id: "p1", path: "value", value: 0.11 }]);
      engine.update(compileStudy(next, { memory }));
      await engine.settled();
      expect(Object.fromEntries(engine.computeCounts())).toEqual({ p1: 2, d1: 1, d2: 1, t1: 2, c1: 2 });
      const warm = engine.state("t1");
      if (cold.status !== "done" || warm.status !== "done") throw new Error("transport did not finish");
      expect((warm.value as TransportCellValue).diagnostics.iterations).toBeLessThan((cold.value as TransportCellValue).diagnostics.iterations);
    } finally {
      engine.dispose();
    }
  });

  it("studyGlobals() gives `core` and a `Plot` whose plot() returns options instead of drawing", () => {
    const { core, Plot: plot } = studyGlobals() as { core: Record<string, unknown>; Plot: typeof Plot };
    expect(typeof core.solveTransport).toBe("function");
    expect(plot.plot({ marks: [], width: 200 })).toEqual({ marks: [], width: 200 });
    const mark = plot.dot([1, 2], { x: (d: number) => d });
    expect(mark).toBeInstanceOf(Plot.Mark);
    expect(mark.plot({ height: 90 })).toEqual({ height: 90, marks: [mark] });
    // The module itself is untouched: a plain mark still draws for real.
    expect(Object.prototype.hasOwnProperty.call(Plot.dot([1]), "plot")).toBe(false);
  });
});
