// Options of the Sinkhorn solvers: their types, defaults and validation, and the
// warnings they share. Caller mistakes throw TransportInputError naming the option.
import { type ScheduleOption, epsilonStages } from "./epsilon-schedule";
import { TransportInputError, describeValue } from "./errors";
import type { Matrix } from "./matrix";
import type { SolveControl, SolveProgress, SolveWarning } from "./result";
import { BALANCED, type MassPenalty, resolveMassPenalty } from "./unbalanced";

/** Options of {@link sinkhorn} (core/sinkhorn.ts). Only `epsilon` is required. */
export interface SinkhornOptions extends SolveControl {
  /** Regularisation strength ε in cost units (absolute), > 0 and finite. */
  readonly epsilon: number;
  /** Mass penalties ρ_a, ρ_b in cost units, > 0; Infinity = that side balanced. Default both Infinity. */
  readonly massPenalty?: MassPenalty;
  /** Stop when the marginal error (core/result.ts) is ≤ this. Default 1e-6. */
  readonly tolerance?: number;
  /** Cap on sweeps (one sweep = one f and one g update), summed over schedule stages. Default 10 000. */
  readonly maxIterations?: number;
  /**
   * Epsilon scaling: solve at startEpsilon (cost units, default the largest cost),
   * then at startEpsilon·factor^k (factor in (0, 1), default 0.5) down to `epsilon`,
   * each stage starting from the last one's potentials. Intermediate stages stop at
   * marginal error max(tolerance, 1e-3). Default off.
   */
  readonly schedule?: ScheduleOption;
  /** Start from these potentials (cost units, lengths n and m) instead of zero. Only f is used: g is recomputed from it. */
  readonly warmStart?: { readonly f: Float64Array; readonly g: Float64Array };
  /**
   * "log": log-domain sweeps, safe for any epsilon. "kernel": scaling sweeps on
   * K = exp(−C/ε), handing over to the log domain (warning "kernel-fallback") if the
   * scalings leave the floating-point range. "auto" (default): kernel when
   * (max C − min C)/ε ≤ 500 (KERNEL_SAFE_RANGE in sinkhorn.ts), else log; decided per schedule stage.
   */
  readonly domain?: "auto" | "log" | "kernel";
}

/** Validated options with defaults filled in. */
export interface SinkhornSettings {
  readonly epsilon: number;
  readonly rho: MassPenalty;
  readonly tolerance: number;
  readonly maxIterations: number;
  readonly schedule: ScheduleOption;
  readonly warmStart?: { readonly f: Float64Array; readonly g: Float64Array };
  readonly domain: "auto" | "log" | "kernel";
  readonly signal?: AbortSignal;
  readonly onProgress?: (progress: SolveProgress) => void;
  readonly progressEvery: number;
}

/** Validates `options` for a problem with n source and m target points. */
export function sinkhornSettings(options: SinkhornOptions, n: number, m: number): SinkhornSettings {
  if (options === null || typeof options !== "object") throw new TransportInputError("options", `must be an object with at least epsilon, got ${describeValue(options)}`, options);
  const { epsilon, tolerance = 1e-6, maxIterations = 10_000, schedule = false, warmStart, domain = "auto", signal, onProgress, progressEvery = 10 } = options;
  if (typeof epsilon !== "number" || !(epsilon > 0) || !Number.isFinite(epsilon)) {
    throw new TransportInputError("epsilon", `must be > 0 and finite, got ${describeValue(epsilon)}`, epsilon);
  }
  const rho = resolveMassPenalty(options.massPenalty ?? BALANCED);
  if (typeof tolerance !== "number" || !(tolerance > 0)) throw new TransportInputError("tolerance", `must be > 0, got ${describeValue(tolerance)}`, tolerance);
  checkPositiveInteger(maxIterations, "maxIterations");
  checkPositiveInteger(progressEvery, "progressEvery");
  if (domain !== "auto" && domain !== "log" && domain !== "kernel") {
    throw new TransportInputError("domain", `must be "auto", "log" or "kernel", got ${describeValue(domain)}`, domain);
  }
  if (onProgress !== undefined && typeof onProgress !== "function") throw new TransportInputError("onProgress", `must be a function, got ${describeValue(onProgress)}`, onProgress);
  if (signal !== undefined && (signal === null || typeof signal !== "object" || typeof signal.aborted !== "boolean")) {
    throw new TransportInputError("signal", `must be an AbortSignal, got ${describeValue(signal)}`, signal);
  }
  if (warmStart !== undefined) {
    if (warmStart === null || typeof warmStart !== "object") throw new TransportInputError("warmStart", `must be {f, g}, got ${describeValue(warmStart)}`, warmStart);
    checkPotential(warmStart.f, n, "warmStart.f");
    checkPotential(warmStart.g, m, "warmStart.g");
  }
  epsilonStages(epsilon, schedule, 1); // validates the schedule option
  return { epsilon, rho, tolerance, maxIterations, schedule, warmStart, domain, signal, onProgress, progressEvery };
}

