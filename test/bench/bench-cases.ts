import type { RowName } from "./bench-options";
import type { MassKind } from "./bench-problems";
import type { RepeatPolicy } from "./median-time";

/** A speed goal from the performance issue: Couplet time ÷ reference time must not exceed `maxRatio`. */
export interface Target {
  readonly maxRatio: number;
  /** E.g. "≤ 0.5 × scipy". */
  readonly text: string;
}

/** One measured line of a row: a problem size and setting, run by Couplet and by the reference. */
export interface BenchCase {
  /** Stable id for JSON consumers, e.g. "assignment-n2000", "sinkhorn-log-n4000-eps0.005". */
  readonly id: string;
  readonly row: RowName;
  /** Short label for the table, e.g. "n = 2000" or "n = 4000, ε = 0.005·max C". */
  readonly label: string;
  readonly n: number;
  readonly m: number;
  readonly masses: MassKind;
  /** Seed of the data; cases with the same seed, sizes and masses share the same problem. */
  readonly seed: number;
  /** Epsilon as a fraction of the largest cost (Sinkhorn rows). */
  readonly epsilonRelative?: number;
  /** Sinkhorn per-iteration rows: iterations k of the short run (the long run does 2k). */
  readonly iterations?: number;
  /** Time-to-tolerance row: target marginal error, iteration cap and whether the epsilon schedule is on. */
  readonly tolerance?: number;
  readonly maxIterations?: number;
  readonly schedule?: boolean;
  readonly target?: Target;
}

/** What a row measures and against which reference, for the table headers and the docs. */
export interface RowDescription {
  readonly title: string;
  /** Unit of the time columns. */
  readonly unit: "ms" | "ms/iteration";
  readonly reference: string;
}

export const ROWS: Record<RowName, RowDescription> = {
  assignment: {
    title: "Assignment: n uniform points vs n uniform points in [0,1]², squared Euclidean cost",
    unit: "ms",
    reference: "scipy.optimize.linear_sum_assignment",
  },
  "network-simplex": {
    title: "Network simplex: n = m points in [0,1]², random masses, squared Euclidean cost",
    unit: "ms",
    reference: 'scipy.optimize.linprog(method="highs"), sparse transportation LP',
  },
  "sinkhorn-kernel": {
    title: "Sinkhorn, kernel domain, time per iteration (n = m points in [0,1]², uniform masses)",
    unit: "ms/iteration",
    reference: "numpy u = a/(K@v), v = b/(K.T@u), single-threaded BLAS",
  },
  "sinkhorn-log": {
    title: "Sinkhorn, log domain, time per iteration (n = m points in [0,1]², uniform masses)",
    unit: "ms/iteration",
    reference: "numpy + scipy.special.logsumexp",
  },
  "sinkhorn-tolerance": {
    title: "Sinkhorn, time to marginal error 1e-6 at ε = 0.005·max C, domain \"auto\" (n = m points in [0,1]², uniform masses)",
    unit: "ms",
    reference: "numpy kernel Sinkhorn, no schedule, error checked every iteration",
  },
};

/** Run sizes: the full run (the rows) or --quick (tiny, a smoke check). */
export function benchCases(quick: boolean): BenchCase[] {
  const cases: BenchCase[] = [];
  const assignmentSizes = quick ? [100, 200] : [1000, 2000, 4000];
  for (const n of assignmentSizes) {
    cases.push({
      id: `assignment-n${n}`,
      row: "assignment",
      label: `n = ${n}`,
      n,
      m: n,
      masses: "uniform",
      seed: 11,
      target: n === 2000 ? { maxRatio: 0.5, text: "≤ 0.5 × scipy" } : undefined,
    });
  }
  const simplexSizes = quick ? [50, 100] : [400, 800, 2000];
  for (const n of simplexSizes) {
    cases.push({
      id: `network-simplex-n${n}`,
      row: "network-simplex",
      label: `n = m = ${n}`,
      n,
      m: n,
      masses: "random",
      seed: 22,
      target: n === 800 ? { maxRatio: 0.05, text: "≤ 0.05 × HiGHS" } : undefined,
    });
  }
  const sinkhornSizes = quick ? [200] : [1000, 4000];
  for (const domain of ["kernel", "log"] as const) {
    for (const n of sinkhornSizes) {
      for (const epsilonRelative of [0.05, 0.005]) {
        // Enough iterations that the k-iteration run takes well over its one-off setup
        // (kernel build, final evaluation) on either side, so the difference is not noise.
        const iterations = domain === "kernel" ? (quick ? 1000 : n <= 1000 ? 200 : 50) : quick ? 20 : n <= 1000 ? 10 : 3;
        cases.push({
          id: `sinkhorn-${domain}-n${n}-eps${epsilonRelative}`,
          row: `sinkhorn-${domain}`,
          label: `n = ${n}, ε = ${epsilonRelative}·max C`,
          n,
          m: n,
          masses: "uniform",
          seed: 33,
          epsilonRelative,
          iterations,
          target: domain === "kernel" ? { maxRatio: 2.5, text: "≤ 2.5 × numpy" } : { maxRatio: 0.3, text: "≤ 0.3 × numpy" },
        });
      }
    }
  }
  const toleranceSize = quick ? 200 : 1000;
  for (const schedule of [false, true]) {
    cases.push({
      id: `sinkhorn-tolerance-n${toleranceSize}-${schedule ? "schedule" : "plain"}`,
      row: "sinkhorn-tolerance",
      label: `n = ${toleranceSize}, ${schedule ? "with ε schedule" : "no schedule"}`,
      n: toleranceSize,
      m: toleranceSize,
      masses: "uniform",
      seed: 33,
      epsilonRelative: 0.005,
      tolerance: 1e-6,
      maxIterations: 100_000,
      schedule,
    });
  }
  return cases;
}

/** Repetition rule for both sides (see medianTime). */
export function repeatPolicy(quick: boolean): RepeatPolicy {
  return quick ? { repetitions: 3, budgetSeconds: 5, longSeconds: 20 } : { repetitions: 5, budgetSeconds: 30, longSeconds: 60 };
}

/** HiGHS time limit per solve (seconds); a longer solve is reported as not finished. */
export const LP_TIME_LIMIT_SECONDS = 1200;
