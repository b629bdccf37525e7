import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { parseStudy } from "../../../cells/document";
import { namedParameters, parseOverrides, parseParameterText } from "../../../cells/cli/parse-overrides";
import { UsageError } from "../../../cells/cli/usage-error";

// The fixture has one parameter of every control: spread (number 0–2), rho (log-range
// 0.01–100), count (integer 10–2000), method (choice), showLines (toggle), note (text),
// drawSeed (seed).
const everyKind = parseStudy(readFileSync(fileURLToPath(new URL("../../fixtures/studies/every-kind.couplet.json", import.meta.url)), "utf8"));

function problem(texts: string[]): string {
  try {
    parseOverrides(everyKind, texts);
  } catch (error) {
    expect(error).toBeInstanceOf(UsageError);
    return (error as Error).message;
  }
  throw new Error("expected a UsageError");
}

describe("parseOverrides", () => {
  it("parseOverrides(study, valid texts) types each value by its parameter's control", () => {
    const values = parseOverrides(everyKind, [
      "spread=1.25",
      "rho=1e-1",
      "count=400",
      "method=debiased",
      "showLines=off",
      "note=second = final draft",
      "drawSeed=4294967295",
    ]);
    expect(values).toEqual({ spread: 1.25, rho: 0.1, count: 400, method: "debiased", showLines: false, note: "second = final draft", drawSeed: 4294967295 });
  });

  it("parseOverrides(study, toggle words) reads true/false, yes/no, on/off and 1/0 in any case", () => {
    for (const word of ["true", "YES", "On", "1"]) expect(parseOverrides(everyKind, [`showLines=${word}`])).toEqual({ showLines: true });
    for (const word of ["false", "no", "OFF", "0"]) expect(parseOverrides(everyKind, [`showLines=${word}`])).toEqual({ showLines: false });
  });

  it("parseOverrides(study, [text=]) keeps an empty text value", () => {
    expect(parseOverrides(everyKind, ["note="])).toEqual({ note: "" });
  });

  it("parseOverrides(study, [unknown name]) throws a UsageError listing the study's parameters", () => {
    const message = problem(["epsilon=0.1"]);
    expect(message).toContain('the study has no parameter "epsilon"');
    expect(message).toContain("spread, rho, count, method, showLines, note, drawSeed");
  });

  it("parseOverrides(study, [a data cell's name]) says the cell is not a parameter", () => {
    expect(problem(["ovens=3"])).toContain('"ovens" is a data cell, not a parameter');
  });

  it("parseOverrides(study, invalid values) names the option, the parameter and the problem", () => {
    // Strict numbers: no hex, no trailing text, no Infinity (common practice for CLIs, no source).
    expect(problem(["spread=0x1"])).toBe('--set spread=0x1: parameter "spread" (number): not a number: "0x1"');
    expect(problem(["spread=1.5km"])).toContain("not a number");
    expect(problem(["rho=Infinity"])).toContain("not a number");
    expect(problem(["rho=1000"])).toContain("1000 is outside the parameter's range [0.01, 100]");
    expect(problem(["count=12.5"])).toContain('not a whole number: "12.5"');
    expect(problem(["count=5"])).toContain("outside the parameter's range [10, 2000]");
    expect(problem(["method=greedy"])).toContain('"greedy" is not one of the options: exact, entropic, debiased');
    expect(problem(["showLines=maybe"])).toContain("true/false, yes/no, on/off or 1/0");
    expect(problem(["drawSeed=-1"])).toContain("a seed is a whole number in [0, 4294967295]");
    expect(problem(["drawSeed=4294967296"])).toContain("a seed is a whole number in [0, 4294967295]");
  });

  it("parseOverrides(study, [no equals sign]) asks for NAME=VALUE", () => {
    expect(problem(["spread"])).toContain("write NAME=VALUE");
    expect(problem(["=3"])).toContain("write NAME=VALUE");
  });

  it("parseOverrides(study, [the same name twice]) refuses the second", () => {
    expect(problem(["spread=1", "spread=2"])).toContain('parameter "spread" is set twice');
  });
});

describe("parseParameterText", () => {
  it("parseParameterText(choice of numbers, text) reads the text as a number", () => {
    const settings = { control: "choice", value: 0.1, options: [0.1, 1, 10] } as const;
    expect(parseParameterText(settings, "0.10")).toEqual({ value: 0.1 });
    expect(parseParameterText(settings, "1e1")).toEqual({ value: 10 });
    expect(parseParameterText(settings, "2")).toEqual({ problem: '"2" is not one of the options: 0.1, 1, 10' });
  });

  it("parseParameterText(choice of strings that look like numbers, text) keeps the string", () => {
    const settings = { control: "choice", value: "01", options: ["01", "02"] } as const;
    expect(parseParameterText(settings, "01")).toEqual({ value: "01" });
  });

  it("parseParameterText(unbounded integer, text) accepts any whole number", () => {
    expect(parseParameterText({ control: "integer", value: 3 }, "-7")).toEqual({ value: -7 });
  });
});

describe("namedParameters", () => {
  it("namedParameters(study) lists parameter cells in study order", () => {
    expect(namedParameters(everyKind).map((c) => c.name)).toEqual(["spread", "rho", "count", "method", "showLines", "note", "drawSeed"]);
  });
});
