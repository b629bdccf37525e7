// Entropic and unbalanced optimal transport by Sinkhorn iterations.
//
// Problem (our convention, /work/shared/REFERENCES.md):
//   min_P ⟨C,P⟩ + ε·KL(P‖a⊗b) + ρ_a·KL(P1‖a) + ρ_b·KL(Pᵀ1‖b),
// generalised KL, ρ = Infinity making a side a hard constraint. Optimal plans have the
// form P_ij = a_i b_j exp((f_i + g_j − C_ij)/ε) and the potentials are fixed points of
//   f_i = −τ_a·ε·log Σ_j b_j exp((g_j − C_ij)/ε),  τ_a = ρ_a/(ρ_a+ε)  (1 if balanced),
// and the mirror update for g (Sinkhorn 1967; Cuturi 2013; unbalanced form Chizat,
// Peyré, Schmitzer & Vialard 2018, Math. Comp. 87).
//
// Structure: one "sweep" updates f then g; the engines (sinkhorn-engines.ts) keep g
// up to date with f, so each sweep also measures the source marginal error of the
// current state at no extra cost (the target marginal is exact by construction) and
// the solver can stop on the state whose error it measured.
import { type CostScale, type ResolvedEpsilon, resolveEpsilon } from "./cost";
import { entropicValues } from "./entropic-values";
import { SCHEDULE_STAGE_TOLERANCE, epsilonStages } from "./epsilon-schedule";
import { TransportInputError, describeValue } from "./errors";
import { iterationHistory } from "./iteration-history";
import { type KernelBackend, type KernelSweeper, kernelSweeper } from "./kernel-sweep";
import { type GibbsProblem, logOf } from "./logsumexp";
import type { Matrix } from "./matrix";
import type { Measure } from "./measure";
import type { Diagnostics, GibbsPlan, SolveOptions, SolveStatus, SolveWarning, TransportMethod, TransportResult, TransportValues } from "./result";
import { type SweepEngine, kernelEngine, logEngine } from "./sinkhorn-engines";
import { type SinkhornOptions, checkMasses, epsilonWarnings, formatNumber, notConvergedWarning, scanCost, sinkhornSettings } from "./sinkhorn-settings";
import { BALANCED, type MassPenalty, dampingFactor, resolveMassPenalty } from "./unbalanced";

export type { SinkhornOptions } from "./sinkhorn-settings";

/** What {@link sinkhorn} returns: potentials, numbers and diagnostics (plain data). */
export interface SinkhornOutcome extends Diagnostics {
  /** Domain of the last stage: "sinkhorn-kernel" or "sinkhorn-log". */
  readonly algorithm: "sinkhorn-log" | "sinkhorn-kernel";
  /** Kernel pass implementation when the last stage ran in the kernel domain. */
  readonly kernelBackend?: KernelBackend;
  /** Source potentials f (length n, cost units). */
  readonly f: Float64Array;
  /** Target potentials g (length m, cost units); g is the target update of f. */
  readonly g: Float64Array;
  /** The epsilon the potentials and values belong to (the target epsilon). */
  readonly epsilon: number;
  readonly values: TransportValues & { readonly dual: number; readonly entropic: number };
}

/**
 * Largest (max C − min C)/ε for which "auto" uses the kernel domain.
 * Why this is safe: every kernel entry is then ≥ e^−500 ≈ 7e−218, a normal double, so
 * no transport is silently forbidden by underflow to 0. The engine keeps both scalings
 * in [1e−280, 1e280] and hands over to the log domain (from the same state) the
 * moment one leaves it; inside that range a row sum t_i = Σ_j K_ij b_j v_j ≥ 1e−280 is
 * dominated by terms far above the subnormal range, so every plan entry lost to
 * underflow is below 1e−20 of its row, and the kernel iteration computes the same
 * fixed point as the log domain to rounding. For ε below range/500 the scalings
 * e^(f/ε) would typically pass 1e280 anyway, so the log domain is used from the start.
 */
export const KERNEL_SAFE_RANGE = 500;

/**
 * Entropic (and unbalanced) transport between masses `a` (length n) and `b`
 * (length m) under the cost matrix `C` (row-major n×m) by Sinkhorn sweeps.
 * Never throws for numerical reasons: non-convergence (status "not-converged" with a
 * warning), cancellation through `signal` (status "cancelled", checked before every
 * sweep) and odd settings (warnings "epsilon-tiny", "epsilon-large",
 * "unequal-mass", "kernel-fallback") are reported in the outcome. Throws
 * {@link TransportInputError} naming the option for invalid inputs.
 * Progress: `onProgress` every `progressEvery` sweeps (default 10).
 */
