/**
 * One problem found in a study file. `path` locates it in the study's JSON
 * (`cells[3].settings.epsilon.relative`; "" for the file as a whole) and
 * `message` says what is wrong and what was found (`must be > 0, got -1`).
 * A problem in the JSON text itself also carries a 1-based `line` and `column`.
 */
export interface StudyIssue {
  readonly path: string;
  readonly message: string;
  readonly line?: number;
  readonly column?: number;
}

/** Formats one issue as `path: message` (the file as a whole shows as "(study)"). */
export function formatIssue(issue: StudyIssue): string {
  return `${issue.path === "" ? "(study)" : issue.path}: ${issue.message}`;
}

/**
 * A study text or document that cannot be used as it is. Carries every issue
 * found (not only the first), each with its path, so an editor can mark them all.
 * The message lists them one per line, prefixed by the file when known:
 * `depots.couplet.json: 2 problems\n  cells[3].kind: unknown cell kind "plot"; …`.
 */
export class StudyFormatError extends Error {
  /** All problems, in document order. Never empty. */
  readonly issues: readonly StudyIssue[];
  /** The file the text came from, when known. */
  readonly file?: string;

  constructor(issues: readonly StudyIssue[], options: { file?: string } = {}) {
    const head = `${options.file ? `${options.file}: ` : ""}${issues.length === 1 ? "1 problem" : `${issues.length} problems`}`;
    super(`${head}\n${issues.map((issue) => `  ${formatIssue(issue)}`).join("\n")}`);
    this.name = "StudyFormatError";
    this.issues = issues;
    if (options.file !== undefined) this.file = options.file;
  }
}

const PLAIN_KEY = /^[A-Za-z_$][A-Za-z0-9_$]*$/;

/**
 * The path of a member of the value at `path`: `.key` for plain keys,
 * `["odd key"]` otherwise, `[3]` for array indices. `childPath("", "cells")` is "cells".
 */
export function childPath(path: string, key: string | number): string {
  if (typeof key === "number") return `${path}[${key}]`;
  if (PLAIN_KEY.test(key)) return path === "" ? key : `${path}.${key}`;
  return `${path}[${JSON.stringify(key)}]`;
}
