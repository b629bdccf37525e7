import { existsSync } from "node:fs";
import { dirname } from "node:path";
import { fileURLToPath } from "node:url";
import { studySeed, type Cell, type CellOf, type StudyDocument } from "../document/study-types";
import { readMeasureFile } from "../data/read-measure-file";
import { CellHeldError } from "../kinds/cell-error";
import { type MeasureFileReader, type TransportSolver, createStudyMemory, solveInThread } from "../kinds/define-context";
import { describeCell } from "../kinds/registry";
import type { CellState } from "../runtime/cell-definition";
import { createSolveWorkerPool, shouldSolveOffThread, solveWorkerUrl } from "../runtime/solve-off-thread";
import { StudyEngine } from "../runtime/study-engine";
import { supportSize } from "../../core/measure";
import type { CellOutcome } from "./cell-outcome";
import { compileStudy, studyGlobals } from "./compile-study";
import { checkOverrides, describeControl } from "./parameter-overrides";
import { RECEIPT_KINDS, createReceipt } from "./receipts";
import { causeInWords, cellNameOf } from "./cause-in-words";

export { StudyRunError } from "./study-run-error";

/** Options of {@link runStudy}. */
export interface RunStudyOptions {
  /** Path of the study file: data file paths are relative to its folder. Default: the working directory. */
  studyPath?: string;
  /**
   * Parameter cell name → value for this run, parsed to the parameter's type by the
   * caller; checked against the control (StudyRunError naming the parameter).
   */
  overrides?: Record<string, unknown>;
  /** Run code cells and code figures. Default true; false holds them (status "held"). */
  runCode?: boolean;
  /** Called on every state change of a cell (running states at most every 50 ms per cell). */
  onProgress?: (event: { cellId: string; name?: string; state: CellState }) => void;
  /**
   * Where transport solves (and sweep runs) go: `"auto"` (default) sends problems
   * above `shouldSolveOffThread` to a worker (dist/solve-worker.mjs; in-thread when
   * it is not built), `true` every problem, `false` none.
   */
  offThread?: boolean | "auto";
  /** Clock for receipts' `recordedAt` (tests pin it). Default: the system clock. */
  now?: () => Date;
}

/** One parameter as it was run: its value (overrides applied) and its control in words. */
export interface RunParameter {
  name: string;
  value: unknown;
  control: string;
}

/** A finished headless run of a study. */
export interface StudyRun {
  study: StudyDocument;
  /** One outcome per cell, in study order. */
  outcomes: CellOutcome[];
  /** Wall-clock seconds of the whole run. */
  seconds: number;
  parameters: RunParameter[];
}

/**
 * Runs a study headless, to the end: compiles its cells (cells/study/compile-study.ts),
 * runs them on a fresh StudyEngine with the globals `core` and `Plot`, waits until
 * every cell is done, failed or held (sweeps to their last run), and returns one
 * outcome per cell with its value, headline, cautions and — for data, transport
 * and sweep cells — a fresh receipt. Failures stay with the failing cell and its
 * dependents. Throws StudyRunError for bad overrides, before computing anything.
 */
export async function runStudy(study: StudyDocument, options: RunStudyOptions = {}): Promise<StudyRun> {
  const { studyPath, runCode = true, onProgress, offThread = "auto", now = () => new Date() } = options;
  const overrides = checkOverrides(study, options.overrides);
  const started = performance.now();
  const solver = solverFor(offThread);
  const definitions = compileStudy(study, {
    ...(studyPath === undefined ? {} : { studyFolder: dirname(studyPath) }),
    readMeasureFile: fileReader,
    runCode,
    solve: solver.solve,
    memory: createStudyMemory(),
    overrides,
  });
  const names = new Map(study.cells.map((cell) => [cell.id, cell.name]));
  const engine = new StudyEngine({
    globals: studyGlobals(),
    ...(onProgress ? { onChange: (cellId: string, state: CellState) => onProgress({ cellId, ...(names.get(cellId) === undefined ? {} : { name: names.get(cellId) }), state }) } : {}),
  });
  let states: Map<string, CellState>;
  try {
    engine.update(definitions);
    await engine.settled();
    states = engine.states();
  } finally {
    engine.dispose();
    await solver.close();
  }
  const seconds = (performance.now() - started) / 1000;
  const recordedAt = now().toISOString();
  const valuesByName = new Map<string, unknown>();
  for (const cell of study.cells) {
    const state = states.get(cell.id);
    if (cell.name !== undefined && state?.status === "done") valuesByName.set(cell.name, state.value);
  }
  const outcomes = study.cells.map((cell) => outcomeOf(cell, states, study, { valuesByName, recordedAt }));
  const parameters = study.cells
    .filter((cell): cell is CellOf<"parameter"> => cell.kind === "parameter")
    .map((cell) => ({ name: cell.name ?? cell.id, value: overrides.has(cell.name ?? "") ? overrides.get(cell.name!) : cell.settings.value, control: describeControl(cell.settings) }));
  return { study, outcomes, seconds, parameters };
}

