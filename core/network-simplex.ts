import { TransportInputError, describeValue } from "./errors";
import type { Matrix } from "./matrix";
import type { SolveProgress, SolveStatus, SparsePlan } from "./result";

/** Caller-side control of {@link networkSimplex}. */
export interface NetworkSimplexControl {
  /** Aborting ends the solve with status "cancelled" and the current (feasible for the big-M problem) plan. */
  readonly signal?: AbortSignal;
  /** Cap on pivots (degenerate ones included). Default 2⁵³ − 1, i.e. none. */
  readonly maxIterations?: number;
  /**
   * Called every `progressEvery` pivots with the pivot count and the current marginal
   * error (mass still on artificial arcs, relative to the total, larger side).
   */
  readonly onProgress?: (progress: SolveProgress) => void;
  /** Pivots between progress reports. Default 10 000. */
  readonly progressEvery?: number;
}

/** What {@link networkSimplex} returns. */
export interface NetworkSimplexResult {
  /** ⟨C, P⟩ of the returned plan. */
  readonly cost: number;
  /** Basic (spanning-tree) plan: at most n + m − 1 entries, only positive masses, sorted by (from, to). */
  readonly plan: SparsePlan;
  /** Source potentials (length n): f_i + g_j = C_ij on basic arcs, ≤ C_ij (to rounding) elsewhere. */
  readonly f: Float64Array;
  /** Target potentials (length m). */
  readonly g: Float64Array;
  /** Pivots performed, degenerate ones included. */
  readonly iterations: number;
  readonly status: SolveStatus;
}

/** Relative mismatch of Σa and Σb that {@link networkSimplex} accepts. */
export const MASS_BALANCE_TOLERANCE = 1e-9;

// Entering arcs need a reduced cost below −REL_TOL·(|C_ij| + |π_i| + |π_j|): the
// rounding error of a reduced cost grows with the magnitudes it is computed from.
const REL_TOL = 1e-12;
// Reduced costs above −ABS_TOL·max|C| are never considered (cheap pre-filter).
const ABS_TOL = 1e-14;

/**
 * Exact optimal transport between histograms `a` (length n) and `b` (length m) for the
 * dense cost `C` (n×m, row-major) by the primal network simplex method on the bipartite
 * transportation network (Dantzig 1951), the basis tree kept as parent pointers, a preorder
 * thread, subtree sizes and last descendants (Ahuja, Magnanti & Orlin 1993, Network Flows,
 * ch. 11), so that a pivot costs O(cycle + moved subtree), never O(nm).
 *
 * - Basis: a spanning tree on the n + m nodes plus an artificial root joined by
 *   big-M artificial arcs (cost 2(n+m+1)·max|C|), which start as the basis and leave it.
 * - Anti-cycling: Cunningham's (1976) strongly feasible trees — every zero-flow tree arc
 *   points towards the root — kept by choosing, among tied blocking arcs, the last one
 *   met when walking the pivot cycle from its apex in the cycle's orientation
 *   (Ahuja, Magnanti & Orlin 1993, Network Flows, ch. 11).
 * - Pricing: block search (Grigoriadis 1986) over blocks of ⌈√(nm)⌉ arcs.
 * - Potentials π are recomputed from the tree for each moved subtree, so they never drift;
 *   f_i = −π_i and g_j = π_(n+j). Components joined to the root only through artificial
 *   arcs (degenerate optima) get their own anchor at 0; an isolated zero-mass node gets the
 *   tightest feasible value, e.g. g_j = min_i (C_ij − f_i).
 * - Flows of the final basis are recomputed from the supplies, so the plan's marginals are
 *   exact to rounding even after many pivots.
 *
 * Masses must be finite and ≥ 0 (zeros allowed) with |Σa − Σb| ≤ 1e-9·max(Σa, Σb); the
 * caller rescales. A residual mismatch stays on artificial arcs and shows as marginal error.
 * Throws {@link TransportInputError} on bad shapes, NaN/negative masses, non-finite costs
 * or unbalanced totals. Non-convergence (iteration cap) and cancellation are statuses.
 */
