import { TransportInputError, describeValue } from "./errors";
import type { Matrix } from "./matrix";
import type { SolveStatus } from "./result";

/** Caller-side control of {@link assignment}. */
export interface AssignmentControl {
  /** Aborting ends the solve with status "cancelled"; rows not yet assigned get −1. */
  readonly signal?: AbortSignal;
}

/** What {@link assignment} returns. */
export interface AssignmentResult {
  /** permutation[i] = column assigned to row i (−1 only when cancelled). */
  readonly permutation: Int32Array;
  /** Σ_i C[i, permutation[i]] (a sum, not divided by n), over assigned rows. */
  readonly cost: number;
  /** Row potentials: f_i + g_j ≤ C_ij for all (i, j), equality on assigned pairs (to rounding). */
  readonly f: Float64Array;
  /** Column potentials. */
  readonly g: Float64Array;
  readonly status: SolveStatus;
}

/** Below this size the classic start is used directly (candidate lists would be most of a row). */
const AUCTION_MIN_SIZE = 64;
/** Cheapest columns per row that the sparse price-finding auction looks at. */
const CANDIDATES = 32;

/**
 * Minimum-cost perfect matching (linear assignment) for a square dense cost matrix
 * (n×n, row-major), exact up to double rounding: the duals satisfy C_ij − f_i − g_j ≥ 0
 * (to rounding), = 0 on the matching, and Σf + Σg = cost.
 *
 * The answer always comes from shortest augmenting paths (Jonker & Volgenant 1987,
 * Computing 38): each free row is matched along a Dijkstra shortest path in reduced costs
 * C_ij − g_j, and the column prices g are updated so that every matched row stays tight.
 * That is exact from any starting prices; good prices make the paths short. They come from:
 * - n ≥ 64: an ε-scaling auction (Bertsekas 1988, Ann. Oper. Res. 14), ε shrinking 8× per
 *   phase down to 1e-4·(cost range)/n, first restricted to each row's 32 cheapest columns
 *   (bids cost O(32), not O(n)); if that stalls because the candidate graph has no perfect
 *   matching (a crowded region must send rows far away, or massive ties), on the dense
 *   matrix. All rows are then matched afresh by augmenting paths on the dense matrix, which
 *   repairs whatever the auction's approximations got wrong.
 * - n < 64, or if the dense auction also hits its bid budget: Jonker & Volgenant's start —
 *   column reduction, reduction transfer and two rounds of augmenting row reduction.
 * O(n³) worst case, about O(n²) on typical dense problems.
 *
 * For a transport problem with n uniform masses w on each side, P = w·(permutation matrix)
 * is an optimal plan (Birkhoff 1946; von Neumann 1953) and (f, g) are its potentials.
 * Throws {@link TransportInputError} naming "C" for a non-square or non-finite matrix.
 */
export function assignment(C: Matrix, control: AssignmentControl = {}): AssignmentResult {
  const { signal } = control;
  checkSquare(C);
  const n = C.rows;
  const c = C.data;
  const rowOf = new Int32Array(n).fill(-1); // column → row
  const colOf = new Int32Array(n).fill(-1); // row → column
  const v = new Float64Array(n); // column prices (the potentials g)
  if (signal?.aborted) return { permutation: colOf, cost: 0, f: new Float64Array(n), g: v, status: "cancelled" };

  const free = new Int32Array(n);
  let numFree: number;
  if (n >= AUCTION_MIN_SIZE && auctionPrices(c, n, v)) {
    for (let i = 0; i < n; i++) free[i] = i;
    numFree = n;
  } else {
    v.fill(0);
    numFree = classicStart(c, n, v, rowOf, colOf, free);
  }
  const status = augmentFreeRows(c, n, v, rowOf, colOf, free, numFree, signal);

  // Row potentials u_i = C[i, x_i] − v_{x_i}; an unassigned row (cancelled) takes its row minimum.
  const u = new Float64Array(n);
  let sum = 0;
  let comp = 0;
  for (let i = 0; i < n; i++) {
    const j = colOf[i];
    const base = i * n;
    if (j >= 0) {
      const cij = c[base + j];
      u[i] = cij - v[j];
      const s = sum + cij;
      comp += Math.abs(sum) >= Math.abs(cij) ? sum - s + cij : cij - s + sum;
      sum = s;
    } else {
      let best = Infinity;
      for (let jj = 0; jj < n; jj++) {
        const h = c[base + jj] - v[jj];
        if (h < best) best = h;
      }
      u[i] = best;
    }
  }
  return { permutation: colOf, cost: sum + comp, f: u, g: v, status };
}

