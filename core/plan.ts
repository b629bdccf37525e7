// Reading transport plans. A sparse plan lists its entries; an entropic plan is kept
// as potentials (GibbsPlan) and evaluated on demand from the cost matrix:
//   P_ij = a_i b_j exp((f_i + g_j − C_ij)/ε),
// with the same arithmetic as the solvers' diagnostics, so sums agree to the bit.
import { TransportInputError, describeValue } from "./errors";
import { fastExp } from "./fastexp";
import type { Matrix } from "./matrix";
import type { GibbsPlan, TransportPlan } from "./result";

/** Entries of a plan: mass `mass[k]` moves from source `from[k]` to target `to[k]`. */
export interface PlanEntries {
  readonly from: Int32Array;
  readonly to: Int32Array;
  readonly mass: Float64Array;
}

/** Options of {@link planEntries}. */
export interface PlanEntriesOptions {
  /** Keep entries with mass strictly above this (absolute mass, ≥ 0). Default 0. */
  readonly threshold?: number;
  /** Keep at most this many entries, the largest. Positive integer, default 1000. */
  readonly limit?: number;
}

/**
 * The plan as a dense rows×cols matrix (row-major). A Gibbs plan needs its cost
 * matrix `C`; a sparse plan ignores it. Memory is rows·cols doubles.
 */
export function planDense(plan: TransportPlan, C?: Matrix): Matrix {
  const { rows, cols } = checkPlan(plan);
  const data = new Float64Array(rows * cols);
  if (plan.kind === "sparse") {
    for (let k = 0; k < plan.mass.length; k++) data[plan.from[k] * cols + plan.to[k]] += plan.mass[k];
  } else {
    const g = gibbsReader(plan, C);
    for (let i = 0; i < rows; i++) g.row(i, data, i * cols);
  }
  return { data, rows, cols };
}

/** Row i of the plan (length cols): what source point i sends to each target point. */
export function planRow(plan: TransportPlan, C: Matrix | undefined, i: number): Float64Array {
  const { rows, cols } = checkPlan(plan);
  if (!Number.isInteger(i) || i < 0 || i >= rows) throw new TransportInputError("i", `must be an integer row index in [0, ${rows - 1}], got ${describeValue(i)}`, i);
  const out = new Float64Array(cols);
  if (plan.kind === "sparse") {
    for (let k = 0; k < plan.mass.length; k++) if (plan.from[k] === i) out[plan.to[k]] += plan.mass[k];
  } else {
    gibbsReader(plan, C).row(i, out, 0);
  }
  return out;
}

/**
 * The largest entries of the plan, for drawing: at most `limit` entries with mass
 * above `threshold`, sorted by decreasing mass (ties: by source, then target index).
 * Streams over a Gibbs plan without storing it (a heap of `limit` entries).
 */
export function planEntries(plan: TransportPlan, C?: Matrix, options: PlanEntriesOptions = {}): PlanEntries {
  const { rows, cols } = checkPlan(plan);
  const { threshold = 0, limit = 1000 } = options;
  if (typeof threshold !== "number" || !(threshold >= 0) || !Number.isFinite(threshold)) {
    throw new TransportInputError("threshold", `must be a finite number >= 0, got ${describeValue(threshold)}`, threshold);
  }
  if (typeof limit !== "number" || !Number.isInteger(limit) || limit < 1) throw new TransportInputError("limit", `must be a positive integer, got ${describeValue(limit)}`, limit);
  const heap = topEntries(limit);
  if (plan.kind === "sparse") {
    for (let k = 0; k < plan.mass.length; k++) {
      const mass = plan.mass[k];
      if (mass > threshold) heap.offer(mass, plan.from[k] * cols + plan.to[k]);
    }
  } else {
    const g = gibbsReader(plan, C);
    const row = new Float64Array(cols);
    for (let i = 0; i < rows; i++) {
      g.row(i, row, 0);
      for (let j = 0; j < cols; j++) if (row[j] > threshold) heap.offer(row[j], i * cols + j);
    }
  }
  const { mass, index } = heap.sorted();
  const from = new Int32Array(mass.length);
  const to = new Int32Array(mass.length);
  for (let k = 0; k < mass.length; k++) {
    from[k] = Math.floor(index[k] / cols);
    to[k] = index[k] - from[k] * cols;
  }
  return { from, to, mass };
}

