// Self-transport OT_ε(a, a) with one potential: the optimal plan of a symmetric
// problem is P_ij = a_i a_j exp((f_i + f_j − C_ij)/ε), and f is the fixed point of
// f = T(f), T(f)_i = −τ·ε·log Σ_j a_j exp((f_j − C_ij)/ε). Iterating the average
// f ← ½(f + T(f)) converges in a few sweeps where plain Sinkhorn would oscillate
// (Feydy, Séjourné, Vialard, Amari, Trouvé & Peyré 2019, AISTATS, Sec. 3).
import { entropicValues } from "./entropic-values";
import { SCHEDULE_STAGE_TOLERANCE, type ScheduleOption, epsilonStages } from "./epsilon-schedule";
import { TransportInputError, describeValue } from "./errors";
import { iterationHistory } from "./iteration-history";
import { type GibbsProblem, logOf, symmetricSweep } from "./logsumexp";
import type { Matrix } from "./matrix";
import type { Diagnostics, SolveControl, SolveStatus, SolveWarning } from "./result";
import { checkMasses, epsilonWarnings, notConvergedWarning, scanCost } from "./sinkhorn-settings";
import { dampingFactor } from "./unbalanced";

/** Options of {@link sinkhornSymmetric}. Same meaning and defaults as for sinkhorn(). */
export interface SymmetricOptions extends SolveControl {
  /** ε in cost units, > 0. */
  readonly epsilon: number;
  /** Mass penalty ρ on both marginals (> 0, Infinity = balanced). Default Infinity. */
  readonly massPenalty?: number;
  readonly tolerance?: number;
  readonly maxIterations?: number;
  readonly schedule?: ScheduleOption;
  /** Added to the iteration numbers in history and progress reports (to chain solves). Default 0. */
  readonly iterationOffset?: number;
}

/** What {@link sinkhornSymmetric} returns. */
export interface SymmetricOutcome extends Diagnostics {
  readonly algorithm: "sinkhorn-symmetric-log";
  /** The symmetric potential f (length n, cost units): f = g. */
  readonly f: Float64Array;
  readonly epsilon: number;
  readonly values: { readonly cost: number; readonly objective: number; readonly dual: number; readonly mass: number; readonly entropic: number; readonly penalty: number };
}

/**
 * OT_ε(a, a) (+ unbalanced penalties ρ·KL on both marginals) for masses `a` and a
 * symmetric n×n cost `C` (C(x_i, x_j); symmetry is assumed, not checked), by averaged
 * symmetric log-domain sweeps. Stops when the marginal error is ≤ tolerance (status
 * "converged"), at the cap ("not-converged" + warning) or on abort ("cancelled").
 * Options are validated as in sinkhorn(); throws TransportInputError naming them.
 */