/**
 * Prices from a forward ε-scaling auction (Bertsekas 1988, Ann. Oper. Res. 14): row i bids
 * for the column minimising C_ij − v_j and lowers that column's reward v_j by the gap to its
 * second best plus ε; ε starts at a quarter of the cost range and shrinks 8× per phase down
 * to 1e-4·range/n. First on a sparse graph — each row's CANDIDATES cheapest columns, ties
 * broken by distance from column i so that tied rows spread out — where a bid costs O(32);
 * if that stalls (its bid cap is hit: the candidate graph has no perfect matching, e.g. when
 * a crowded region must send some rows far away), on the dense matrix with a total bid cap.
 * Returns false when both give up; the prices are then unusable.
 */
function auctionPrices(c: Float64Array, n: number, v: Float64Array): boolean {
  const k = Math.min(CANDIDATES, n);
  const cand = new Int32Array(n * k);
  const candCost = new Float64Array(n * k);
  let candLo = Infinity;
  let candHi = -Infinity;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const base = i * n;
    const out = i * k;
    let count = 0;
    // Columns in the order i, i+1, …, n−1, 0, …, i−1; strict "<" keeps the earliest of ties.
    for (let step = 0; step < n; step++) {
      const j = i + step < n ? i + step : i + step - n;
      const h = c[base + j];
      if (h < lo) lo = h;
      if (h > hi) hi = h;
      if (count < k || h < candCost[out + k - 1]) {
        let p = count < k ? count++ : k - 1;
        while (p > 0 && candCost[out + p - 1] > h) {
          candCost[out + p] = candCost[out + p - 1];
          cand[out + p] = cand[out + p - 1];
          p--;
        }
        candCost[out + p] = h;
        cand[out + p] = j;
      }
    }
    if (candCost[out] < candLo) candLo = candCost[out];
    if (candCost[out + k - 1] > candHi) candHi = candCost[out + k - 1];
  }
  const owner = new Int32Array(n);
  const queue = new Int32Array(n);

  // Costs so spread that their range overflows: leave them to the classic start.
  if (!Number.isFinite(hi - lo)) return false;

  // Sparse auction on the candidate lists.
  {
    const range = scaleOf(candLo, candHi);
    const epsFinal = (1e-4 * range) / n;
    const bidCap = 50 * n + 1000;
    v.fill(0);
    let stalled = false;
    for (let eps = range / 4; !stalled; eps = Math.max(eps / 8, epsFinal)) {
      owner.fill(-1);
      for (let q = 0; q < n; q++) queue[q] = n - 1 - q;
      let pending = n;
      let bids = 0;
      while (pending > 0) {
        if (++bids > bidCap) {
          stalled = true;
          break;
        }
        const i = queue[--pending];
        const base = i * k;
        let u1 = Infinity;
        let u2 = Infinity;
        let j1 = -1;
        for (let q = 0; q < k; q++) {
          const j = cand[base + q];
          const h = candCost[base + q] - v[j];
          if (h < u2) {
            if (h >= u1) u2 = h;
            else {
              u2 = u1;
              u1 = h;
              j1 = j;
            }
          }
        }
        v[j1] -= u2 - u1 + eps;
        const previous = owner[j1];
        if (previous >= 0) queue[pending++] = previous;
        owner[j1] = i;
      }
      if (!stalled && eps <= epsFinal) return true;
    }
  }

  // Dense auction: every bid scans its whole row.
  {
    const range = scaleOf(lo, hi);
    const epsFinal = (1e-4 * range) / n;
    let budget = 100 * n + 1000;
    v.fill(0);
    for (let eps = range / 4; ; eps = Math.max(eps / 8, epsFinal)) {
      owner.fill(-1);
      for (let q = 0; q < n; q++) queue[q] = n - 1 - q;
      let pending = n;
      while (pending > 0) {
        if (--budget < 0) return false;
        const i = queue[--pending];
        const base = i * n;
        let u1 = c[base] - v[0];
        let j1 = 0;
        let u2 = Infinity;
        for (let j = 1; j < n; j++) {
          const h = c[base + j] - v[j];
          if (h < u2) {
            if (h >= u1) u2 = h;
            else {
              u2 = u1;
              u1 = h;
              j1 = j;
            }
          }
        }
        v[j1] -= u2 - u1 + eps;
        const previous = owner[j1];
        if (previous >= 0) queue[pending++] = previous;
        owner[j1] = i;
      }
      if (eps <= epsFinal) return true;
    }
  }
}

