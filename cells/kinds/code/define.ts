import type { CellOf } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import type { DefineContext } from "../define-context";
import { type CellDescription, versionKey } from "../kind-runtime";
import { valueText } from "../value-text";
import { codeComputation } from "./code-computation";

/**
 * A code cell's definition: its JavaScript runs as the body of an async function
 * (cells/runtime/compile-code-cell.ts) with the names it uses in scope — other
 * cells' values, `core` (cells/study/core-api.ts), `Plot` and the standard
 * built-ins. Its value is what the code returns. Held (not run) when the context
 * says code must not run.
 */
export function defineCodeCell(cell: CellOf<"code">, context: DefineContext): CellDefinition {
  const { inputs, compute } = codeComputation(cell.settings.code, context.runCode);
  return { id: cell.id, name: cell.name ?? null, inputs, version: versionKey(cell, { runCode: context.runCode }), compute };
}

/** Headline: the value in one line (see valueText); no cautions. */
export function describeCode(_cell: CellOf<"code">, value: unknown): CellDescription {
  return { headline: valueText(value), cautions: [] };
}
