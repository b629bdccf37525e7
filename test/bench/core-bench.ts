// Benchmark harness for the transport core: `npm run bench -- [--quick] [--json [FILE]] [--only ROWS]`.
// Times Couplet's solvers on seeded problems and, when python3 has numpy and scipy, the
// same problems (handed over as .npy files) through test/bench/reference.py. Prints one
// table per row with the ratio Couplet ÷ reference and the target, met or missed.
// Not a test: nothing here asserts; a value mismatch only makes the exit code 1.
// What each row measures: docs/benchmarks.md.
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import { join } from "node:path";
import { CORE_VERSION } from "../../core/version";
import { type BenchCase, LP_TIME_LIMIT_SECONDS, benchCases, repeatPolicy } from "./bench-cases";
import { BenchUsageError, USAGE, parseBenchOptions } from "./bench-options";
import { type BenchProblem, cloudProblem } from "./bench-problems";
import { type CaseResult, type SideFailure, type SideMeasurement, formatSummary, formatTables, judgeCase } from "./bench-report";
import { runCouplet } from "./couplet-side";
import { describeMachine } from "./machine-description";
import { writeNpy } from "./npy-file";
import { type PythonReference, type ReferenceCase, type ReferenceOutcome, detectReference, runReference } from "./python-reference";
import type { RepeatPolicy } from "./median-time";

function main(): number {
  let options;
  try {
    options = parseBenchOptions(process.argv.slice(2));
  } catch (error) {
    if (!(error instanceof BenchUsageError)) throw error;
    process.stderr.write(`bench: ${error.message}\n${USAGE}\n`);
    return 2;
  }
  if (options.help) {
    process.stdout.write(`${USAGE}\n`);
    return 0;
  }
  // With --json to stdout the readable output goes to stderr, so stdout stays parseable.
  const print = (text: string) => (options.json === "-" ? process.stderr : process.stdout).write(`${text}\n`);
  const progress = (text: string) => process.stderr.write(`${text}\n`);

  const started = new Date();
  const machine = describeMachine();
  const detected = options.noReference ? { unavailable: "skipped (--no-reference)" } : detectReference();
  const reference = "unavailable" in detected ? undefined : detected;
  if (!reference) progress(`bench: reference not run: ${(detected as { unavailable: string }).unavailable}`);
  const policy = repeatPolicy(options.quick);
  const cases = benchCases(options.quick).filter((c) => options.only === undefined || options.only.includes(c.row));

  const folder = mkdtempSync(join(os.tmpdir(), "couplet-bench-"));
  const cleanUp = () => rmSync(folder, { recursive: true, force: true });
  process.once("SIGINT", () => {
    cleanUp();
    process.exit(130);
  });
  const results: CaseResult[] = [];
  try {
    for (const [index, benchCase] of cases.entries()) {
      progress(`bench: [${index + 1}/${cases.length}] ${benchCase.row} ${benchCase.label} (load ${os.loadavg()[0].toFixed(2)})`);
      const loadAverage = Math.round(os.loadavg()[0] * 100) / 100;
      const result = runCase(benchCase, policy, reference, folder);
      result.loadAverage = loadAverage;
      for (const note of result.notes) if (note.startsWith("VALUE MISMATCH")) progress(`\n!!!!! ${benchCase.id}: ${note} !!!!!\n`);
      results.push(result);
    }
  } finally {
    cleanUp();
  }

  const loadAtEnd = os.loadavg().map((x) => Math.round(x * 100) / 100);
  print(`Couplet core benchmarks — ${started.toISOString()}${options.quick ? " (--quick: tiny sizes, smoke check only)" : ""}`);
  print(`  machine: ${machine.cpuModel}, ${machine.cores} cores, ${machine.memoryGiB} GiB, ${machine.platform}`);
  print(`  node ${machine.node} (V8 ${machine.v8}), Couplet core ${CORE_VERSION}; load average at start ${machine.loadAtStart.join(" ")}, at end ${loadAtEnd.join(" ")}`);
  print(`  reference: ${describeReference(reference, detected)}`);
  print(formatTables(results));
  print(formatSummary(results));

  if (options.json !== undefined) {
    const report = {
      generatedAt: started.toISOString(),
      quick: options.quick,
      machine: { ...machine, loadAtEnd },
      coreVersion: CORE_VERSION,
      reference: reference
        ? { available: true, environment: reference.environment, unsetVariables: reference.unset }
        : { available: false, reason: (detected as { unavailable: string }).unavailable },
      rows: results.map(toJson),
    };
    const text = JSON.stringify(report, null, 2);
    if (options.json === "-") process.stdout.write(`${text}\n`);
    else writeFileSync(options.json, `${text}\n`);
  }
  return results.some((r) => r.valueCheck !== undefined && !r.valueCheck.ok) ? 1 : 0;
}

