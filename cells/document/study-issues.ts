import { describeValue } from "../../core/errors";
import { CELL_KIND_NAMES, isCellKindName, kindSettings } from "../kinds/settings-registry";
import { checkCellId, checkCellName } from "./cell-name";
import { MIGRATIONS } from "./migrate-study";
import { MAX_SEED } from "./seed";
import { type StudyIssue, childPath } from "./study-issue";
import { CURRENT_FORMAT_VERSION, STUDY_FORMAT } from "./study-types";
import { type JsonObject, checkArray, checkNumber, checkObject, checkPresent, checkString, isJsonObject, jsonTypeName } from "./value-checks";

const OLDEST_VERSION = Math.min(CURRENT_FORMAT_VERSION, ...MIGRATIONS.map((m) => m.from));

// ISO 8601 / RFC 3339 date-time with seconds and a zone, as Date.prototype.toISOString writes.
const DATE_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?(Z|[+-]\d{2}:\d{2})$/;

/** Checks `format` and `formatVersion`; false when the rest cannot be judged. */
function checkHeader(study: JsonObject, issues: StudyIssue[]): boolean {
  if (study.format === undefined) {
    issues.push({ path: "format", message: `missing (required): a study file starts with "format": "${STUDY_FORMAT}"` });
    return false;
  }
  if (study.format !== STUDY_FORMAT) {
    issues.push({ path: "format", message: `must be "${STUDY_FORMAT}", got ${jsonTypeName(study.format)}: this is not a Couplet study` });
    return false;
  }
  const v = study.formatVersion;
  if (v === undefined) {
    issues.push({ path: "formatVersion", message: `missing (required): the format version, ${CURRENT_FORMAT_VERSION} for files written by this version of Couplet` });
    return false;
  }
  if (typeof v !== "number" || !Number.isInteger(v)) {
    issues.push({ path: "formatVersion", message: `must be an integer, got ${jsonTypeName(v)}` });
    return false;
  }
  if (v > CURRENT_FORMAT_VERSION) {
    issues.push({ path: "formatVersion", message: `${v} is newer than this version of Couplet reads (${OLDEST_VERSION} to ${CURRENT_FORMAT_VERSION}); update Couplet to open this study` });
    return false;
  }
  if (v >= OLDEST_VERSION && v < CURRENT_FORMAT_VERSION) {
    issues.push({ path: "formatVersion", message: `${v} is an older format version: migrate the study first (parseStudy does)` });
    return false;
  }
  if (v !== CURRENT_FORMAT_VERSION) {
    issues.push({ path: "formatVersion", message: `${v} is not a Couplet format version (known: ${OLDEST_VERSION} to ${CURRENT_FORMAT_VERSION})` });
    return false;
  }
  return true;
}

function checkCell(cell: unknown, path: string, issues: StudyIssue[]): void {
  if (!checkObject(cell, path, issues)) return;
  if (checkPresent(cell, "id", path, issues)) checkCellId(cell.id, childPath(path, "id"), issues);
  const kindPath = childPath(path, "kind");
  let known = false;
  if (checkPresent(cell, "kind", path, issues)) {
    if (isCellKindName(cell.kind)) known = true;
    else issues.push({ path: kindPath, message: `unknown cell kind ${jsonTypeName(cell.kind)}; known kinds: ${CELL_KIND_NAMES.join(", ")}` });
  }
  if (cell.name !== undefined) checkCellName(cell.name, childPath(path, "name"), issues);
  else if (known && kindSettings(cell.kind as never).nameRequired) checkPresent(cell, "name", path, issues, `for a ${cell.kind} cell: other cells refer to it by name`);
  if (checkPresent(cell, "settings", path, issues) && known) {
    issues.push(...kindSettings(cell.kind as never).validate(cell.settings, childPath(path, "settings")));
  }
}

