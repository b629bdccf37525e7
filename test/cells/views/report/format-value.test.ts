import { describe, expect, it } from "vitest";
import { formatParameterValue, formatSeconds, formatTableValue } from "../../../../cells/views/report/format-value";

describe("formatTableValue", () => {
  it("formatTableValue(value, format) writes each column format as documented", () => {
    expect(formatTableValue(12345.6, "integer")).toBe("12,346");
    expect(formatTableValue(0.1234, "percent")).toBe("12.3 %");
    expect(formatTableValue(0.000123456, "scientific")).toBe("1.23e\u22124");
    expect(formatTableValue(4321, "scientific")).toBe("4.32e3");
    expect(formatTableValue(Math.PI, { fixed: 3 })).toBe("3.142");
    expect(formatTableValue(-Math.PI, { fixed: 1 })).toBe("\u22123.1");
    expect(formatTableValue(Math.PI, { significant: 2 })).toBe("3.1");
    expect(formatTableValue(Math.PI, undefined)).toBe("3.142");
    expect(formatTableValue(7, "text")).toBe("7");
  });

  it("formatTableValue(null, booleans, strings) gives a dash, yes/no and the string as is", () => {
    expect(formatTableValue(null, "integer")).toBe("—");
    expect(formatTableValue(true, undefined)).toBe("yes");
    expect(formatTableValue("<b>", "percent")).toBe("<b>"); // escaping is the renderer's job
  });
});

describe("formatParameterValue and formatSeconds", () => {
  it("formatParameterValue(number) keeps the exact shortest form so the run can be repeated", () => {
    expect(formatParameterValue(0.1 + 0.2)).toBe("0.30000000000000004");
    expect(formatParameterValue(1e-7)).toBe("1e-7");
    expect(formatParameterValue(false)).toBe("off");
  });

  it("formatSeconds(seconds) picks ms, s or min and never shows 60 s", () => {
    expect(formatSeconds(0.0008)).toBe("0.8 ms");
    expect(formatSeconds(0.412)).toBe("412 ms");
    expect(formatSeconds(12.5)).toBe("12.50 s");
    expect(formatSeconds(59.999)).toBe("1 min 00 s");
    expect(formatSeconds(185)).toBe("3 min 05 s");
    expect(formatSeconds(NaN)).toBe("—");
  });
});