export function sinkhorn(a: Float64Array, b: Float64Array, C: Matrix, options: SinkhornOptions): SinkhornOutcome {
  const started = performance.now();
  checkMasses(a, "a");
  checkMasses(b, "b");
  const n = a.length;
  const m = b.length;
  const { min: cmin, max: cmax } = scanCost(C, n, m);
  const { epsilon, rho, tolerance, maxIterations, schedule, warmStart, domain, signal, onProgress, progressEvery } = sinkhornSettings(options, n, m);
  const stages = epsilonStages(epsilon, schedule, cmax);

  const massA = sum(a);
  const massB = sum(b);
  const logA = logOf(a);
  const logB = logOf(b);
  const problemAt = (eps: number): GibbsProblem => ({
    n,
    m,
    C: C.data,
    invEpsilon: 1 / eps,
    a,
    b,
    logA,
    logB,
    massA,
    massB,
    tauA: dampingFactor(rho.source, eps),
    tauB: dampingFactor(rho.target, eps),
    epsOverRhoA: rho.source === Infinity ? 0 : eps / rho.source,
    epsOverRhoB: rho.target === Infinity ? 0 : eps / rho.target,
  });

  const warnings: SolveWarning[] = [];
  const f = warmStart ? Float64Array.from(warmStart.f) : new Float64Array(n);
  const g = warmStart ? Float64Array.from(warmStart.g) : new Float64Array(m);
  const history = iterationHistory();
  let iterations = 0;
  let status: SolveStatus = "not-converged";
  let lastError = NaN;
  let engine: SweepEngine | undefined;
  let engineEpsilon = epsilon;
  // Why and at which epsilon a requested kernel iteration handed over to the log domain.
  let fallback: { epsilon: number; reason: string } | undefined;

  // One kernel buffer for all stages (allocated on first use; null if it cannot be).
  let sweeper: KernelSweeper | null | undefined;
  const startEngine = (eps: number): SweepEngine => {
    const problem = problemAt(eps);
    const wantKernel = domain === "kernel" || (domain === "auto" && (cmax - cmin) / eps <= KERNEL_SAFE_RANGE);
    if (wantKernel) {
      if (sweeper === undefined) sweeper = kernelSweeper(n, m);
      const kernel = sweeper && kernelEngine(problem, cmin, sweeper);
      if (kernel && kernel.start(f)) return kernel;
      if (domain === "kernel") {
        fallback = { epsilon: eps, reason: sweeper ? "its starting scalings e^(f/ε) are outside the floating-point range" : "the memory for the kernel matrix could not be allocated" };
      }
    }
    const log = logEngine(problem);
    log.start(f);
    return log;
  };

  stages: for (let s = 0; s < stages.length; s++) {
    if (signal?.aborted) {
      status = "cancelled";
      break;
    }
    const eps = stages[s];
    const last = s === stages.length - 1;
    const stageTolerance = last ? tolerance : Math.max(tolerance, SCHEDULE_STAGE_TOLERANCE);
    engine = startEngine(eps);
    engineEpsilon = eps;
    for (;;) {
      if (signal?.aborted) {
        status = "cancelled";
        break stages;
      }
      if (iterations >= maxIterations) break stages;
      const error = engine.sweep();
      if (Number.isNaN(error) && engine.domain === "kernel") {
        // Scalings left the safe range: continue from the same state in the log domain.
        engine.read(f, g);
        engine = logEngine(problemAt(eps));
        engine.start(f);
        if (domain === "kernel") fallback = { epsilon: eps, reason: "its scalings left the floating-point range" };
        continue;
      }
      iterations++;
      history.push(iterations, error);
      lastError = error;
      if (onProgress && iterations % progressEvery === 0) onProgress({ iteration: iterations, marginalError: error, epsilon: eps });
      if (error <= stageTolerance) {
        if (last) status = "converged";
        break;
      }
      engine.advance();
    }
    engine.read(f, g);
  }
  if (engine) engine.read(f, g);
  if (!engine || engineEpsilon !== epsilon) {
    // Stopped before the target epsilon (cancelled, or the cap hit during a schedule):
    // report the current f at the target epsilon with g brought up to date.
    const log = logEngine(problemAt(epsilon));
    log.start(f);
    log.read(f, g);
  }

  const evaluation = entropicValues(a, b, C, f, g, epsilon, rho.source, rho.target);
  if (status === "not-converged") warnings.push(notConvergedWarning(iterations, lastError, tolerance));
  warnings.push(...epsilonWarnings(epsilon, cmax));
  if (rho.source === Infinity && rho.target === Infinity && Math.abs(massA - massB) > 1e-9 * Math.max(massA, massB)) {
    warnings.push({
      code: "unequal-mass",
      message: `Balanced transport needs equal total masses, got ${formatNumber(massA)} (source) and ${formatNumber(massB)} (target); the iteration cannot converge. Normalise both measures or use finite mass penalties.`,
    });
  }
  // With a finite penalty the entropic term ε·KL(P‖a⊗b) pulls the plan's mass toward
  // m(a)·m(b), which is far from either mass unless the masses are near 1.
  const reference = massA * massB;
  if ((rho.source !== Infinity || rho.target !== Infinity) && (reference > 2 * Math.max(massA, massB) || reference < 0.5 * Math.min(massA, massB))) {
    warnings.push({
      code: "reference-mass",
      message: `The entropic reference a⊗b has total mass ${formatNumber(reference)} (source ${formatNumber(massA)} × target ${formatNumber(massB)}), so with finite mass penalties the transported mass is pulled toward it; rescale the masses to totals near 1 for a mass that reflects supply and demand.`,
    });
  }
  if (fallback) {
    warnings.push({
      code: "kernel-fallback",
      message: `The kernel-domain iteration stopped at epsilon = ${formatNumber(fallback.epsilon)} because ${fallback.reason}; the solve continued from the same state in the log domain (same fixed point, slower sweeps).`,
    });
  }

  return {
    algorithm: engine?.domain === "kernel" && engineEpsilon === epsilon ? "sinkhorn-kernel" : "sinkhorn-log",
    ...(engine?.domain === "kernel" && engineEpsilon === epsilon ? { kernelBackend: engine.backend } : {}),
    f,
    g,
    epsilon,
    status,
    iterations,
    marginalError: evaluation.marginalError,
    ...history.read(),
    seconds: (performance.now() - started) / 1000,
    warnings,
    values: {
      cost: evaluation.cost,
      objective: evaluation.objective,
      dual: evaluation.dual,
      mass: evaluation.mass,
      entropic: evaluation.entropic,
      ...(rho.source !== Infinity || rho.target !== Infinity ? { penalties: evaluation.penalties } : {}),
    },
  };
}

