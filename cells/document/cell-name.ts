import { type StudyIssue } from "./study-issue";
import { jsonTypeName } from "./value-checks";

/**
 * Words a cell name cannot be, because code cells refer to cells by name as
 * JavaScript variables: the reserved words of ECMAScript (ECMA-262, 2024,
 * §12.7.2 ReservedWord, plus the words reserved in strict-mode code and modules),
 * `arguments` and `eval` (which strict code cannot bind), and the global values
 * `undefined`, `NaN` and `Infinity` (a cell of that name would silently shadow them).
 */
export const RESERVED_NAMES: ReadonlySet<string> = new Set([
  // ReservedWord
  "await", "break", "case", "catch", "class", "const", "continue", "debugger", "default", "delete", "do",
  "else", "enum", "export", "extends", "false", "finally", "for", "function", "if", "import", "in",
  "instanceof", "new", "null", "return", "super", "switch", "this", "throw", "true", "try", "typeof",
  "var", "void", "while", "with", "yield",
  // reserved in strict-mode code
  "implements", "interface", "let", "package", "private", "protected", "public", "static",
  // cannot be bound in strict code
  "arguments", "eval",
  // global values a cell must not shadow
  "undefined", "NaN", "Infinity",
]);

// IdentifierName of ECMA-262 (§12.7) written with Unicode properties; the names are
// stored as plain strings, so escape sequences such as \u0061 are not accepted.
const IDENTIFIER = /^[\p{ID_Start}$_][\p{ID_Continue}$\u200C\u200D]*$/u;

/** True when `text` is a JavaScript identifier name (reserved words included). */
export function isIdentifierName(text: string): boolean {
  return IDENTIFIER.test(text);
}

/** True when `text` can name a cell: an identifier that is not in {@link RESERVED_NAMES}. */
export function isCellName(text: unknown): text is string {
  return typeof text === "string" && IDENTIFIER.test(text) && !RESERVED_NAMES.has(text);
}

/**
 * Checks a cell name (or a reference to one): messages
 * `must be a cell name (a string), got 3`,
 * `"2eps" is not a valid JavaScript identifier (letters, digits, _ and $; not starting with a digit)`,
 * `"class" cannot be a cell name: it is reserved in JavaScript`.
 */
export function checkCellName(value: unknown, path: string, issues: StudyIssue[]): value is string {
  if (typeof value !== "string") {
    issues.push({ path, message: `must be a cell name (a string), got ${jsonTypeName(value)}` });
    return false;
  }
  if (!IDENTIFIER.test(value)) {
    issues.push({ path, message: `${JSON.stringify(value)} is not a valid JavaScript identifier (letters, digits, _ and $; not starting with a digit)` });
    return false;
  }
  if (RESERVED_NAMES.has(value)) {
    issues.push({ path, message: `${JSON.stringify(value)} cannot be a cell name: it is reserved in JavaScript` });
    return false;
  }
  return true;
}

// Ids start with a letter so that no id looks like an array index: JavaScript
// objects list such keys first, which would reorder `receipts` on save.
const CELL_ID = /^[A-Za-z][A-Za-z0-9_-]{0,63}$/;

/** True for a valid cell id: a letter, then up to 63 letters, digits, `_` or `-`. */
export function isCellId(value: unknown): value is string {
  return typeof value === "string" && CELL_ID.test(value);
}

/** Checks a cell id: `must be a string, got 3` or `"1a" is not a valid cell id (…)`. */
export function checkCellId(value: unknown, path: string, issues: StudyIssue[]): value is string {
  if (typeof value !== "string") {
    issues.push({ path, message: `must be a cell id (a string), got ${jsonTypeName(value)}` });
    return false;
  }
  if (!CELL_ID.test(value)) {
    issues.push({ path, message: `${JSON.stringify(value)} is not a valid cell id (a letter, then up to 63 letters, digits, _ or -)` });
    return false;
  }
  return true;
}
