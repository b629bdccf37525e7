import { assignment } from "./assignment";
import type { CostScale } from "./cost";
import { TransportInputError, describeValue } from "./errors";
import type { Matrix } from "./matrix";
import { type Measure, measureDimension, measurePoints, supportSize } from "./measure";
import { MASS_BALANCE_TOLERANCE, networkSimplex } from "./network-simplex";
import { transport1d } from "./one-dimensional";
import type { SolveProgress, SolveStatus, SolveWarning, SparsePlan, TransportResult } from "./result";
import { sparsePlanCost, sparsePlanMarginalError, sparsePlanMass } from "./sparse-plan";

/** The exact algorithms, as named in results. */
export type ExactAlgorithm = "sorting" | "network-simplex" | "assignment";

/** What {@link solveExact} reads from the solve options (other fields are ignored). */
export interface ExactOptions {
  /** "auto" (default) picks sorting in 1-D, assignment for uniform equal sizes, else network simplex. */
  readonly exactAlgorithm?: "auto" | ExactAlgorithm;
  /** Aborting ends the solve with status "cancelled" (not an exception). */
  readonly signal?: AbortSignal;
  /**
   * Network simplex only: called every 10 000 pivots with the pivot count and the mass
   * not yet routed through real arcs as marginal error.
   */
  readonly onProgress?: (progress: SolveProgress) => void;
}

/** Relative spread below which masses count as uniform (assignment applies). */
const UNIFORM_TOLERANCE = 1e-12;

const ALGORITHMS: readonly string[] = ["auto", "sorting", "network-simplex", "assignment"];

/**
 * Exact (unregularised) optimal transport between `source` (n points) and `target`
 * (m points) for the cost matrix `C` (n×m, row-major). `exponent` is p when the cost is
 * |x−y|^p (undefined for a user matrix); it decides whether sorting applies.
 *
 * Algorithm ("auto"): sorting ({@link transport1d}) when both measures are 1-D and p ≥ 1;
 * else the assignment solver ({@link assignment}) when n = m, all masses are equal
 * (relative spread ≤ 1e-12) and so are the totals — a permutation is then optimal (Birkhoff 1946; von Neumann
 * 1953) and each entry carries mass a_i; else {@link networkSimplex}. A forced algorithm that
 * does not apply throws a {@link TransportInputError} naming "exactAlgorithm".
 *
 * Totals must agree to 1e-9 relative, else a TransportInputError naming "target.mass"
 * (normalise, or use the unbalanced method). Within that tolerance the target is rescaled
 * to the source total for the solve; marginalError is measured against the caller's masses.
 *
 * Result: method "exact"; values.cost = objective = ⟨C, P⟩, dual = ⟨f,a⟩ + ⟨g,b⟩ (equal to
 * the cost at optimum), mass = Σ P; potentials f, g with f_i + g_j ≤ C_ij; a sparse plan of
 * at most n + m − 1 positive entries; diagnostics with status, iterations (pivots for the
 * network simplex, n for assignment, staircase cells n + m − 1 for sorting), the plan's
 * marginal error, a one-entry history and wall time.
 */
