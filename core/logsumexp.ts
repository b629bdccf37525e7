// Log-domain Sinkhorn passes over a dense cost matrix. Potentials are kept in
// units of epsilon (F = f/ε, G = g/ε) so the inner loops do one multiply, two
// adds and one exponential per entry.
//
// Stabilisation without a max pass: the exponent F_i + G_j − C_ij/ε is
// log(P_ij / (a_i b_j)) for the current plan, which after a half-step of Sinkhorn
// is bounded (e.g. a_i·e^(...) ≤ 1 when the other side's marginal is met), so the
// sums land near 1 and never need a per-row maximum. Only when a sum leaves
// [1e-250, 1e250] (cold start, a jump in epsilon, zero masses) is that row or the
// column pass redone with the classic max-shifted log-sum-exp. In range, terms lost to
// underflow are below 1e-308 and change the sum by less than 1e-58 relatively.
import { fastExp } from "./fastexp";

const TINY = 1e-250;
const HUGE = 1e250;

/**
 * One Gibbs problem at one epsilon, in units of epsilon. `C` is row-major n×m.
 * `tauA = ρ_a/(ρ_a+ε)` (1 when balanced) damps the source update, and
 * `epsOverRhoA = ε/ρ_a` (0 when balanced) sets the marginal the optimality
 * conditions require, a·e^(−f/ρ_a) = a·e^(−F·ε/ρ_a); likewise for the target.
 */
export interface GibbsProblem {
  readonly n: number;
  readonly m: number;
  readonly C: Float64Array;
  readonly invEpsilon: number;
  readonly a: Float64Array;
  readonly b: Float64Array;
  /** log a_i (−Infinity where a_i = 0). */
  readonly logA: Float64Array;
  /** log b_j (−Infinity where b_j = 0). */
  readonly logB: Float64Array;
  readonly massA: number;
  readonly massB: number;
  readonly tauA: number;
  readonly tauB: number;
  readonly epsOverRhoA: number;
  readonly epsOverRhoB: number;
}

/** Scratch buffers for the passes (length m each); reused across sweeps. */
export interface LogWork {
  readonly row: Float64Array;
  readonly acc: Float64Array;
  readonly colMax: Float64Array;
}

/** Fresh scratch buffers for a problem with m target points. */
export function logWork(m: number): LogWork {
  return { row: new Float64Array(m), acc: new Float64Array(m), colMax: new Float64Array(m) };
}

/** log of each entry; −Infinity for zeros. */
export function logOf(x: Float64Array): Float64Array {
  const out = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) out[i] = Math.log(x[i]);
  return out;
}

// Performance note: every loop over a row of C lives in its own small function,
// called once per row. V8 then optimises it after a few rows, inlining fastExp;
// a single call holding the whole double loop would run in on-stack-replaced code,
// which we measured 3–6× slower for these loops.

/** Row kernel: e_j = exp(F_i + G_j − C_ij/ε) into `row`; returns Σ_j b_j e_j. */
function expRow(C: Float64Array, o: number, m: number, ie: number, Fi: number, G: Float64Array, b: Float64Array, row: Float64Array): number {
  let R = 0;
  for (let j = 0; j < m; j++) {
    const e = fastExp(Fi + G[j] - C[o + j] * ie);
    row[j] = e;
    R += b[j] * e;
  }
  return R;
}

/** Row kernel: acc_j += w·row_j. */
function addScaledRow(acc: Float64Array, row: Float64Array, w: number, m: number): void {
  for (let j = 0; j < m; j++) acc[j] += w * row[j];
}

/** Row kernel: acc_j += w·exp(h + G_j − C_ij/ε). */
function addExpRow(acc: Float64Array, C: Float64Array, o: number, m: number, ie: number, h: number, G: Float64Array, w: number): void {
  for (let j = 0; j < m; j++) acc[j] += w * fastExp(h + G[j] - C[o + j] * ie);
}

/** Row kernel: colMax_j = max(colMax_j, h − C_ij/ε). */
function maxIntoColumns(colMax: Float64Array, C: Float64Array, o: number, m: number, ie: number, h: number): void {
  for (let j = 0; j < m; j++) {
    const v = h - C[o + j] * ie;
    if (v > colMax[j]) colMax[j] = v;
  }
}

/** Row kernel: acc_j += exp(h − C_ij/ε − colMax_j). */
function addShiftedExpRow(acc: Float64Array, C: Float64Array, o: number, m: number, ie: number, h: number, colMax: Float64Array): void {
  for (let j = 0; j < m; j++) acc[j] += fastExp(h - C[o + j] * ie - colMax[j]);
}

/** Row kernel: log Σ_j exp(H_j + logW_j − C_ij/ε), max-shifted (the slow, always-safe path). */
function logSumExpRow(C: Float64Array, o: number, m: number, ie: number, H: Float64Array, logW: Float64Array): number {
  let max = -Infinity;
  for (let j = 0; j < m; j++) {
    const v = H[j] + logW[j] - C[o + j] * ie;
    if (v > max) max = v;
  }
  if (max === Infinity || max === -Infinity) return max;
  let s = 0;
  for (let j = 0; j < m; j++) s += fastExp(H[j] + logW[j] - C[o + j] * ie - max);
  return max + Math.log(s);
}