export function sinkhornSymmetric(a: Float64Array, C: Matrix, options: SymmetricOptions): SymmetricOutcome {
  const started = performance.now();
  checkMasses(a, "a");
  const n = a.length;
  const { max: cmax } = scanCost(C, n, n);
  const { epsilon, massPenalty = Infinity, tolerance = 1e-6, maxIterations = 10_000, schedule, signal, onProgress, progressEvery = 10, iterationOffset = 0 } = options;
  if (typeof epsilon !== "number" || !(epsilon > 0) || !Number.isFinite(epsilon)) throw new TransportInputError("epsilon", `must be > 0 and finite, got ${describeValue(epsilon)}`, epsilon);
  if (typeof massPenalty !== "number" || !(massPenalty > 0)) throw new TransportInputError("massPenalty", `must be > 0 (Infinity = balanced), got ${describeValue(massPenalty)}`, massPenalty);
  if (typeof tolerance !== "number" || !(tolerance > 0)) throw new TransportInputError("tolerance", `must be > 0, got ${describeValue(tolerance)}`, tolerance);
  if (!Number.isInteger(maxIterations) || maxIterations < 1) throw new TransportInputError("maxIterations", `must be a positive integer, got ${describeValue(maxIterations)}`, maxIterations);
  if (!Number.isInteger(progressEvery) || progressEvery < 1) throw new TransportInputError("progressEvery", `must be a positive integer, got ${describeValue(progressEvery)}`, progressEvery);
  if (!Number.isInteger(iterationOffset) || iterationOffset < 0) throw new TransportInputError("iterationOffset", `must be an integer >= 0, got ${describeValue(iterationOffset)}`, iterationOffset);
  if (signal !== undefined && (signal === null || typeof signal !== "object" || typeof signal.aborted !== "boolean")) {
    throw new TransportInputError("signal", `must be an AbortSignal, got ${describeValue(signal)}`, signal);
  }
  if (onProgress !== undefined && typeof onProgress !== "function") throw new TransportInputError("onProgress", `must be a function, got ${describeValue(onProgress)}`, onProgress);
  const stages = epsilonStages(epsilon, schedule, cmax);

  let massA = 0;
  for (let i = 0; i < n; i++) massA += a[i];
  const logA = logOf(a);
  const problemAt = (eps: number): GibbsProblem => ({
    n,
    m: n,
    C: C.data,
    invEpsilon: 1 / eps,
    a,
    b: a,
    logA,
    logB: logA,
    massA,
    massB: massA,
    tauA: dampingFactor(massPenalty, eps),
    tauB: dampingFactor(massPenalty, eps),
    epsOverRhoA: massPenalty === Infinity ? 0 : eps / massPenalty,
    epsOverRhoB: massPenalty === Infinity ? 0 : eps / massPenalty,
  });

  // Potentials in cost units; converted to units of epsilon per stage.
  const f = new Float64Array(n);
  let F = new Float64Array(n);
  let Fn = new Float64Array(n);
  const history = iterationHistory();
  let iterations = 0;
  let status: SolveStatus = "not-converged";
  let lastError = NaN;
  let stageEpsilon = NaN; // epsilon the units of F refer to
  stages: for (let s = 0; s < stages.length; s++) {
    const eps = stages[s];
    if (!Number.isNaN(stageEpsilon)) for (let i = 0; i < n; i++) f[i] = F[i] * stageEpsilon;
    stageEpsilon = eps;
    const last = s === stages.length - 1;
    const stageTolerance = last ? tolerance : Math.max(tolerance, SCHEDULE_STAGE_TOLERANCE);
    const p = problemAt(eps);
    for (let i = 0; i < n; i++) F[i] = f[i] / eps;
    for (;;) {
      if (signal?.aborted) {
        status = "cancelled";
        break stages;
      }
      if (iterations >= maxIterations) break stages;
      const error = symmetricSweep(p, F, Fn);
      iterations++;
      history.push(iterationOffset + iterations, error);
      lastError = error;
      if (onProgress && iterations % progressEvery === 0) onProgress({ iteration: iterationOffset + iterations, marginalError: error, epsilon: eps });
      if (error <= stageTolerance) {
        if (last) status = "converged";
        break;
      }
      [F, Fn] = [Fn, F];
    }
  }
  if (!Number.isNaN(stageEpsilon)) for (let i = 0; i < n; i++) f[i] = F[i] * stageEpsilon;
  // Potentials left at an intermediate epsilon (cancelled or capped during a schedule)
  // are reported as they are, evaluated at the target epsilon.
  const v = entropicValues(a, a, C, f, f, epsilon, massPenalty, massPenalty);
  const warnings: SolveWarning[] = [];
  if (status === "not-converged") warnings.push(notConvergedWarning(iterations, lastError, tolerance));
  warnings.push(...epsilonWarnings(epsilon, cmax));
  return {
    algorithm: "sinkhorn-symmetric-log",
    f,
    epsilon,
    status,
    iterations,
    marginalError: v.marginalError,
    ...history.read(),
    seconds: (performance.now() - started) / 1000,
    warnings,
    values: { cost: v.cost, objective: v.objective, dual: v.dual, mass: v.mass, entropic: v.entropic, penalty: v.penalties.source + v.penalties.target },
  };
}