export function solveExact(
  source: Measure,
  target: Measure,
  C: Matrix,
  exponent: number | undefined,
  options: ExactOptions,
  costScale: CostScale,
): TransportResult {
  const started = performance.now();
  const { exactAlgorithm = "auto", signal, onProgress } = options;
  if (!ALGORITHMS.includes(exactAlgorithm)) {
    throw new TransportInputError("exactAlgorithm", `unknown algorithm ${describeValue(exactAlgorithm)}; known: ${ALGORITHMS.join(", ")}`, exactAlgorithm);
  }
  const a = source.mass;
  const b = target.mass;
  const n = supportSize(source);
  const m = supportSize(target);
  if (!C || C.rows !== n || C.cols !== m) {
    throw new TransportInputError("C", `shape ${C?.rows}×${C?.cols} does not match ${n} source × ${m} target points`, [C?.rows, C?.cols]);
  }
  const sa = sum(a);
  const sb = sum(b);
  if (Math.abs(sa - sb) > MASS_BALANCE_TOLERANCE * Math.max(sa, sb)) {
    throw new TransportInputError(
      "target.mass",
      `totals differ (source ${sa}, target ${sb}): exact transport needs equal totals; normalize both measures or use the unbalanced method`,
      sb,
    );
  }

  const sortingApplies =
    measureDimension(source) === 1 && measureDimension(target) === 1 && exponent !== undefined && Number.isFinite(exponent) && exponent >= 1;
  const assignmentApplies = n === m && isUniform(a) && isUniform(b) && Math.abs(sa - sb) <= UNIFORM_TOLERANCE * Math.max(sa, sb);
  let algorithm: ExactAlgorithm;
  if (exactAlgorithm === "auto") algorithm = sortingApplies ? "sorting" : assignmentApplies ? "assignment" : "network-simplex";
  else algorithm = exactAlgorithm;
  if (algorithm === "sorting" && !sortingApplies) {
    const why =
      measureDimension(source) !== 1 || measureDimension(target) !== 1
        ? `both measures must be 1-D (got ${measureDimension(source)}-D and ${measureDimension(target)}-D)`
        : exponent === undefined
          ? "the cost must be |x−y|^p, not a user matrix"
          : `the cost exponent must be >= 1 (got ${exponent}): the monotone coupling is optimal only for convex costs`;
    throw new TransportInputError("exactAlgorithm", `"sorting" does not apply: ${why}; use "network-simplex"`, exactAlgorithm);
  }
  if (algorithm === "assignment" && !assignmentApplies) {
    throw new TransportInputError(
      "exactAlgorithm",
      `"assignment" needs equal sizes, uniform masses and equal totals (got ${n} and ${m} points${n === m ? ", masses or totals not all equal" : ""}); use "network-simplex"`,
      exactAlgorithm,
    );
  }

  // The solvers see a target rescaled to the source total (a no-op when totals agree bit for bit).
  const bSolve = sa === sb ? b : b.map((w) => (w * sa) / sb);
  let plan: SparsePlan;
  let f: Float64Array;
  let g: Float64Array;
  let status: SolveStatus;
  let iterations: number;
  if (algorithm === "sorting") {
    const result = transport1d(measurePoints(source), a, measurePoints(target), bSolve, exponent!);
    ({ plan, f, g } = result);
    status = "converged";
    iterations = n + m - 1;
  } else if (algorithm === "assignment") {
    const result = assignment(C, { signal });
    const rows: number[] = [];
    for (let i = 0; i < n; i++) if (result.permutation[i] >= 0) rows.push(i);
    plan = {
      kind: "sparse",
      rows: n,
      cols: m,
      from: Int32Array.from(rows),
      to: Int32Array.from(rows, (i) => result.permutation[i]),
      mass: Float64Array.from(rows, (i) => a[i]),
    };
    ({ f, g, status } = result);
    iterations = n;
  } else {
    const result = networkSimplex(a, bSolve, C, { signal, onProgress });
    ({ plan, f, g, status, iterations } = result);
  }

  const cost = sparsePlanCost(plan, C);
  const marginalError = sparsePlanMarginalError(plan, a, b);
  const warnings: SolveWarning[] = [];
  if (status === "not-converged") {
    warnings.push({ code: "not-converged", message: "The exact solver stopped at its iteration cap; the plan is feasible for the relaxed problem but may not be optimal." });
  }
  return {
    method: "exact",
    algorithm,
    values: { cost, objective: cost, dual: dot(f, a) + dot(g, b), mass: sparsePlanMass(plan) },
    costScale,
    potentials: { f, g },
    plan,
    diagnostics: {
      status,
      iterations,
      marginalError,
      history: Float64Array.of(marginalError),
      historyIterations: Int32Array.of(iterations),
      seconds: (performance.now() - started) / 1000,
      warnings,
    },
  };
}

function isUniform(mass: Float64Array): boolean {
  let min = Infinity;
  let max = -Infinity;
  for (let k = 0; k < mass.length; k++) {
    if (mass[k] < min) min = mass[k];
    if (mass[k] > max) max = mass[k];
  }
  return max > 0 && max - min <= UNIFORM_TOLERANCE * max;
}

function sum(x: Float64Array): number {
  let s = 0;
  for (let k = 0; k < x.length; k++) s += x[k];
  return s;
}

/** ⟨x, y⟩ with Neumaier compensation (potentials can be large and of both signs). */
function dot(x: Float64Array, y: Float64Array): number {
  let s = 0;
  let comp = 0;
  for (let k = 0; k < x.length; k++) {
    const term = x[k] * y[k];
    const t = s + term;
    comp += Math.abs(s) >= Math.abs(term) ? s - t + term : term - t + s;
    s = t;
  }
  return s + comp;
}