/** Row sums (source, length rows) and column sums (target, length cols) of the plan. */
export function planMarginals(plan: TransportPlan, C?: Matrix): { source: Float64Array; target: Float64Array } {
  const { rows, cols } = checkPlan(plan);
  const source = new Float64Array(rows);
  const target = new Float64Array(cols);
  if (plan.kind === "sparse") {
    for (let k = 0; k < plan.mass.length; k++) {
      source[plan.from[k]] += plan.mass[k];
      target[plan.to[k]] += plan.mass[k];
    }
  } else {
    const g = gibbsReader(plan, C);
    const row = new Float64Array(cols);
    for (let i = 0; i < rows; i++) {
      g.row(i, row, 0);
      let s = 0;
      for (let j = 0; j < cols; j++) {
        s += row[j];
        target[j] += row[j];
      }
      source[i] = s;
    }
  }
  return { source, target };
}

function checkPlan(plan: TransportPlan): { rows: number; cols: number } {
  if (!plan || (plan.kind !== "sparse" && plan.kind !== "gibbs")) {
    throw new TransportInputError("plan", `must be a sparse or Gibbs transport plan, got ${describeValue(plan && (plan as { kind?: unknown }).kind)}`, plan);
  }
  return { rows: plan.rows, cols: plan.cols };
}

/** Evaluates rows of a Gibbs plan: row(i, out, offset) writes P_i· into out[offset ..]. */
function gibbsReader(plan: GibbsPlan, C: Matrix | undefined): { row(i: number, out: Float64Array, offset: number): void } {
  const { rows, cols, epsilon, f, g, sourceMass: a, targetMass: b } = plan;
  if (!C || !(C.data instanceof Float64Array) || C.rows !== rows || C.cols !== cols) {
    throw new TransportInputError("C", `an entropic (Gibbs) plan is stored as potentials and needs its ${rows}×${cols} cost matrix, got ${describeValue(C && [C.rows, C.cols])}`, C);
  }
  const ie = 1 / epsilon;
  const G = new Float64Array(cols);
  const logB = new Float64Array(cols);
  for (let j = 0; j < cols; j++) {
    G[j] = g[j] * ie;
    logB[j] = Math.log(b[j]);
  }
  const data = C.data;
  return {
    row(i, out, offset) {
      const ai = a[i];
      if (!(ai > 0)) {
        out.fill(0, offset, offset + cols);
        return;
      }
      const Fi = f[i] * ie;
      const la = Math.log(ai);
      const o = i * cols;
      // Same expression as core/entropic-values.ts: exp(y + log a_i + log b_j), y = (f_i + g_j − C_ij)/ε.
      for (let j = 0; j < cols; j++) out[offset + j] = fastExp(Fi + G[j] - data[o + j] * ie + la + logB[j]);
    },
  };
}

/** A bounded min-heap keeping the `limit` largest (mass, index) pairs; ties favour the lower index. */
function topEntries(limit: number): { offer(mass: number, index: number): void; sorted(): { mass: Float64Array; index: Float64Array } } {
  const cap = limit;
  let mass = new Float64Array(Math.min(cap, 1024));
  let index = new Float64Array(Math.min(cap, 1024));
  let size = 0;
  // "a worse than b": smaller mass, or equal mass and larger index.
  const worse = (ma: number, ia: number, mb: number, ib: number) => ma < mb || (ma === mb && ia > ib);
  const siftDown = (k: number) => {
    for (;;) {
      const l = 2 * k + 1;
      if (l >= size) return;
      const r = l + 1;
      let w = l;
      if (r < size && worse(mass[r], index[r], mass[l], index[l])) w = r;
      if (!worse(mass[w], index[w], mass[k], index[k])) return;
      [mass[w], mass[k]] = [mass[k], mass[w]];
      [index[w], index[k]] = [index[k], index[w]];
      k = w;
    }
  };
  return {
    offer(m, ix) {
      if (size < cap) {
        if (size === mass.length) {
          const grow = Math.min(cap, 2 * size);
          const m2 = new Float64Array(grow);
          m2.set(mass);
          mass = m2;
          const i2 = new Float64Array(grow);
          i2.set(index);
          index = i2;
        }
        let k = size++;
        mass[k] = m;
        index[k] = ix;
        while (k > 0) {
          const parent = (k - 1) >> 1;
          if (!worse(mass[k], index[k], mass[parent], index[parent])) break;
          [mass[k], mass[parent]] = [mass[parent], mass[k]];
          [index[k], index[parent]] = [index[parent], index[k]];
          k = parent;
        }
        return;
      }
      if (!worse(mass[0], index[0], m, ix)) return;
      mass[0] = m;
      index[0] = ix;
      siftDown(0);
    },
    sorted() {
      const order = Array.from({ length: size }, (_, k) => k);
      order.sort((p, q) => (mass[q] - mass[p]) || (index[p] - index[q]));
      return { mass: Float64Array.from(order, (k) => mass[k]), index: Float64Array.from(order, (k) => index[k]) };
    },
  };
}
