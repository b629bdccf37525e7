import { type CellOf, studySeed } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import type { DefineContext } from "../define-context";
import { type CellDescription, versionKey } from "../kind-runtime";
import { resolveSweepPlan } from "./resolve-sweep";
import { runSweep } from "./run-sweep";
import { sweepDependencies, sweepUsesStudySeed } from "./settings";
import { drawsSamples } from "./sweep-problem";
import { type SweepCellValue, isSweepValue } from "./sweep-value";

/**
 * A sweep cell's definition: inputs are its transport cell and its references;
 * its value is a {@link SweepCellValue}, yielded run by run (the cell is
 * "running" with a partial table until the last run). Each run re-solves the
 * transport's problem with one setting changed, through `context.solve` (so large
 * runs go off-thread) with no warm start.
 */
export function defineSweepCell(cell: CellOf<"sweep">, context: DefineContext): CellDefinition {
  const { settings } = cell;
  const seed = studySeed(context.study);
  return {
    id: cell.id,
    name: cell.name ?? null,
    inputs: sweepDependencies(settings),
    version: versionKey(cell, { seed: sweepUsesStudySeed(settings) ? seed : null }),
    compute: (inputs, ctx): AsyncGenerator<SweepCellValue, void, unknown> => {
      // Resolved before the first run, so a bad setting fails the cell at once.
      const plan = resolveSweepPlan(settings, inputs, seed, cell.id);
      return runSweep(plan, { solve: context.solve, signal: ctx.signal, progress: (report) => ctx.progress(report) });
    },
  };
}

/**
 * Headline "epsilon over 9 values × 1 replicate (9 runs)". Cautions: runs that
 * did not converge, replicates that repeat one problem (only sample-size sweeps
 * draw new subsamples), and a sweep stopped before its last run.
 */
export function describeSweep(_cell: CellOf<"sweep">, value: unknown): CellDescription {
  if (!isSweepValue(value)) return { cautions: [] };
  const { vary, values, replicates, rows, planned } = value;
  const headline = `${vary} over ${values.length} ${values.length === 1 ? "value" : "values"} × ${replicates} ${replicates === 1 ? "replicate" : "replicates"} (${planned} runs)`;
  const cautions: string[] = [];
  if (!value.complete) cautions.push(`Stopped after ${rows.length} of ${planned} runs.`);
  if (value.notConverged > 0) cautions.push(`${value.notConverged} of ${rows.length} runs did not converge.`);
  if (replicates > 1 && !drawsSamples(vary)) cautions.push("Replicates repeat the same problem: only sample-size sweeps draw new subsamples.");
  return { headline, cautions };
}
