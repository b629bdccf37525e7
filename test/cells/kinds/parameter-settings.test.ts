import { describe, expect, it } from "vitest";
import { parameterDependencies, validateParameterSettings, type ParameterSettings } from "../../../cells/kinds/parameter/settings";

const P = "cells[0].settings";
const issues = (settings: unknown) => validateParameterSettings(settings, P);

describe("validateParameterSettings", () => {
  it("validateParameterSettings accepts each control with a value in bounds", () => {
    expect(issues({ control: "number", value: 0.5, min: 0, max: 1, step: 0.1 })).toEqual([]);
    expect(issues({ control: "log-range", value: 0.05, min: 0.001, max: 1 })).toEqual([]);
    expect(issues({ control: "integer", value: 3 })).toEqual([]);
    expect(issues({ control: "integer", value: 3, min: 1, max: 9, step: 2 })).toEqual([]);
    expect(issues({ control: "choice", value: 2, options: ["a", 2] })).toEqual([]);
    expect(issues({ control: "toggle", value: false })).toEqual([]);
    expect(issues({ control: "text", value: "", multiline: true })).toEqual([]);
    expect(issues({ control: "seed", value: 4294967295 })).toEqual([]);
  });

  it("validateParameterSettings reports a value outside [min, max]", () => {
    expect(issues({ control: "log-range", value: 3, min: 0.001, max: 1 })).toEqual([{ path: `${P}.value`, message: "must be within [0.001, 1], got 3" }]);
    expect(issues({ control: "integer", value: -4, min: 0 })).toEqual([{ path: `${P}.value`, message: "must be within [0, ∞], got -4" }]);
  });

  it("validateParameterSettings requires min < max, and min > 0 for a log range", () => {
    expect(issues({ control: "number", value: 1, min: 2, max: 2 })).toEqual([{ path: `${P}.max`, message: "must be > min (2), got 2" }]);
    expect(issues({ control: "log-range", value: 1, min: 0, max: 2 })).toEqual([{ path: `${P}.min`, message: "must be > 0, got 0" }]);
    expect(issues({ control: "integer", value: 1, min: 5, max: 2 })).toEqual([{ path: `${P}.max`, message: "must be > min (5), got 2" }]);
  });

  it("validateParameterSettings reports missing control, value and bounds", () => {
    expect(issues({ value: 1 })).toEqual([{ path: `${P}.control`, message: "missing (required)" }]);
    expect(issues({ control: "number" })).toEqual([
      { path: `${P}.value`, message: "missing (required)" },
      { path: `${P}.min`, message: "missing (required)" },
      { path: `${P}.max`, message: "missing (required)" },
    ]);
  });

  it("validateParameterSettings names the known controls for an unknown one", () => {
    expect(issues({ control: "slider", value: 1 })).toEqual([
      { path: `${P}.control`, message: 'must be one of "number", "log-range", "integer", "choice", "toggle", "text", "seed", got "slider"' },
    ]);
  });

  it("validateParameterSettings checks value types per control", () => {
    expect(issues({ control: "integer", value: 2.5 })).toEqual([{ path: `${P}.value`, message: "must be an integer, got 2.5" }]);
    expect(issues({ control: "toggle", value: "on" })).toEqual([{ path: `${P}.value`, message: 'must be true or false, got "on"' }]);
    expect(issues({ control: "text", value: 3 })).toEqual([{ path: `${P}.value`, message: "must be a string, got 3" }]);
    expect(issues({ control: "seed", value: -1 })).toEqual([{ path: `${P}.value`, message: "must be >= 0, got -1" }]);
    expect(issues({ control: "seed", value: 2 ** 32 })).toEqual([{ path: `${P}.value`, message: "must be <= 4294967295, got 4294967296" }]);
    expect(issues({ control: "number", value: 0.5, min: 0, max: 1, step: 0 })).toEqual([{ path: `${P}.step`, message: "must be > 0, got 0" }]);
  });

  it("validateParameterSettings checks choice options: non-empty, no repeats, value among them", () => {
    expect(issues({ control: "choice", value: "a", options: [] })).toEqual([{ path: `${P}.options`, message: "must have at least 1 item, got 0" }]);
    expect(issues({ control: "choice", value: "a", options: ["a", "b", "a"] })).toEqual([{ path: `${P}.options[2]`, message: 'repeats options[0] ("a")' }]);
    expect(issues({ control: "choice", value: "c", options: ["a", "b"] })).toEqual([{ path: `${P}.value`, message: 'must be one of the options ("a", "b"), got "c"' }]);
    expect(issues({ control: "choice", value: "a", options: ["a", null] })).toEqual([{ path: `${P}.options[1]`, message: "must be a string or a number, got null" }]);
  });

  it("validateParameterSettings checks label and unit are text", () => {
    expect(issues({ control: "toggle", value: true, label: 5 })).toEqual([{ path: `${P}.label`, message: "must be a string, got 5" }]);
  });
});

describe("parameterDependencies", () => {
  it("parameterDependencies is empty: a parameter depends on nothing", () => {
    expect(parameterDependencies({ control: "toggle", value: true } as ParameterSettings)).toEqual([]);
  });
});