/** Generates the case's problem, times Couplet, then the reference on the same arrays. */
function runCase(benchCase: BenchCase, policy: RepeatPolicy, reference: PythonReference | undefined, folder: string): CaseResult {
  const problem = cloudProblem(benchCase.n, benchCase.m, benchCase.masses, benchCase.seed);
  let couplet: SideMeasurement | SideFailure;
  let valueName = "value";
  const notes: string[] = [];
  try {
    const outcome = runCouplet(benchCase, problem, policy);
    couplet = outcome.measurement;
    valueName = outcome.valueName;
    notes.push(...outcome.notes);
  } catch (error) {
    couplet = { error: error instanceof Error ? error.message : String(error) };
  }
  let measured: SideMeasurement | SideFailure = { error: "reference not run (see the header)" };
  if (reference) {
    const referenceCase = toReferenceCase(benchCase, problem, policy, folder);
    const [outcome] = runReference(reference, folder, [referenceCase], 4 * 3600);
    measured = fromReference(benchCase, outcome, notes);
  }
  return judgeCase(benchCase, couplet, measured, valueName, notes);
}

/** Writes the problem's arrays once per data set and describes the case for reference.py. */
function toReferenceCase(benchCase: BenchCase, problem: BenchProblem, policy: RepeatPolicy, folder: string): ReferenceCase {
  const files = { C: `${problem.key}-C.npy`, a: `${problem.key}-a.npy`, b: `${problem.key}-b.npy` };
  if (!existsSync(join(folder, files.C))) {
    writeNpy(join(folder, files.C), problem.C.data, [problem.C.rows, problem.C.cols]);
    writeNpy(join(folder, files.a), problem.a, [problem.a.length]);
    writeNpy(join(folder, files.b), problem.b, [problem.b.length]);
  }
  const base = { id: benchCase.id, files, ...policy };
  const epsilon = benchCase.epsilonRelative === undefined ? undefined : benchCase.epsilonRelative * problem.maxCost;
  switch (benchCase.row) {
    case "assignment":
      return { ...base, kind: "assignment" };
    case "network-simplex":
      return { ...base, kind: "transport-lp", timeLimitSeconds: LP_TIME_LIMIT_SECONDS };
    case "sinkhorn-kernel":
    case "sinkhorn-log":
      return { ...base, kind: "sinkhorn-iterations", domain: benchCase.row === "sinkhorn-kernel" ? "kernel" : "log", epsilon, iterations: benchCase.iterations };
    case "sinkhorn-tolerance":
      return { ...base, kind: "sinkhorn-tolerance", epsilon, tolerance: benchCase.tolerance, maxIterations: benchCase.maxIterations };
  }
}

/** Converts reference.py's seconds to ms and flags an LP that HiGHS did not finish. */
function fromReference(benchCase: BenchCase, outcome: ReferenceOutcome | undefined, notes: string[]): SideMeasurement | SideFailure {
  if (!outcome) return { error: "reference.py returned nothing for this case" };
  if (outcome.error !== undefined || outcome.seconds === undefined) return { error: outcome.error ?? "no time reported" };
  if (benchCase.row === "network-simplex" && outcome.status !== 0) {
    notes.push(`HiGHS did not finish (status ${outcome.status}: ${outcome.message}); its time is a lower bound`);
  }
  if (benchCase.row === "sinkhorn-tolerance" && outcome.marginalError !== undefined && !(outcome.marginalError <= (benchCase.tolerance ?? 0))) {
    notes.push(`reference stopped at marginal error ${outcome.marginalError.toExponential(2)} after ${outcome.iterations} iterations (cap)`);
  }
  return {
    ms: outcome.seconds * 1000,
    samples: (outcome.samples ?? []).map((s) => s * 1000),
    cpuMs: outcome.cpuSeconds === undefined ? undefined : outcome.cpuSeconds * 1000,
    singleRun: outcome.singleRun ?? false,
    value: outcome.value !== undefined && Number.isFinite(outcome.value) ? outcome.value : undefined,
    iterations: outcome.iterations,
    marginalError: outcome.marginalError,
    status: outcome.status === undefined ? undefined : String(outcome.status),
    totalMs: outcome.totalSeconds === undefined ? undefined : outcome.totalSeconds * 1000,
  };
}

function describeReference(reference: PythonReference | undefined, detected: PythonReference | { unavailable: string }): string {
  if (!reference) return `not run — ${(detected as { unavailable: string }).unavailable}`;
  const env = reference.environment;
  const blas = Array.isArray(env.blas) ? env.blas.map((b) => `${b.api} ${b.version ?? ""} kernel ${b.kernel ?? "?"}, ${b.threads} thread(s)`).join("; ") : (env.blas ?? "unknown");
  const unset = reference.unset.length > 0 ? `; unset for the child: ${reference.unset.join(", ")}` : "";
  return `python ${env.python}, numpy ${env.numpy}, scipy ${env.scipy}; BLAS: ${blas}; OMP/OPENBLAS/MKL_NUM_THREADS=1${unset}`;
}

function toJson(r: CaseResult) {
  return {
    id: r.case.id,
    row: r.case.row,
    label: r.case.label,
    n: r.case.n,
    m: r.case.m,
    epsilonRelative: r.case.epsilonRelative,
    iterations: r.case.iterations,
    schedule: r.case.schedule,
    unit: r.case.row === "sinkhorn-kernel" || r.case.row === "sinkhorn-log" ? "ms/iteration" : "ms",
    couplet: r.couplet,
    reference: r.reference,
    ratio: r.ratio,
    cpuRatio: r.cpuRatio,
    target: r.case.target,
    verdict: r.verdict,
    valueName: r.valueName,
    valueCheck: r.valueCheck,
    notes: r.notes,
    loadAverage: r.loadAverage,
  };
}

process.exitCode = main();
