import { costMatrix } from "../../../core/cost";
import { convergenceFigure } from "../../views/figures/convergence";
import { couplingLinesFigure } from "../../views/figures/coupling-lines";
import type { FigureSpec } from "../../views/figures/figure-spec";
import { orderByCoordinate, planMatrixFigure } from "../../views/figures/plan-matrix";
import { potentialsFigure } from "../../views/figures/potentials";
import { type SweepRow, sweepCurveFigure } from "../../views/figures/sweep-curve";
import { CellSettingError } from "../cell-error";
import { asPointMeasure } from "../measure-input";
import type { CellInputs } from "../resolve-number";
import type { SweepOutput } from "../sweep/settings";
import { type SweepCellValue, isSweepValue } from "../sweep/sweep-value";
import { type TransportCellValue, transportInput } from "../transport/transport-value";
import type { FigureSettings } from "./settings";
import { mergePotentials } from "./merge-potentials";

/** Settings of a ready view (every view but "code"). */
export type ReadyFigureSettings = Exclude<FigureSettings, { readonly view: "code" }>;

/** Options as written, loosely typed: each view reads the ones it knows. */
interface AnyOptions {
  readonly title?: string;
  readonly width?: number;
  readonly maxLines?: number;
  readonly logScale?: boolean;
  readonly side?: "source" | "target" | "both";
  readonly output?: SweepOutput;
  readonly logX?: boolean;
  readonly logY?: boolean;
}

/**
 * The FigureSpec of a ready view (cells/views/figures) from the cells it draws:
 * - coupling-lines, plan-matrix: the transport's measures and plan (an entropic
 *   plan is evaluated from the cost matrix, recomputed from the measures); the
 *   plan matrix orders both sides by their first coordinate;
 * - potentials: f over the source, g over the target, or both on one picture
 *   (one colour scale; side "both", the default);
 * - convergence: each transport's error history, labelled by cell name, with its tolerance;
 * - sweep-curve: one output of one or more sweeps against the varied setting
 *   (series named by sweep when there are several; "balanced" penalties have no
 *   place on an axis and are left out and counted).
 * Throws a CellSettingError when an input is not what the view draws.
 */
export function readyFigure(settings: ReadyFigureSettings, inputs: CellInputs): FigureSpec<object> {
  const options = (settings.options ?? {}) as AnyOptions;
  const common = { ...(options.title === undefined ? {} : { title: options.title }), ...(options.width === undefined ? {} : { width: options.width }) };
  const transport = (k: number) => transportInput(inputs[settings.of[k]], `of[${k}]`, settings.of[k]);
  switch (settings.view) {
    case "coupling-lines":
    case "plan-matrix": {
      const t = transport(0);
      const plan = t.plan;
      if (!plan) throw new CellSettingError("of[0]", `"${settings.of[0]}" has no plan to draw`);
      const cost = plan.kind === "gibbs" ? costMatrix(t.source, t.target, t.costSpec) : undefined;
      const cautions = statusCautions(t, settings.of[0]);
      if (settings.view === "coupling-lines") {
        return couplingLinesFigure({ ...common, source: asPointMeasure(t.source), target: asPointMeasure(t.target), plan, cost, cautions, ...(options.maxLines === undefined ? {} : { maxLines: options.maxLines }) });
      }
      return planMatrixFigure({ ...common, plan, cost, cautions, sourceOrder: orderByCoordinate(t.source), targetOrder: orderByCoordinate(t.target) });
    }
    case "potentials": {
      const t = transport(0);
      if (!t.potentials) throw new CellSettingError("of[0]", `"${settings.of[0]}" has no potentials to draw`);
      const side = options.side ?? "both";
      const cautions = statusCautions(t, settings.of[0]);
      const f = () => potentialsFigure({ ...common, cautions, measure: t.source, potential: t.potentials!.f, label: "f (source potential)", side: "source" });
      const g = () => potentialsFigure({ ...common, cautions, measure: t.target, potential: t.potentials!.g, label: "g (target potential)", side: "target" });
      return side === "source" ? f() : side === "target" ? g() : mergePotentials(f(), g());
    }
    case "convergence": {
      const histories = settings.of.map((name, k) => {
        const t = transport(k);
        return {
          label: name,
          iterations: t.diagnostics.historyIterations,
          errors: t.diagnostics.history,
          ...(t.solveOptions.tolerance === undefined ? {} : { tolerance: t.solveOptions.tolerance }),
        };
      });
      const spec = convergenceFigure({ ...common, histories });
      if (options.logScale !== false) return spec;
      // A linear error axis: drop the decade domain and ticks the log view sets.
      return { ...spec, options: { ...spec.options, y: { label: "marginal error", grid: true } }, notes: spec.notes.map((n) => n.replace(" (no place on a log axis)", "")) };
    }
    case "sweep-curve": {
      const sweeps = settings.of.map((name, k) => {
        const value = inputs[name];
        if (!isSweepValue(value)) throw new CellSettingError(`of[${k}]`, `"${name}" is not a sweep`);
        return { name, value };
      });
      const output = options.output ?? sweeps[0].value.record[0];
      const rows: SweepRow[] = [];
      let balanced = 0;
      for (const { name, value } of sweeps) rows.push(...sweepRows(value, output, name, sweeps.length > 1, () => balanced++));
      const cautions = sweeps.filter(({ value }) => !value.complete).map(({ name, value }) => `${name}: ${value.rows.length} of ${value.planned} runs so far.`);
      if (balanced > 0) cautions.push(`${balanced} ${balanced === 1 ? "run" : "runs"} with a balanced ("balanced" = ∞) penalty cannot be placed on the axis.`);
      return sweepCurveFigure({
        ...common,
        rows,
        xLabel: sweeps[0].value.vary,
        yLabel: output,
        logX: options.logX ?? sweeps[0].value.logSpaced,
        logY: options.logY ?? false,
        cautions,
      });
    }
  }
}

function sweepRows(value: SweepCellValue, output: SweepOutput, name: string, named: boolean, onBalanced: () => void): SweepRow[] {
  if (!value.record.includes(output)) throw new CellSettingError("options.output", `sweep "${name}" does not record "${output}" (it records ${value.record.join(", ")})`);
  if (output === "status") throw new CellSettingError("options.output", '"status" is text, not a number to draw');
  return value.rows.map((row) => {
    if (row.value === "balanced") onBalanced();
    const y = row[output];
    return {
      x: typeof row.value === "number" ? row.value : Infinity,
      y: typeof y === "number" ? y : NaN,
      replicate: row.replicate,
      ...(named ? { series: name } : {}),
    };
  });
}

function statusCautions(t: TransportCellValue, name: string): string[] {
  const { status } = t.diagnostics;
  return status === "converged" ? [] : [`${name} is ${status.replace("-", " ")}: the plan drawn is its last iterate.`];
}