export function networkSimplex(a: Float64Array, b: Float64Array, C: Matrix, control: NetworkSimplexControl = {}): NetworkSimplexResult {
  const { signal, maxIterations = Number.MAX_SAFE_INTEGER, onProgress, progressEvery = 10_000 } = control;
  if (!(maxIterations >= 0)) throw new TransportInputError("maxIterations", `must be >= 0, got ${describeValue(maxIterations)}`, maxIterations);
  if (!(progressEvery >= 1)) throw new TransportInputError("progressEvery", `must be >= 1, got ${describeValue(progressEvery)}`, progressEvery);
  const n = a.length;
  const m = b.length;
  const costScale = checkProblem(a, b, C);
  const cost = C.data;
  const nm = n * m;
  const N = n + m;
  const root = N;
  const ART = 2 * (N + 1) * costScale;
  if (!Number.isFinite(2 * ART)) {
    throw new TransportInputError("C", `costs up to ${costScale} are too large for the big-M start (overflow); rescale the cost matrix`, costScale);
  }

  // Node arrays (index N is the root). pred[u] is the tree arc joining u to parent[u]:
  // a real arc i→j has index i·m + j, the artificial arc of node u has index nm + u.
  // dirUp[u] = 1 when that arc points from u to its parent. flow[u] and predCost[u] are
  // the flow and cost of pred[u]: a non-tree arc carries no flow, so nothing is dense.
  const parent = new Int32Array(N + 1);
  const pred = new Int32Array(N + 1);
  const dirUp = new Uint8Array(N + 1);
  const flow = new Float64Array(N + 1);
  const predCost = new Float64Array(N + 1);
  const pi = new Float64Array(N + 1);
  // Preorder ("thread") as a circular doubly linked list, subtree sizes and last descendants.
  const thread = new Int32Array(N + 1);
  const revThread = new Int32Array(N + 1);
  const succNum = new Int32Array(N + 1);
  const lastSucc = new Int32Array(N + 1);
  const supply = new Float64Array(N + 1);
  // Scratch for the stem of a pivot (path from the entering node to the leaving arc).
  const stem = new Int32Array(N + 1);
  const oldLast = new Int32Array(N + 1);
  const oldSucc = new Int32Array(N + 1);
  const oldPrev = new Int32Array(N + 1);
  const oldAfter = new Int32Array(N + 1);

  for (let i = 0; i < n; i++) supply[i] = a[i];
  for (let j = 0; j < m; j++) supply[n + j] = -b[j];

  // Initial strongly feasible tree: sources (and zero-demand targets) hang below the root by
  // an upward arc carrying their supply, targets with demand by a downward arc carrying it.
  parent[root] = -1;
  pred[root] = -1;
  succNum[root] = N + 1;
  lastSucc[root] = N - 1;
  thread[root] = 0;
  revThread[0] = root;
  pi[root] = ART;
  for (let u = 0; u < N; u++) {
    parent[u] = root;
    pred[u] = nm + u;
    predCost[u] = ART;
    succNum[u] = 1;
    lastSucc[u] = u;
    thread[u] = u + 1 < N ? u + 1 : root;
    revThread[u + 1 < N ? u + 1 : root] = u;
    if (supply[u] >= 0) {
      dirUp[u] = 1;
      flow[u] = supply[u];
      pi[u] = 0;
    } else {
      dirUp[u] = 0;
      flow[u] = -supply[u];
      pi[u] = 2 * ART;
    }
  }
  const piTarget = pi.subarray(n, N);

  const blockSize = Math.max(10, Math.ceil(Math.sqrt(nm)));
  const absTol = ABS_TOL * costScale;
  let nextArc = 0;

  /**
   * Block search: scans arcs cyclically from nextArc in blocks, returns the arc with the most
   * negative reduced cost of the first block that has an admissible one, or −1 after a full pass.
   */
  const findEnteringArc = (): number => {
    let best = -1;
    let minRc = -absTol;
    let scanned = 0;
    let inBlock = 0;
    let i = Math.floor(nextArc / m);
    let j = nextArc - i * m;
    while (scanned < nm) {
      const base = i * m;
      const ui = pi[i];
      let len = m - j;
      if (len > blockSize - inBlock) len = blockSize - inBlock;
      if (len > nm - scanned) len = nm - scanned;
      const end = j + len;
      for (let jj = j; jj < end; jj++) {
        const rc = cost[base + jj] + ui - piTarget[jj];
        if (rc < minRc) {
          const arc = base + jj;
          // Tree arcs have zero reduced cost up to rounding: never let one re-enter.
          if (pred[i] !== arc && pred[n + jj] !== arc) {
            minRc = rc;
            best = arc;
          }
        }
      }
      scanned += len;
      inBlock += len;
      j = end;
      if (j === m) {
        j = 0;
        i = i + 1 === n ? 0 : i + 1;
      }
      if (inBlock === blockSize || scanned === nm) {
        if (best >= 0) {
          const bi = Math.floor(best / m);
          const bj = best - bi * m;
          const scale = Math.abs(cost[best]) + Math.abs(pi[bi]) + Math.abs(piTarget[bj]);
          if (minRc < -REL_TOL * scale) break;
          best = -1;
          minRc = -absTol;
        }
        inBlock = 0;
      }
    }
    nextArc = i * m + j;
    return best;
  };

  /** One pivot on entering arc (k → l). */
  const pivot = (arc: number): void => {
    const k = Math.floor(arc / m);
    const l = n + (arc - k * m);
    const cEnter = cost[arc];
    // Apex of the cycle: walk up from the endpoint with the smaller subtree.
    let u = k;
    let v = l;
    while (u !== v) {
      if (succNum[u] < succNum[v]) u = parent[u];
      else v = parent[v];
    }
    const apex = u;
    // Leaving arc: the last blocking arc met when walking the cycle apex → k → l → apex.
    // On the k side (walked here from k up) that is the first minimum; on the l side
    // (walked from l up, same sense as the cycle) the last one, and it beats k-side ties.
    let delta = Infinity;
    let uOut = -1;
    let onKSide = true;
    for (u = k; u !== apex; u = parent[u]) {
      if (dirUp[u] === 1 && flow[u] < delta) {
        delta = flow[u];
        uOut = u;
      }
    }
    for (u = l; u !== apex; u = parent[u]) {
      if (dirUp[u] === 0 && flow[u] <= delta) {
        delta = flow[u];
        uOut = u;
        onKSide = false;
      }
    }
    if (delta > 0) {
      for (u = k; u !== apex; u = parent[u]) flow[u] += dirUp[u] === 1 ? -delta : delta;
      for (u = l; u !== apex; u = parent[u]) flow[u] += dirUp[u] === 1 ? delta : -delta;
      flow[uOut] = 0;
    }
    const uIn = onKSide ? k : l;
    const vIn = onKSide ? l : k;

    // Stem: uIn = stem[0], parent chain up to uOut = stem[t]. Record the old preorder facts.
    let t = 0;
    stem[0] = uIn;
    for (u = uIn; u !== uOut; ) {
      u = parent[u];
      stem[++t] = u;
    }
    for (let s = 0; s <= t; s++) {
      const w = stem[s];
      oldLast[s] = lastSucc[w];
      oldSucc[s] = succNum[w];
      oldPrev[s] = revThread[w];
      oldAfter[s] = thread[lastSucc[w]];
    }
    const size = oldSucc[t];

    // Cut the subtree of uOut out of the preorder; fix sizes and last descendants on the
    // path up to the apex. The apex's subtree keeps its node set (the moved subtree stays
    // inside it), so nodes above it change at most their last descendant, fixed below.
    const apexLast = lastSucc[apex];
    {
      const before = oldPrev[t];
      const after = oldAfter[t];
      const last = oldLast[t];
      thread[before] = after;
      revThread[after] = before;
      let x = parent[uOut];
      for (; x !== apex; x = parent[x]) {
        succNum[x] -= size;
        if (lastSucc[x] === last) lastSucc[x] = before;
      }
      if (lastSucc[apex] === last) lastSucc[apex] = before;
    }

    // Reverse the stem: each stem node becomes the child of the one below it.
    for (let s = t; s >= 1; s--) {
      const w = stem[s];
      const below = stem[s - 1];
      parent[w] = below;
      pred[w] = pred[below];
      flow[w] = flow[below];
      predCost[w] = predCost[below];
      dirUp[w] = dirUp[below] ^ 1;
    }
    parent[uIn] = vIn;
    pred[uIn] = arc;
    flow[uIn] = delta;
    predCost[uIn] = cEnter;
    dirUp[uIn] = onKSide ? 1 : 0;

    // New preorder of the moved subtree: the old subtree of stem[0], then for each s ≥ 1
    // stem[s] with its old subtree minus that of stem[s−1] (two contiguous old pieces).
    let tail = oldLast[0];
    for (let s = 1; s <= t; s++) {
      const w = stem[s];
      thread[tail] = w;
      revThread[w] = tail;
      tail = oldPrev[s - 1];
      if (oldLast[s - 1] !== oldLast[s]) {
        const h = oldAfter[s - 1];
        thread[tail] = h;
        revThread[h] = tail;
        tail = oldLast[s];
      }
    }
    const newLast = tail;
    succNum[uIn] = size;
    lastSucc[uIn] = newLast;
    for (let s = 1; s <= t; s++) {
      succNum[stem[s]] = size - oldSucc[s - 1];
      lastSucc[stem[s]] = newLast;
    }

    // Hang it as the first child of vIn; sizes and last descendants up to the apex, then
    // propagate a changed last descendant of the apex to the ancestors that shared it.
    {
      const next = thread[vIn];
      thread[vIn] = uIn;
      revThread[uIn] = vIn;
      thread[newLast] = next;
      revThread[next] = newLast;
      let x = vIn;
      for (; x !== apex; x = parent[x]) {
        succNum[x] += size;
        if (lastSucc[x] === vIn) lastSucc[x] = newLast;
      }
      if (lastSucc[apex] === vIn) lastSucc[apex] = newLast;
      const apexNewLast = lastSucc[apex];
      if (apexNewLast !== apexLast) {
        for (x = parent[apex]; x !== -1 && lastSucc[x] === apexLast; x = parent[x]) lastSucc[x] = apexNewLast;
      }
    }

    // Potentials of the moved subtree, from the (unchanged) parent downwards.
    u = uIn;
    for (let c = 0; c < size; c++) {
      const p = parent[u];
      pi[u] = dirUp[u] === 1 ? pi[p] - predCost[u] : pi[p] + predCost[u];
      u = thread[u];
    }
  };

  /**
   * Recomputes all potentials from the tree, shifted so that the largest subtree hanging
   * below the root has its anchor at 0: precision follows the bulk of the problem rather
   * than the big-M offsets. Reduced costs do not change.
   */
  const reanchor = (): void => {
    let anchor = -1;
    for (let u = thread[root]; u !== root; u = thread[lastSucc[u]]) {
      if (anchor < 0 || succNum[u] > succNum[anchor]) anchor = u;
    }
    // The anchor's potential is 0: the root sits at −(anchor's arc cost) in its direction.
    pi[root] = dirUp[anchor] === 1 ? ART : -ART;
    for (let u = thread[root]; u !== root; u = thread[u]) {
      const p = parent[u];
      pi[u] = dirUp[u] === 1 ? pi[p] - predCost[u] : pi[p] + predCost[u];
    }
  };

  const marginalError = (): number => {
    let sourceGap = 0;
    let targetGap = 0;
    for (let u = 0; u < N; u++) {
      if (pred[u] >= nm) {
        if (u < n) sourceGap += flow[u];
        else targetGap += flow[u];
      }
    }
    return Math.max(sourceGap / sumOf(a), targetGap / sumOf(b));
  };

  let iterations = 0;
  let status: SolveStatus = "converged";
  const reanchorEvery = Math.max(1000, N);
  for (;;) {
    if (iterations >= maxIterations) {
      status = "not-converged";
      break;
    }
    if ((iterations & 127) === 0 && signal?.aborted) {
      status = "cancelled";
      break;
    }
    let arc = findEnteringArc();
    if (arc < 0) {
      // Optimal for these potentials; confirm with freshly anchored ones (tolerances scale
      // with the magnitudes), continue if that reveals an improving arc.
      reanchor();
      arc = findEnteringArc();
      if (arc < 0) break;
    }
    pivot(arc);
    iterations++;
    if (iterations % reanchorEvery === 0) reanchor();
    if (onProgress && iterations % progressEvery === 0) onProgress({ iteration: iterations, marginalError: marginalError() });
  }

  // Final basic flows from the supplies (leaves first), so rounding does not accumulate.
  const finalFlow = new Float64Array(N + 1);
  {
    const sub = Float64Array.from(supply);
    for (let u = revThread[root]; u !== root; u = revThread[u]) {
      const s = sub[u];
      sub[parent[u]] += s;
      const x = dirUp[u] === 1 ? s : -s;
      finalFlow[u] = x > 0 ? x : 0;
    }
  }

  // Plan: real tree arcs with positive flow, sorted by arc index (row-major order).
  let count = 0;
  const arcs = new Float64Array(N);
  for (let u = 0; u < N; u++) if (pred[u] < nm && finalFlow[u] > 0) arcs[count++] = pred[u] * (N + 1) + u;
  const order = arcs.subarray(0, count).sort();
  const from = new Int32Array(count);
  const to = new Int32Array(count);
  const mass = new Float64Array(count);
  let total = 0;
  let comp = 0;
  for (let k = 0; k < count; k++) {
    const key = order[k];
    const arc = Math.floor(key / (N + 1));
    const node = key - arc * (N + 1);
    const i = Math.floor(arc / m);
    from[k] = i;
    to[k] = arc - i * m;
    mass[k] = finalFlow[node];
    const term = mass[k] * cost[arc];
    const s = total + term;
    comp += Math.abs(total) >= Math.abs(term) ? total - s + term : term - s + total;
    total = s;
  }

  const { f, g } = outputPotentials(n, m, cost, thread, parent, dirUp, predCost, pred, succNum, nm);
  return {
    cost: total + comp,
    plan: { kind: "sparse", rows: n, cols: m, from, to, mass },
    f,
    g,
    iterations,
    status,
  };
}

