import { describe, expect, it } from "vitest";
import { TRANSPORT_DEFAULTS, mapTransportReferences, transportDependencies, validateTransportSettings, type TransportSettings } from "../../../cells/kinds/transport/settings";

const P = "cells[3].settings";
const base = { source: "depots", target: "shops", method: "entropic", epsilon: { relative: 0.05, reference: "median" } };
const issues = (settings: unknown) => validateTransportSettings(settings, P);

describe("validateTransportSettings", () => {
  it("validateTransportSettings accepts every method with its required settings", () => {
    expect(issues({ source: "a", target: "b", method: "exact" })).toEqual([]);
    expect(issues(base)).toEqual([]);
    expect(issues({ ...base, method: "unbalanced", massPenalty: { source: 1, target: "balanced" } })).toEqual([]);
    expect(issues({ ...base, method: "debiased", massPenalty: 0.5 })).toEqual([]);
    expect(issues({ ...base, method: "debiased" })).toEqual([]);
  });

  it("validateTransportSettings reports a negative relative epsilon at its path with the value", () => {
    expect(issues({ ...base, epsilon: { relative: -1 } })).toEqual([{ path: `${P}.epsilon.relative`, message: "must be > 0, got -1" }]);
  });

  it("validateTransportSettings requires epsilon for non-exact methods and a mass penalty for unbalanced", () => {
    expect(issues({ source: "a", target: "b", method: "entropic" })).toEqual([{ path: `${P}.epsilon`, message: 'missing (required when method is "entropic")' }]);
    expect(issues({ ...base, method: "unbalanced" })).toEqual([{ path: `${P}.massPenalty`, message: 'missing (required when method is "unbalanced")' }]);
  });

  it("validateTransportSettings reports missing source, target and method together", () => {
    expect(issues({})).toEqual([
      { path: `${P}.source`, message: "missing (required)" },
      { path: `${P}.target`, message: "missing (required)" },
      { path: `${P}.method`, message: "missing (required)" },
    ]);
  });

  it("validateTransportSettings names the known methods for an unknown one", () => {
    expect(issues({ ...base, method: "sinkhorn" })).toEqual([
      { path: `${P}.method`, message: 'must be one of "exact", "entropic", "unbalanced", "debiased", got "sinkhorn"' },
    ]);
  });

  it("validateTransportSettings checks epsilon's form: one of absolute or relative, a known reference", () => {
    expect(issues({ ...base, epsilon: 0.1 })).toEqual([{ path: `${P}.epsilon`, message: "must be an object, got 0.1" }]);
    expect(issues({ ...base, epsilon: {} })).toEqual([{ path: `${P}.epsilon`, message: 'must hold "absolute" (cost units) or "relative" (× a cost statistic)' }]);
    expect(issues({ ...base, epsilon: { absolute: 1, relative: 1 } })).toEqual([{ path: `${P}.epsilon`, message: 'give either "absolute" or "relative", not both' }]);
    expect(issues({ ...base, epsilon: { relative: 0.1, reference: "mode" } })).toEqual([
      { path: `${P}.epsilon.reference`, message: 'must be one of "max", "median", "mean", got "mode"' },
    ]);
    expect(issues({ ...base, epsilon: { absolute: 0.1, reference: "max" } })).toEqual([{ path: `${P}.epsilon.reference`, message: 'only applies to a "relative" epsilon' }]);
    expect(issues({ ...base, epsilon: { absolute: "0.1" } })).toEqual([
      { path: `${P}.epsilon.absolute`, message: 'must be a number or a reference {"param": name}, got "0.1"' },
    ]);
  });

  it("validateTransportSettings accepts a parameter reference in place of a number and checks its name", () => {
    expect(issues({ ...base, epsilon: { relative: { param: "eps" } }, tolerance: { param: "tol" } })).toEqual([]);
    expect(issues({ ...base, epsilon: { relative: { param: "2eps" } } })).toEqual([
      { path: `${P}.epsilon.relative.param`, message: '"2eps" is not a valid JavaScript identifier (letters, digits, _ and $; not starting with a digit)' },
    ]);
  });

  it("validateTransportSettings checks mass penalties: > 0, \"balanced\" or a reference, per side", () => {
    const unb = { ...base, method: "unbalanced" };
    expect(issues({ ...unb, massPenalty: 0 })).toEqual([{ path: `${P}.massPenalty`, message: "must be > 0, got 0" }]);
    expect(issues({ ...unb, massPenalty: null })).toEqual([{ path: `${P}.massPenalty`, message: 'must be a number > 0, "balanced" or a reference {"param": name}, got null' }]);
    expect(issues({ ...unb, massPenalty: { source: 1 } })).toEqual([{ path: `${P}.massPenalty.target`, message: "missing (required)" }]);
    expect(issues({ ...unb, massPenalty: { source: "infinite", target: 2 } })).toEqual([
      { path: `${P}.massPenalty.source`, message: 'must be a number > 0, "balanced" or a reference {"param": name}, got "infinite"' },
    ]);
  });

  it("validateTransportSettings checks cost, limits, schedule and algorithm choices", () => {
    expect(issues({ ...base, cost: { kind: "power" } })).toEqual([{ path: `${P}.cost.p`, message: 'missing (required when kind is "power")' }]);
    expect(issues({ ...base, cost: { kind: "power", p: -2 } })).toEqual([{ path: `${P}.cost.p`, message: "must be > 0, got -2" }]);
    expect(issues({ ...base, cost: { kind: "manhattan" } })).toEqual([
      { path: `${P}.cost.kind`, message: 'must be one of "sqeuclidean", "euclidean", "power", "matrix", got "manhattan"' },
    ]);
    expect(issues({ ...base, cost: { kind: "matrix", cell: "class" } })).toEqual([{ path: `${P}.cost.cell`, message: '"class" cannot be a cell name: it is reserved in JavaScript' }]);
    expect(issues({ ...base, tolerance: 0 })).toEqual([{ path: `${P}.tolerance`, message: "must be > 0, got 0" }]);
    expect(issues({ ...base, maxIterations: 10.5 })).toEqual([{ path: `${P}.maxIterations`, message: "must be an integer, got 10.5" }]);
    expect(issues({ ...base, maxIterations: 0 })).toEqual([{ path: `${P}.maxIterations`, message: "must be >= 1, got 0" }]);
    expect(issues({ ...base, schedule: "yes" })).toEqual([{ path: `${P}.schedule`, message: 'must be true, false or an object {factor, start}, got "yes"' }]);
    expect(issues({ ...base, schedule: { factor: 1.5 } })).toEqual([{ path: `${P}.schedule.factor`, message: "must be < 1 (epsilon shrinks by this factor each stage), got 1.5" }]);
    expect(issues({ ...base, warmStart: 1 })).toEqual([{ path: `${P}.warmStart`, message: "must be true or false, got 1" }]);
    expect(issues({ ...base, exactAlgorithm: "hungarian" })).toEqual([
      { path: `${P}.exactAlgorithm`, message: 'must be one of "auto", "sorting", "network-simplex", "assignment", got "hungarian"' },
    ]);
  });

  it("validateTransportSettings keeps checking settings the chosen method does not use", () => {
    // Switching method back must not meet a bad stored value.
    expect(issues({ source: "a", target: "b", method: "exact", epsilon: { absolute: -1 } })).toEqual([{ path: `${P}.epsilon.absolute`, message: "must be > 0, got -1" }]);
  });

  it("validateTransportSettings rejects settings that are not an object", () => {
    expect(issues([])).toEqual([{ path: P, message: "must be an object, got an array" }]);
  });

  it("TRANSPORT_DEFAULTS match the core's documented defaults", () => {
    // core/result.ts SolveOptions: tolerance 1e-6, maxIterations 10 000; core/cost.ts reference "max".
    expect(TRANSPORT_DEFAULTS).toMatchObject({ tolerance: 1e-6, maxIterations: 10000, reference: "max", exactAlgorithm: "auto" });
  });
});

