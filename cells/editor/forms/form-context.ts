import type { Cell, CellKindName, SettingPath, StudyDocument } from "../../document";

/**
 * What a settings form may do and know. Forms never write the study: they hand
 * changes to `set` / `replace`, which go through updateStudy (and the undo
 * history) and answer with the problem in words when the study refuses them.
 */
export interface CellFormContext {
  readonly cell: Cell;
  readonly study: StudyDocument;
  /** Sets one setting (`undefined` removes it). Returns the problem, or undefined when applied. */
  set(path: SettingPath, value: unknown, label: string): string | undefined;
  /** Replaces the cell's whole settings object. */
  replace(settings: Readonly<Record<string, unknown>>, label: string): string | undefined;
  /** Names of the cells of the given kinds, in study order. */
  names(...kinds: CellKindName[]): string[];
  /** Current value of the cell named `name` (undefined when not computed). */
  valueOf(name: string): unknown;
}

/** Cells a number may be linked to: parameters first, then code cells with names. */
export function linkableNames(context: CellFormContext): string[] {
  return [...context.names("parameter"), ...context.names("code")];
}
