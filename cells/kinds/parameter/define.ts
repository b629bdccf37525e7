import type { CellOf } from "../../document/study-types";
import type { CellDefinition } from "../../runtime/cell-definition";
import type { DefineContext } from "../define-context";
import { type CellDescription, versionKey } from "../kind-runtime";

/**
 * A parameter cell's definition: no inputs; its value is the control's value, or
 * the run's override for this parameter's name (checked by the caller against the
 * control's bounds, see cells/study/parameter-overrides.ts).
 */
export function defineParameterCell(cell: CellOf<"parameter">, context: DefineContext): CellDefinition {
  const name = cell.name ?? null;
  const overridden = name !== null && context.overrides?.has(name) === true;
  const value = overridden ? context.overrides!.get(name!) : cell.settings.value;
  return {
    id: cell.id,
    name,
    inputs: [],
    version: versionKey(cell, overridden ? { override: value } : null),
    compute: () => value,
  };
}

/** Headline `eps = 0.05` (numbers in their shortest exact form, text quoted). */
export function describeParameter(cell: CellOf<"parameter">, value: unknown): CellDescription {
  const shown = typeof value === "string" ? JSON.stringify(value) : String(value);
  return { headline: `${cell.name ?? cell.id} = ${shown}${cell.settings.unit ? ` ${cell.settings.unit}` : ""}`, cautions: [] };
}
