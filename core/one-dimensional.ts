import { TransportInputError, describeValue } from "./errors";
import type { SparsePlan } from "./result";

/** What {@link transport1d} returns. */
export interface Transport1dResult {
  /** Σ_k mass_k·|x_from − y_to|^p = W_p^p for normalised masses. */
  readonly cost: number;
  /** The monotone (north-west corner) coupling, positive entries only, in original indices. */
  readonly plan: SparsePlan;
  /** Source potentials (length n, original order). */
  readonly f: Float64Array;
  /** Target potentials (length m, original order). */
  readonly g: Float64Array;
}

/**
 * Exact optimal transport on the line for the cost |x − y|^p, p ≥ 1, between weighted
 * points: W_p^p = ∫₀¹ |F⁻¹(t) − G⁻¹(t)|^p dt (Villani 2003, Topics in Optimal Transportation,
 * Thm 2.18). Both supports are sorted (stably, ties by index) and the quantile functions
 * merged: the north-west corner rule on the sorted problem. |x − y|^p is convex in x − y,
 * so the sorted cost matrix is Monge and this coupling is optimal (Hoffman 1963).
 * O((n + m) log(n + m)) time, O(n + m) memory.
 *
 * Potentials come from complementary slackness along the staircase of n + m − 1 cells
 * the merge visits (a spanning tree): f of the first sorted source is 0, then
 * f_i + g_j = |x_i − y_j|^p on each cell. Zero-mass points are not skipped: they sit on
 * the staircase with zero flow, so they get potentials like any other point, those of a
 * basis that is dual feasible by the Monge property; they never appear in the plan, which
 * lists only positive masses (≤ n + m − 1 entries), sorted by (from, to).
 *
 * Masses must be finite and ≥ 0 with equal totals (relative mismatch ≤ 1e-9); a residual
 * mismatch stays unshipped and shows as marginal error. Throws {@link TransportInputError}
 * naming the field for p < 1 (the coupling need not be optimal: the caller falls back to a
 * general solver), non-finite points, bad masses or mismatched lengths.
 */
export function transport1d(x: Float64Array, a: Float64Array, y: Float64Array, b: Float64Array, p: number): Transport1dResult {
  if (typeof p !== "number" || !(p >= 1) || !Number.isFinite(p)) {
    throw new TransportInputError("p", `sorting is exact only for |x−y|^p with finite p >= 1, got ${describeValue(p)}`, p);
  }
  const n = checkSide(x, a, "x", "a");
  const m = checkSide(y, b, "y", "b");
  const sa = total(a);
  const sb = total(b);
  if (Math.abs(sa - sb) > 1e-9 * Math.max(sa, sb)) {
    throw new TransportInputError("b", `total mass ${sb} differs from the source total ${sa}; rescale one side or use the unbalanced method`, sb);
  }
  const xs = sortedOrder(x);
  const ys = sortedOrder(y);
  const cost = (xi: number, yj: number): number => {
    const d = Math.abs(xi - yj);
    return p === 1 ? d : p === 2 ? d * d : Math.pow(d, p);
  };

  const f = new Float64Array(n);
  const g = new Float64Array(m);
  const from = new Int32Array(n + m - 1);
  const to = new Int32Array(n + m - 1);
  const mass = new Float64Array(n + m - 1);
  let count = 0;
  let sum = 0;
  let comp = 0;
  let s = 0;
  let t = 0;
  let i = xs[0];
  let j = ys[0];
  let restA = a[i];
  let restB = b[j];
  f[i] = 0;
  g[j] = cost(x[i], y[j]);
  for (;;) {
    const moved = restA < restB ? restA : restB;
    if (moved > 0) {
      from[count] = i;
      to[count] = j;
      mass[count++] = moved;
      const term = moved * cost(x[i], y[j]);
      const next = sum + term;
      comp += Math.abs(sum) >= Math.abs(term) ? sum - next + term : term - next + sum;
      sum = next;
    }
    restA -= moved;
    restB -= moved;
    // Next cell: below when the source is used up (or the targets are), else to the right.
    const down = t === m - 1 || (s < n - 1 && restA <= restB);
    if (down) {
      if (s === n - 1) break;
      i = xs[++s];
      restA = a[i];
      f[i] = cost(x[i], y[j]) - g[j];
    } else {
      j = ys[++t];
      restB = b[j];
      g[j] = cost(x[i], y[j]) - f[i];
    }
  }

  // Entries in row-major order of (from, to) for a canonical, order-independent plan.
  const order = new Int32Array(count);
  for (let k = 0; k < count; k++) order[k] = k;
  order.sort((k1, k2) => from[k1] - from[k2] || to[k1] - to[k2]);
  const planFrom = new Int32Array(count);
  const planTo = new Int32Array(count);
  const planMass = new Float64Array(count);
  for (let r = 0; r < count; r++) {
    const k = order[r];
    planFrom[r] = from[k];
    planTo[r] = to[k];
    planMass[r] = mass[k];
  }
  return { cost: sum + comp, plan: { kind: "sparse", rows: n, cols: m, from: planFrom, to: planTo, mass: planMass }, f, g };
}

/** Indices that sort `v` ascending; ties keep index order (stable), so results are deterministic. */
function sortedOrder(v: Float64Array): Int32Array {
  const order = new Int32Array(v.length);
  for (let k = 0; k < v.length; k++) order[k] = k;
  order.sort((p, q) => v[p] - v[q] || p - q);
  return order;
}

function checkSide(points: Float64Array, mass: Float64Array, pointsField: string, massField: string): number {
  if (!(points instanceof Float64Array)) throw new TransportInputError(pointsField, "must be a Float64Array", points);
  if (!(mass instanceof Float64Array)) throw new TransportInputError(massField, "must be a Float64Array", mass);
  if (points.length === 0) throw new TransportInputError(pointsField, "empty: at least one point is needed", 0);
  if (mass.length !== points.length) throw new TransportInputError(massField, `length mismatch: ${mass.length} masses for ${points.length} points`, mass.length);
  for (let k = 0; k < points.length; k++) {
    if (!Number.isFinite(points[k])) throw new TransportInputError(`${pointsField}[${k}]`, `must be finite, got ${describeValue(points[k])}`, points[k]);
    const w = mass[k];
    if (!Number.isFinite(w)) throw new TransportInputError(`${massField}[${k}]`, `mass must be finite, got ${describeValue(w)}`, w);
    if (w < 0) throw new TransportInputError(`${massField}[${k}]`, `mass must be >= 0, got ${w}`, w);
  }
  if (!(total(mass) > 0)) throw new TransportInputError(massField, "total mass is zero: at least one point needs positive mass", 0);
  return points.length;
}

function total(v: Float64Array): number {
  let s = 0;
  for (let k = 0; k < v.length; k++) s += v[k];
  return s;
}