function outcomeOf(cell: Cell, states: Map<string, CellState>, study: StudyDocument, context: { valuesByName: Map<string, unknown>; recordedAt: string }): CellOutcome {
  const base = { cellId: cell.id, kind: cell.kind, ...(cell.name === undefined ? {} : { name: cell.name }) };
  const state = states.get(cell.id);
  if (!state || state.status === "waiting" || state.status === "running") {
    // settled() returned with the cell unfinished: only when the engine was disposed early.
    return { ...base, status: "failed", error: { message: "did not finish", cause: "own error" }, seconds: 0, cautions: [] };
  }
  if (state.status === "failed") {
    const held = heldBy(cell.id, states);
    if (held !== undefined) {
      const message = held === cell.id ? state.message : `input "${cellNameOf(held, study)}" is held (code not run)`;
      return { ...base, status: "held", error: { message, cause: held === cell.id ? "code held" : `held input "${cellNameOf(held, study)}"` }, seconds: 0, cautions: [] };
    }
    return { ...base, status: "failed", error: { message: state.message, cause: causeInWords(state.cause, study) }, seconds: 0, cautions: [] };
  }
  const { value, seconds } = state;
  let headline: string | undefined;
  let cautions: readonly string[] = [];
  try {
    ({ headline, cautions } = describeCell(cell, value));
  } catch {
    // A description is a courtesy: a value it cannot read still counts as done.
  }
  const receipt = RECEIPT_KINDS.includes(cell.kind) ? createReceipt(cell, value, { valuesByName: context.valuesByName, studySeed: studySeed(study), seconds, recordedAt: context.recordedAt }) : undefined;
  return { ...base, status: "done", value, seconds, ...(headline === undefined ? {} : { headline }), cautions: [...cautions], ...(receipt ? { receipt } : {}) };
}

/** The id of the held cell a failure comes from (itself, or the root of an upstream chain), if any. */
function heldBy(id: string, states: Map<string, CellState>): string | undefined {
  const state = states.get(id);
  if (state?.status !== "failed") return undefined;
  if (state.error instanceof CellHeldError) return id;
  if (state.cause.kind === "upstream" && state.cause.cellId !== undefined) {
    const root = states.get(state.cause.cellId);
    if (root?.status === "failed" && root.error instanceof CellHeldError) return state.cause.cellId;
  }
  return undefined;
}

/** Reads data files with cells/data (CSV, TSV, JSON, .npy) relative to the study folder. */
const fileReader: MeasureFileReader = (path, request) =>
  readMeasureFile(path, {
    ...(request.format === undefined ? {} : { format: request.format }),
    ...(request.columns === undefined ? {} : { coordinates: request.columns }),
    ...(request.mass === undefined ? {} : { massColumn: request.mass }),
    ...(request.relativeTo === undefined ? {} : { relativeTo: request.relativeTo }),
    ...(request.name === undefined ? {} : { name: request.name }),
  });

/**
 * The solver for a run's `offThread` choice; "auto" falls back to in-thread when the
 * worker is not built. Off-thread solves share a pool of warm workers for the run
 * (a sweep solves dozens of problems in a row); `close` ends them.
 */
function solverFor(offThread: boolean | "auto"): { solve: TransportSolver; close(): Promise<void> } {
  const inThread = { solve: solveInThread, close: async () => {} };
  if (offThread === false) return inThread;
  const workerBuilt = existsSync(fileURLToPath(solveWorkerUrl()));
  if (offThread === "auto" && !workerBuilt) return inThread;
  const pool = createSolveWorkerPool();
  return {
    solve: (request, control) => {
      const { source, target, options } = request;
      const large = offThread === true || shouldSolveOffThread(supportSize(source), supportSize(target), options.method);
      return large ? pool.solve(request, control) : solveInThread(request, control);
    },
    close: () => pool.close(),
  };
}
