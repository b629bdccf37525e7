import { describe, expect, it } from "vitest";
import { codeDependencies, mapCodeReferences, validateCodeSettings, type CodeSettings } from "../../../cells/kinds/code/settings";

const P = "cells[1].settings";

describe("validateCodeSettings", () => {
  it("validateCodeSettings accepts any text, even code that does not parse (the runtime reports that)", () => {
    expect(validateCodeSettings({ code: "return (" }, P)).toEqual([]);
  });

  it("validateCodeSettings requires code as a string", () => {
    expect(validateCodeSettings({}, P)).toEqual([{ path: `${P}.code`, message: "missing (required)" }]);
    expect(validateCodeSettings({ code: ["a"] }, P)).toEqual([{ path: `${P}.code`, message: "must be a string, got an array" }]);
    expect(validateCodeSettings("x", P)).toEqual([{ path: P, message: 'must be an object, got "x"' }]);
  });
});

describe("codeDependencies", () => {
  it("codeDependencies is empty: names in code are found by the runtime", () => {
    const s: CodeSettings = { code: "return plan.values.cost * eps" };
    expect(codeDependencies(s)).toEqual([]);
    expect(mapCodeReferences(s, () => "x")).toBe(s);
  });
});
