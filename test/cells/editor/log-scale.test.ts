import { describe, expect, it } from "vitest";
import { linearValue, logPosition, logValue, roundSignificant } from "../../../cells/editor/controls/log-scale";

// A log slider maps positions linearly to log(value) (common practice, no source).

describe("log slider scale", () => {
  it("logPosition puts the geometric mean of min and max in the middle", () => {
    expect(logPosition(Math.sqrt(0.001 * 1), 0.001, 1, 1000)).toBe(500);
  });

  it("logValue returns the exact ends at positions 0 and steps", () => {
    expect(logValue(0, 0.001, 1)).toBe(0.001);
    expect(logValue(1000, 0.001, 1)).toBe(1);
  });

  it("logValue rounds to 3 significant digits and stays within the range", () => {
    const v = logValue(333, 0.001, 1);
    expect(v).toBe(roundSignificant(v, 3));
    expect(v).toBeGreaterThanOrEqual(0.001);
    expect(v).toBeLessThanOrEqual(1);
  });

  it("logPosition(logValue(p)) is within one step of p for every position", () => {
    for (let p = 0; p <= 1000; p += 7) expect(Math.abs(logPosition(logValue(p, 1e-4, 10), 1e-4, 10) - p)).toBeLessThanOrEqual(1);
  });

  it("logPosition throws a RangeError naming min and max for a range that is not positive", () => {
    expect(() => logPosition(1, 0, 1)).toThrow(/min 0, max 1/);
  });

  it("linearValue snaps to the step from min", () => {
    expect(linearValue(333, 0, 10, 1000, 0.5)).toBe(3.5);
  });
});
