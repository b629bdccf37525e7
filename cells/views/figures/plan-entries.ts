import { TransportInputError, describeValue } from "../../../core/errors";
import type { Matrix } from "../../../core/matrix";
import type { GibbsPlan, SparsePlan, TransportPlan } from "../../../core/result";

/*
 * Figure-side evaluation of transport plans. Kept private to the figures because
 * core/plan.ts (planDense / planEntries) was not yet written when the figures were;
 * once it lands these two functions can delegate to it. The formula is the one in
 * core/result.ts: P_ij = a_i b_j exp((f_i + g_j − C_ij) / ε).
 */

/** The largest entries of a plan, heaviest first, plus totals over the whole plan. */
export interface TopPlanEntries {
  /** Source index of each kept entry. */
  readonly from: Int32Array;
  /** Target index of each kept entry. */
  readonly to: Int32Array;
  /** Mass of each kept entry, non-increasing. */
  readonly mass: Float64Array;
  /** Σ P_ij over the whole plan. */
  readonly totalMass: number;
  /** Number of entries with positive mass in the whole plan. */
  readonly positiveCount: number;
}

function checkCostFor(plan: GibbsPlan, cost: Matrix | undefined, field: string): Matrix {
  if (!cost) throw new TransportInputError(field, "an entropic (gibbs) plan needs its cost matrix to be evaluated", cost);
  if (cost.rows !== plan.rows || cost.cols !== plan.cols) {
    throw new TransportInputError(field, `dimension mismatch: plan is ${plan.rows}×${plan.cols}, cost is ${cost.rows}×${cost.cols}`, `${cost.rows}×${cost.cols}`);
  }
  if (cost.data.length !== cost.rows * cost.cols) {
    throw new TransportInputError(field, `data length ${cost.data.length} is not rows×cols = ${cost.rows}×${cost.cols}`, cost.data.length);
  }
  return cost;
}

function checkSparse(plan: SparsePlan, field: string): void {
  const { from, to, mass, rows, cols } = plan;
  if (from.length !== mass.length || to.length !== mass.length) {
    throw new TransportInputError(field, `from, to and mass must have equal lengths, got ${from.length}, ${to.length}, ${mass.length}`, mass.length);
  }
  for (let k = 0; k < mass.length; k++) {
    if (!(from[k] >= 0 && from[k] < rows)) throw new TransportInputError(`${field}.from[${k}]`, `must be in [0, ${rows}), got ${describeValue(from[k])}`, from[k]);
    if (!(to[k] >= 0 && to[k] < cols)) throw new TransportInputError(`${field}.to[${k}]`, `must be in [0, ${cols}), got ${describeValue(to[k])}`, to[k]);
    if (!(mass[k] >= 0) || !Number.isFinite(mass[k])) throw new TransportInputError(`${field}.mass[${k}]`, `must be finite and >= 0, got ${describeValue(mass[k])}`, mass[k]);
  }
}

/** Visits every entry of a gibbs plan in row-major order. */
function forEachGibbs(plan: GibbsPlan, cost: Matrix, visit: (i: number, j: number, p: number) => void): void {
  const { rows, cols, epsilon, f, g, sourceMass: a, targetMass: b } = plan;
  const C = cost.data;
  for (let i = 0; i < rows; i++) {
    // Taking logs of the masses keeps P in range when exp((f+g−C)/ε) alone would overflow.
    const la = Math.log(a[i]);
    for (let j = 0; j < cols; j++) {
      visit(i, j, Math.exp(la + Math.log(b[j]) + (f[i] + g[j] - C[i * cols + j]) / epsilon));
    }
  }
}

/**
 * The plan as a dense rows×cols matrix (row-major, entry (i,j) = mass moved from
 * source i to target j). Duplicate sparse entries are summed. A gibbs plan needs
 * `cost`; a mismatch throws {@link TransportInputError} naming `field`.
 */
export function densePlan(plan: TransportPlan, cost?: Matrix, field = "cost"): Matrix {
  const { rows, cols } = plan;
  const data = new Float64Array(rows * cols);
  if (plan.kind === "sparse") {
    checkSparse(plan, "plan");
    for (let k = 0; k < plan.mass.length; k++) data[plan.from[k] * cols + plan.to[k]] += plan.mass[k];
  } else {
    forEachGibbs(plan, checkCostFor(plan, cost, field), (i, j, p) => {
      data[i * cols + j] = p;
    });
  }
  return { data, rows, cols };
}

