import { describe, expect, it } from "vitest";
import { figureDependencies, mapFigureReferences, validateFigureSettings, type FigureSettings } from "../../../cells/kinds/figure/settings";

const P = "cells[6].settings";
const issues = (settings: unknown) => validateFigureSettings(settings, P);

describe("validateFigureSettings", () => {
  it("validateFigureSettings accepts each view with its cells and options", () => {
    expect(issues({ view: "coupling-lines", of: ["plan"], options: { maxLines: 200, title: "t", width: 600, colour: "kept" } })).toEqual([]);
    expect(issues({ view: "plan-matrix", of: ["plan"] })).toEqual([]);
    expect(issues({ view: "potentials", of: ["plan"], options: { side: "target" } })).toEqual([]);
    expect(issues({ view: "convergence", of: ["a", "b"], options: { logScale: false } })).toEqual([]);
    expect(issues({ view: "sweep-curve", of: ["sw"], options: { output: "divergence", logX: true, logY: false } })).toEqual([]);
    expect(issues({ view: "code", code: "return 1" })).toEqual([]);
  });

  it("validateFigureSettings names the known views", () => {
    expect(issues({ view: "heatmap", of: ["plan"] })).toEqual([
      { path: `${P}.view`, message: 'must be one of "coupling-lines", "plan-matrix", "convergence", "potentials", "sweep-curve", "code", got "heatmap"' },
    ]);
  });

  it("validateFigureSettings requires the drawn cells, exactly one for single-transport views", () => {
    expect(issues({ view: "plan-matrix" })).toEqual([{ path: `${P}.of`, message: 'missing (required when view is "plan-matrix")' }]);
    expect(issues({ view: "plan-matrix", of: ["a", "b"] })).toEqual([{ path: `${P}.of`, message: "a plan-matrix figure draws exactly one transport cell, got 2 names" }]);
    expect(issues({ view: "convergence", of: [] })).toEqual([{ path: `${P}.of`, message: "must have at least 1 item, got 0" }]);
    expect(issues({ view: "convergence", of: "plan" })).toEqual([{ path: `${P}.of`, message: 'must be an array, got "plan"' }]);
    expect(issues({ view: "convergence", of: ["a", "a"] })).toEqual([{ path: `${P}.of[1]`, message: 'repeats of[0] ("a")' }]);
    expect(issues({ view: "convergence", of: ["a", 3] })).toEqual([{ path: `${P}.of[1]`, message: "must be a cell name (a string), got 3" }]);
  });

  it("validateFigureSettings type-checks known options and keeps the others", () => {
    expect(issues({ view: "coupling-lines", of: ["p"], options: { maxLines: 0 } })).toEqual([{ path: `${P}.options.maxLines`, message: "must be >= 1, got 0" }]);
    expect(issues({ view: "coupling-lines", of: ["p"], options: { width: -5 } })).toEqual([{ path: `${P}.options.width`, message: "must be > 0, got -5" }]);
    expect(issues({ view: "potentials", of: ["p"], options: { side: "left" } })).toEqual([
      { path: `${P}.options.side`, message: 'must be one of "source", "target", "both", got "left"' },
    ]);
    expect(issues({ view: "sweep-curve", of: ["s"], options: { logY: "yes" } })).toEqual([{ path: `${P}.options.logY`, message: 'must be true or false, got "yes"' }]);
    expect(issues({ view: "plan-matrix", of: ["p"], options: [] })).toEqual([{ path: `${P}.options`, message: "must be an object, got an array" }]);
  });

  it("validateFigureSettings requires code for a code figure", () => {
    expect(issues({ view: "code" })).toEqual([{ path: `${P}.code`, message: 'missing (required when view is "code")' }]);
    expect(issues({ view: "code", code: 5 })).toEqual([{ path: `${P}.code`, message: "must be a string, got 5" }]);
  });
});

describe("figureDependencies", () => {
  it("figureDependencies lists the drawn cells; a code figure leaves its names to the runtime", () => {
    expect(figureDependencies({ view: "convergence", of: ["a", "b"] } as FigureSettings)).toEqual(["a", "b"]);
    expect(figureDependencies({ view: "code", code: "return plan" } as FigureSettings)).toEqual([]);
  });

  it("mapFigureReferences renames within of and keeps the object when nothing matches", () => {
    const s = { view: "convergence", of: ["a", "b"] } as FigureSettings;
    expect(mapFigureReferences(s, (n) => (n === "b" ? "c" : n))).toEqual({ view: "convergence", of: ["a", "c"] });
    expect(mapFigureReferences(s, (n) => n)).toBe(s);
  });
});
