import type { Cell, StudyDocument } from "../../../cells/document/study-types";
import { type DefineContext, createStudyMemory, solveInThread } from "../../../cells/kinds/define-context";
import type { CellContext } from "../../../cells/runtime/cell-definition";

/** A define context for `study`: in-thread solves, fresh memory, code runs. */
export function defineContext(study: StudyDocument, extra: Partial<DefineContext> = {}): DefineContext {
  return { study, runCode: true, solve: solveInThread, memory: createStudyMemory(), ...extra };
}

/** A compute context that is never aborted; progress reports are collected. */
export function computeContext(reports: unknown[] = []): CellContext {
  return { signal: new AbortController().signal, progress: (report) => reports.push(report) };
}

/** The cell `id` of `study`, typed as the kind it is. */
export function cellOf<K extends Cell["kind"]>(study: StudyDocument, id: string, _kind?: K): Extract<Cell, { kind: K }> {
  const cell = study.cells.find((c) => c.id === id);
  if (!cell) throw new Error(`no cell ${id}`);
  return cell as Extract<Cell, { kind: K }>;
}

/** Drains an async iterable, returning every value it yielded. */
export async function collect<T>(iterable: AsyncIterable<T>): Promise<T[]> {
  const out: T[] = [];
  for await (const value of iterable) out.push(value);
  return out;
}
