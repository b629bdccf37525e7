import { TransportInputError, describeValue } from "./errors";

/** Epsilon scaling settings: start at `startEpsilon` (cost units) and multiply by `factor` per stage. */
export type ScheduleOption = boolean | { readonly factor?: number; readonly startEpsilon?: number };

/** Marginal error at which intermediate stages of an epsilon schedule move on. */
export const SCHEDULE_STAGE_TOLERANCE = 1e-3;

/**
 * The epsilons of an epsilon schedule ("epsilon scaling", Kosowsky & Yuille 1994;
 * Schmitzer 2019, SIAM J. Sci. Comput. 41), largest first, ending exactly at
 * `epsilon`: startEpsilon·factor^k while above epsilon, then epsilon. Without a
 * schedule, or when the start is not above epsilon, just [epsilon]. Defaults:
 * factor 0.5 (must be in (0, 1)), startEpsilon = `maxCost`.
 */
export function epsilonStages(epsilon: number, schedule: ScheduleOption | undefined, maxCost: number): number[] {
  if (schedule === undefined || schedule === false) return [epsilon];
  if (schedule !== true && (schedule === null || typeof schedule !== "object")) {
    throw new TransportInputError("schedule", `must be true, false or {factor, startEpsilon}, got ${describeValue(schedule)}`, schedule);
  }
  const { factor = 0.5, startEpsilon } = schedule === true ? {} : schedule;
  if (typeof factor !== "number" || !(factor > 0 && factor < 1)) throw new TransportInputError("schedule.factor", `must be in (0, 1), got ${describeValue(factor)}`, factor);
  if (startEpsilon !== undefined && (typeof startEpsilon !== "number" || !Number.isFinite(startEpsilon) || !(startEpsilon > 0))) {
    throw new TransportInputError("schedule.startEpsilon", `must be > 0 and finite, got ${describeValue(startEpsilon)}`, startEpsilon);
  }
  const start = startEpsilon ?? maxCost;
  const stages: number[] = [];
  for (let e = start; e > epsilon * (1 + 1e-12); e *= factor) stages.push(e);
  stages.push(epsilon);
  return stages;
}
