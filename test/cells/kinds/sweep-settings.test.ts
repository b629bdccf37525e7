import { describe, expect, it } from "vitest";
import { expandSweepRange, mapSweepReferences, sweepDependencies, sweepUsesStudySeed, validateSweepSettings, type SweepSettings } from "../../../cells/kinds/sweep/settings";

const P = "cells[5].settings";
const issues = (settings: unknown) => validateSweepSettings(settings, P);
const base = { transport: "plan", vary: "epsilon", values: [0.01, 0.1, 1] };

describe("validateSweepSettings", () => {
  it("validateSweepSettings accepts lists, ranges, replicates and outputs", () => {
    expect(issues(base)).toEqual([]);
    expect(issues({ ...base, values: { from: 0.001, to: 1, count: 7, spacing: "log" }, replicates: 4, seed: 12, record: ["cost", "seconds"] })).toEqual([]);
    expect(issues({ transport: "plan", vary: "massPenalty.target", values: [1, "balanced"] })).toEqual([]);
    expect(issues({ transport: "plan", vary: "sampleSize", values: { from: 10, to: { param: "nMax" }, count: 4 } })).toEqual([]);
  });

  it("validateSweepSettings reports missing transport, vary and values", () => {
    expect(issues({})).toEqual([
      { path: `${P}.transport`, message: "missing (required)" },
      { path: `${P}.vary`, message: "missing (required)" },
      { path: `${P}.values`, message: "missing (required)" },
    ]);
  });

  it("validateSweepSettings names the settings a sweep can vary", () => {
    expect(issues({ ...base, vary: "cost" })).toEqual([
      {
        path: `${P}.vary`,
        message:
          'must be one of "epsilon", "massPenalty", "massPenalty.source", "massPenalty.target", "sampleSize", "sampleSize.source", "sampleSize.target", "tolerance", "maxIterations", "costExponent", got "cost"',
      },
    ]);
  });

  it("validateSweepSettings checks values against the varied setting", () => {
    expect(issues({ ...base, values: [0.1, -1] })).toEqual([{ path: `${P}.values[1]`, message: "must be > 0, got -1" }]);
    expect(issues({ ...base, values: [0.1, "balanced"] })).toEqual([{ path: `${P}.values[1]`, message: 'must be a number, got "balanced"' }]);
    expect(issues({ ...base, vary: "sampleSize.source", values: [10, 20.5] })).toEqual([{ path: `${P}.values[1]`, message: "must be an integer, got 20.5" }]);
    expect(issues({ ...base, values: [0.1, 0.2, 0.1] })).toEqual([{ path: `${P}.values[2]`, message: "repeats values[0] (0.1)" }]);
    expect(issues({ ...base, values: [] })).toEqual([{ path: `${P}.values`, message: "must have at least 1 item, got 0" }]);
    expect(issues({ ...base, values: 0.1 })).toEqual([{ path: `${P}.values`, message: "must be a list of values or a range {from, to, count}, got 0.1" }]);
  });

  it("validateSweepSettings checks ranges: count >= 2, distinct ends, known spacing", () => {
    expect(issues({ ...base, values: { from: 0.1, to: 1, count: 1 } })).toEqual([{ path: `${P}.values.count`, message: "must be >= 2, got 1" }]);
    expect(issues({ ...base, values: { from: 0.1, to: 0.1, count: 3 } })).toEqual([
      { path: `${P}.values.to`, message: 'must differ from "from" (0.1): a range of one value is a list of one' },
    ]);
    expect(issues({ ...base, values: { from: 0, to: 1, count: 3, spacing: "log" } })).toEqual([{ path: `${P}.values.from`, message: "must be > 0, got 0" }]);
    expect(issues({ ...base, values: { from: 0.1, to: 1, count: 3, spacing: "geometric" } })).toEqual([
      { path: `${P}.values.spacing`, message: 'must be one of "linear", "log", got "geometric"' },
    ]);
    expect(issues({ ...base, values: { from: 0.1, count: 3 } })).toEqual([{ path: `${P}.values.to`, message: "missing (required)" }]);
  });

  it("validateSweepSettings checks replicates, seed and recorded outputs", () => {
    expect(issues({ ...base, replicates: 0 })).toEqual([{ path: `${P}.replicates`, message: "must be >= 1, got 0" }]);
    expect(issues({ ...base, record: ["cost", "wasserstein"] })).toEqual([
      {
        path: `${P}.record[1]`,
        message: 'must be one of "cost", "objective", "divergence", "mass", "iterations", "marginalError", "seconds", "status", "energyDistance", got "wasserstein"',
      },
    ]);
    expect(issues({ ...base, record: ["cost", "cost"] })).toEqual([{ path: `${P}.record[1]`, message: 'repeats record[0] ("cost")' }]);
    expect(issues({ ...base, record: [] })).toEqual([{ path: `${P}.record`, message: "must have at least 1 item, got 0" }]);
  });
});

describe("expandSweepRange", () => {
  it("expandSweepRange spaces values linearly with exact ends", () => {
    expect(expandSweepRange(0, 1, 5)).toEqual([0, 0.25, 0.5, 0.75, 1]);
  });

  it("expandSweepRange spaces values evenly in log with exact ends", () => {
    const v = expandSweepRange(0.001, 1, 4, "log");
    expect(v[0]).toBe(0.001);
    expect(v[3]).toBe(1);
    expect(v[1]).toBeCloseTo(0.01, 15);
    expect(v[2]).toBeCloseTo(0.1, 15);
  });

  it("expandSweepRange rounds sample sizes and drops repeats", () => {
    expect(expandSweepRange(1, 3, 5, "linear", true)).toEqual([1, 2, 3]);
  });
});

describe("sweepDependencies", () => {
  it("sweepDependencies lists the transport, then references in the range, replicates and seed", () => {
    const s = { transport: "plan", vary: "epsilon", values: { from: { param: "lo" }, to: 1, count: 3 }, replicates: { param: "reps" }, seed: { param: "s" } } as unknown as SweepSettings;
    expect(sweepDependencies(s)).toEqual(["plan", "lo", "reps", "s"]);
    expect(mapSweepReferences(s, (n) => (n === "plan" ? "plan2" : n)).transport).toBe("plan2");
  });

  it("sweepUsesStudySeed is true when the seed is omitted or \"study\"", () => {
    expect(sweepUsesStudySeed(base as SweepSettings)).toBe(true);
    expect(sweepUsesStudySeed({ ...base, seed: 1 } as SweepSettings)).toBe(false);
  });
});
