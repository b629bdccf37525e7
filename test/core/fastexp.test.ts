import { describe, expect, it } from "vitest";
import { EXP_OVERFLOW, EXP_UNDERFLOW, INV_STEP, LN2_STEP_HI, LN2_STEP_LO, ROUNDER, fastExp } from "../../core/fastexp";
import { seededRandom } from "../../core/random";

describe("fastExp", () => {
  it("fastExp(x) is within 3 ulp of Math.exp over [−745, 709]", () => {
    // Reference: the engine's Math.exp (itself within 1 ulp in V8's fdlibm port); table method of Tang 1989.
    const r = seededRandom(1);
    let worst = 0;
    for (let k = 0; k < 200_000; k++) {
      const x = k < 100_000 ? -745 + 1454 * r() : 4 * r() - 2;
      const e = Math.exp(x);
      if (e < 2.3e-308) continue; // subnormal results carry fewer digits
      worst = Math.max(worst, Math.abs(fastExp(x) - e) / e);
    }
    expect(worst).toBeLessThan(3 * Number.EPSILON);
  });

  it("fastExp(x) is 0 below the underflow limit, Infinity above the overflow limit, and keeps NaN", () => {
    // IEEE 754 double range: e^x underflows to 0 below −745.13 and overflows above 709.78 (common practice).
    expect(fastExp(0)).toBe(1);
    expect(fastExp(-Infinity)).toBe(0);
    expect(fastExp(-746)).toBe(0);
    expect(fastExp(EXP_UNDERFLOW)).toBe(0);
    expect(fastExp(Infinity)).toBe(Infinity);
    expect(fastExp(710)).toBe(Infinity);
    expect(fastExp(EXP_OVERFLOW)).toBe(Infinity);
    expect(Number.isNaN(fastExp(NaN))).toBe(true);
    expect(fastExp(709.7) / 1e308).toBeCloseTo(Math.exp(709.7) / 1e308, 12);
  });

  it("fastExp's inlined literals equal the named constants they stand for", () => {
    // Guards the hand-inlined constants in fastExp (see the comment there).
    expect(INV_STEP).toBe(369.3299304675746);
    expect(LN2_STEP_HI).toBe(0.00270760617331689);
    expect(LN2_STEP_LO).toBe(7.453964567463233e-13);
    expect(ROUNDER).toBe(6755399441055744);
  });
});
