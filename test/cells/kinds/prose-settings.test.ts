import { describe, expect, it } from "vitest";
import { mapProseReferences, proseDependencies, splitProse, validateProseSettings } from "../../../cells/kinds/prose/settings";

const P = "cells[0].settings";
const issues = (text: unknown) => validateProseSettings({ text }, P);

describe("splitProse", () => {
  it("splitProse splits text and live values with paths and formats", () => {
    const { segments, problems } = splitProse("Cost @{plan.values.cost:4f} at eps @{ eps : 2e }.");
    expect(problems).toEqual([]);
    expect(segments).toEqual([
      { kind: "text", text: "Cost " },
      { kind: "value", value: { start: 5, end: 27, name: "plan", nameStart: 7, nameEnd: 11, path: ["values", "cost"], format: { digits: 4, notation: "fixed" } } },
      { kind: "text", text: " at eps " },
      { kind: "value", value: { start: 35, end: 48, name: "eps", nameStart: 38, nameEnd: 41, path: [], format: { digits: 2, notation: "scientific" } } },
      { kind: "text", text: "." },
    ]);
  });

  it("splitProse reads digits alone as significant digits and indices in paths", () => {
    const [value] = splitProse("@{rows.0.cost:3}").segments;
    expect(value).toMatchObject({ kind: "value", value: { name: "rows", path: ["0", "cost"], format: { digits: 3, notation: "significant" } } });
  });

  it("splitProse turns \\@{ into plain text @{", () => {
    expect(splitProse("write \\@{name} to show a value")).toEqual({ segments: [{ kind: "text", text: "write @{name} to show a value" }], problems: [] });
  });

  it("splitProse keeps text with no live values as one segment", () => {
    expect(splitProse("a @ b {c}").segments).toEqual([{ kind: "text", text: "a @ b {c}" }]);
  });
});

describe("validateProseSettings", () => {
  it("validateProseSettings accepts markdown with live values", () => {
    expect(issues("# Title\n\nCost @{plan.values.cost:4}.")).toEqual([]);
  });

  it("validateProseSettings locates a malformed live value by line and column", () => {
    expect(issues("line one\nsee @{3x} here")).toEqual([{ path: `${P}.text`, message: 'line 2, column 5: live value "@{3x}": "3x" is not a cell name' }]);
    expect(issues("@{class}")).toEqual([{ path: `${P}.text`, message: 'line 1, column 1: live value "@{class}": "class" is reserved in JavaScript and cannot name a cell' }]);
    expect(issues("@{}")).toEqual([{ path: `${P}.text`, message: 'line 1, column 1: live value "@{}": expected a cell name' }]);
    expect(issues("@{a..b}")).toEqual([{ path: `${P}.text`, message: 'line 1, column 1: live value "@{a..b}": "" after "." must be a field name or an array index' }]);
    expect(issues("@{a:x}")).toEqual([{ path: `${P}.text`, message: 'line 1, column 1: live value "@{a:x}": format "x" must be digits then f, s or e (e.g. ":3f", ":4", ":2e")' }]);
    expect(issues("@{a:0s}")).toEqual([{ path: `${P}.text`, message: 'line 1, column 1: live value "@{a:0s}": format digits must be between 1 and 20, got 0' }]);
  });

  it("validateProseSettings reports a live value left open on its line", () => {
    expect(issues("mail me@{home\n}")).toEqual([{ path: `${P}.text`, message: 'line 1, column 8: live value "@{home" has no closing "}" on its line (write \\@{ for a literal "@{")' }]);
  });

  it("validateProseSettings reports every malformed value", () => {
    expect(issues("@{1} and @{2}")).toHaveLength(2);
  });

  it("validateProseSettings requires text as a string", () => {
    expect(validateProseSettings({}, P)).toEqual([{ path: `${P}.text`, message: "missing (required)" }]);
    expect(issues(null)).toEqual([{ path: `${P}.text`, message: "must be a string, got null" }]);
  });
});

describe("proseDependencies", () => {
  it("proseDependencies lists the cells shown, once each, in order", () => {
    expect(proseDependencies({ text: "@{b} @{a.x} @{b:2} \\@{c}" })).toEqual(["b", "a"]);
  });

  it("mapProseReferences renames names only, leaving every other character", () => {
    const s = { text: "@{ eps : 3f } vs @{epsilon} and eps and @{eps.x}" };
    expect(mapProseReferences(s, (n) => (n === "eps" ? "rate" : n)).text).toBe("@{ rate : 3f } vs @{epsilon} and eps and @{rate.x}");
    expect(mapProseReferences(s, (n) => n)).toBe(s);
  });
});
