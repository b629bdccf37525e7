import { assignment } from "../../core/assignment";
import { networkSimplex } from "../../core/network-simplex";
import type { BenchCase } from "./bench-cases";
import type { BenchProblem } from "./bench-problems";
import type { SideMeasurement } from "./bench-report";
import { runCoupletSinkhorn } from "./couplet-sinkhorn";
import { type RepeatPolicy, medianTime } from "./median-time";

/** Couplet's measurement of a case and what its compared value means. */
export interface CoupletOutcome {
  readonly measurement: SideMeasurement;
  readonly valueName: string;
  readonly notes: string[];
}

/**
 * Times Couplet's solver for one case on its problem. Only the solver call is timed:
 * the cost matrix is built beforehand, as it is for the reference.
 */
export function runCouplet(benchCase: BenchCase, problem: BenchProblem, policy: RepeatPolicy): CoupletOutcome {
  switch (benchCase.row) {
    case "assignment":
      return runAssignment(problem, policy);
    case "network-simplex":
      return runNetworkSimplex(problem, policy);
    default:
      return runCoupletSinkhorn(benchCase, problem, policy);
  }
}

function runAssignment(problem: BenchProblem, policy: RepeatPolicy): CoupletOutcome {
  const { timing, value: result } = medianTime(() => assignment(problem.C), policy);
  const { data, cols } = problem.C;
  // The value is recomputed from the permutation so that it cannot drift from the matching.
  let sum = 0;
  for (let i = 0; i < problem.C.rows; i++) sum += data[i * cols + result.permutation[i]];
  const notes: string[] = [];
  if (Math.abs(result.cost - sum) > 1e-9 * Math.abs(sum)) notes.push(`assignment() reports cost ${result.cost} but its permutation costs ${sum}`);
  return { measurement: { ...timing, value: sum, status: result.status }, valueName: "assignment cost Σ C[i, σ(i)]", notes };
}

function runNetworkSimplex(problem: BenchProblem, policy: RepeatPolicy): CoupletOutcome {
  const { timing, value: result } = medianTime(() => networkSimplex(problem.a, problem.b, problem.C), policy);
  return {
    measurement: { ...timing, value: result.cost, status: result.status, iterations: result.iterations },
    valueName: "transport cost ⟨C, P⟩",
    notes: [],
  };
}
