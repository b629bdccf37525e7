// Study benchmark: `npm run bench:studies -- [--quick] [--json [FILE]]`.
// Opens and evaluates the generated 50-cell study of bench-study-document.ts headless:
// parse, compile, evaluate with runStudy, the overhead over the same solves called
// directly through core's solveTransport, re-evaluation after one parameter changes
// (the cells StudyEngine.computeCounts says ran again must be exactly the parameter
// and its dependents by the study's references), and the HTML report of the run.
// Not a test: nothing asserts; a recompute MISMATCH makes the exit code 1.
// What each row measures: docs/benchmarks.md, "## Studies".
import os from "node:os";
import { gzipSync } from "node:zlib";
import { solveTransport } from "../../core/solve";
import { CORE_VERSION } from "../../core/version";
import { type Cell, type StudyDocument, cellDependencies, parseStudy, serializeStudy, updateStudy } from "../../cells/document";
import { type TransportSolver, createStudyMemory, solveInThread } from "../../cells/kinds/define-context";
import { freeNames } from "../../cells/runtime/free-names";
import type { SolveRequest } from "../../cells/runtime/solve-protocol";
import { StudyEngine } from "../../cells/runtime/study-engine";
import { compileStudy, studyGlobals } from "../../cells/study/compile-study";
import { figureFrom, studyReportModel } from "../../cells/study/report-model";
import { type StudyRun, runStudy } from "../../cells/study/run-study";
import { renderReport } from "../../cells/views/report/render-report";
import { sanitizeHtml } from "../../cells/views/report/sanitize-html";
import { BENCH_PARAMETER_CHANGES, BENCH_STUDY_KINDS, benchStudy } from "./bench-study-document";
import { type BenchRow, type JudgedRow, RowBenchUsageError, formatRows, judgeRow, middle, parseRowBenchOptions, rowBenchUsage, sampleList, writeRowsJson } from "./bench-rows";
import { describeMachine } from "./machine-description";

const SECTION = "Studies (generated 50-cell study)";

/** A solve the engine asked for, and how long it took inside the engine (ms). */
interface RecordedSolve {
  readonly request: SolveRequest;
  readonly ms: number;
}

/** An in-thread solver that keeps every request and times it. */
function recordingSolver(): { solve: TransportSolver; solves: RecordedSolve[] } {
  const solves: RecordedSolve[] = [];
  return {
    solves,
    // solveInThread's body, timed synchronously: timing across an await would also
    // count other cells' work queued in between.
    solve: async (request, control) => {
      control.signal?.throwIfAborted();
      const { source, target, cost, options } = request;
      const started = performance.now();
      const result = solveTransport(source, target, cost, { ...options, signal: control.signal, onProgress: control.onProgress });
      solves.push({ request, ms: performance.now() - started });
      return result;
    },
  };
}

/** The same problems through core's solveTransport, nothing else: the reference of the evaluation rows (ms). */
function bareSolveTime(solves: readonly RecordedSolve[]): number {
  const started = performance.now();
  for (const { request } of solves) solveTransport(request.source, request.target, request.cost, request.options);
  return performance.now() - started;
}

const load = () => Math.round(os.loadavg()[0] * 100) / 100;

async function time<T>(run: () => Promise<T> | T): Promise<{ ms: number; value: T }> {
  const started = performance.now();
  const value = await run();
  return { ms: performance.now() - started, value };
}

/**
 * The ids of the cells that must compute again when the cell `changedId` changes:
 * itself and everything that depends on it, transitively, through the study's
 * references — typed settings (cellDependencies) and, for code cells and code
 * figures, the free names of their code that name cells.
 */
export function dependentsByReferences(study: StudyDocument, changedId: string): Set<string> {
  const names = new Set(study.cells.map((c) => c.name).filter((n): n is string => n !== undefined));
  const uses = new Map<string, string[]>();
  for (const cell of study.cells) {
    const code = codeOf(cell);
    const fromCode = code === undefined ? [] : freeNames(code).names.filter((n) => names.has(n));
    uses.set(cell.id, [...new Set([...cellDependencies(cell), ...fromCode])]);
  }
  const reached = new Set([changedId]);
  const reachedNames = new Set<string>();
  const start = study.cells.find((c) => c.id === changedId)?.name;
  if (start !== undefined) reachedNames.add(start);
  for (let grew = true; grew; ) {
    grew = false;
    for (const cell of study.cells) {
      if (reached.has(cell.id) || !uses.get(cell.id)!.some((n) => reachedNames.has(n))) continue;
      reached.add(cell.id);
      if (cell.name !== undefined) reachedNames.add(cell.name);
      grew = true;
    }
  }
  return reached;
}

