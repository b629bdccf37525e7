import { describe, expect, it } from "vitest";
import { TransportInputError } from "../../core/errors";
import { normalDraw, parkMiller, randomSource, seededRandom } from "../../core/random";
import { inputError } from "./expectations";

describe("parkMiller", () => {
  it("parkMiller(1) reaches state 1043618065 at the 10000th output (Park & Miller 1988 check value)", () => {
    // Park & Miller 1988, CACM 31, "minimal standard": x0 = 1, x10000 = 1043618065.
    const random = parkMiller(1);
    let value = 0;
    for (let i = 0; i < 10000; i++) value = random();
    const state = Math.round(value * 2147483647);
    expect(state).toBe(1043618065);
    expect(value).toBe(1043618065 / 2147483647);
  });

  it("parkMiller(1) starts 16807, 16807² (the recurrence x ← 16807·x mod 2³¹−1, by hand)", () => {
    const random = parkMiller(1);
    expect(random() * 2147483647).toBeCloseTo(16807, 6);
    expect(random() * 2147483647).toBeCloseTo(282475249, 4); // 16807² < 2³¹−1, no reduction yet
  });

  it("parkMiller(0) is the same stream as parkMiller(1) (0 is not a valid state)", () => {
    const a = parkMiller(0);
    const b = parkMiller(1);
    for (let i = 0; i < 5; i++) expect(a()).toBe(b());
  });

  it("parkMiller(NaN) throws a TransportInputError naming seed", () => {
    expect(inputError(() => parkMiller(Number.NaN)).field).toBe("seed");
    expect(inputError(() => parkMiller(Number.POSITIVE_INFINITY)).field).toBe("seed");
  });
});

describe("seededRandom", () => {
  it("seededRandom(seed) gives the same bits for the same seed and differs between seeds", () => {
    const draw = (seed: number) => {
      const r = seededRandom(seed);
      return Float64Array.from({ length: 1000 }, () => r());
    };
    expect(Buffer.from(draw(42).buffer).equals(Buffer.from(draw(42).buffer))).toBe(true);
    expect(Buffer.from(draw(42).buffer).equals(Buffer.from(draw(43).buffer))).toBe(false);
  });

  it("seededRandom(seed) stays in [0, 1) with mean 1/2, variance 1/12 and no lag-1 correlation", () => {
    // Moments of U(0,1) (common practice, no source); bounds are 5 standard errors.
    const n = 100_000;
    const r = seededRandom(2024);
    const u = Float64Array.from({ length: n }, () => r());
    let sum = 0;
    let min = 1;
    let max = 0;
    for (const v of u) {
      sum += v;
      min = Math.min(min, v);
      max = Math.max(max, v);
    }
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    const mean = sum / n;
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    let variance = 0;
    let lag = 0;
    for (let i = 0; i < n; i++) {
      variance += (u[i] - mean) ** 2;
      if (i > 0) lag += (u[i] - mean) * (u[i - 1] - mean);
    }
    variance /= n;
    // Var of the sample variance of U(0,1): (1/80 − 1/144)/n.
    expect(Math.abs(variance - 1 / 12)).toBeLessThan(5 * Math.sqrt((1 / 80 - 1 / 144) / n));
    expect(Math.abs(lag / (n - 1) / variance)).toBeLessThan(5 / Math.sqrt(n));
  });

  it("seededRandom(seed) fills 100 equal bins evenly (chi-square, 99 degrees of freedom)", () => {
    // Pearson chi-square: mean 99, sd √198 ≈ 14 under uniformity (common practice, no source).
    const bins = new Float64Array(100);
    const n = 100_000;
    const r = seededRandom(7);
    for (let i = 0; i < n; i++) bins[Math.floor(r() * 100)]++;
    let chi2 = 0;
    for (const c of bins) chi2 += (c - n / 100) ** 2 / (n / 100);
    expect(chi2).toBeLessThan(99 + 5 * Math.sqrt(198));
    expect(chi2).toBeGreaterThan(99 - 5 * Math.sqrt(198));
  });

  it("seededRandom(Infinity) throws a TransportInputError naming seed", () => {
    const error = inputError(() => seededRandom(Number.POSITIVE_INFINITY));
    expect(error.field).toBe("seed");
  });
});

describe("randomSource", () => {
  it("randomSource(seed) is seededRandom(seed) and randomSource(fn) is fn itself", () => {
    const a = randomSource(5);
    const b = seededRandom(5);
    for (let i = 0; i < 10; i++) expect(a()).toBe(b());
    const fn = parkMiller(3);
    expect(randomSource(fn)).toBe(fn);
  });

  it("randomSource('x', 'options.random') throws a TransportInputError naming the given field", () => {
    const error = inputError(() => randomSource("x" as unknown as number, "options.random"));
    expect(error.field).toBe("options.random");
    expect(inputError(() => randomSource(Number.NaN)).field).toBe("random");
  });
});

describe("normalDraw", () => {
  it("normalDraw(random) has mean 0, variance 1 and 95 % of draws within ±1.96", () => {
    // Standard normal moments and the 1.96 quantile (common practice, no source); 5 standard errors.
    const n = 100_000;
    const r = seededRandom(11);
    let sum = 0;
    let squares = 0;
    let inside = 0;
    for (let i = 0; i < n; i++) {
      const z = normalDraw(r);
      sum += z;
      squares += z * z;
      if (Math.abs(z) < 1.959964) inside++;
    }
    expect(Math.abs(sum / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(squares / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    expect(Math.abs(inside / n - 0.95)).toBeLessThan(5 * Math.sqrt((0.95 * 0.05) / n));
  });

  it("normalDraw(random) consumes exactly two uniforms per draw", () => {
    let calls = 0;
    const base = seededRandom(1);
    const counting = () => {
      calls++;
      return base();
    };
    for (let i = 0; i < 10; i++) normalDraw(counting);
    expect(calls).toBe(20);
  });
});
