/** Timings of one benchmark case, in milliseconds. */
export interface Timing {
  /** Median wall-clock time of `samples` (ms), from performance.now(). */
  readonly ms: number;
  /** Each timed run (ms), warm-up excluded unless `singleRun`. */
  readonly samples: readonly number[];
  /**
   * Median CPU time of the same runs (ms; user + system of the whole process, from
   * process.cpuUsage()). Unlike wall time it leaves out the time spent waiting for a
   * core, so it stays near the quiet-machine value when other processes compete.
   */
  readonly cpuMs: number;
  /** True when one run took so long that it was the only one, warm-up included. */
  readonly singleRun: boolean;
}

/** How many times to run a case. */
export interface RepeatPolicy {
  /** Upper bound on timed runs after the warm-up (at least 3 are made). */
  readonly repetitions: number;
  /** Fewer runs (never below 3) when repetitions × (first run's time) would pass this, in seconds. */
  readonly budgetSeconds: number;
  /** A first run longer than this (seconds) is kept as the only sample. */
  readonly longSeconds: number;
}

/** Warm-up time and run cap; reference.py uses the same numbers. */
export const WARM_UP_MS = 250;
export const WARM_UP_RUNS = 20;

/** Wall and CPU milliseconds of one call. */
function clock<T>(run: () => T): { wall: number; cpu: number; value: T } {
  const cpu0 = process.cpuUsage();
  const wall0 = performance.now();
  const value = run();
  const wall = performance.now() - wall0;
  const used = process.cpuUsage(cpu0);
  return { wall, cpu: (used.user + used.system) / 1000, value };
}

/**
 * Warm-up: at least one run, and more while less than {@link WARM_UP_MS} in all has
 * passed (at most {@link WARM_UP_RUNS} runs), so that V8 has optimised the hot loops
 * even when one run is short. Returns the first run's clock and the last value.
 */
export function warmUp<T>(run: () => T): { first: { wall: number; cpu: number }; value: T } {
  const begin = performance.now();
  const first = clock(run);
  let value = first.value;
  for (let runs = 1; runs < WARM_UP_RUNS && performance.now() - begin < WARM_UP_MS; runs++) value = run();
  return { first, value };
}

/**
 * Median of several runs of `run` after the warm-up. The same rule as reference.py's
 * `timed`, so both sides are measured alike. Returns the timing and the value of the
 * last run.
 */
export function medianTime<T>(run: () => T, policy: RepeatPolicy): { timing: Timing; value: T } {
  const { first, value: warmValue } = warmUp(run);
  let value = warmValue;
  if (first.wall > policy.longSeconds * 1000) return { timing: { ms: first.wall, samples: [first.wall], cpuMs: first.cpu, singleRun: true }, value };
  const count = Math.max(3, Math.min(policy.repetitions, Math.floor((policy.budgetSeconds * 1000) / Math.max(first.wall, 1e-6))));
  const samples: number[] = [];
  const cpu: number[] = [];
  for (let k = 0; k < count; k++) {
    const c = clock(run);
    value = c.value;
    samples.push(c.wall);
    cpu.push(c.cpu);
  }
  return { timing: { ms: median(samples), samples, cpuMs: median(cpu), singleRun: false }, value };
}

/**
 * Time per iteration of an iterative solver, cancelling its one-off setup: runs
 * `run(k)` and `run(2k)` in pairs (after warming up on `run(k)`) and takes the
 * median of (t(2k) − t(k)) / k, for wall and CPU time alike. Also returns the median
 * wall time of the k-iteration run, setup included. Under heavy load a wall-time
 * difference can come out ≤ 0; the caller flags that.
 */
export function medianIterationTime<T>(run: (iterations: number) => T, iterations: number, repetitions: number): { timing: Timing; totalMs: number; value: T } {
  let value = warmUp(() => run(iterations)).value;
  const differences: number[] = [];
  const cpuDifferences: number[] = [];
  const totals: number[] = [];
  for (let r = 0; r < Math.max(3, repetitions); r++) {
    const short = clock(() => run(iterations));
    value = short.value;
    const long = clock(() => run(2 * iterations));
    differences.push((long.wall - short.wall) / iterations);
    cpuDifferences.push((long.cpu - short.cpu) / iterations);
    totals.push(short.wall);
  }
  return { timing: { ms: median(differences), samples: differences, cpuMs: median(cpuDifferences), singleRun: false }, totalMs: median(totals), value };
}

/** Median of a non-empty list (mean of the middle two for even length). */
export function median(values: readonly number[]): number {
  const sorted = [...values].sort((x, y) => x - y);
  const h = sorted.length;
  return h % 2 ? sorted[(h - 1) / 2] : 0.5 * (sorted[h / 2 - 1] + sorted[h / 2]);
}
