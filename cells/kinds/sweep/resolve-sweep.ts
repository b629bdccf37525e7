import { type CellInputs, resolveNumber, resolveOptionalNumber, resolveSeed } from "../resolve-number";
import { CellSettingError } from "../cell-error";
import { transportInput } from "../transport/transport-value";
import { DEFAULT_SWEEP_RECORD, type SweepSettings, expandSweepRange } from "./settings";
import { checkSweepApplies } from "./sweep-problem";
import type { SweepCellValue } from "./sweep-value";

/** Everything a sweep needs before its first run: a {@link SweepCellValue} without rows. */
export type SweepPlan = Omit<SweepCellValue, "rows" | "complete" | "columns" | "planned" | "notConverged">;

/**
 * Resolves a sweep's settings against its inputs: the transport's value, the
 * values (a range's ends resolved and expanded by `expandSweepRange`, whole
 * numbers for sample sizes and iteration caps), replicates, the seed ("study":
 * derived from the study seed and the cell id) and the outputs (default cost and
 * objective). Checks that the varied setting applies to the transport.
 */
export function resolveSweepPlan(settings: SweepSettings, inputs: CellInputs, studySeed: number, cellId: string): SweepPlan {
  const transport = transportInput(inputs[settings.transport], "transport", settings.transport);
  const { vary } = settings;
  const integer = vary.startsWith("sampleSize") || vary === "maxIterations";
  let values: (number | "balanced")[];
  let logSpaced = false;
  if (Array.isArray(settings.values)) values = [...settings.values];
  else {
    const range = settings.values as Exclude<SweepSettings["values"], readonly unknown[]>;
    const bounds = integer ? { atLeast: 1 } : { above: 0 };
    const from = resolveNumber(range.from, inputs, "values.from", bounds);
    const to = resolveNumber(range.to, inputs, "values.to", bounds);
    if (from === to) throw new CellSettingError("values.to", `must differ from "from" (${from}): a range of one value is a list of one`);
    const spacing = range.spacing ?? "linear";
    values = expandSweepRange(from, to, range.count, spacing, integer);
    logSpaced = spacing === "log";
  }
  checkSweepApplies(vary, values, transport, settings.transport);
  return {
    vary,
    values,
    replicates: resolveOptionalNumber(settings.replicates, 1, inputs, "replicates", { integer: true, atLeast: 1 }),
    seed: resolveSeed(settings.seed, inputs, studySeed, cellId),
    record: settings.record ?? DEFAULT_SWEEP_RECORD,
    logSpaced,
    transportName: settings.transport,
    transport,
  };
}
