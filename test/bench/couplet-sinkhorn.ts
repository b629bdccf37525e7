import { type SinkhornOutcome, sinkhorn } from "../../core/sinkhorn";
import type { BenchCase } from "./bench-cases";
import type { BenchProblem } from "./bench-problems";
import type { CoupletOutcome } from "./couplet-side";
import { type RepeatPolicy, medianIterationTime, medianTime } from "./median-time";

// sinkhorn() requires tolerance > 0; this one is never reached, so exactly
// maxIterations sweeps run.
const UNREACHABLE_TOLERANCE = 1e-300;

/**
 * Times core/sinkhorn.ts for a Sinkhorn case.
 * - Per-iteration rows: `iterations` k and 2k sweeps in the requested domain, time per
 *   iteration = median (t(2k) − t(k)) / k, so the kernel build and the final evaluation
 *   cancel out (reference.py does the same).
 * - Time-to-tolerance row: the whole solve (domain "auto", with or without the epsilon
 *   schedule) until marginal error ≤ tolerance.
 * The compared value is the dual value ⟨f, a⟩ + ⟨g, b⟩ of the returned potentials.
 */
export function runCoupletSinkhorn(benchCase: BenchCase, problem: BenchProblem, policy: RepeatPolicy): CoupletOutcome {
  const epsilon = benchCase.epsilonRelative! * problem.maxCost;
  const { a, b, C } = problem;
  const notes: string[] = [];
  const valueName = "dual value ⟨f, a⟩ + ⟨g, b⟩";
  if (benchCase.row === "sinkhorn-tolerance") {
    const { timing, value: outcome } = medianTime(
      () => sinkhorn(a, b, C, { epsilon, tolerance: benchCase.tolerance, maxIterations: benchCase.maxIterations, schedule: benchCase.schedule }),
      policy,
    );
    if (outcome.status !== "converged") notes.push(`Couplet did not converge: ${outcome.status} after ${outcome.iterations} iterations, marginal error ${outcome.marginalError.toExponential(2)}`);
    return { measurement: { ...timing, ...summary(outcome, a, b) }, valueName, notes };
  }
  const domain = benchCase.row === "sinkhorn-kernel" ? "kernel" : "log";
  const { timing, totalMs, value: outcome } = medianIterationTime(
    (iterations) => sinkhorn(a, b, C, { epsilon, tolerance: UNREACHABLE_TOLERANCE, maxIterations: iterations, domain }),
    benchCase.iterations!,
    policy.repetitions,
  );
  if (outcome.algorithm !== `sinkhorn-${domain}`) notes.push(`asked for the ${domain} domain but ${outcome.algorithm} ran`);
  for (const warning of outcome.warnings) if (warning.code === "kernel-fallback") notes.push(`Couplet warned: ${warning.message}`);
  return { measurement: { ...timing, totalMs, ...summary(outcome, a, b) }, valueName, notes };
}

function summary(outcome: SinkhornOutcome, a: Float64Array, b: Float64Array) {
  let value = 0;
  for (let i = 0; i < a.length; i++) value += outcome.f[i] * a[i];
  for (let j = 0; j < b.length; j++) value += outcome.g[j] * b[j];
  return {
    value,
    iterations: outcome.iterations,
    status: outcome.status,
    marginalError: outcome.marginalError,
    algorithm: outcome.kernelBackend ? `${outcome.algorithm} (${outcome.kernelBackend})` : outcome.algorithm,
  };
}
