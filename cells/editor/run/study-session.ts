import type { Cell, StudyChange, StudyDocument } from "../../document";
import { StudyFormatError, formatIssue } from "../../document";
import { CellHeldError } from "../../kinds/cell-error";
import { type MeasureFileReader, type StudyMemory, type TransportSolver, createStudyMemory } from "../../kinds/define-context";
import type { CellDefinition, CellState } from "../../runtime/cell-definition";
import { StudyEngine } from "../../runtime/study-engine";
import { compileStudy, studyGlobals } from "../../study/compile-study";
import { type StudyHistory, applyChanges, redo, replacePresent, startHistory, undo } from "../model/study-history";
import type { EditorCellState } from "./status-words";

/** Options of a {@link StudySession}. */
export interface StudySessionOptions {
  readonly study: StudyDocument;
  /** Solves transport problems (the page's Web Worker client). */
  readonly solve: TransportSolver;
  /** Reads data files (the page's cache of server files). */
  readonly readMeasureFile?: MeasureFileReader;
  /** Folder of the study on the server, for relative data paths. */
  readonly studyFolder?: string;
  /** Whether code cells and code figures run. */
  readonly runCode: boolean;
  /** Extra version for data cells reading `path` (changes when the file arrives), see DataFileCache. */
  readonly fileGeneration?: (path: string) => number;
  /**
   * While true, entropic, unbalanced and debiased transport cells run as if their
   * `warmStart` setting were on (the study itself is not changed): re-solving after
   * a tuned epsilon or penalty starts from the cell's previous potentials. Sweeps
   * never warm-start (their iteration counts would stop meaning anything).
   */
  readonly warmWhileTuning?: () => boolean;
  /** Called with the newest state of cells (not batched here). */
  readonly onState?: (id: string, state: EditorCellState) => void;
  /** Called after the present study changed (an edit, undo, redo or replacement). */
  readonly onStudy?: (study: StudyDocument, how: "edit" | "undo" | "redo" | "replace") => void;
  /** Clock, ms (history merging). Default Date.now. */
  readonly now?: () => number;
}

/**
 * One open study in the editor: its undo history (the study is an immutable value
 * changed by updateStudy transactions) and the reactive engine that runs it. After
 * every change the whole study is compiled again (cheap: definitions are closures)
 * and the engine recomputes only the cells whose definition changed, and their
 * dependents. Transport solves go through `solve` (a Web Worker), so the page stays
 * responsive and a superseded solve is terminated.
 */
export class StudySession {
  private historyValue: StudyHistory;
  private readonly engine: StudyEngine;
  private readonly memory: StudyMemory = createStudyMemory();
  private readonly options: StudySessionOptions;
  private runCodeValue: boolean;
  private readonly states = new Map<string, EditorCellState>();
  private readonly now: () => number;

  constructor(options: StudySessionOptions) {
    this.options = options;
    this.runCodeValue = options.runCode;
    this.now = options.now ?? Date.now;
    this.historyValue = startHistory(options.study);
    // Progress at most 5 times a second per cell: each refresh repaints the status line, and
    // faster refreshes took main-thread time from the solve's worker on 2 cores (docs/benchmarks.md, Editor).
    this.engine = new StudyEngine({ globals: studyGlobals(), progressInterval: 200, onChange: (id, state) => this.observe(id, state) });
    this.recompile();
  }

  /** The present study. */
  get study(): StudyDocument {
    return this.historyValue.present;
  }

  /** The undo history (for labels and counts). */
  get history(): StudyHistory {
    return this.historyValue;
  }

  /** Whether code cells run. */
  get runCode(): boolean {
    return this.runCodeValue;
  }

  /** The state of cell `id` as the editor shows it (held included); "waiting" before the engine knows it. */
  state(id: string): EditorCellState {
    return this.states.get(id) ?? { status: "waiting" };
  }

  /** The value of the cell named `name` when it is done (or its latest progressive value), else undefined. */
  valueOf(name: string): unknown {
    const cell = this.study.cells.find((c) => c.name === name);
    if (!cell) return undefined;
    const state = this.states.get(cell.id);
    if (state?.status === "done") return state.value;
    if (state?.status === "running") return state.value;
    return undefined;
  }

  /**
   * Applies changes as one undoable step (merged with the previous step when
   * `mergeKey` matches and it was recent). Returns the problem in words when the
   * study refuses them (nothing changes then), else undefined.
   */
  apply(changes: readonly StudyChange[], label: string, mergeKey?: string): string | undefined {
    let applied;
    try {
      applied = applyChanges(this.historyValue, changes, { label, now: this.now(), ...(mergeKey === undefined ? {} : { mergeKey }) });
    } catch (error) {
      return problemText(error);
    }
    if (applied.history === this.historyValue) return undefined;
    this.historyValue = applied.history;
    this.afterChange("edit");
    return undefined;
  }

