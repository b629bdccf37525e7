import { describe, expect, it } from "vitest";
import { assignment } from "../../core/assignment";
import { TransportInputError } from "../../core/errors";
import type { Matrix } from "../../core/matrix";
import { networkSimplex } from "../../core/network-simplex";
import { type RandomSource, seededRandom } from "../../core/random";
import { lpCertificate, solveTransportLp } from "../oracle/lp-oracle";
import { expectClose, inputError } from "./expectations";

type Kind = "uniform" | "geometric" | "integer-ties" | "crowded" | "repeated-points";

/**
 * Seeded n×n cost matrices: i.i.d. uniform, squared distances of 2-D clouds, integers 0..3,
 * two clusters holding 75 % of the sources but 60 % of the targets (some rows must go far),
 * or clouds with only 5 distinct source and 7 distinct target locations (massive ties).
 */
function costs(kind: Kind, n: number, seed: number): Matrix {
  const random = seededRandom(seed);
  const data = new Float64Array(n * n);
  if (kind === "uniform") for (let k = 0; k < data.length; k++) data[k] = random();
  else if (kind === "integer-ties") for (let k = 0; k < data.length; k++) data[k] = Math.floor(4 * random());
  else if (kind === "crowded") {
    const x = Float64Array.from({ length: n }, (_, i) => random() + (i < 0.75 * n ? 0 : 10));
    const y = Float64Array.from({ length: n }, (_, j) => random() + (j < 0.6 * n ? 0 : 10));
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) data[i * n + j] = (x[i] - y[j]) ** 2;
  } else if (kind === "repeated-points") {
    const x = Float64Array.from({ length: 10 }, random);
    const y = Float64Array.from({ length: 14 }, random);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) data[i * n + j] = (x[2 * (i % 5)] - y[2 * (j % 7)]) ** 2 + (x[2 * (i % 5) + 1] - y[2 * (j % 7) + 1]) ** 2;
    }
  } else {
    const x = Float64Array.from({ length: 2 * n }, random);
    const y = Float64Array.from({ length: 2 * n }, random);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) data[i * n + j] = (x[2 * i] - y[2 * j]) ** 2 + (x[2 * i + 1] - y[2 * j + 1]) ** 2;
  }
  return { data, rows: n, cols: n };
}

/** Minimum over all n! permutations (Heap's algorithm): the definition of the problem. */
function bruteForce(C: Matrix): number {
  const n = C.rows;
  const p = Array.from({ length: n }, (_, k) => k);
  const value = () => p.reduce((s, j, i) => s + C.data[i * n + j], 0);
  let best = value();
  const c = new Array(n).fill(0);
  let i = 0;
  while (i < n) {
    if (c[i] < i) {
      const k = i % 2 === 0 ? 0 : c[i];
      [p[k], p[i]] = [p[i], p[k]];
      best = Math.min(best, value());
      c[i]++;
      i = 0;
    } else {
      c[i] = 0;
      i++;
    }
  }
  return best;
}

function expectPermutation(perm: Int32Array): void {
  expect(Array.from(perm).sort((u, v) => u - v)).toEqual(Array.from(perm, (_, k) => k));
}

/** Checks f_i + g_j ≤ C_ij everywhere, equality on the matching, Σf + Σg = cost (LP duality). */
function expectCertificate(C: Matrix, result: ReturnType<typeof assignment>): void {
  const n = C.rows;
  const w = new Float64Array(n).fill(1);
  const plan = { from: Int32Array.from({ length: n }, (_, i) => i), to: result.permutation, mass: w };
  const cert = lpCertificate(w, w, C, plan, result.f, result.g);
  expect(cert.dualViolation).toBeLessThanOrEqual(1e-13);
  expect(cert.slackness).toBeLessThanOrEqual(1e-13);
  expect(cert.gap).toBeLessThanOrEqual(1e-13);
  expectClose(cert.cost, result.cost, 1e-14, 1);
}

describe("assignment against enumeration", () => {
  const cases: [Kind, number, number][] = [];
  for (const kind of ["uniform", "geometric", "integer-ties"] as const) for (let n = 2; n <= 7; n++) cases.push([kind, n, 40 + n]);
  it.each(cases)("assignment(%s, n = %d, seed %d) equals the minimum over all permutations", (kind, n, seed) => {
    // Oracle: exhaustive enumeration of the n! permutations (definition, common practice).
    const C = costs(kind, n, seed);
    const result = assignment(C);
    expectPermutation(result.permutation);
    expectClose(result.cost, bruteForce(C), 1e-14, 1);
    expectCertificate(C, result);
  });
});

