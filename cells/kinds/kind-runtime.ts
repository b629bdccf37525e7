import type { CellOf } from "../document/study-types";
import type { CellDefinition } from "../runtime/cell-definition";
import type { DefineContext } from "./define-context";
import type { CellKindName } from "./settings-registry";

/** What a run says about one computed cell besides its value. */
export interface CellDescription {
  /** One short line for summaries, e.g. "S_ε = 0.0123 (debiased, converged, 212 it)". */
  readonly headline?: string;
  /** Things a reader should keep in mind, plain text (e.g. "not converged …"). */
  readonly cautions: readonly string[];
}

/** How one kind of cell runs: compiling a study cell to an engine definition, and describing its value. */
export interface KindRuntime<K extends CellKindName> {
  /** The engine definition of `cell` (id, name, inputs, version, compute). */
  readonly define: (cell: CellOf<K>, context: DefineContext) => CellDefinition;
  /** Headline and cautions of a value this kind computed. */
  readonly describe: (cell: CellOf<K>, value: unknown) => CellDescription;
}

/**
 * The version key of a definition: the cell's kind, name and settings plus what
 * else its computation reads from outside the cell (`extra`: an override, the
 * study seed, the study folder, whether code runs). The engine recomputes a cell
 * only when this key, its name or its inputs change.
 */
export function versionKey(cell: { readonly kind: string; readonly name?: string; readonly settings: unknown }, extra?: unknown): string {
  return JSON.stringify([cell.kind, cell.name ?? null, cell.settings, extra ?? null]);
}
