import type { StudyDocument } from "../document/study-types";
import { type DefineContext, type MeasureFileReader, type StudyMemory, type TransportSolver, createStudyMemory, solveInThread } from "../kinds/define-context";
import { defineCell } from "../kinds/registry";
import type { CellDefinition } from "../runtime/cell-definition";
import * as core from "./core-api";
import { studyPlot } from "./plot-api";

/** Options of {@link compileStudy}; every one has a default that works headless. */
export interface CompileStudyOptions {
  /** Folder of the study file (relative data paths start there). */
  readonly studyFolder?: string;
  /** Reads data files; without one, file data cells fail saying files cannot be read here. */
  readonly readMeasureFile?: MeasureFileReader;
  /** False holds code cells and code figures. Default true. */
  readonly runCode?: boolean;
  /** Solves transport problems. Default: in this thread (`solveInThread`). */
  readonly solve?: TransportSolver;
  /** Memory shared by successive compilations for one engine (warm starts). Default: a fresh one. */
  readonly memory?: StudyMemory;
  /** Parameter values replacing the written ones, by parameter name, already checked (see checkOverrides). */
  readonly overrides?: ReadonlyMap<string, unknown>;
}

/**
 * The engine definitions of a study's cells, in study order: each cell compiled by
 * its kind (cells/kinds/registry.ts). Pass the result to `StudyEngine.update`; an
 * editor compiles again after each change with the same `memory`, and the engine
 * recomputes only the cells whose definition (version key, name, inputs) changed.
 * A cell whose kind fails to compile it becomes a definition that fails with that
 * error, so one broken cell never stops the rest.
 */
export function compileStudy(study: StudyDocument, options: CompileStudyOptions = {}): CellDefinition[] {
  const context: DefineContext = {
    study,
    runCode: options.runCode ?? true,
    solve: options.solve ?? solveInThread,
    memory: options.memory ?? createStudyMemory(),
    ...(options.studyFolder === undefined ? {} : { studyFolder: options.studyFolder }),
    ...(options.readMeasureFile === undefined ? {} : { readMeasureFile: options.readMeasureFile }),
    ...(options.overrides === undefined ? {} : { overrides: options.overrides }),
  };
  return study.cells.map((cell) => {
    try {
      return defineCell(cell, context);
    } catch (error) {
      return {
        id: cell.id,
        name: cell.name ?? null,
        inputs: [],
        compute: () => {
          throw error;
        },
      };
    }
  });
}

/**
 * The names every cell may use besides other cells and the standard built-ins
 * (pass as `StudyEngine`'s `globals`): `core`, the transport core's public API
 * (cells/study/core-api.ts), and `Plot`, @observablehq/plot with `plot()` keeping
 * options instead of drawing (cells/study/plot-api.ts). Fresh objects per call.
 */
export function studyGlobals(): Record<string, unknown> {
  return { core: Object.freeze({ ...core }), Plot: studyPlot() };
}