  /** Takes back the last step; false when there was nothing to undo. */
  undo(): boolean {
    const { history, step } = undo(this.historyValue);
    if (!step) return false;
    this.historyValue = history;
    this.afterChange("undo");
    return true;
  }

  /** Makes the last undone step again; false when there was nothing to redo. */
  redo(): boolean {
    const { history, step } = redo(this.historyValue);
    if (!step) return false;
    this.historyValue = history;
    this.afterChange("redo");
    return true;
  }

  /** Replaces the study (reload from disk, canonical text after a save); `forget` clears undo. */
  replace(study: StudyDocument, forget = true): void {
    this.historyValue = replacePresent(this.historyValue, study, forget);
    this.afterChange("replace");
  }

  /** Lets code run (after the user chose to) or holds it again. */
  setRunCode(runCode: boolean): void {
    if (runCode === this.runCodeValue) return;
    this.runCodeValue = runCode;
    this.recompile();
  }

  /** Compiles the present study and hands the definitions to the engine. */
  recompile(): void {
    const { solve, readMeasureFile, studyFolder, fileGeneration } = this.options;
    const definitions = compileStudy(this.options.warmWhileTuning?.() ? withWarmStarts(this.study) : this.study, {
      solve,
      runCode: this.runCodeValue,
      memory: this.memory,
      ...(readMeasureFile ? { readMeasureFile } : {}),
      ...(studyFolder === undefined ? {} : { studyFolder }),
    });
    const withFiles = fileGeneration ? definitions.map((def, k) => withFileGeneration(def, this.study.cells[k], fileGeneration)) : definitions;
    this.engine.update(withFiles);
    // Cells that left the study leave the state table too.
    const ids = new Set(this.study.cells.map((c) => c.id));
    for (const id of [...this.states.keys()]) if (!ids.has(id)) this.states.delete(id);
  }

  /** Resolves once nothing is queued or running. */
  settled(): Promise<void> {
    return this.engine.settled();
  }

  /** Stops every computation. */
  dispose(): void {
    this.engine.dispose();
  }

  private afterChange(how: "edit" | "undo" | "redo" | "replace"): void {
    this.recompile();
    this.options.onStudy?.(this.study, how);
  }

  private observe(id: string, state: CellState): void {
    const shown = this.held(id, state) ?? state;
    this.states.set(id, shown);
    this.options.onState?.(id, shown);
  }

  /** A failure that comes from held code, as a "held" state with its reason. */
  private held(id: string, state: CellState): EditorCellState | undefined {
    if (state.status !== "failed") return undefined;
    if (state.error instanceof CellHeldError) return { status: "held", reason: "code from a study you have not chosen to run" };
    if (state.cause.kind === "upstream" && state.cause.cellId !== undefined) {
      const root = this.states.get(state.cause.cellId);
      if (root?.status === "held" || (root?.status === "failed" && root.error instanceof CellHeldError)) {
        return { status: "held", reason: `waits on ${state.cause.name ?? state.cause.cellId}, whose code is held` };
      }
    }
    return undefined;
  }
}

/** The study as run while tuning: iterative transport cells warm-start (see StudySessionOptions.warmWhileTuning). */
export function withWarmStarts(study: StudyDocument): StudyDocument {
  let changed = false;
  const cells = study.cells.map((cell) => {
    if (cell.kind !== "transport" || cell.settings.method === "exact" || cell.settings.warmStart === true) return cell;
    changed = true;
    return { ...cell, settings: { ...cell.settings, warmStart: true } } as Cell;
  });
  return changed ? { ...study, cells } : study;
}

/** A data cell reading a file recomputes when the file arrives: its version includes the file's load count. */
function withFileGeneration(def: CellDefinition, cell: Cell | undefined, generation: (path: string) => number): CellDefinition {
  if (!cell || cell.kind !== "data" || cell.settings.from !== "file") return def;
  return { ...def, version: `${def.version ?? ""}|file:${generation(cell.settings.path)}` };
}

/** A refused change in words: the study's own messages (`epsilon.relative: must be > 0, got -1`). */
export function problemText(error: unknown): string {
  if (error instanceof StudyFormatError) {
    const [first, ...rest] = error.issues;
    const text = formatIssue(first).replace(/^cells\[\d+\]\.settings\./, "").replace(/^cells\[\d+\]\./, "");
    return rest.length > 0 ? `${text} (and ${rest.length} more)` : text;
  }
  return error instanceof Error ? error.message : String(error);
}
