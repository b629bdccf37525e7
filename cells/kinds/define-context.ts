import type { Measure } from "../../core/measure";
import type { SolveProgress, TransportResult } from "../../core/result";
import { solveTransport } from "../../core/solve";
import type { StudyDocument } from "../document/study-types";
import type { DataFileFormat } from "./data/settings";
import type { SolveRequest } from "../runtime/solve-protocol";

/** Caller-side control of one solve: cancellation and progress. */
export interface SolveControl {
  readonly signal?: AbortSignal;
  readonly onProgress?: (progress: SolveProgress) => void;
}

/**
 * Solves one transport problem, in this thread or another. Resolves with the
 * result (any status); rejects with the solver's error, or with the signal's
 * reason when aborted off-thread. `request.options` may carry `warmStart`.
 */
export type TransportSolver = (request: SolveRequest, control: SolveControl) => Promise<TransportResult>;

/** What a data cell of `"from": "file"` asks the file reader for. */
export interface MeasureFileRequest {
  /** Format; undefined means "from the extension". */
  readonly format?: DataFileFormat;
  /** Coordinate columns in order; undefined means every column but the mass column. */
  readonly columns?: readonly string[];
  /** Mass column; undefined means the column named "mass" when there is one. */
  readonly mass?: string;
  /** Folder relative paths start from (the study file's folder). */
  readonly relativeTo?: string;
  /** Name of the measure in error messages (the cell's name). */
  readonly name?: string;
}

/** Reads a point cloud from a file (Node: cells/data/read-measure-file.ts). */
export type MeasureFileReader = (path: string, request: MeasureFileRequest) => Measure;

/**
 * What cells remember between computations of one engine (one run, or one editor
 * session): the last potentials of each transport cell, by cell id, for warm starts.
 * Never module-level: each engine gets its own, so two runs never share state.
 */
export interface StudyMemory {
  readonly potentials: Map<string, { readonly f: Float64Array; readonly g: Float64Array }>;
}

/** A fresh, empty {@link StudyMemory}. */
export function createStudyMemory(): StudyMemory {
  return { potentials: new Map() };
}

/**
 * Everything a cell kind needs to turn a study cell into an engine definition,
 * besides the cell itself. Built by `compileStudy` (cells/study/compile-study.ts).
 */
export interface DefineContext {
  /** The study being compiled (its seed derives the cells' "study" seeds). */
  readonly study: StudyDocument;
  /** Folder of the study file: relative data paths start here. Undefined: the working directory. */
  readonly studyFolder?: string;
  /** Reads data files; undefined where files cannot be read (a data cell from a file then fails, saying so). */
  readonly readMeasureFile?: MeasureFileReader;
  /** False holds code cells and code figures (they fail with CellHeldError instead of running). */
  readonly runCode: boolean;
  /** Solves transport problems (in-thread, or off-thread when large). */
  readonly solve: TransportSolver;
  /** Per-engine memory (warm-start potentials). */
  readonly memory: StudyMemory;
  /** Parameter values replacing the written ones, by parameter cell name (already checked). */
  readonly overrides?: ReadonlyMap<string, unknown>;
}

/**
 * A {@link TransportSolver} that runs `solveTransport` (core/solve.ts) on the calling
 * thread. The signal is passed to the core, which checks it between iterations; a
 * synchronous solve cannot see an abort made by its own blocked thread, so in
 * practice only an abort before the call (or from a progress callback) takes effect.
 */
export const solveInThread: TransportSolver = async (request, control) => {
  control.signal?.throwIfAborted();
  const { source, target, cost, options } = request;
  return solveTransport(source, target, cost, { ...options, signal: control.signal, onProgress: control.onProgress });
};