describe("transportDependencies", () => {
  it("transportDependencies lists source, target, a cost matrix cell and referenced parameters once each", () => {
    const s = {
      source: "depots",
      target: "shops",
      cost: { kind: "matrix", cell: "roads" },
      method: "unbalanced",
      epsilon: { relative: { param: "eps" } },
      massPenalty: { source: { param: "rho" }, target: { param: "rho" } },
      maxIterations: { param: "cap" },
      schedule: { start: { absolute: { param: "eps0" } } },
    } as unknown as TransportSettings;
    expect(transportDependencies(s)).toEqual(["depots", "shops", "roads", "eps", "rho", "cap", "eps0"]);
  });

  it("mapTransportReferences renames every reference and returns the same object when none matches", () => {
    const s = { ...base, epsilon: { relative: { param: "eps" } }, massPenalty: { param: "eps" }, extra: 1 } as unknown as TransportSettings;
    const renamed = mapTransportReferences(s, (n) => (n === "eps" ? "epsilon1" : n));
    expect(renamed).toEqual({ ...base, epsilon: { relative: { param: "epsilon1" } }, massPenalty: { param: "epsilon1" }, extra: 1 });
    expect(Object.keys(renamed)).toEqual(Object.keys(s));
    expect(mapTransportReferences(s, (n) => n)).toBe(s);
  });
});
