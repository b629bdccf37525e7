import { describeValue } from "../../core/errors";
import { isCellKindName, kindSettings } from "../kinds/settings-registry";
import { deepFreeze } from "./deep-freeze";
import { copyJsonData, jsonEqual, withKey } from "./json-data";
import { type StudyIssue, StudyFormatError, childPath } from "./study-issue";
import { studyIssues } from "./study-issues";
import type { Cell, Receipt, StudyDocument } from "./study-types";
import { isJsonObject } from "./value-checks";

/** A path into a cell's settings: `"epsilon.relative"` or `["components", 0, "mean"]`. */
export type SettingPath = string | readonly (string | number)[];

/**
 * One edit of a study. Changes in a list apply in order, each seeing the
 * result of the previous ones; the study is validated once, after the last.
 */
export type StudyChange =
  /** Sets one setting of a cell (creating objects on the way); `value: undefined` removes the key. */
  | { readonly type: "set-setting"; readonly id: string; readonly path: SettingPath; readonly value: unknown }
  /** Replaces a cell's whole settings object. */
  | { readonly type: "set-settings"; readonly id: string; readonly settings: { readonly [key: string]: unknown } }
  /** Inserts a cell at `index` (0 … number of cells; default: at the end). */
  | { readonly type: "insert-cell"; readonly cell: Cell; readonly index?: number }
  /** Removes a cell and its receipt. */
  | { readonly type: "remove-cell"; readonly id: string }
  /** Moves a cell so that it ends up at `index` (0 … number of cells − 1). */
  | { readonly type: "move-cell"; readonly id: string; readonly index: number }
  /**
   * Renames a cell (`name: undefined` removes its name). With `updateReferences`
   * (default true) typed settings of every cell that named the old name are
   * rewritten; code is not (its names belong to the runtime).
   */
  | { readonly type: "rename"; readonly id: string; readonly name: string | undefined; readonly updateReferences?: boolean }
  | { readonly type: "set-seed"; readonly seed: number }
  | { readonly type: "set-title"; readonly title: string }
  /** Sets the free text; undefined removes it. */
  | { readonly type: "set-about"; readonly about: string | undefined }
  /** Records (or with undefined, drops) the receipt of a cell; written by the runtime. */
  | { readonly type: "set-receipt"; readonly id: string; readonly receipt: Receipt | undefined };

/** The outcome of {@link updateStudy}. */
export interface StudyUpdate {
  /** The new study; the very same object when no change changed anything. */
  readonly study: StudyDocument;
  /**
   * Ids of cells to recompute or redraw: cells whose settings or name changed,
   * inserted, removed and moved cells, cells whose references a rename rewrote,
   * and cells drawing on the study seed when it changed. Title, about and
   * receipts change no cell.
   */
  readonly changed: ReadonlySet<string>;
}

const STUDY_ORDER = ["format", "formatVersion", "title", "about", "seed", "cells", "receipts"];
const CELL_ORDER = ["id", "kind", "name", "settings"];

function fail(path: string, message: string): never {
  throw new StudyFormatError([{ path, message }]);
}

function splitPath(path: SettingPath, at: string): (string | number)[] {
  const segments = typeof path === "string" ? path.split(".") : [...path];
  if (segments.length === 0 || segments.some((s) => s === "")) fail(at, `must name a setting such as "epsilon.relative", got ${describeValue(path)}`);
  return segments;
}

/** Immutable set inside JSON data; returns the new container. */
function setIn(container: unknown, segments: readonly (string | number)[], value: unknown, at: string, where: string): unknown {
  if (segments.length === 0) return value;
  const [head, ...rest] = segments;
  const here = childPath(where, head);
  if (Array.isArray(container)) {
    const index = typeof head === "number" ? head : /^\d+$/.test(head) ? Number(head) : NaN;
    if (!Number.isInteger(index) || index < 0 || index > container.length) {
      fail(at, `${here}: an index into an array of ${container.length} items must be an integer in [0, ${container.length}], got ${describeValue(head)}`);
    }
    if (rest.length === 0 && value === undefined) fail(at, `${here}: cannot remove an array item; set the whole array instead`);
    const out = container.slice();
    out[index] = setIn(container[index], rest, value, at, here);
    return out;
  }
  if (container === undefined) container = typeof head === "number" ? [] : {};
  if (Array.isArray(container)) return setIn(container, segments, value, at, where);
  if (!isJsonObject(container)) fail(at, `${where || "settings"} is ${describeValue(container)}, not an object: cannot set ${JSON.stringify(String(head))} inside it`);
  const key = String(head);
  const inner = setIn(container[key], rest, value, at, here);
  if (inner === undefined && !(key in container)) return container;
  return withKey(container, key, inner);
}

function checkedJson(value: unknown, path: string): unknown {
  const copy = copyJsonData(value, path);
  if ("issue" in copy) throw new StudyFormatError([copy.issue]);
  return copy.value;
}

/**
 * Applies changes to a study and returns the new study with the ids of the
 * cells that changed. Never mutates `study`: unchanged cells are shared (same
 * objects), new parts are deep copies of what the changes carry, frozen.
 *
 * Throws a {@link StudyFormatError} — and changes nothing — when a change
 * cannot apply (unknown id: path `changes[2].id`; index out of range; value
 * that is not JSON data) or when the result is not a valid study (paths in the
 * new study, e.g. `cells[1].settings.epsilon.relative: must be > 0, got 0`).
 * `study` is taken to be valid: only the cells the changes touched are checked
 * again in full, plus ids, names, the top-level fields and receipts.
 */
