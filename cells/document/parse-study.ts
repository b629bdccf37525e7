import { deepFreeze } from "./deep-freeze";
import { migrateStudy } from "./migrate-study";
import { scanJson } from "./scan-json";
import { type StudyIssue, StudyFormatError, childPath } from "./study-issue";
import { studyIssues } from "./study-issues";
import type { StudyDocument } from "./study-types";

/** Options of {@link parseStudy}. */
export interface ParseStudyOptions {
  /** The file the text came from, named in the error message. */
  readonly path?: string;
}

/**
 * Reads a study from JSON text: checks the JSON (reporting a syntax error with
 * its line and column, and any key written twice in one object), migrates an
 * older format version to the current one, validates everything, and returns
 * the study deep-frozen. Unknown fields are kept, in their order.
 *
 * Throws a {@link StudyFormatError} listing every issue found, e.g.
 * `cells[3].settings.epsilon.relative: must be > 0, got -1`. Issue paths refer
 * to the study after migration. A leading byte-order mark is ignored.
 */
export function parseStudy(text: string, options: ParseStudyOptions = {}): StudyDocument {
  const file = options.path;
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const scan = scanJson(text);
  if (scan.error) {
    const { line, column, message } = scan.error;
    throw new StudyFormatError([{ path: "", message: `invalid JSON at line ${line}, column ${column}: ${message}`, line, column }], { file });
  }
  const issues: StudyIssue[] = scan.duplicates.map((d) => ({
    path: childPath(d.path, d.key),
    message: `written twice in one object (again at line ${d.line}, column ${d.column}); keep one`,
    line: d.line,
    column: d.column,
  }));
  const migrated = migrateStudy(JSON.parse(text));
  issues.push(...studyIssues(migrated));
  if (issues.length > 0) throw new StudyFormatError(issues, { file });
  return deepFreeze(migrated as StudyDocument);
}

/**
 * Throws a {@link StudyFormatError} unless `study` is a valid study of the
 * current version (for values built in code, e.g. before saving).
 */
export function assertValidStudy(study: unknown, options: ParseStudyOptions = {}): asserts study is StudyDocument {
  const issues = studyIssues(study);
  if (issues.length > 0) throw new StudyFormatError(issues, { file: options.path });
}
