/**
 * What the study engine runs: one definition per cell. Cell kinds compile study
 * cells into these; the engine never sees the study format.
 */
export interface CellDefinition {
  /** Stable cell id, unique within one `update` call. */
  readonly id: string;
  /** The name other cells use, or null for anonymous cells (prose, figures). */
  readonly name: string | null;
  /** Names this cell depends on, in any order; repeats are ignored. */
  readonly inputs: readonly string[];
  /**
   * Caller-given version key. When present, `update` redefines the cell only if
   * the key, the name or the inputs change; when absent, only if `compute` is a
   * different function (identity) or the name or inputs change.
   */
  readonly version?: string | number;
  /**
   * Computes the value from the named inputs. May return a value, a Promise, or an
   * AsyncIterable (or a generator): each yield is a progressive value, the last is final.
   */
  compute(inputs: Record<string, unknown>, context: CellContext): unknown;
}

/** Handed to each computation of a cell. */
export interface CellContext {
  /** Aborted when this computation is superseded (redefinition, an input changed) or the engine is disposed. */
  readonly signal: AbortSignal;
  /**
   * Reports progress, e.g. `{iteration, marginalError}`. Cheap to call often: reports
   * are batched and surface as `{status: "running", progress}` at most once per
   * batching interval (50 ms by default), the latest report winning.
   */
  progress(report: unknown): void;
}

/** Why a cell failed. */
export interface FailureCause {
  /**
   * - `own-error`: the cell's own computation threw or rejected;
   * - `upstream`: an input failed; `cellId`/`name` name the first failed cell of the chain;
   * - `cycle`: the cell is on a circular definition; `cycle` lists the cell ids around it;
   * - `unknown-name`: an input is defined by no cell and is not an allowed global; `name` is it;
   * - `duplicate-name`: the cell's name is defined by another cell too, or is reserved by the engine.
   */
  readonly kind: "own-error" | "upstream" | "cycle" | "unknown-name" | "duplicate-name";
  readonly cellId?: string;
  readonly name?: string;
  /** For `cycle`: ids of the cells around the shortest cycle through this cell, starting with it. */
  readonly cycle?: readonly string[];
  /** For `duplicate-name`: ids of every cell defining the name. */
  readonly cellIds?: readonly string[];
}

/**
 * The state of one cell as the engine reports it.
 * - `waiting`: (re)defined or an input changed; its inputs are not ready yet;
 * - `running`: computing since `since` (ms since the Unix epoch). A progressive cell
 *   stays running until its iterable ends; `value` then holds its latest yield and
 *   `progress` its latest progress report;
 * - `done`: `value` is final; `seconds` is the wall time of the computation that made it,
 *   `runs` how many times this cell has been computed since the engine was created;
 * - `failed`: see {@link FailureCause}; `message` is one line a practitioner can act on.
 */
export type CellState =
  | { readonly status: "waiting" }
  | { readonly status: "running"; readonly progress?: unknown; readonly value?: unknown; readonly since: number }
  | { readonly status: "done"; readonly value: unknown; readonly seconds: number; readonly runs: number }
  | { readonly status: "failed"; readonly error: Error; readonly message: string; readonly cause: FailureCause };