function codeOf(cell: Cell): string | undefined {
  const settings = cell.settings as { code?: unknown; view?: unknown };
  if (cell.kind === "code" || (cell.kind === "figure" && settings.view === "code")) return typeof settings.code === "string" ? settings.code : undefined;
  return undefined;
}

async function main(): Promise<number> {
  let options;
  try {
    options = parseRowBenchOptions(process.argv.slice(2));
  } catch (error) {
    if (!(error instanceof RowBenchUsageError)) throw error;
    process.stderr.write(`bench:studies: ${error.message}\n${rowBenchUsage("bench:studies", "Times the generated 50-cell study: parse, compile, evaluate, re-evaluate, report.")}\n`);
    return 2;
  }
  if (options.help) {
    process.stdout.write(`${rowBenchUsage("bench:studies", "Times the generated 50-cell study: parse, compile, evaluate, re-evaluate, report.")}\n`);
    return 0;
  }
  const print = (text: string) => (options.json === "-" ? process.stderr : process.stdout).write(`${text}\n`);
  const progress = (text: string) => process.stderr.write(`bench:studies: ${text} (load ${os.loadavg()[0].toFixed(2)})\n`);
  const started = new Date();
  const machine = describeMachine();
  const reps = options.quick ? 2 : 7;
  const rows: BenchRow[] = [];
  let mismatch = false;

  const study = benchStudy();
  const text = serializeStudy(study);
  const kinds = Object.entries(BENCH_STUDY_KINDS).map(([k, n]) => `${n} ${k}`).join(", ");

  // ---- open: parse and compile --------------------------------------------------
  progress("parse and compile");
  const parseSamples: number[] = [];
  const compileSamples: number[] = [];
  for (let r = 0; r < 3 + reps * 3; r++) {
    const parsed = await time(() => parseStudy(text));
    const compiled = await time(() => compileStudy(parsed.value, { solve: solveInThread, memory: createStudyMemory() }));
    if (r >= 3) {
      parseSamples.push(parsed.ms);
      compileSamples.push(compiled.ms);
    }
  }
  rows.push({
    section: SECTION,
    id: "study.parse",
    label: `parse (parseStudy, ${(text.length / 1024).toFixed(1)} KiB of JSON)`,
    value: middle(parseSamples),
    unit: "ms",
    notes: [`${study.cells.length} cells: ${kinds}`],
    samples: parseSamples,
    load: load(),
  });
  rows.push({ section: SECTION, id: "study.compile", label: "compile (compileStudy, 50 definitions)", value: middle(compileSamples), unit: "ms", notes: [], samples: compileSamples, load: load() });

  // ---- evaluate: runStudy, against the bare solves ----------------------------------
  progress("evaluate (runStudy, in-thread solves)");
  const first = await time(() => runStudy(study, { offThread: false }));
  const failed = first.value.outcomes.filter((o) => o.status !== "done");
  if (failed.length > 0) progress(`!!!!! ${failed.length} cells did not finish: ${failed.map((o) => `${o.cellId} (${o.error?.message})`).join("; ")} !!!!!`);
  // Each repetition times, back to back (so a change in the machine's load hits all
  // three alike): runStudy; the same evaluation on a bare engine (what runStudy does
  // minus receipts and outcomes) with every solve recorded and timed inside it; and
  // the recorded problems alone through solveTransport.
  const runSamples: number[] = [];
  const engineSamples: number[] = [];
  const insideSamples: number[] = [];
  const bareSamples: number[] = [];
  let lastRun: StudyRun = first.value;
  let recorded: RecordedSolve[] = [];
  for (let r = 0; r < reps + 1; r++) {
    const run = await time(() => runStudy(study, { offThread: false }));
    const recorder = recordingSolver();
    const engine = new StudyEngine({ globals: studyGlobals() });
    const engineRun = await time(async () => {
      engine.update(compileStudy(study, { solve: recorder.solve, memory: createStudyMemory() }));
      await engine.settled();
    });
    engine.dispose();
    const bareRun = bareSolveTime(recorder.solves);
    lastRun = run.value;
    if (r === 0) continue; // warm-up of the engine-only path
    runSamples.push(run.ms);
    engineSamples.push(engineRun.ms);
    insideSamples.push(recorder.solves.reduce((sum, x) => sum + x.ms, 0));
    bareSamples.push(bareRun);
    recorded = recorder.solves;
  }
  progress("evaluate (runStudy, default: large solves in worker threads)");
  const autoSamples: number[] = [];
  await runStudy(study); // warm the worker bundle's file cache
  for (let r = 0; r < reps; r++) autoSamples.push((await time(() => runStudy(study))).ms);

  const bare = middle(bareSamples);
  const evaluate = middle(runSamples);
  const methods = new Map<string, number>();
  for (const { request } of recorded) methods.set(request.options.method, (methods.get(request.options.method) ?? 0) + 1);
  rows.push({
    section: SECTION,
    id: "study.evaluate",
    label: "evaluate (runStudy, solves in-thread)",
    value: evaluate,
    unit: "ms",
    reference: { label: `${recorded.length} bare solveTransport calls`, value: bare },
    notes: [
      `first (cold) run ${first.ms.toFixed(0)} ms; samples ${sampleList(runSamples)}`,
      `overhead over the bare solves ${(evaluate - bare).toFixed(0)} ms. Medians of the paired runs: engine alone (no receipts) ${middle(engineSamples).toFixed(0)} ms, of which solves timed inside it ${middle(insideSamples).toFixed(0)} ms (bare ${bare.toFixed(0)}) and other cells + runtime ${middle(engineSamples.map((e, k) => e - insideSamples[k])).toFixed(0)} ms; runStudy − engine alone (receipts, outcomes) ${middle(runSamples.map((x, k) => x - engineSamples[k])).toFixed(0)} ms`,
      `solves by method: ${[...methods].map(([m, n]) => `${n} ${m}`).join(", ")} (the sweep's 4 runs included)`,
    ],
    samples: runSamples,
    load: load(),
  });
  rows.push({
    section: SECTION,
    id: "study.evaluate-auto",
    label: "evaluate (runStudy default: large solves in worker threads)",
    value: middle(autoSamples),
    unit: "ms",
    reference: { label: "bare solves", value: bare },
    notes: [`samples ${sampleList(autoSamples)}; each run starts its own worker pool (the CLI's path)`],
    samples: autoSamples,
    load: load(),
  });

  // ---- re-evaluation after one parameter changes ----------------------------------------
  for (const change of BENCH_PARAMETER_CHANGES) {
    progress(`re-evaluate after "${change.id}" changes`);
    const expected = dependentsByReferences(study, change.id);
    const recorder = recordingSolver();
    const memory = createStudyMemory();
    const engine = new StudyEngine({ globals: studyGlobals() });
    engine.update(compileStudy(study, { solve: recorder.solve, memory }));
    await engine.settled();
    let current = study;
    const samples: number[] = [];
    const bareRe: number[] = [];
    const problems: string[] = [];
    let recomputedCount = -1;
    let solvesPerChange = 0;
    for (let r = 0; r < Math.max(3, reps); r++) {
      const value = change.values[(r + 1) % 2];
      current = updateStudy(current, [{ type: "set-setting", id: change.id, path: "value", value }]).study;
      const before = engine.computeCounts();
      recorder.solves.length = 0;
      const definitions = compileStudy(current, { solve: recorder.solve, memory });
      const run = await time(async () => {
        engine.update(definitions);
        await engine.settled();
      });
      const after = engine.computeCounts();
      const recomputed = new Set([...after].filter(([id, n]) => n > (before.get(id) ?? 0)).map(([id]) => id));
      const twice = [...after].filter(([id, n]) => n - (before.get(id) ?? 0) > 1).map(([id]) => id);
      const missing = [...expected].filter((id) => !recomputed.has(id));
      const extra = [...recomputed].filter((id) => !expected.has(id));
      if (missing.length + extra.length + twice.length > 0) {
        problems.push(`change ${r + 1}: not recomputed ${JSON.stringify(missing)}, recomputed without a reference ${JSON.stringify(extra)}, computed more than once ${JSON.stringify(twice)}`);
      }
      const failedCells = [...engine.states()].filter(([, s]) => s.status === "failed").map(([id]) => id);
      if (failedCells.length > 0) problems.push(`change ${r + 1}: failed cells ${failedCells.join(", ")}`);
      recomputedCount = recomputed.size;
      solvesPerChange = recorder.solves.length;
      samples.push(run.ms);
      bareRe.push(recorder.solves.length > 0 ? bareSolveTime(recorder.solves) : 0);
    }
    engine.dispose();
    const ok = problems.length === 0;
    if (!ok) {
      mismatch = true;
      progress(`\n!!!!! MISMATCH after "${change.id}" changes: ${problems.join("; ")} !!!!!\n`);
    }
    const bareMedian = middle(bareRe);
    rows.push({
      section: SECTION,
      id: `study.reevaluate.${change.id}`,
      label: `re-evaluate after "${change.id}" changes: ${recomputedCount} cells recomputed / ${expected.size} by references`,
      value: middle(samples),
      unit: "ms",
      ...(bareMedian > 0 ? { reference: { label: `${solvesPerChange} bare solves`, value: bareMedian } } : {}),
      target: { text: `recomputed = dependents (${expected.size})`, met: () => ok },
      notes: [
        `${change.what}; expected: ${[...expected].join(", ")}`,
        `samples ${sampleList(samples)} (update → settled; values alternate ${JSON.stringify(change.values[0])} ↔ ${JSON.stringify(change.values[1])}; warm-start memory kept between changes)`,
        ...(ok ? [] : problems.map((p) => `MISMATCH ${p}`)),
      ],
      samples,
      load: load(),
    });
  }

  // ---- the report of the run (10 figures) --------------------------------------------------
  progress("report");
  const figures = lastRun.outcomes.filter((o) => o.kind === "figure" && o.status === "done");
  const modelSamples: number[] = [];
  const renderSamples: number[] = [];
  const svgSamples: number[] = [];
  const sanitizeSamples: number[] = [];
  let html = "";
  for (let r = 0; r < 1 + reps; r++) {
    const model = await time(() => studyReportModel(lastRun, { generatedAt: started.toISOString() }));
    const rendered = await time(() => renderReport(model.value));
    const svg = await time(() => figures.map((o) => figureFrom(o.value, o.cellId)));
    const sanitized = await time(() => model.value.cells.map((c) => (c.svg === undefined ? "" : sanitizeHtml(c.svg))));
    if (r === 0) continue;
    modelSamples.push(model.ms);
    renderSamples.push(rendered.ms);
    svgSamples.push(svg.ms);
    sanitizeSamples.push(sanitized.ms);
    html = rendered.value;
  }
  const bytes = Buffer.byteLength(html, "utf8");
  const gzipped = gzipSync(html).length;
  const svgBytes = (html.match(/<svg[\s\S]*?<\/svg>/g) ?? []).reduce((s, x) => s + Buffer.byteLength(x, "utf8"), 0);
  rows.push({
    section: SECTION,
    id: "study.report-model",
    label: `report model (studyReportModel, ${figures.length} figures drawn)`,
    value: middle(modelSamples),
    unit: "ms",
    reference: { label: `renderSvg of the ${figures.length} figures alone`, value: middle(svgSamples) },
    notes: [`samples ${sampleList(modelSamples)}`],
    samples: modelSamples,
    load: load(),
  });
  rows.push({
    section: SECTION,
    id: "study.report-render",
    label: "report HTML (renderReport)",
    value: middle(renderSamples),
    unit: "ms",
    reference: { label: "sanitizeHtml of the figures' SVG alone", value: middle(sanitizeSamples) },
    notes: [`samples ${sampleList(renderSamples)}`],
    samples: renderSamples,
    load: load(),
  });
  rows.push({
    section: SECTION,
    id: "study.report-size",
    label: "report size",
    value: bytes / 1024,
    unit: "KiB",
    notes: [`${bytes} bytes, ${(gzipped / 1024).toFixed(1)} KiB gzipped (zlib default level); inline SVG ${(svgBytes / 1024).toFixed(1)} KiB of it`],
    load: load(),
  });

  const judged: JudgedRow[] = rows.map(judgeRow);
  const loadAtEnd = os.loadavg().map((x) => Math.round(x * 100) / 100);
  print(`Couplet study benchmarks — ${started.toISOString()}${options.quick ? " (--quick: few repetitions)" : ""}`);
  print(`  machine: ${machine.cpuModel}, ${machine.cores} cores, ${machine.memoryGiB} GiB; node ${machine.node}; core ${CORE_VERSION}`);
  print(`  load average at start ${machine.loadAtStart.join(" ")}, at end ${loadAtEnd.join(" ")}; times are medians of ${reps} runs after a warm-up`);
  print(formatRows(judged));
  print(mismatch ? "\nRe-evaluation: MISMATCH between recomputed cells and dependents, see the notes above." : "\nRe-evaluation: every change recomputed exactly the parameter and its dependents.");
  if (options.json !== undefined) writeRowsJson(options.json, { generatedAt: started.toISOString(), quick: options.quick, coreVersion: CORE_VERSION, loadAtEnd }, machine, judged);
  return mismatch ? 1 : 0;
}

process.exitCode = await main();
