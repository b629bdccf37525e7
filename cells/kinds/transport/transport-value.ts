import type { CostSpec } from "../../../core/cost";
import type { Measure } from "../../../core/measure";
import type { TransportResult } from "../../../core/result";
import type { PortableSolveOptions } from "../../runtime/solve-protocol";
import { CellSettingError } from "../cell-error";
import { shortDescription } from "../resolve-number";

/**
 * The value of a transport cell: the core's TransportResult (so `plan.values.cost`,
 * `plan.diagnostics.iterations`, `plan.potentials.f` read as in core/result.ts)
 * plus the problem it solved, for figures, sweeps and receipts:
 * - `source`, `target`: the two measures as solved (rescaled to mass 1 with `normalize`);
 * - `costSpec`: the ground cost (a user matrix included);
 * - `solveOptions`: the solver options with every reference resolved (no warm start);
 * - `names`: the cells that gave the source and target.
 */
export type TransportCellValue = TransportResult & {
  readonly source: Measure;
  readonly target: Measure;
  readonly costSpec: CostSpec;
  readonly solveOptions: PortableSolveOptions;
  readonly names: { readonly source: string; readonly target: string };
  /** True when the measures were rescaled to total mass 1 (the cell's `normalize`). */
  readonly normalized?: boolean;
};

/** True for a transport cell's value (see {@link TransportCellValue}). */
export function isTransportValue(value: unknown): value is TransportCellValue {
  if (typeof value !== "object" || value === null) return false;
  const v = value as Partial<TransportCellValue>;
  return typeof v.method === "string" && typeof v.values === "object" && typeof v.diagnostics === "object" && typeof v.solveOptions === "object" && typeof v.costSpec === "object";
}

/** The transport value a setting names, or a {@link CellSettingError} saying what the cell gave instead. */
export function transportInput(value: unknown, setting: string, name: string): TransportCellValue {
  if (isTransportValue(value)) return value;
  throw new CellSettingError(setting, `"${name}" gives ${shortDescription(value)}, not a transport result; name a transport cell`);
}
