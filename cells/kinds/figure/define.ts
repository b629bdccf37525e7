import type { CellOf } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import { isFigureSpec } from "../../views/figures/figure-spec";
import { codeComputation } from "../code/code-computation";
import type { DefineContext } from "../define-context";
import { type CellDescription, versionKey } from "../kind-runtime";
import { codeFigureValue } from "./code-figure";
import { type ReadyFigureSettings, readyFigure } from "./ready-view";
import { figureDependencies } from "./settings";

/**
 * A figure cell's definition. A ready view depends on the cells it draws (`of`)
 * and its value is the view's FigureSpec (cells/views/figures). A code figure
 * depends on the names its code uses, runs like a code cell (held when code must
 * not run) and its value is the FigureSpec or Plot options the code returned
 * (see codeFigureValue). Rendering to SVG or DOM is the views' business.
 */
export function defineFigureCell(cell: CellOf<"figure">, context: DefineContext): CellDefinition {
  const { settings } = cell;
  if (settings.view === "code") {
    const { inputs, compute } = codeComputation(settings.code, context.runCode, "figure code");
    return {
      id: cell.id,
      name: cell.name ?? null,
      inputs,
      version: versionKey(cell, { runCode: context.runCode }),
      compute: async (values) => codeFigureValue(await compute(values)),
    };
  }
  return {
    id: cell.id,
    name: cell.name ?? null,
    inputs: figureDependencies(settings),
    version: versionKey(cell),
    compute: (values) => readyFigure(settings as ReadyFigureSettings, values),
  };
}

/** Headline: the figure's title or view name; cautions: the figure's own (e.g. not converged). */
export function describeFigure(cell: CellOf<"figure">, value: unknown): CellDescription {
  if (isFigureSpec(value)) {
    const spec = value as { title?: string; figure: string; cautions: readonly string[] };
    return { headline: spec.title ?? spec.figure, cautions: spec.cautions };
  }
  return { headline: cell.settings.view === "code" ? "figure drawn by code" : undefined, cautions: [] };
}