/** Row kernel: Σ_j w_j exp(Fi + H_j − C_ij/ε). */
function weightedExpSum(C: Float64Array, o: number, m: number, ie: number, Fi: number, H: Float64Array, w: Float64Array): number {
  let R = 0;
  for (let j = 0; j < m; j++) R += w[j] * fastExp(Fi + H[j] - C[o + j] * ie);
  return R;
}

/**
 * Target update from scratch, safe for any F (two passes with per-column maxima):
 * G_j ← −τ_b · log Σ_i a_i exp(F_i − C_ij/ε). Writes `G`. Rows with a_i = 0 are skipped.
 */
export function targetUpdate(p: GibbsProblem, F: Float64Array, G: Float64Array, work: LogWork): void {
  const { n, m, C, invEpsilon: ie, a, logA, tauB } = p;
  const { acc, colMax } = work;
  colMax.fill(-Infinity);
  for (let i = 0; i < n; i++) if (a[i] > 0) maxIntoColumns(colMax, C, i * m, m, ie, F[i] + logA[i]);
  acc.fill(0);
  for (let i = 0; i < n; i++) if (a[i] > 0) addShiftedExpRow(acc, C, i * m, m, ie, F[i] + logA[i], colMax);
  for (let j = 0; j < m; j++) G[j] = -tauB * (colMax[j] + Math.log(acc[j]));
}

/**
 * One full Sinkhorn sweep in a single pass over C, for a state (F, G) whose
 * target side is up to date (G = target update of F):
 * 1. measures the source marginal error of (F, G) — relative L1 distance of P1 from
 *    a·e^(−f/ρ_a), the target side being exact by construction;
 * 2. writes the source update F' = −τ_a · log Σ_j b_j exp(G_j − C_ij/ε) to `Fnext`;
 * 3. writes the target update of F' to `Gnext`.
 * Each entry's exponential e_ij = exp(F_i + G_j − C_ij/ε) serves both updates:
 * exp(F'_i + G_j − C_ij/ε) = e_ij · exp(F'_i − F_i). Returns the error of (F, G).
 */
export function fusedSweep(p: GibbsProblem, F: Float64Array, G: Float64Array, Fnext: Float64Array, Gnext: Float64Array, work: LogWork): number {
  const { n, m, C, invEpsilon: ie, a, b, logB, tauA, tauB, epsOverRhoA } = p;
  const { row, acc } = work;
  acc.fill(0);
  let error = 0;
  for (let i = 0; i < n; i++) {
    const o = i * m;
    const Fi = F[i];
    // R = Σ_j b_j exp(F_i + G_j − C_ij/ε) = (P1)_i / a_i.
    const R = expRow(C, o, m, ie, Fi, G, b, row);
    const stable = R > TINY && R < HUGE;
    const logSum = stable ? Math.log(R) - Fi : logSumExpRow(C, o, m, ie, G, logB);
    const ratio = stable ? R : Math.exp(Fi + logSum);
    const target = epsOverRhoA === 0 ? 1 : Math.exp(-Fi * epsOverRhoA);
    const ai = a[i];
    error += ai * Math.abs(ratio - target);
    const Fi2 = -tauA * logSum;
    Fnext[i] = Fi2;
    if (!(ai > 0)) continue;
    if (stable) addScaledRow(acc, row, ai * Math.exp(Fi2 - Fi), m);
    else addExpRow(acc, C, o, m, ie, Fi2, G, ai);
  }
  // acc_j = Σ_i a_i exp(F'_i + G_j − C_ij/ε): the target update, stabilised by G_j.
  let redo = false;
  for (let j = 0; j < m; j++) {
    const s = acc[j];
    if (s > TINY && s < HUGE) Gnext[j] = -tauB * (Math.log(s) - G[j]);
    else redo = true;
  }
  if (redo) targetUpdate(p, Fnext, Gnext, work);
  return error / p.massA;
}

/**
 * One averaged symmetric sweep for a self term OT_ε(a, a) (Feydy et al. 2019,
 * AISTATS, symmetric Sinkhorn): with T(F)_i = −τ·log Σ_j a_j exp(F_j − C_ij/ε),
 * writes F' = ½(F + T(F)) to `Fnext`. C must be symmetric n×n (only `a`, `logA`,
 * `tauA`, `epsOverRhoA` and `massA` of `p` are used). Returns the marginal error of
 * the symmetric plan a_i a_j exp(F_i + F_j − C_ij/ε) (both marginals are equal).
 */
export function symmetricSweep(p: GibbsProblem, F: Float64Array, Fnext: Float64Array): number {
  const { n, C, invEpsilon: ie, a, logA, tauA, epsOverRhoA } = p;
  let error = 0;
  for (let i = 0; i < n; i++) {
    const o = i * n;
    const Fi = F[i];
    const R = weightedExpSum(C, o, n, ie, Fi, F, a);
    const stable = R > TINY && R < HUGE;
    const logSum = stable ? Math.log(R) - Fi : logSumExpRow(C, o, n, ie, F, logA);
    const ratio = stable ? R : Math.exp(Fi + logSum);
    const target = epsOverRhoA === 0 ? 1 : Math.exp(-Fi * epsOverRhoA);
    error += a[i] * Math.abs(ratio - target);
    Fnext[i] = 0.5 * (Fi - tauA * logSum);
  }
  return error / p.massA;
}
