import { type NameMapper } from "../../document/references";
import { type StudyIssue, childPath } from "../../document/study-issue";
import { checkObject, checkPresent, checkString } from "../../document/value-checks";

/**
 * Settings of a code cell: JavaScript whose free names are other cells. The
 * runtime finds those names by parsing the code; the document keeps the text.
 */
export interface CodeSettings {
  /** JavaScript source: an expression, or statements ending in `return`. */
  readonly code: string;
  readonly [extra: string]: unknown;
}

/** Validates code settings at `path`: `code` must be a string (its syntax is the runtime's business). */
export function validateCodeSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  if (checkPresent(settings, "code", path, issues)) checkString(settings.code, childPath(path, "code"), issues);
  return issues;
}

/**
 * Code is not rewritten by the document: renaming a cell leaves code cells as
 * they are (their names are found, and reported when unknown, by the runtime).
 */
export function mapCodeReferences(settings: CodeSettings, _rename: NameMapper): CodeSettings {
  return settings;
}

/** Always `[]`: a code cell's dependencies come from its code, found by the runtime. */
export function codeDependencies(_settings: CodeSettings): string[] {
  return [];
}
