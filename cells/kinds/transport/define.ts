import { normalizeMeasure, supportSize } from "../../../core/measure";
import type { CellOf } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import { formatNumber } from "../../views/figures/format-number";
import type { DefineContext } from "../define-context";
import { type CellDescription, versionKey } from "../kind-runtime";
import { measureInput } from "../measure-input";
import { resolveCost, resolveSolveOptions } from "./resolve-transport";
import { transportDependencies } from "./settings";
import { type TransportCellValue, isTransportValue } from "./transport-value";

/** Fewer points than this on either side of an exact or debiased comparison earns a "small sample" caution. */
export const SMALL_SAMPLE = 50;

/**
 * A transport cell's definition: inputs are its source and target, a cost matrix
 * cell and every referenced number; its value is a {@link TransportCellValue}.
 * With `normalize`, both measures are rescaled to total mass 1 before solving
 * (the value holds the rescaled measures: the problem as solved).
 * Solving goes through `context.solve` (off-thread for large problems when the
 * run allows it) with the computation's signal and progress. With `warmStart`,
 * the cell starts from its own previous potentials (kept in `context.memory`,
 * never a module global) when the sizes still match; a warm start is not an input.
 */
export function defineTransportCell(cell: CellOf<"transport">, context: DefineContext): CellDefinition {
  const { settings } = cell;
  return {
    id: cell.id,
    name: cell.name ?? null,
    inputs: transportDependencies(settings),
    version: versionKey(cell),
    compute: async (inputs, ctx): Promise<TransportCellValue> => {
      const given = [measureInput(inputs[settings.source], "source", settings.source), measureInput(inputs[settings.target], "target", settings.target)];
      // normalize: both measures rescaled to total mass 1 (docs/format.md, "transport").
      const [source, target] = settings.normalize === true ? given.map((m) => normalizeMeasure(m)) : given;
      const solveOptions = resolveSolveOptions(settings, inputs);
      const costSpec = resolveCost(settings.cost, inputs);
      const previous = context.memory.potentials.get(cell.id);
      const warm =
        settings.warmStart === true && solveOptions.method !== "exact" && previous && previous.f.length === supportSize(source) && previous.g.length === supportSize(target)
          ? previous
          : undefined;
      const result = await context.solve(
        { source, target, cost: costSpec, options: warm ? { ...solveOptions, warmStart: warm } : solveOptions },
        { signal: ctx.signal, onProgress: (progress) => ctx.progress(progress) },
      );
      if (result.potentials && result.diagnostics.status !== "cancelled") context.memory.potentials.set(cell.id, result.potentials);
      return {
        ...result,
        source,
        target,
        costSpec,
        solveOptions,
        names: { source: settings.source, target: settings.target },
        ...(settings.normalize === true ? { normalized: true } : {}),
      };
    },
  };
}

const MAIN_VALUE = {
  exact: { label: "cost", of: (v: TransportCellValue) => v.values.cost },
  entropic: { label: "OT_ε", of: (v: TransportCellValue) => v.values.objective },
  unbalanced: { label: "UOT_ε", of: (v: TransportCellValue) => v.values.objective },
  debiased: { label: "S_ε", of: (v: TransportCellValue) => v.values.divergence ?? NaN },
} as const;

/**
 * Headline: the method's main value — the divergence S_ε (debiased), the cost
 * (exact), the objective OT_ε / UOT_ε (entropic / unbalanced) — then method,
 * epsilon, transported mass (unbalanced), status and iterations:
 * "S_ε = 0.0123 (debiased, ε = 0.0412, converged, 212 it)".
 *
 * Cautions: the solver's warnings (except debiased's note that OT_ε is not a
 * distance: its headline is already S_ε); for entropic and unbalanced results,
 * that the value is regularised; and "small sample" when an exact or debiased
 * comparison has a point cloud of fewer than {@link SMALL_SAMPLE} points (a rule
 * of thumb, common practice, no source: plug-in estimates between distributions
 * converge slowly in n, Fournier & Guillin 2015).
 */
export function describeTransport(_cell: CellOf<"transport">, value: unknown): CellDescription {
  if (!isTransportValue(value)) return { cautions: [] };
  const { method, diagnostics } = value;
  const main = MAIN_VALUE[method];
  const parts: string[] = [method];
  if (method === "exact") parts.push(value.algorithm);
  if (value.epsilon) parts.push(`ε = ${formatNumber(value.epsilon.absolute, 3)}`);
  if (method === "unbalanced") parts.push(`mass ${formatNumber(value.values.mass, 4)}`);
  parts.push(diagnostics.status.replace("-", " "), `${diagnostics.iterations} it`);
  const headline = `${main.label} = ${formatNumber(main.of(value), 4)} (${parts.join(", ")})`;

  const cautions: string[] = [];
  for (const w of diagnostics.warnings) if (!(method === "debiased" && w.code === "regularised-value")) cautions.push(w.message);
  if (method === "entropic" || method === "unbalanced") {
    cautions.push("Regularised value: OT_ε is not a distance (OT_ε(a, a) > 0); compare measures with the debiased method.");
  }
  if (method === "exact" || method === "debiased") {
    const sizes = [value.source, value.target].filter((m) => m.kind === "points").map((m) => supportSize(m));
    const smallest = Math.min(...sizes);
    if (smallest < SMALL_SAMPLE) {
      cautions.push(`Small sample: ${smallest} points on one side. If the points are a sample of a larger population, a value from fewer than ${SMALL_SAMPLE} points carries a large sampling error (check with a sample-size sweep); if they are the whole population, this does not apply.`);
    }
  }
  return { headline, cautions };
}