/** Reports every value of `key` used by two cells: `duplicate id "t1" (also used by cells[2])`. */
function checkUnique(cells: readonly unknown[], key: "id" | "name", issues: StudyIssue[]): void {
  const first = new Map<string, number>();
  cells.forEach((cell, i) => {
    if (!isJsonObject(cell) || typeof cell[key] !== "string") return;
    const value = cell[key] as string;
    const earlier = first.get(value);
    if (earlier === undefined) first.set(value, i);
    else issues.push({ path: `cells[${i}].${key}`, message: `duplicate ${key} ${JSON.stringify(value)} (also used by cells[${earlier}])` });
  });
}

function checkReceipts(receipts: unknown, cells: readonly unknown[], issues: StudyIssue[]): void {
  if (!checkObject(receipts, "receipts", issues)) return;
  const ids = new Set(cells.filter(isJsonObject).map((c) => c.id));
  for (const [id, receipt] of Object.entries(receipts)) {
    const path = childPath("receipts", id);
    if (!ids.has(id)) issues.push({ path, message: `no cell has id ${JSON.stringify(id)}: a receipt belongs to a cell of the study` });
    if (!checkObject(receipt, path, issues)) continue;
    const at = (key: string) => childPath(path, key);
    if (checkPresent(receipt, "fingerprint", path, issues)) checkString(receipt.fingerprint, at("fingerprint"), issues, { nonEmpty: true });
    for (const key of ["settings", "summary"]) if (checkPresent(receipt, key, path, issues)) checkObject(receipt[key], at(key), issues);
    if (checkPresent(receipt, "coreVersion", path, issues)) checkString(receipt.coreVersion, at("coreVersion"), issues, { nonEmpty: true });
    if (checkPresent(receipt, "seconds", path, issues)) checkNumber(receipt.seconds, at("seconds"), issues, { atLeast: 0 });
    if (checkPresent(receipt, "recordedAt", path, issues) && checkString(receipt.recordedAt, at("recordedAt"), issues)) {
      if (!DATE_TIME.test(receipt.recordedAt) || Number.isNaN(Date.parse(receipt.recordedAt))) {
        issues.push({ path: at("recordedAt"), message: `must be an ISO 8601 date-time with a time zone such as "2026-12-01T09:30:00Z", got ${describeValue(receipt.recordedAt)}` });
      }
    }
  }
}

/** Options of {@link studyIssues}. */
export interface StudyIssuesOptions {
  /**
   * Cell objects known to be valid (e.g. the unchanged cells of a study being
   * updated): their own fields are not checked again; ids and names still are.
   */
  readonly trustedCells?: ReadonlySet<unknown>;
}

/**
 * Every problem with a study value of the current format version, each with
 * its path; [] when it is a valid study. Order: top-level fields, then cells in
 * order, then repeated ids and names, then receipts. Stops after the
 * header when `format` or `formatVersion` is wrong (nothing else can be judged).
 * Checks field types and values, each cell's settings through its kind, unique
 * ids and names, and the outer shape of receipts. References between cells are
 * not checked here (a study may be mid-edit): see `referenceIssues`.
 */
export function studyIssues(value: unknown, options: StudyIssuesOptions = {}): StudyIssue[] {
  const { trustedCells } = options;
  const issues: StudyIssue[] = [];
  if (!isJsonObject(value)) {
    issues.push({ path: "", message: `a study must be a JSON object, got ${jsonTypeName(value)}` });
    return issues;
  }
  if (!checkHeader(value, issues)) return issues;
  if (checkPresent(value, "title", "", issues)) checkString(value.title, "title", issues);
  if (value.about !== undefined) checkString(value.about, "about", issues);
  if (value.seed !== undefined) checkNumber(value.seed, "seed", issues, { integer: true, atLeast: 0, atMost: MAX_SEED });
  if (checkPresent(value, "cells", "", issues) && checkArray(value.cells, "cells", issues)) {
    value.cells.forEach((cell, i) => {
      if (!trustedCells?.has(cell)) checkCell(cell, `cells[${i}]`, issues);
    });
    checkUnique(value.cells, "id", issues);
    checkUnique(value.cells, "name", issues);
    if (value.receipts !== undefined) checkReceipts(value.receipts, value.cells, issues);
  }
  return issues;
}