export function updateStudy(study: StudyDocument, changes: readonly StudyChange[]): StudyUpdate {
  let cells: Cell[] = study.cells.slice();
  let top: StudyDocument = study;
  const changed = new Set<string>();
  let dirty = false;

  const indexOf = (id: unknown, at: string): number => {
    const i = cells.findIndex((c) => c.id === id);
    if (i < 0) fail(at, `no cell has id ${describeValue(id)}`);
    return i;
  };
  const replaceCell = (i: number, cell: Cell) => {
    cells[i] = cell;
    changed.add(cell.id);
    dirty = true;
  };
  const setTop = (key: string, value: unknown) => {
    if (jsonEqual(top[key], value)) return false;
    top = withKey(top, key, value, STUDY_ORDER);
    dirty = true;
    return true;
  };

  changes.forEach((change, k) => {
    const at = `changes[${k}]`;
    switch (change.type) {
      case "set-setting": {
        const i = indexOf(change.id, childPath(at, "id"));
        const segments = splitPath(change.path, childPath(at, "path"));
        const value = change.value === undefined ? undefined : checkedJson(change.value, childPath(at, "value"));
        const settings = setIn(cells[i].settings, segments, value, childPath(at, "path"), "");
        if (!jsonEqual(settings, cells[i].settings)) replaceCell(i, withKey(cells[i], "settings", settings) as Cell);
        break;
      }
      case "set-settings": {
        const i = indexOf(change.id, childPath(at, "id"));
        const settings = checkedJson(change.settings, childPath(at, "settings"));
        if (!jsonEqual(settings, cells[i].settings)) replaceCell(i, withKey(cells[i], "settings", settings) as Cell);
        break;
      }
      case "insert-cell": {
        const cell = checkedJson(change.cell, childPath(at, "cell"));
        if (!isJsonObject(cell)) fail(childPath(at, "cell"), `must be a cell object, got ${describeValue(change.cell)}`);
        const index = change.index ?? cells.length;
        if (!Number.isInteger(index) || index < 0 || index > cells.length) fail(childPath(at, "index"), `must be an integer in [0, ${cells.length}], got ${describeValue(index)}`);
        // Known fields first, in the usual order; then the cell's other fields as given.
        let ordered: object = {};
        for (const key of CELL_ORDER) if (cell[key] !== undefined) ordered = withKey(ordered, key, cell[key]);
        for (const [key, value] of Object.entries(cell)) if (!CELL_ORDER.includes(key)) ordered = withKey(ordered, key, value);
        cells.splice(index, 0, ordered as Cell);
        if (typeof cell.id === "string") changed.add(cell.id);
        dirty = true;
        break;
      }
      case "remove-cell": {
        const i = indexOf(change.id, childPath(at, "id"));
        cells.splice(i, 1);
        changed.add(change.id);
        dirty = true;
        if (top.receipts && change.id in top.receipts) setTop("receipts", withKey(top.receipts, change.id, undefined));
        break;
      }
      case "move-cell": {
        const i = indexOf(change.id, childPath(at, "id"));
        const { index } = change;
        if (!Number.isInteger(index) || index < 0 || index >= cells.length) fail(childPath(at, "index"), `must be an integer in [0, ${cells.length - 1}], got ${describeValue(index)}`);
        if (index !== i) {
          const [cell] = cells.splice(i, 1);
          cells.splice(index, 0, cell);
          changed.add(change.id);
          dirty = true;
        }
        break;
      }
      case "rename": {
        const i = indexOf(change.id, childPath(at, "id"));
        const before = cells[i].name;
        if (change.name === before) break;
        if (change.name !== undefined && typeof change.name !== "string") fail(childPath(at, "name"), `must be a string or undefined, got ${describeValue(change.name)}`);
        replaceCell(i, withKey(cells[i], "name", change.name, CELL_ORDER) as Cell);
        if ((change.updateReferences ?? true) && before !== undefined && change.name !== undefined) {
          const to = change.name;
          cells = cells.map((cell) => {
            if (!isCellKindName(cell.kind) || !isJsonObject(cell.settings)) return cell;
            const settings = kindSettings(cell.kind).mapReferences(cell.settings, (name) => (name === before ? to : name));
            if (settings === cell.settings) return cell;
            changed.add(cell.id);
            return withKey(cell, "settings", settings) as Cell;
          });
        }
        break;
      }
      case "set-seed":
        if (setTop("seed", change.seed)) {
          for (const cell of cells) if (kindSettings(cell.kind).usesStudySeed(cell.settings)) changed.add(cell.id);
        }
        break;
      case "set-title":
        setTop("title", change.title);
        break;
      case "set-about":
        setTop("about", change.about);
        break;
      case "set-receipt": {
        indexOf(change.id, childPath(at, "id"));
        const receipt = change.receipt === undefined ? undefined : checkedJson(change.receipt, childPath(at, "receipt"));
        const receipts = top.receipts ?? {};
        if (!jsonEqual(receipts[change.id], receipt)) setTop("receipts", withKey(receipts, change.id, receipt));
        break;
      }
      default:
        fail(childPath(at, "type"), `unknown change ${describeValue((change as { type: unknown }).type)}; known: set-setting, set-settings, insert-cell, remove-cell, move-cell, rename, set-seed, set-title, set-about, set-receipt`);
    }
  });

  if (!dirty) return { study, changed };
  const sameCells = cells.length === study.cells.length && cells.every((c, i) => c === study.cells[i]);
  const next = withKey(top, "cells", sameCells ? study.cells : cells, STUDY_ORDER);
  const issues: StudyIssue[] = studyIssues(next, { trustedCells: new Set(study.cells) });
  if (issues.length > 0) throw new StudyFormatError(issues);
  return { study: deepFreeze(next), changed };
}