describe("assignment as optimal transport between uniform clouds", () => {
  it.each([
    ["geometric", 60, 1],
    ["uniform", 80, 2],
    ["integer-ties", 70, 3],
    ["crowded", 100, 4],
    ["repeated-points", 90, 5],
  ] as const)("assignment(%s, n = %d, seed %d): cost/n equals the LP and network simplex values for masses 1/n", async (kind, n, seed) => {
    // Birkhoff 1946 / von Neumann 1953: a permutation/n is an optimal plan between uniform
    // clouds of equal size, so the assignment value over n is the transport optimum.
    const C = costs(kind, n, seed);
    const w = new Float64Array(n).fill(1 / n);
    const result = assignment(C);
    const lp = await solveTransportLp(w, w, C); // oracle: HiGHS (Huangfu & Hall 2018)
    const simplex = networkSimplex(w, w, C);
    expectClose(result.cost / n, lp.cost, 1e-9, 1e-6);
    expectClose(result.cost / n, simplex.cost, 1e-12, 1e-12);
    expectCertificate(C, result);
  });

  it.each([
    ["uniform", 400],
    ["geometric", 400],
    ["integer-ties", 400],
    ["crowded", 400],
    ["repeated-points", 400],
  ] as const)("assignment(%s, n = %d) returns a permutation with a dual certificate", (kind, n) => {
    const C = costs(kind, n, 7);
    const result = assignment(C);
    expect(result.status).toBe("converged");
    expectPermutation(result.permutation);
    expectCertificate(C, result);
  });
});

describe("assignment laws", () => {
  it("assignment of a row- and column-permuted matrix returns the correspondingly permuted matching", () => {
    // Relabelling (common practice, no source); continuous random costs make the optimum unique.
    const n = 120;
    const C = costs("geometric", n, 8);
    const random = seededRandom(9);
    const rowPerm = shuffle(n, random);
    const colPerm = shuffle(n, random);
    const data = new Float64Array(n * n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) data[r * n + c] = C.data[rowPerm[r] * n + colPerm[c]];
    const base = assignment(C);
    const permuted = assignment({ data, rows: n, cols: n });
    expectClose(permuted.cost, base.cost, 1e-12);
    for (let r = 0; r < n; r++) expect(colPerm[permuted.permutation[r]]).toBe(base.permutation[rowPerm[r]]);
  });

  it("assignment returns identical bits for identical inputs", () => {
    const C = costs("integer-ties", 150, 10);
    const r1 = assignment(C);
    const r2 = assignment({ data: Float64Array.from(C.data), rows: 150, cols: 150 });
    expect(Array.from(r1.permutation)).toEqual(Array.from(r2.permutation));
    expect(Object.is(r1.cost, r2.cost)).toBe(true);
    expect(Buffer.from(r1.f.buffer).equals(Buffer.from(r2.f.buffer))).toBe(true);
    expect(Buffer.from(r1.g.buffer).equals(Buffer.from(r2.g.buffer))).toBe(true);
  });

  it("assignment does not modify its input", () => {
    const C = costs("uniform", 50, 11);
    const copy = Float64Array.from(C.data);
    assignment(C);
    expect(C.data).toEqual(copy);
  });

  it("assignment of a 1×1 matrix matches the single pair", () => {
    const result = assignment({ data: Float64Array.of(3.5), rows: 1, cols: 1 });
    expect(Array.from(result.permutation)).toEqual([0]);
    expect(result.cost).toBe(3.5);
    expect(result.f[0] + result.g[0]).toBe(3.5);
  });

  it("assignment with an aborted signal returns status cancelled, not an exception", () => {
    const controller = new AbortController();
    controller.abort();
    const result = assignment(costs("geometric", 100, 12), { signal: controller.signal });
    expect(result.status).toBe("cancelled");
  });
});

describe("assignment input errors", () => {
  it("assignment of a 3×4 matrix throws a TransportInputError naming C", () => {
    expect(inputError(() => assignment({ data: new Float64Array(12), rows: 3, cols: 4 })).field).toBe("C");
  });

  it("assignment of a matrix with a NaN entry throws naming the entry", () => {
    const data = new Float64Array(9);
    data[7] = NaN;
    expect(inputError(() => assignment({ data, rows: 3, cols: 3 })).field).toBe("C[2][1]");
  });
});

function shuffle(count: number, random: RandomSource): Int32Array {
  const p = Int32Array.from({ length: count }, (_, k) => k);
  for (let k = count - 1; k > 0; k--) {
    const r = Math.floor(random() * (k + 1));
    [p[k], p[r]] = [p[r], p[k]];
  }
  return p;
}
