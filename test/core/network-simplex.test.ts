import { describe, expect, it } from "vitest";
import { TransportInputError } from "../../core/errors";
import type { Matrix } from "../../core/matrix";
import { networkSimplex } from "../../core/network-simplex";
import { type RandomSource, seededRandom } from "../../core/random";
import { lpCertificate, solveTransportLp } from "../oracle/lp-oracle";
import { expectClose, inputError } from "./expectations";

type Kind = "continuous" | "integer-ties" | "zero-masses" | "repeated-points" | "negative-costs" | "sparse-support";

interface Instance {
  readonly label: string;
  readonly a: Float64Array;
  readonly b: Float64Array;
  readonly C: Matrix;
}

function points(random: RandomSource, count: number, dim: number): Float64Array {
  const out = new Float64Array(count * dim);
  for (let k = 0; k < out.length; k++) out[k] = random();
  return out;
}

function sqeuclidean(x: Float64Array, y: Float64Array, dim: number): Matrix {
  const n = x.length / dim;
  const m = y.length / dim;
  const data = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < m; j++) {
      let s = 0;
      for (let k = 0; k < dim; k++) s += (x[i * dim + k] - y[j * dim + k]) ** 2;
      data[i * m + j] = s;
    }
  }
  return { data, rows: n, cols: m };
}

/** Positive masses normalised to total 1. */
function weights(random: RandomSource, count: number, zeroShare = 0): Float64Array {
  const w = new Float64Array(count);
  for (let k = 0; k < count; k++) w[k] = random() < zeroShare ? 0 : 0.05 + random();
  if (w.every((x) => x === 0)) w[0] = 1;
  const total = w.reduce((s, x) => s + x, 0);
  return w.map((x) => x / total);
}

/** Integer masses 0..4 on both sides with equal totals (the smaller side topped up). */
function integerMasses(random: RandomSource, n: number, m: number): [Float64Array, Float64Array] {
  const a = Float64Array.from({ length: n }, () => Math.floor(random() * 5));
  const b = Float64Array.from({ length: m }, () => Math.floor(random() * 5));
  a[0] += 1;
  const sa = a.reduce((s, x) => s + x, 0);
  const sb = b.reduce((s, x) => s + x, 0);
  if (sa > sb) b[Math.floor(random() * m)] += sa - sb;
  else a[Math.floor(random() * n)] += sb - sa;
  return [a, b];
}

/** A seeded instance of the given kind (invented data; the oracle decides the answer). */
function instance(kind: Kind, n: number, m: number, seed: number): Instance {
  const random = seededRandom(seed);
  const label = `${kind} ${n}×${m} seed ${seed}`;
  switch (kind) {
    case "continuous":
      return { label, a: weights(random, n), b: weights(random, m), C: sqeuclidean(points(random, n, 2), points(random, m, 2), 2) };
    case "integer-ties": {
      // Integer masses and costs 1..3: many tied optimal plans and degenerate bases.
      const [a, b] = integerMasses(random, n, m);
      const data = Float64Array.from({ length: n * m }, () => 1 + Math.floor(random() * 3));
      return { label, a, b, C: { data, rows: n, cols: m } };
    }
    case "zero-masses":
      return { label, a: weights(random, n, 0.3), b: weights(random, m, 0.3), C: sqeuclidean(points(random, n, 3), points(random, m, 3), 3) };
    case "repeated-points": {
      // Only 4 distinct source and 5 distinct target locations: identical cost rows/columns.
      const xs = points(random, 4, 2);
      const ys = points(random, 5, 2);
      const x = new Float64Array(n * 2);
      const y = new Float64Array(m * 2);
      for (let i = 0; i < n; i++) x.set(xs.subarray(2 * (i % 4), 2 * (i % 4) + 2), 2 * i);
      for (let j = 0; j < m; j++) y.set(ys.subarray(2 * (j % 5), 2 * (j % 5) + 2), 2 * j);
      return { label, a: weights(random, n), b: weights(random, m), C: sqeuclidean(x, y, 2) };
    }
    case "negative-costs": {
      const data = Float64Array.from({ length: n * m }, () => 10 * random() - 7);
      return { label, a: weights(random, n), b: weights(random, m), C: { data, rows: n, cols: m } };
    }
    case "sparse-support": {
      // Most mass on a few points, integer masses, integer costs 0..9 (ties, degenerate).
      const [a, b] = integerMasses(random, n, m);
      for (let i = 0; i < n; i++) if (i % 3 !== 0) a[i] = 0;
      a[0] += b.reduce((s, x) => s + x, 0) - a.reduce((s, x) => s + x, 0);
      const data = Float64Array.from({ length: n * m }, () => Math.floor(random() * 10));
      return { label, a, b, C: { data, rows: n, cols: m } };
    }
  }
}

