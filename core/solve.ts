import { type CostSpec, checkCost, costExponent, costMatrix, costScale } from "./cost";
import { solveDebiased } from "./debiased";
import { TransportInputError, describeValue } from "./errors";
import { solveExact } from "./exact";
import type { Measure } from "./measure";
import type { SolveOptions, TransportMethod, TransportResult } from "./result";
import { solveEntropic, solveUnbalanced } from "./sinkhorn";

const METHODS: readonly TransportMethod[] = ["exact", "entropic", "unbalanced", "debiased"];

/**
 * Solves one transport problem between `source` and `target` under `cost` with
 * the formulation in `options.method`. The one entry point the CLI, the runtime
 * and the worker use. Caller mistakes throw TransportInputError; every numerical
 * outcome (converged, not converged, cancelled) comes back in the result.
 */
export function solveTransport(source: Measure, target: Measure, cost: CostSpec, options: SolveOptions): TransportResult {
  if (!options || !METHODS.includes(options.method)) {
    throw new TransportInputError("method", `unknown method ${describeValue(options?.method)}; known: ${METHODS.join(", ")}`, options?.method);
  }
  checkCost(cost);
  if (options.method !== "exact" && options.epsilon === undefined) {
    throw new TransportInputError("epsilon", `the ${options.method} method needs epsilon (absolute, or relative to the cost scale)`, undefined);
  }
  if (options.method === "debiased") return solveDebiased(source, target, cost, options);
  const C = costMatrix(source, target, cost);
  const scale = costScale(C);
  switch (options.method) {
    case "exact":
      return solveExact(source, target, C, costExponent(cost), options, scale);
    case "entropic":
      return solveEntropic(source, target, C, options, scale);
    case "unbalanced":
      return solveUnbalanced(source, target, C, options, scale);
  }
  throw new TransportInputError("method", `unknown method ${describeValue(options.method)}`, options.method);
}