/**
 * Potentials for the caller: each component of the real-arc forest gets its anchor (the node
 * joined to the root) at 0 and the rest from tree arcs. At a degenerate optimum the simplex
 * keeps all non-isolated components at one common big-M offset, so dropping the offsets keeps
 * every reduced cost between them; isolated nodes then get the tightest feasible value.
 */
function outputPotentials(
  n: number,
  m: number,
  cost: Float64Array,
  thread: Int32Array,
  parent: Int32Array,
  dirUp: Uint8Array,
  predCost: Float64Array,
  pred: Int32Array,
  succNum: Int32Array,
  nm: number,
): { f: Float64Array; g: Float64Array } {
  const N = n + m;
  const root = N;
  const pi = new Float64Array(N + 1);
  for (let u = thread[root]; u !== root; u = thread[u]) {
    if (pred[u] >= nm) {
      pi[u] = 0;
      continue;
    }
    const p = parent[u];
    pi[u] = dirUp[u] === 1 ? pi[p] - predCost[u] : pi[p] + predCost[u];
  }
  const f = new Float64Array(n);
  const g = new Float64Array(m);
  for (let i = 0; i < n; i++) f[i] = 0 - pi[i]; // 0 − 0 is +0, −0 would be −0
  for (let j = 0; j < m; j++) g[j] = pi[n + j];
  const isolated = (u: number) => pred[u] >= nm && succNum[u] === 1;
  // Isolated targets first (against all f), then isolated sources (against the final g).
  for (let j = 0; j < m; j++) {
    if (!isolated(n + j)) continue;
    let best = Infinity;
    for (let i = 0; i < n; i++) {
      const r = cost[i * m + j] - f[i];
      if (r < best) best = r;
    }
    g[j] = best;
  }
  for (let i = 0; i < n; i++) {
    if (!isolated(i)) continue;
    let best = Infinity;
    const base = i * m;
    for (let j = 0; j < m; j++) {
      const r = cost[base + j] - g[j];
      if (r < best) best = r;
    }
    f[i] = best;
  }
  return { f, g };
}