const KINDS: readonly Kind[] = ["continuous", "integer-ties", "zero-masses", "repeated-points", "negative-costs", "sparse-support"];
const CASES: Instance[] = [];
for (let s = 0; s < 36; s++) {
  const n = 1 + ((s * 37) % 80);
  const m = 1 + ((s * 53 + 11) % 100);
  CASES.push(instance(KINDS[s % KINDS.length], n, m, 1000 + s));
}
CASES.push(instance("continuous", 80, 100, 77));
CASES.push(instance("integer-ties", 80, 100, 78));
CASES.push(instance("zero-masses", 80, 100, 79));
CASES.push(instance("integer-ties", 1, 7, 80));
CASES.push(instance("continuous", 9, 1, 81));

describe("networkSimplex against the HiGHS LP oracle", () => {
  it.each(CASES.map((c) => [c.label, c] as const))("networkSimplex(%s) matches the LP optimum with a feasible basic plan and a dual certificate", async (_label, { a, b, C }) => {
    const result = networkSimplex(a, b, C);
    expect(result.status).toBe("converged");
    // Oracle: HiGHS dual simplex on the same LP (Huangfu & Hall 2018).
    const lp = await solveTransportLp(a, b, C);
    const total = a.reduce((s, x) => s + x, 0);
    const maxC = C.data.reduce((s, x) => Math.max(s, Math.abs(x)), 0);
    expectClose(result.cost, lp.cost, 1e-9, 1e-6 * maxC * total);
    // LP optimality conditions (Dantzig 1963): feasibility, f ⊕ g ≤ C, slackness, no gap.
    const cert = lpCertificate(a, b, C, result.plan, result.f, result.g);
    expect(cert.marginalError).toBeLessThanOrEqual(1e-12);
    expect(cert.negativeMass).toBe(0);
    expect(cert.dualViolation).toBeLessThanOrEqual(1e-12);
    expect(cert.slackness).toBeLessThanOrEqual(1e-12);
    expect(cert.gap).toBeLessThanOrEqual(1e-12);
    expectClose(cert.cost, result.cost, 1e-13, maxC * total);
    // A basic solution lives on a spanning tree: at most n + m − 1 entries (Dantzig 1951).
    expect(result.plan.mass.length).toBeLessThanOrEqual(a.length + b.length - 1);
    expect(result.plan.mass.every((x) => x > 0)).toBe(true);
  });
});

describe("networkSimplex certificates", () => {
  it("networkSimplex(a, b, C) returns potentials whose dual value ⟨f,a⟩ + ⟨g,b⟩ equals the cost", () => {
    // LP strong duality (common practice, no source beyond any LP text).
    const { a, b, C } = instance("continuous", 50, 70, 5);
    const { f, g, cost } = networkSimplex(a, b, C);
    let dual = 0;
    a.forEach((x, i) => (dual += x * f[i]));
    b.forEach((x, j) => (dual += x * g[j]));
    expectClose(dual, cost, 1e-13);
  });

  it("networkSimplex gives isolated zero-mass points dual-feasible potentials", () => {
    // Dual feasibility must hold on every pair, also for points that carry nothing.
    const { b, C } = instance("continuous", 6, 8, 6);
    const a = Float64Array.from([0, 0.5, 0, 0, 0.5, 0]);
    const cert = (() => {
      const r = networkSimplex(a, b, C);
      return lpCertificate(a, b, C, r.plan, r.f, r.g);
    })();
    expect(cert.dualViolation).toBeLessThanOrEqual(1e-12);
    expect(cert.marginalError).toBeLessThanOrEqual(1e-12);
  });

  it("networkSimplex(a, b, C) with n = m = 2000 (dense, 4·10⁶ arcs) finishes with a feasible plan and dual certificate", () => {
    // Size check only (no timing): the certificate proves optimality by LP duality.
    const { a, b, C } = instance("continuous", 2000, 2000, 2024);
    const result = networkSimplex(a, b, C);
    expect(result.status).toBe("converged");
    const cert = lpCertificate(a, b, C, result.plan, result.f, result.g);
    expect(cert.marginalError).toBeLessThanOrEqual(1e-12);
    expect(cert.negativeMass).toBe(0);
    expect(cert.dualViolation).toBeLessThanOrEqual(1e-12);
    expect(cert.slackness).toBeLessThanOrEqual(1e-12);
    expect(cert.gap).toBeLessThanOrEqual(1e-12);
    expect(result.plan.mass.length).toBeLessThanOrEqual(3999);
  });
});

