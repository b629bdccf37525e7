import type { CostSpec, ScaleReference } from "../../../core/cost";
import { subsample } from "../../../core/generators";
import type { Measure } from "../../../core/measure";
import { seededRandom } from "../../../core/random";
import { deriveSeed } from "../../document/seed";
import type { PortableSolveOptions } from "../../runtime/solve-protocol";
import { CellSettingError } from "../cell-error";
import type { TransportCellValue } from "../transport/transport-value";
import type { SweepTarget } from "./settings";

/** One problem of a sweep: the transport's problem with one setting changed. */
export interface SweepProblem {
  readonly source: Measure;
  readonly target: Measure;
  readonly cost: CostSpec;
  readonly options: PortableSolveOptions;
}

/** True when the sweep draws subsamples (only sample-size sweeps do). */
export function drawsSamples(vary: SweepTarget): boolean {
  return vary.startsWith("sampleSize");
}

/**
 * Checks that varying `vary` changes the transport `base` (named `name`), and that
 * sample sizes fit its measures; throws a {@link CellSettingError} on "vary" or
 * "values" otherwise. Exact transports use neither epsilon, penalties, tolerance
 * nor an iteration cap; entropic ones no penalty; a user cost matrix has no
 * exponent and cannot be subsampled.
 */
export function checkSweepApplies(vary: SweepTarget, values: readonly (number | "balanced")[], base: TransportCellValue, name: string): void {
  const { method } = base;
  const refuse = (why: string) => {
    throw new CellSettingError("vary", `"${vary}" ${why} ("${name}")`);
  };
  if (method === "exact" && !drawsSamples(vary) && vary !== "costExponent") refuse("has no effect on an exact transport");
  if (method === "entropic" && vary.startsWith("massPenalty")) refuse("has no effect on a balanced entropic transport; make it unbalanced");
  if (base.costSpec.kind === "matrix" && (vary === "costExponent" || drawsSamples(vary))) refuse("does not apply to a user cost matrix");
  if (drawsSamples(vary)) {
    const sides = vary === "sampleSize.source" ? (["source"] as const) : vary === "sampleSize.target" ? (["target"] as const) : (["source", "target"] as const);
    for (const side of sides) {
      let available = 0;
      for (const w of base[side].mass) if (w > 0) available++;
      const largest = Math.max(...values.map((v) => (typeof v === "number" ? v : 0)));
      if (largest > available) {
        throw new CellSettingError("values", `sample size ${largest} is more than the ${available} points (with mass) of "${base.names[side]}"`);
      }
    }
  }
}

/**
 * The problem of one run: `base`'s problem with `vary` set to `value`.
 * - epsilon keeps its form (absolute, or relative with the same reference);
 * - penalties: "balanced" is Infinity; the side not varied keeps its penalty
 *   (Infinity when the transport had none);
 * - sample sizes: the source subsample is drawn with seed `replicateSeed`, the
 *   target subsample with FNV-1a-32("<replicateSeed>:target") (core `subsample`:
 *   without replacement, nested across sizes for one seed);
 * - costExponent makes the cost |x−y|^p.
 * No warm start: every run starts cold, so runs are reproducible one by one.
 */
export function sweepProblem(base: TransportCellValue, vary: SweepTarget, value: number | "balanced", replicateSeed: number): SweepProblem {
  let { source, target, costSpec: cost } = base;
  const options: { -readonly [K in keyof PortableSolveOptions]: PortableSolveOptions[K] } = { ...base.solveOptions };
  const v = value === "balanced" ? Infinity : value;
  switch (vary) {
    case "epsilon": {
      const e = options.epsilon as { absolute?: number; reference?: ScaleReference } | undefined;
      options.epsilon = e && e.absolute !== undefined ? { absolute: v } : { relative: v, reference: e?.reference ?? "max" };
      break;
    }
    case "massPenalty":
    case "massPenalty.source":
    case "massPenalty.target": {
      const current = options.massPenalty;
      const sides = current === undefined ? { source: Infinity, target: Infinity } : typeof current === "number" ? { source: current, target: current } : current;
      options.massPenalty =
        vary === "massPenalty" ? { source: v, target: v } : vary === "massPenalty.source" ? { source: v, target: sides.target } : { source: sides.source, target: v };
      break;
    }
    case "sampleSize":
    case "sampleSize.source":
    case "sampleSize.target":
      if (vary !== "sampleSize.target") source = subsample(source, v, seededRandom(replicateSeed));
      if (vary !== "sampleSize.source") target = subsample(target, v, seededRandom(deriveSeed(replicateSeed, "target")));
      break;
    case "tolerance":
      options.tolerance = v;
      break;
    case "maxIterations":
      options.maxIterations = v;
      break;
    case "costExponent":
      cost = { kind: "power", p: v };
      break;
  }
  return { source, target, cost, options };
}