/**
 * Entropic transport between two measures with equal total mass (relative 1e-9),
 * OT_ε = min_P ⟨C,P⟩ + ε·KL(P‖a⊗b). `C` is the source×target cost matrix and
 * `costScale` its statistics, against which a relative epsilon is resolved.
 * `options.massPenalty` is ignored (see {@link solveUnbalanced}). Throws
 * {@link TransportInputError} for a missing or invalid epsilon, unequal masses
 * ("target.mass") and invalid solver options.
 */
export function solveEntropic(source: Measure, target: Measure, C: Matrix, options: SolveOptions, costScale: CostScale): TransportResult {
  const { a, b } = checkProblem(source, target, C);
  const eps = resolveEpsilonOption(options, costScale);
  checkEqualMass(a, b);
  const outcome = sinkhorn(a, b, C, sinkhornOptions(options, eps.absolute, BALANCED, costScale));
  return entropicResult("entropic", outcome, costScale, eps, undefined, a, b);
}

/**
 * Unbalanced entropic transport: ⟨C,P⟩ + ε·KL(P‖a⊗b) + ρ_a·KL(P1‖a) + ρ_b·KL(Pᵀ1‖b)
 * (Chizat et al. 2018). `options.massPenalty` is required: one ρ for both sides or
 * {source, target}, each > 0, Infinity = that side balanced. With both sides
 * balanced the total masses must be equal, as for {@link solveEntropic}.
 */
