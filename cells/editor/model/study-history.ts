import { type StudyChange, type StudyDocument, updateStudy } from "../../document";

/** One step the user can undo: the study before and after, and what it was. */
export interface HistoryStep {
  readonly before: StudyDocument;
  readonly after: StudyDocument;
  /** Words for the undo button's label, e.g. "set epsilon", "move cell". */
  readonly label: string;
  /**
   * Steps with the same key made close together merge into one (dragging a slider
   * makes dozens of changes; one undo should take back the whole drag).
   */
  readonly mergeKey?: string;
  /** ms (caller's clock) of the last change merged into this step. */
  readonly at: number;
  /** Cells whose computations the step touched (union over merged changes). */
  readonly changed: ReadonlySet<string>;
}

/** Options of {@link applyChanges}. */
export interface ApplyOptions {
  /** Undo label, e.g. "set epsilon". */
  readonly label: string;
  /** Steps with the same key within `mergeWindow` ms of each other merge. */
  readonly mergeKey?: string;
  /** Now, in ms; passed in so the history stays a pure value. */
  readonly now: number;
  /** Merge window in ms. Default 1200. */
  readonly mergeWindow?: number;
}

/**
 * The editor's undo history: a pure value holding the current study and the
 * steps before and after it. Every method returns a new history; none mutates.
 * The study itself is immutable (cells/document `updateStudy`), so a step only
 * keeps references to two studies and shares all unchanged cells.
 */
export interface StudyHistory {
  readonly present: StudyDocument;
  /** Oldest first. */
  readonly past: readonly HistoryStep[];
  /** Next redo first. */
  readonly future: readonly HistoryStep[];
  /** Most steps kept in `past`. */
  readonly limit: number;
}

/** A history whose present is `study`, with nothing to undo or redo. `limit` default 400 steps. */
export function startHistory(study: StudyDocument, limit = 400): StudyHistory {
  if (!(Number.isInteger(limit) && limit >= 1)) throw new RangeError(`limit must be a positive integer, got ${limit}`);
  return { present: study, past: [], future: [], limit };
}

/** The outcome of {@link applyChanges}: the new history and the ids of the cells to recompute. */
export interface AppliedChanges {
  readonly history: StudyHistory;
  readonly changed: ReadonlySet<string>;
}

/**
 * Applies `changes` to the present study through `updateStudy` and records one
 * undo step (or extends the last one when it has the same `mergeKey` and was made
 * within the merge window). Clears the redo list. A change that changes nothing
 * returns the same history. Throws what `updateStudy` throws (a StudyFormatError
 * listing the problems): the history is then unchanged.
 */
export function applyChanges(history: StudyHistory, changes: readonly StudyChange[], options: ApplyOptions): AppliedChanges {
  const { label, mergeKey, now, mergeWindow = 1200 } = options;
  const { study, changed } = updateStudy(history.present, changes);
  if (study === history.present) return { history, changed };
  const last = history.past[history.past.length - 1];
  if (last && mergeKey !== undefined && last.mergeKey === mergeKey && now - last.at <= mergeWindow && history.future.length === 0) {
    const merged: HistoryStep = { ...last, after: study, at: now, changed: new Set([...last.changed, ...changed]) };
    return { history: { ...history, present: study, past: [...history.past.slice(0, -1), merged] }, changed };
  }
  const step: HistoryStep = { before: history.present, after: study, label, at: now, changed, ...(mergeKey === undefined ? {} : { mergeKey }) };
  const past = [...history.past, step];
  return { history: { ...history, present: study, past: past.length > history.limit ? past.slice(past.length - history.limit) : past, future: [] }, changed };
}

/**
 * Replaces the present study without an undo step (a reload from disk, or the
 * server's canonical text after a save). Both lists are cleared when `forget`
 * (default true): old steps would lead back to a study that is no longer on disk.
 */
export function replacePresent(history: StudyHistory, study: StudyDocument, forget = true): StudyHistory {
  return forget ? { ...history, present: study, past: [], future: [] } : { ...history, present: study };
}

/** Takes back the last step; the same history when there is nothing to undo. */
export function undo(history: StudyHistory): { history: StudyHistory; step?: HistoryStep } {
  const step = history.past[history.past.length - 1];
  if (!step) return { history };
  return { history: { ...history, present: step.before, past: history.past.slice(0, -1), future: [step, ...history.future] }, step };
}

/** Makes the last undone step again; the same history when there is nothing to redo. */
export function redo(history: StudyHistory): { history: StudyHistory; step?: HistoryStep } {
  const [step, ...rest] = history.future;
  if (!step) return { history };
  return { history: { ...history, present: step.after, past: [...history.past, { ...step, mergeKey: undefined }], future: rest }, step };
}

/** Label of the step undo would take back, or undefined. */
export function undoLabel(history: StudyHistory): string | undefined {
  return history.past[history.past.length - 1]?.label;
}

/** Label of the step redo would make, or undefined. */
export function redoLabel(history: StudyHistory): string | undefined {
  return history.future[0]?.label;
}