/**
 * The `limit` heaviest entries of a plan (ties broken by row-major position, so the
 * result is deterministic), with the plan's total mass and count of positive entries.
 * Gibbs plans are scanned once with a bounded min-heap: O(nm log limit) time,
 * O(limit) memory, so n×m is never stored.
 */
export function topPlanEntries(plan: TransportPlan, limit: number, cost?: Matrix, field = "cost"): TopPlanEntries {
  if (!(limit >= 0) || !Number.isInteger(limit)) throw new TransportInputError("maxLines", `must be a non-negative integer, got ${describeValue(limit)}`, limit);
  const heap = new EntryHeap(limit);
  let totalMass = 0;
  let positiveCount = 0;
  const cols = plan.cols;
  if (plan.kind === "sparse") {
    checkSparse(plan, "plan");
    for (let k = 0; k < plan.mass.length; k++) {
      const p = plan.mass[k];
      totalMass += p;
      if (p > 0) {
        positiveCount++;
        heap.offer(p, plan.from[k] * cols + plan.to[k], plan.from[k], plan.to[k]);
      }
    }
  } else {
    forEachGibbs(plan, checkCostFor(plan, cost, field), (i, j, p) => {
      totalMass += p;
      if (p > 0) {
        positiveCount++;
        heap.offer(p, i * cols + j, i, j);
      }
    });
  }
  return { ...heap.sortedDescending(), totalMass, positiveCount };
}

/**
 * Keeps the `capacity` largest (mass, position) pairs. Order: larger mass first,
 * then smaller position. The root holds the weakest kept entry.
 */
class EntryHeap {
  private readonly mass: Float64Array;
  private readonly pos: Float64Array;
  private readonly from: Int32Array;
  private readonly to: Int32Array;
  private size = 0;

  constructor(private readonly capacity: number) {
    this.mass = new Float64Array(capacity);
    this.pos = new Float64Array(capacity);
    this.from = new Int32Array(capacity);
    this.to = new Int32Array(capacity);
  }

  /** True when entry a is weaker (ranks later) than entry b. */
  private weaker(ma: number, pa: number, mb: number, pb: number): boolean {
    return ma < mb || (ma === mb && pa > pb);
  }

  offer(m: number, p: number, i: number, j: number): void {
    if (this.capacity === 0) return;
    if (this.size < this.capacity) {
      let k = this.size++;
      // sift up
      while (k > 0) {
        const parent = (k - 1) >> 1;
        if (!this.weaker(m, p, this.mass[parent], this.pos[parent])) break;
        this.move(parent, k);
        k = parent;
      }
      this.put(k, m, p, i, j);
      return;
    }
    if (!this.weaker(this.mass[0], this.pos[0], m, p)) return;
    // replace root, sift down
    let k = 0;
    for (;;) {
      const l = 2 * k + 1;
      if (l >= this.size) break;
      const r = l + 1;
      const c = r < this.size && this.weaker(this.mass[r], this.pos[r], this.mass[l], this.pos[l]) ? r : l;
      if (!this.weaker(this.mass[c], this.pos[c], m, p)) break;
      this.move(c, k);
      k = c;
    }
    this.put(k, m, p, i, j);
  }

  private move(src: number, dst: number): void {
    this.mass[dst] = this.mass[src];
    this.pos[dst] = this.pos[src];
    this.from[dst] = this.from[src];
    this.to[dst] = this.to[src];
  }

  private put(k: number, m: number, p: number, i: number, j: number): void {
    this.mass[k] = m;
    this.pos[k] = p;
    this.from[k] = i;
    this.to[k] = j;
  }

  sortedDescending(): { from: Int32Array; to: Int32Array; mass: Float64Array } {
    const order = Array.from({ length: this.size }, (_, k) => k);
    order.sort((x, y) => (this.weaker(this.mass[x], this.pos[x], this.mass[y], this.pos[y]) ? 1 : -1));
    return {
      from: Int32Array.from(order, (k) => this.from[k]),
      to: Int32Array.from(order, (k) => this.to[k]),
      mass: Float64Array.from(order, (k) => this.mass[k]),
    };
  }
}