describe("networkSimplex laws", () => {
  it("networkSimplex returns identical bits for identical inputs", () => {
    // Determinism (DESIGN.md: same inputs, same bits).
    const { a, b, C } = instance("integer-ties", 40, 30, 9);
    const r1 = networkSimplex(a, b, C);
    const r2 = networkSimplex(Float64Array.from(a), Float64Array.from(b), { data: Float64Array.from(C.data), rows: C.rows, cols: C.cols });
    expect(Object.is(r1.cost, r2.cost)).toBe(true);
    expect(r1.iterations).toBe(r2.iterations);
    expect(Buffer.from(r1.f.buffer).equals(Buffer.from(r2.f.buffer))).toBe(true);
    expect(Buffer.from(r1.g.buffer).equals(Buffer.from(r2.g.buffer))).toBe(true);
    expect(Array.from(r1.plan.from)).toEqual(Array.from(r2.plan.from));
    expect(Array.from(r1.plan.to)).toEqual(Array.from(r2.plan.to));
    expect(Buffer.from(r1.plan.mass.buffer).equals(Buffer.from(r2.plan.mass.buffer))).toBe(true);
  });

  it("networkSimplex with permuted sources and targets returns the same optimal cost and a permuted certificate", () => {
    // Relabelling points does not change the LP (common practice, no source).
    const { a, b, C } = instance("continuous", 30, 40, 10);
    const random = seededRandom(11);
    const rowPerm = shuffle(30, random);
    const colPerm = shuffle(40, random);
    const a2 = Float64Array.from(rowPerm, (i) => a[i]);
    const b2 = Float64Array.from(colPerm, (j) => b[j]);
    const data = new Float64Array(30 * 40);
    for (let r = 0; r < 30; r++) for (let c = 0; c < 40; c++) data[r * 40 + c] = C.data[rowPerm[r] * 40 + colPerm[c]];
    const C2 = { data, rows: 30, cols: 40 };
    const r1 = networkSimplex(a, b, C);
    const r2 = networkSimplex(a2, b2, C2);
    expectClose(r2.cost, r1.cost, 1e-12);
    // Continuous random data: the optimal plan is unique, so the plans correspond entry by entry.
    const dense1 = new Float64Array(30 * 40);
    r1.plan.mass.forEach((x, k) => (dense1[r1.plan.from[k] * 40 + r1.plan.to[k]] = x));
    r2.plan.mass.forEach((x, k) => expectClose(x, dense1[rowPerm[r2.plan.from[k]] * 40 + colPerm[r2.plan.to[k]]], 1e-10, 1e-3));
  });

  it("networkSimplex does not modify its inputs", () => {
    const { a, b, C } = instance("zero-masses", 20, 25, 12);
    const copies = [Float64Array.from(a), Float64Array.from(b), Float64Array.from(C.data)];
    networkSimplex(a, b, C);
    expect([a, b, C.data]).toEqual(copies);
  });

  it("networkSimplex with an aborted signal returns status cancelled, not an exception", () => {
    const { a, b, C } = instance("continuous", 20, 20, 13);
    const controller = new AbortController();
    controller.abort();
    const result = networkSimplex(a, b, C, { signal: controller.signal });
    expect(result.status).toBe("cancelled");
  });

  it("networkSimplex with maxIterations 3 stops with status not-converged and a non-negative plan", () => {
    const { a, b, C } = instance("continuous", 20, 20, 14);
    const result = networkSimplex(a, b, C, { maxIterations: 3 });
    expect(result.status).toBe("not-converged");
    expect(result.iterations).toBe(3);
    expect(result.plan.mass.every((x) => x >= 0)).toBe(true);
  });

  it("networkSimplex reports progress with a marginal error that ends at zero", () => {
    const { a, b, C } = instance("continuous", 60, 60, 15);
    const seen: number[] = [];
    networkSimplex(a, b, C, { onProgress: (p) => seen.push(p.marginalError), progressEvery: 20 });
    expect(seen.length).toBeGreaterThan(2);
    expect(seen[0]).toBeGreaterThan(0);
    expect(seen[seen.length - 1]).toBeLessThanOrEqual(seen[0]);
  });
});

describe("networkSimplex input errors", () => {
  const { a, b, C } = instance("continuous", 3, 4, 16);

  it("networkSimplex(a, b, C) with totals differing by 1e-6 throws a TransportInputError naming b", () => {
    const b2 = b.map((x, j) => (j === 0 ? x + 1e-6 : x));
    expect(inputError(() => networkSimplex(a, b2, C)).field).toBe("b");
  });

  it("networkSimplex(a, b, C) with a 3×3 matrix for 3 × 4 masses throws naming C", () => {
    expect(inputError(() => networkSimplex(a, b, { data: new Float64Array(9), rows: 3, cols: 3 })).field).toBe("C");
  });

  it("networkSimplex(a, b, C) with a negative or NaN mass throws naming that entry", () => {
    expect(inputError(() => networkSimplex(Float64Array.from([0.5, 0.7, -0.2]), b, C)).field).toBe("a[2]");
    expect(inputError(() => networkSimplex(a, Float64Array.from([NaN, 0, 0, 1]), C)).field).toBe("b[0]");
  });

  it("networkSimplex(a, b, C) with an infinite cost throws naming the entry", () => {
    const data = Float64Array.from(C.data);
    data[5] = Infinity;
    expect(inputError(() => networkSimplex(a, b, { data, rows: 3, cols: 4 })).field).toBe("C[1][1]");
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