/** A positive cost scale from the extreme values (range, else magnitude, else 1). */
function scaleOf(lo: number, hi: number): number {
  return hi - lo > 0 ? hi - lo : Math.abs(hi) > 0 ? Math.abs(hi) : 1;
}

/**
 * Jonker & Volgenant's initialisation: column reduction, reduction transfer and two rounds of
 * augmenting row reduction. Leaves a partial matching with every matched row tight and the
 * unmatched rows in `free`; returns their number.
 */
function classicStart(c: Float64Array, n: number, v: Float64Array, rowOf: Int32Array, colOf: Int32Array, free: Int32Array): number {
  if (n === 1) {
    v[0] = c[0];
    rowOf[0] = 0;
    colOf[0] = 0;
    return 0;
  }
  // Column reduction: v_j = min_i C_ij, scanned row by row for cache locality. Columns are
  // taken in reverse order; a row that is the minimum of several keeps the first it got.
  const argRow = new Int32Array(n);
  v.fill(Infinity);
  for (let i = 0; i < n; i++) {
    const base = i * n;
    for (let j = 0; j < n; j++) {
      const h = c[base + j];
      if (h < v[j]) {
        v[j] = h;
        argRow[j] = i;
      }
    }
  }
  const matches = new Int32Array(n);
  for (let j = n - 1; j >= 0; j--) {
    const i = argRow[j];
    if (matches[i]++ === 0) {
      colOf[i] = j;
      rowOf[j] = i;
    }
  }

  // Reduction transfer: a row matched exactly once hands its slack to its column's price.
  let numFree = 0;
  for (let i = 0; i < n; i++) {
    if (matches[i] === 0) {
      free[numFree++] = i;
    } else if (matches[i] === 1) {
      const j1 = colOf[i];
      const base = i * n;
      let min = Infinity;
      for (let j = 0; j < n; j++) {
        if (j === j1) continue;
        const h = c[base + j] - v[j];
        if (h < min) min = h;
      }
      v[j1] -= min;
    }
  }

  // Augmenting row reduction, twice: an auction with ε = 0. A displaced row is retried at
  // once when its column's price strictly dropped, else queued for the next round.
  const retryCap = 8 * n + 64;
  for (let round = 0; round < 2 && numFree > 0; round++) {
    const count = numFree;
    let k = 0;
    let retries = 0;
    numFree = 0;
    while (k < count) {
      if (retries > retryCap) {
        // Safety valve against long runs of tiny price drops: leave the rest to augmentation.
        while (k < count) free[numFree++] = free[k++];
        break;
      }
      const i = free[k++];
      const base = i * n;
      let u1 = c[base] - v[0];
      let j1 = 0;
      let u2 = Infinity;
      let j2 = -1;
      for (let j = 1; j < n; j++) {
        const h = c[base + j] - v[j];
        if (h < u2) {
          if (h >= u1) {
            u2 = h;
            j2 = j;
          } else {
            u2 = u1;
            u1 = h;
            j2 = j1;
            j1 = j;
          }
        }
      }
      let i0 = rowOf[j1];
      if (u1 < u2) v[j1] -= u2 - u1;
      else if (i0 >= 0) {
        j1 = j2;
        i0 = rowOf[j1];
      }
      if (i0 >= 0) {
        colOf[i0] = -1;
        if (u1 < u2) {
          free[--k] = i0;
          retries++;
        } else free[numFree++] = i0;
      }
      colOf[i] = j1;
      rowOf[j1] = i;
    }
  }
  return numFree;
}