export function solveUnbalanced(source: Measure, target: Measure, C: Matrix, options: SolveOptions, costScale: CostScale): TransportResult {
  const { a, b } = checkProblem(source, target, C);
  const eps = resolveEpsilonOption(options, costScale);
  if (options.massPenalty === undefined) {
    throw new TransportInputError("massPenalty", "the unbalanced method needs massPenalty: a number > 0 for both sides or {source, target} (Infinity = balanced side)", undefined);
  }
  const rho = resolveMassPenalty(options.massPenalty);
  if (rho.source === Infinity && rho.target === Infinity) checkEqualMass(a, b);
  const outcome = sinkhorn(a, b, C, sinkhornOptions(options, eps.absolute, rho, costScale));
  return entropicResult("unbalanced", outcome, costScale, eps, rho, a, b);
}

/** The TransportResult of a finished Sinkhorn solve (plan kept as potentials). */
export function entropicResult(method: TransportMethod, outcome: SinkhornOutcome, costScale: CostScale, epsilon: ResolvedEpsilon, massPenalty: MassPenalty | undefined, a: Float64Array, b: Float64Array): TransportResult {
  const plan: GibbsPlan = {
    kind: "gibbs",
    rows: a.length,
    cols: b.length,
    epsilon: outcome.epsilon,
    f: Float64Array.from(outcome.f),
    g: Float64Array.from(outcome.g),
    sourceMass: Float64Array.from(a),
    targetMass: Float64Array.from(b),
  };
  return {
    method,
    algorithm: outcome.algorithm,
    values: outcome.values,
    costScale,
    epsilon,
    ...(massPenalty ? { massPenalty } : {}),
    potentials: { f: outcome.f, g: outcome.g },
    plan,
    diagnostics: {
      status: outcome.status,
      iterations: outcome.iterations,
      marginalError: outcome.marginalError,
      history: outcome.history,
      historyIterations: outcome.historyIterations,
      seconds: outcome.seconds,
      warnings: outcome.warnings,
    },
  };
}

/** Resolves `options.epsilon` (required) against the cost scale. */
export function resolveEpsilonOption(options: SolveOptions, costScale: CostScale): ResolvedEpsilon {
  if (!options || options.epsilon === undefined) {
    throw new TransportInputError("epsilon", `the ${options?.method ?? "entropic"} method needs epsilon (absolute, or relative to the cost scale)`, undefined);
  }
  return resolveEpsilon(options.epsilon, costScale);
}

/** Maps the study-level options onto {@link SinkhornOptions} (schedule start resolved against the cost scale). */
export function sinkhornOptions(options: SolveOptions, epsilon: number, massPenalty: MassPenalty, costScale: CostScale): SinkhornOptions {
  let schedule: SinkhornOptions["schedule"] = false;
  if (options.schedule === true) schedule = true;
  else if (options.schedule && typeof options.schedule === "object") {
    const { factor, start } = options.schedule;
    schedule = { factor, startEpsilon: start === undefined ? undefined : resolveEpsilon(start, costScale, "schedule.start").absolute };
  } else if (options.schedule !== undefined && options.schedule !== false) {
    throw new TransportInputError("schedule", `must be true, false or {factor, start}, got ${describeValue(options.schedule)}`, options.schedule);
  }
  return {
    epsilon,
    massPenalty,
    tolerance: options.tolerance,
    maxIterations: options.maxIterations,
    schedule,
    warmStart: options.warmStart,
    domain: options.domain,
    signal: options.signal,
    onProgress: options.onProgress,
    progressEvery: options.progressEvery,
  };
}

/** Equal total masses to relative 1e-9, else a TransportInputError on "target.mass". */
export function checkEqualMass(a: Float64Array, b: Float64Array): void {
  const ma = sum(a);
  const mb = sum(b);
  if (Math.abs(ma - mb) > 1e-9 * Math.max(ma, mb)) {
    throw new TransportInputError(
      "target.mass",
      `total mass ${mb} differs from the source total ${ma}; balanced entropic transport needs equal masses: normalise both measures, or use the unbalanced method`,
      mb,
    );
  }
}

function checkProblem(source: Measure, target: Measure, C: Matrix): { a: Float64Array; b: Float64Array } {
  const a = source.mass;
  const b = target.mass;
  if (!C || C.rows !== a.length || C.cols !== b.length) {
    throw new TransportInputError("cost.matrix", `shape ${C?.rows}×${C?.cols} does not match ${a.length} source × ${b.length} target points`, C && [C.rows, C.cols]);
  }
  return { a, b };
}

function sum(x: Float64Array): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i];
  return s;
}