/** Checks a mass vector: a non-empty Float64Array, entries finite and ≥ 0, positive total. */
export function checkMasses(w: unknown, field: string): asserts w is Float64Array {
  if (!(w instanceof Float64Array) || w.length === 0) throw new TransportInputError(field, `must be a non-empty Float64Array of masses, got ${describeValue(w)}`, w);
  let total = 0;
  for (let i = 0; i < w.length; i++) {
    const x = w[i];
    if (!(x >= 0) || x === Infinity) throw new TransportInputError(`${field}[${i}]`, `mass must be finite and >= 0, got ${describeValue(x)}`, x);
    total += x;
  }
  if (!(total > 0)) throw new TransportInputError(field, "total mass is zero", total);
}

/** Checks that C is a rows×cols matrix and returns its smallest and largest entry; throws on a non-finite entry. */
export function scanCost(C: Matrix, rows: number, cols: number, field = "C"): { min: number; max: number } {
  if (!C || !(C.data instanceof Float64Array) || C.rows !== rows || C.cols !== cols || C.data.length !== rows * cols) {
    throw new TransportInputError(field, `must be a ${rows}×${cols} matrix (rows = source points, cols = target points), got ${describeValue(C && [C.rows, C.cols])}`, C);
  }
  const data = C.data;
  let min = Infinity;
  let max = -Infinity;
  for (let k = 0; k < data.length; k++) {
    const v = data[k];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (!Number.isFinite(min) || !Number.isFinite(max)) {
    for (let k = 0; k < data.length; k++) {
      if (!Number.isFinite(data[k])) {
        throw new TransportInputError(`${field}[${Math.floor(k / cols)}][${k % cols}]`, `cost must be finite, got ${describeValue(data[k])}`, data[k]);
      }
    }
  }
  return { min, max };
}

const TINY_EPSILON = 1e-3;

/** "epsilon-tiny" (ε < 1e-3 × max C) and "epsilon-large" (ε > max C) warnings, if they apply. */
export function epsilonWarnings(epsilon: number, maxCost: number): SolveWarning[] {
  const warnings: SolveWarning[] = [];
  if (maxCost > 0 && epsilon < TINY_EPSILON * maxCost) {
    warnings.push({
      code: "epsilon-tiny",
      message: `epsilon = ${formatNumber(epsilon)} is below 1e-3 × the largest cost (${formatNumber(maxCost)}): Sinkhorn needs many iterations (roughly proportional to 1/epsilon); use the epsilon schedule, a looser tolerance or a larger epsilon.`,
    });
  }
  if (epsilon > maxCost) {
    warnings.push({
      code: "epsilon-large",
      message: `epsilon = ${formatNumber(epsilon)} exceeds the largest cost (${formatNumber(maxCost)}): the plan is close to the independent coupling a⊗b and the value is dominated by the entropic term.`,
    });
  }
  return warnings;
}

/** The "not-converged" warning: names the iterations, the last error and the tolerance. */
export function notConvergedWarning(iterations: number, error: number, tolerance: number): SolveWarning {
  return {
    code: "not-converged",
    message: `Stopped after ${iterations} iterations (the maxIterations cap) with marginal error ${formatNumber(error)} above the tolerance ${formatNumber(tolerance)}; raise maxIterations, loosen the tolerance, use a larger epsilon or the epsilon schedule.`,
  };
}

/** Three significant digits for messages; NaN and Infinity as words. */
export function formatNumber(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(3))) : String(x);
}

function checkPositiveInteger(x: unknown, field: string): void {
  if (typeof x !== "number" || !Number.isInteger(x) || x < 1) throw new TransportInputError(field, `must be a positive integer, got ${describeValue(x)}`, x);
}

function checkPotential(x: unknown, length: number, field: string): void {
  if (!(x instanceof Float64Array) || x.length !== length) {
    throw new TransportInputError(field, `must be a Float64Array of length ${length}, got ${describeValue(x instanceof Float64Array ? `length ${x.length}` : x)}`, x);
  }
  for (let i = 0; i < length; i++) {
    if (!Number.isFinite(x[i])) throw new TransportInputError(`${field}[${i}]`, `must be finite, got ${describeValue(x[i])}`, x[i]);
  }
}
