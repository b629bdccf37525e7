import { parseStudy } from "../../../cells/document/parse-study";
import type { StudyDocument } from "../../../cells/document/study-types";
import type { CellOutcome } from "../../../cells/study/cell-outcome";
import { type RunStudyOptions, type StudyRun, runStudy } from "../../../cells/study/run-study";

/** A study of these cells (checked by the document's own parser), seed 1 unless given. */
export function makeStudy(cells: readonly object[], seed = 1): StudyDocument {
  return parseStudy(JSON.stringify({ format: "couplet-study", formatVersion: 2, title: "test", seed, cells }));
}

/** Runs a study in-thread (tests decide off-thread explicitly). */
export function run(study: StudyDocument, options: RunStudyOptions = {}): Promise<StudyRun> {
  return runStudy(study, { offThread: false, now: () => new Date("2026-12-01T09:30:00Z"), ...options });
}

/** The outcome of cell `id`. */
export function outcome(studyRun: StudyRun, id: string): CellOutcome {
  const found = studyRun.outcomes.find((o) => o.cellId === id);
  if (!found) throw new Error(`no outcome for cell ${id}`);
  return found;
}

/** The value of cell `id`, which must be done. */
export function valueOf<T = any>(studyRun: StudyRun, id: string): T {
  const o = outcome(studyRun, id);
  if (o.status !== "done") throw new Error(`cell ${id} is ${o.status}: ${o.error?.message}`);
  return o.value as T;
}

/** Relative closeness with an absolute floor, for numbers from different code paths. */
export function close(a: number, b: number, relative = 1e-12, floor = 1e-14): boolean {
  return Math.abs(a - b) <= Math.max(floor, relative * Math.max(Math.abs(a), Math.abs(b)));
}
