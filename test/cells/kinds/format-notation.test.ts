import { describe, expect, it } from "vitest";
import { defaultNumberText, formatNotation } from "../../../cells/kinds/format-notation";

// Notations as docs/format.md defines them; digits as JavaScript's toFixed,
// toPrecision and toExponential write them (ECMA-262, Number.prototype).
describe("formatNotation", () => {
  it("formatNotation(0.05, notation, 3) gives the examples of docs/format.md's table section", () => {
    expect(["auto", "fixed", "significant", "scientific"].map((n) => formatNotation(0.05, n as never, 3))).toEqual(["0.0500", "0.050", "0.0500", "5.000e-2"]);
  });

  it("formatNotation(x, 'auto') writes the shortest exact text without digits, scientific outside [0.001, 1e6) with them", () => {
    expect(formatNotation(0.000001)).toBe("0.000001");
    expect(formatNotation(1e21)).toBe("1e+21");
    expect(formatNotation(1234567, "auto", 3)).toBe("1.23e+6");
    expect(formatNotation(0.0001234, "auto", 2)).toBe("1.2e-4");
    expect(formatNotation(0, "auto", 2)).toBe("0.0");
  });

  it("formatNotation(x, 'significant') writes large numbers in full rather than toPrecision's exponent", () => {
    expect(formatNotation(123456, "significant", 3)).toBe("123000");
    expect(formatNotation(-2.5, "significant", 1)).toBe("-3");
  });

  it("formatNotation(non-finite) writes NaN and Infinity as JavaScript does", () => {
    expect([formatNotation(NaN, "fixed", 2), formatNotation(-Infinity, "scientific", 2)]).toEqual(["NaN", "-Infinity"]);
  });

  it("defaultNumberText(x) keeps integers and rounds other numbers to 6 significant digits", () => {
    expect([defaultNumberText(300), defaultNumberText(1.2841), defaultNumberText(1 / 3), defaultNumberText(1.5e-7)]).toEqual(["300", "1.2841", "0.333333", "1.5e-7"]);
  });
});
