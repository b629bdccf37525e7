import { describe, expect, it } from "vitest";
import { formatCount, formatNumber, formatPercent } from "../../../../cells/views/figures/format-number";

describe("formatNumber", () => {
  it("formatNumber(value) keeps 4 significant digits in plain notation between 1e−3 and 1e6", () => {
    expect(formatNumber(0.0412345)).toBe("0.04123");
    expect(formatNumber(1234.5678)).toBe("1235");
    expect(formatNumber(10, 1)).toBe("10");
    expect(formatNumber(2.5)).toBe("2.5");
    expect(formatNumber(-0.5)).toBe("\u22120.5");
  });

  it("formatNumber(value) switches to e-notation with a real minus outside that range", () => {
    expect(formatNumber(1e-6, 1)).toBe("1e\u22126");
    expect(formatNumber(0.000123456)).toBe("1.235e\u22124");
    expect(formatNumber(2.5e7)).toBe("2.5e7");
    expect(formatNumber(999999.9)).toBe("1e6");
  });

  it("formatNumber(special values) writes 0, NaN and ∞ readably", () => {
    expect(formatNumber(0)).toBe("0");
    expect(formatNumber(NaN)).toBe("NaN");
    expect(formatNumber(-Infinity)).toBe("\u2212∞");
  });
});

describe("formatCount and formatPercent", () => {
  it("formatCount(12345) groups thousands; formatPercent(0.8734) gives one decimal", () => {
    expect(formatCount(12345)).toBe("12,345");
    expect(formatPercent(0.8734)).toBe("87.3 %");
    expect(formatPercent(1)).toBe("100.0 %");
  });
});