/**
 * Matches each free row along a shortest augmenting path (Dijkstra over reduced costs
 * C_ij − v_j, matched rows tight), then lowers the prices of the columns it settled so that
 * all matched rows stay tight. Columns are scanned in natural order: relaxation and the
 * choice of the next closest column share one sequential pass over the row.
 */
function augmentFreeRows(
  c: Float64Array,
  n: number,
  v: Float64Array,
  rowOf: Int32Array,
  colOf: Int32Array,
  free: Int32Array,
  numFree: number,
  signal: AbortSignal | undefined,
): SolveStatus {
  const d = new Float64Array(n);
  const predRow = new Int32Array(n);
  const done = new Uint8Array(n);
  const settled = new Int32Array(n);
  for (let f = 0; f < numFree; f++) {
    if ((f & 7) === 0 && signal?.aborted) return "cancelled";
    const start = free[f];
    const startBase = start * n;
    let best = Infinity;
    let bestJ = -1;
    for (let j = 0; j < n; j++) {
      const h = c[startBase + j] - v[j];
      d[j] = h;
      predRow[j] = start;
      if (h < best || (h === best && rowOf[j] < 0)) {
        best = h;
        bestJ = j;
      }
    }
    let numSettled = 0;
    let end: number;
    for (;;) {
      const j1 = bestJ;
      const min = best;
      done[j1] = 1;
      settled[numSettled++] = j1;
      const i = rowOf[j1];
      if (i < 0) {
        end = j1;
        break;
      }
      const base = i * n;
      const u1 = c[base + j1] - v[j1] - min;
      best = Infinity;
      bestJ = -1;
      for (let j = 0; j < n; j++) {
        if (done[j] === 1) continue;
        let dj = d[j];
        const h = c[base + j] - v[j] - u1;
        if (h < dj) {
          dj = h;
          d[j] = h;
          predRow[j] = i;
        }
        // Ties go to a free column: the path ends sooner.
        if (dj < best || (dj === best && rowOf[j] < 0)) {
          best = dj;
          bestJ = j;
        }
      }
    }
    // Prices of the settled columns move by their distance below the path length.
    const length = d[end];
    for (let k = 0; k < numSettled; k++) {
      const j = settled[k];
      v[j] += d[j] - length;
      done[j] = 0;
    }
    let j = end;
    for (;;) {
      const i = predRow[j];
      rowOf[j] = i;
      const next = colOf[i];
      colOf[i] = j;
      j = next;
      if (i === start) break;
    }
  }
  return "converged";
}

function checkSquare(C: Matrix): void {
  if (!C || !(C.data instanceof Float64Array)) throw new TransportInputError("C", "must be a matrix with a Float64Array `data`", C);
  if (C.rows !== C.cols) throw new TransportInputError("C", `must be square for an assignment, got ${C.rows}×${C.cols}`, [C.rows, C.cols]);
  if (C.rows < 1) throw new TransportInputError("C", "empty matrix: at least one row is needed", C.rows);
  if (C.data.length !== C.rows * C.cols) throw new TransportInputError("C", `data length ${C.data.length} is not rows×cols = ${C.rows}×${C.cols}`, C.data.length);
  const data = C.data;
  for (let k = 0; k < data.length; k++) {
    const h = data[k];
    if (!Number.isFinite(h)) throw new TransportInputError(`C[${Math.floor(k / C.cols)}][${k % C.cols}]`, `cost must be finite, got ${describeValue(h)}`, h);
  }
}
