import { energyDistance } from "../../../core/energy-distance";
import type { TransportResult } from "../../../core/result";
import { deriveSeed } from "../../document/seed";
import type { TransportSolver } from "../define-context";
import type { SweepOutput } from "./settings";
import { drawsSamples, sweepProblem } from "./sweep-problem";
import type { SweepPlan } from "./resolve-sweep";
import type { SweepCellValue, SweepRowValue } from "./sweep-value";

/** What a running sweep may use: the solver, the computation's signal, a progress report. */
export interface SweepEnvironment {
  readonly solve: TransportSolver;
  readonly signal?: AbortSignal;
  readonly progress?: (report: { readonly run: number; readonly of: number }) => void;
}

/**
 * Runs a sweep: for each value (in order), for each replicate r = 0 … R−1, solves
 * the problem {@link sweepProblem} builds with seed FNV-1a-32("<seed>:replicate-<r>")
 * and records the outputs. Yields the table after every run (`complete: false`)
 * and once more at the end (`complete: true`), so a table or curve fills in as it
 * goes. Yields to the event loop between runs, and stops early when the signal aborts.
 * Energy distances are computed once per pair of measures (once in all, unless the
 * sweep draws subsamples).
 */
export async function* runSweep(plan: SweepPlan, env: SweepEnvironment): AsyncGenerator<SweepCellValue, void, unknown> {
  const { vary, values, replicates, seed, record, transport } = plan;
  const columns = [vary, "replicate", ...record];
  const planned = values.length * replicates;
  const rows: SweepRowValue[] = [];
  let notConverged = 0;
  const snapshot = (complete: boolean): SweepCellValue => ({ ...plan, columns, rows: rows.slice(), planned, complete, notConverged });
  let sharedEnergy: number | undefined;
  for (const value of values) {
    for (let r = 0; r < replicates; r++) {
      if (env.signal?.aborted) return;
      const problem = sweepProblem(transport, vary, value, deriveSeed(seed, `replicate-${r}`));
      const result = await env.solve(problem, { signal: env.signal });
      if (result.diagnostics.status !== "converged") notConverged++;
      const energy = () => {
        if (!drawsSamples(vary)) return (sharedEnergy ??= energyDistance(problem.source, problem.target));
        return energyDistance(problem.source, problem.target);
      };
      const row: Record<string, unknown> = { value, [vary]: value, replicate: r };
      for (const output of record) row[output] = outputOf(output, result, energy);
      rows.push(row as SweepRowValue);
      env.progress?.({ run: rows.length, of: planned });
      yield snapshot(false);
      // Let the event loop breathe between in-thread solves (aborts, progress, other cells).
      await new Promise((resolve) => setTimeout(resolve, 0));
    }
  }
  yield snapshot(true);
}

function outputOf(output: SweepOutput, result: TransportResult, energy: () => number): unknown {
  const { values, diagnostics } = result;
  switch (output) {
    case "cost":
      return values.cost;
    case "objective":
      return values.objective;
    case "divergence":
      return values.divergence ?? null;
    case "mass":
      return values.mass;
    case "iterations":
      return diagnostics.iterations;
    case "marginalError":
      return diagnostics.marginalError;
    case "seconds":
      return diagnostics.seconds;
    case "status":
      return diagnostics.status;
    case "energyDistance":
      return energy();
  }
}
