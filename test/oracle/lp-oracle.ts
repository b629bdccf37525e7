// LP oracle for exact transport tests: the transportation problem (Hitchcock 1941 form)
// handed to HiGHS (Huangfu & Hall 2018, Math. Prog. Comp. 10) compiled to WebAssembly by
// the `highs` npm package. Independent of our solvers: a general dual simplex on the LP
//   min Σ C_ij P_ij  s.t.  Σ_j P_ij = a_i,  Σ_i P_ij = b_j,  P ≥ 0.
// Settings from /work/shared/TOOLCHAIN.md: presolve off, model built from arrays,
// instances kept ≤ 300×300, every native model disposed.
import highsLoader from "highs";
import type { Matrix } from "../../core/matrix";

type Highs = Awaited<ReturnType<typeof highsLoader>>;

/** Optimal LP solution: value, dense row-major plan (n×m) and the row duals f, g. */
export interface LpTransportSolution {
  readonly cost: number;
  readonly plan: Float64Array;
  readonly f: Float64Array;
  readonly g: Float64Array;
}

/** Largest side the oracle accepts (TOOLCHAIN.md: keep ≤ 300×300 in CI). */
export const LP_ORACLE_MAX_SIDE = 300;

let runtime: Promise<Highs> | undefined;

/** The HiGHS runtime, loaded once per test file (the WebAssembly module is reusable). */
export function loadHighs(): Promise<Highs> {
  runtime ??= highsLoader();
  return runtime;
}

/**
 * Solves the balanced transportation LP with HiGHS' dual simplex. `a` and `b` must have
 * equal totals (to ~1e-12). Throws if HiGHS does not report "optimal".
 */
export async function solveTransportLp(a: ArrayLike<number>, b: ArrayLike<number>, C: Matrix): Promise<LpTransportSolution> {
  const n = a.length;
  const m = b.length;
  if (C.rows !== n || C.cols !== m) throw new Error(`oracle: C is ${C.rows}×${C.cols}, masses ${n}, ${m}`);
  if (n > LP_ORACLE_MAX_SIDE || m > LP_ORACLE_MAX_SIDE) throw new Error(`oracle: keep instances ≤ ${LP_ORACLE_MAX_SIDE} per side`);
  const highs = await loadHighs();
  const nm = n * m;
  // Column (i, j) = variable P_ij, index i·m + j, with a 1 in row i and in row n + j.
  const starts = new Int32Array(nm + 1);
  const indices = new Int32Array(2 * nm);
  const values = new Float64Array(2 * nm).fill(1);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < m; j++) {
      const col = i * m + j;
      starts[col] = 2 * col;
      indices[2 * col] = i;
      indices[2 * col + 1] = n + j;
    }
  }
  starts[nm] = 2 * nm;
  const rowBounds = new Float64Array(n + m);
  for (let i = 0; i < n; i++) rowBounds[i] = a[i];
  for (let j = 0; j < m; j++) rowBounds[n + j] = b[j];
  const model = highs.createModel({
    numCols: nm,
    numRows: n + m,
    colCost: C.data,
    colLower: new Float64Array(nm),
    colUpper: new Float64Array(nm).fill(highs.infinity),
    rowLower: rowBounds,
    rowUpper: rowBounds,
    matrix: { format: "csc", numRows: n + m, numCols: nm, starts, indices, values },
  });
  try {
    model.options.set({
      output_flag: false,
      presolve: "off",
      solver: "simplex",
      primal_feasibility_tolerance: 1e-10,
      dual_feasibility_tolerance: 1e-10,
    });
    model.run();
    const status = model.getModelStatus();
    if (status !== highs.constants.modelStatus.optimal) throw new Error(`oracle: HiGHS model status ${status}, not optimal`);
    const solution = model.getSolution();
    return {
      cost: model.getObjectiveValue(),
      plan: Float64Array.from(solution.colValue),
      f: Float64Array.from(solution.rowDual.subarray(0, n)),
      g: Float64Array.from(solution.rowDual.subarray(n, n + m)),
    };
  } finally {
    model.dispose();
  }
}

/** How far a plan and potentials are from the LP optimality conditions (all ≥ 0; 0 is exact). */
export interface LpCertificate {
  /** max_i |Σ_j P_ij − a_i| and max_j |Σ_i P_ij − b_j|, relative to the total mass. */
  readonly marginalError: number;
  /** Most negative plan entry, as a positive number (0 when P ≥ 0). */
  readonly negativeMass: number;
  /** max_ij (f_i + g_j − C_ij)⁺ relative to max|C|: dual infeasibility. */
  readonly dualViolation: number;
  /** max over plan entries of |C_ij − f_i − g_j| relative to max|C|: complementary slackness. */
  readonly slackness: number;
  /** |⟨C,P⟩ − (⟨f,a⟩ + ⟨g,b⟩)| relative to max(|⟨C,P⟩|, max|C|·Σa): duality gap. */
  readonly gap: number;
  /** ⟨C, P⟩ of the sparse plan. */
  readonly cost: number;
}

/**
 * Checks the optimality conditions of the transportation LP for a sparse plan
 * (entries from[k] → to[k] with mass[k]) and potentials f, g: primal feasibility,
 * dual feasibility f_i + g_j ≤ C_ij, complementary slackness and zero duality gap
 * (LP duality, e.g. Dantzig 1963, Linear Programming and Extensions, ch. 6).
 */
export function lpCertificate(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  C: Matrix,
  plan: { from: Int32Array; to: Int32Array; mass: Float64Array },
  f: ArrayLike<number>,
  g: ArrayLike<number>,
): LpCertificate {
  const n = a.length;
  const m = b.length;
  let maxC = 0;
  for (let k = 0; k < C.data.length; k++) maxC = Math.max(maxC, Math.abs(C.data[k]));
  const scale = maxC > 0 ? maxC : 1;
  let total = 0;
  for (let i = 0; i < n; i++) total += a[i];
  const rows = new Float64Array(n);
  const cols = new Float64Array(m);
  let negativeMass = 0;
  let slackness = 0;
  let cost = 0;
  for (let k = 0; k < plan.mass.length; k++) {
    const i = plan.from[k];
    const j = plan.to[k];
    const x = plan.mass[k];
    rows[i] += x;
    cols[j] += x;
    negativeMass = Math.max(negativeMass, -x);
    cost += x * C.data[i * m + j];
    slackness = Math.max(slackness, Math.abs(C.data[i * m + j] - f[i] - g[j]) / scale);
  }
  let marginalError = 0;
  for (let i = 0; i < n; i++) marginalError = Math.max(marginalError, Math.abs(rows[i] - a[i]) / total);
  for (let j = 0; j < m; j++) marginalError = Math.max(marginalError, Math.abs(cols[j] - b[j]) / total);
  let dualViolation = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < m; j++) dualViolation = Math.max(dualViolation, (f[i] + g[j] - C.data[i * m + j]) / scale);
  }
  let dual = 0;
  for (let i = 0; i < n; i++) dual += f[i] * a[i];
  for (let j = 0; j < m; j++) dual += g[j] * b[j];
  const gap = Math.abs(cost - dual) / Math.max(Math.abs(cost), scale * total);
  return { marginalError, negativeMass, dualViolation, slackness, gap, cost };
}