function sumOf(x: Float64Array): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i];
  return s;
}

/** Validates shapes, masses, costs and balance; returns max|C| (1 when C is all zeros). */
function checkProblem(a: Float64Array, b: Float64Array, C: Matrix): number {
  if (!(a instanceof Float64Array)) throw new TransportInputError("a", "must be a Float64Array", a);
  if (!(b instanceof Float64Array)) throw new TransportInputError("b", "must be a Float64Array", b);
  if (!C || !(C.data instanceof Float64Array)) throw new TransportInputError("C", "must be a matrix with a Float64Array `data`", C);
  if (a.length === 0) throw new TransportInputError("a", "empty: at least one source point is needed", 0);
  if (b.length === 0) throw new TransportInputError("b", "empty: at least one target point is needed", 0);
  if (C.rows !== a.length || C.cols !== b.length || C.data.length !== C.rows * C.cols) {
    throw new TransportInputError("C", `shape ${C.rows}×${C.cols} (data length ${C.data.length}) does not match ${a.length} sources × ${b.length} targets`, [C.rows, C.cols]);
  }
  const sa = checkedTotal(a, "a");
  const sb = checkedTotal(b, "b");
  if (Math.abs(sa - sb) > MASS_BALANCE_TOLERANCE * Math.max(sa, sb)) {
    throw new TransportInputError("b", `total mass ${sb} differs from the source total ${sa}; rescale one side or use the unbalanced method`, sb);
  }
  let max = 0;
  const data = C.data;
  for (let k = 0; k < data.length; k++) {
    const v = data[k];
    if (!Number.isFinite(v)) {
      throw new TransportInputError(`C[${Math.floor(k / C.cols)}][${k % C.cols}]`, `cost must be finite, got ${describeValue(v)}`, v);
    }
    const abs = v < 0 ? -v : v;
    if (abs > max) max = abs;
  }
  return max > 0 ? max : 1;
}

function checkedTotal(x: Float64Array, field: string): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) {
    const w = x[i];
    if (!Number.isFinite(w)) throw new TransportInputError(`${field}[${i}]`, `mass must be finite, got ${describeValue(w)}`, w);
    if (w < 0) throw new TransportInputError(`${field}[${i}]`, `mass must be >= 0, got ${w}`, w);
    s += w;
  }
  if (!(s > 0)) throw new TransportInputError(field, "total mass is zero: at least one point needs positive mass", s);
  return s;
}
