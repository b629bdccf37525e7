import { RESERVED_NAMES, isIdentifierName } from "../../document/cell-name";
import { MAX_DIGITS, type NumberNotation } from "../../document/number-format";
import { type NameMapper, collectReferences } from "../../document/references";
import { type StudyIssue, childPath } from "../../document/study-issue";
import { checkObject, checkPresent, checkString } from "../../document/value-checks";

/**
 * Settings of a prose cell: Markdown text with live values of other cells.
 *
 * Live-value syntax (ours): `@{name}` shows the value of the cell `name`;
 * `@{plan.values.cost}` follows fields into it (identifiers or array indices);
 * `@{eps:3f}` formats a number — digits then `f` (fixed: digits after the point),
 * `s` (significant digits, the default letter) or `e` (scientific). Spaces are
 * allowed inside the braces: `@{ plan.values.cost : 4 }`. A live value stays on
 * one line. A backslash right before it, `\@{…}`, makes it plain text `@{…}`.
 */
export interface ProseSettings {
  /** Markdown source, with live values. */
  readonly text: string;
  readonly [extra: string]: unknown;
}

/** A parsed live value `@{name.path:format}` inside prose text. */
export interface LiveValue {
  /** Offset of "@" in the text (UTF-16 units). */
  readonly start: number;
  /** Offset just after the closing "}". */
  readonly end: number;
  /** The cell named. */
  readonly name: string;
  /** Offsets of the name within the text, for renaming in place. */
  readonly nameStart: number;
  readonly nameEnd: number;
  /** Fields followed into the value: identifiers, or digit strings for array indices. */
  readonly path: readonly string[];
  /** Number format; absent means the runtime's default display. */
  readonly format?: { readonly digits: number; readonly notation: Exclude<NumberNotation, "auto"> };
}

/** A piece of prose: literal Markdown (escapes already removed) or a live value. */
export type ProseSegment = { readonly kind: "text"; readonly text: string } | { readonly kind: "value"; readonly value: LiveValue };

/** A malformed live value, located by offset and 1-based line and column. */
export interface ProseProblem {
  readonly offset: number;
  readonly line: number;
  readonly column: number;
  readonly message: string;
}

const FORMAT = /^(\d+)([fse]?)$/;
const NOTATION_OF = { f: "fixed", s: "significant", e: "scientific", "": "significant" } as const;
const INDEX = /^\d+$/;

function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let start = 0;
  for (let i = 0; i < offset; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      start = i + 1;
    }
  }
  return { line, column: offset - start + 1 };
}

/**
 * Splits prose into text and live values. Malformed live values are reported
 * in `problems` and kept as plain text, so a renderer can still show the rest.
 * Joining the text segments and each value's source gives back the text, less
 * the backslashes of escaped `\@{`.
 */
export function splitProse(text: string): { segments: ProseSegment[]; problems: ProseProblem[] } {
  const segments: ProseSegment[] = [];
  const problems: ProseProblem[] = [];
  let plain = "";
  let i = 0;
  const problem = (offset: number, message: string) => problems.push({ offset, ...lineColumn(text, offset), message });
  while (i < text.length) {
    const at = text.indexOf("@{", i);
    if (at < 0) {
      plain += text.slice(i);
      break;
    }
    if (at > 0 && text[at - 1] === "\\") {
      plain += text.slice(i, at - 1) + "@{";
      i = at + 2;
      continue;
    }
    plain += text.slice(i, at);
    const lineEnd = text.indexOf("\n", at);
    const close = text.indexOf("}", at + 2);
    if (close < 0 || (lineEnd >= 0 && close > lineEnd)) {
      const shown = text.slice(at, lineEnd < 0 ? Math.min(text.length, at + 24) : Math.min(lineEnd, at + 24));
      problem(at, `live value ${JSON.stringify(shown)} has no closing "}" on its line (write \\@{ for a literal "@{")`);
      plain += "@{";
      i = at + 2;
      continue;
    }
    const source = text.slice(at, close + 1);
    const parsed = parseInside(text, at + 2, close);
    if (typeof parsed === "string") {
      problem(at, `live value ${JSON.stringify(source)}: ${parsed}`);
      plain += source;
    } else {
      if (plain) segments.push({ kind: "text", text: plain });
      plain = "";
      segments.push({ kind: "value", value: { start: at, end: close + 1, ...parsed } });
    }
    i = close + 1;
  }
  if (plain) segments.push({ kind: "text", text: plain });
  return { segments, problems };
}

/** Parses the inside of `@{…}` (text[from, to)); returns the value or an error message. */
function parseInside(text: string, from: number, to: number): Omit<LiveValue, "start" | "end"> | string {
  const inside = text.slice(from, to);
  const colon = inside.indexOf(":");
  const reference = colon < 0 ? inside : inside.slice(0, colon);
  const lead = reference.length - reference.trimStart().length;
  const parts = reference.trim().split(".");
  const name = parts[0];
  if (name === "") return "expected a cell name";
  if (!isIdentifierName(name)) return `${JSON.stringify(name)} is not a cell name`;
  if (RESERVED_NAMES.has(name)) return `${JSON.stringify(name)} is reserved in JavaScript and cannot name a cell`;
  const path = parts.slice(1);
  for (const key of path) {
    if (!isIdentifierName(key) && !INDEX.test(key)) return `${JSON.stringify(key)} after "." must be a field name or an array index`;
  }
  const out: Omit<LiveValue, "start" | "end"> = { name, nameStart: from + lead, nameEnd: from + lead + name.length, path };
  if (colon < 0) return out;
  const spec = inside.slice(colon + 1).trim();
  const match = FORMAT.exec(spec);
  if (!match) return `format ${JSON.stringify(spec)} must be digits then f, s or e (e.g. ":3f", ":4", ":2e")`;
  const digits = Number(match[1]);
  const notation = NOTATION_OF[match[2] as keyof typeof NOTATION_OF];
  const least = notation === "significant" ? 1 : 0;
  if (digits < least || digits > MAX_DIGITS) return `format digits must be between ${least} and ${MAX_DIGITS}, got ${digits}`;
  return { ...out, format: { digits, notation } };
}

/**
 * Validates prose settings at `path` (e.g. "cells[0].settings"): `text` must be
 * a string; each malformed live value is one issue on `path.text` whose message
 * names its line and column: `line 3, column 5: live value "@{3x}": "3x" is not a cell name`.
 */
export function validateProseSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  const textPath = childPath(path, "text");
  if (!checkPresent(settings, "text", path, issues) || !checkString(settings.text, textPath, issues)) return issues;
  for (const p of splitProse(settings.text).problems) issues.push({ path: textPath, message: `line ${p.line}, column ${p.column}: ${p.message}` });
  return issues;
}

/** Renames the cells named in live values, leaving every other character of the text as it was. */
export function mapProseReferences(settings: ProseSettings, rename: NameMapper): ProseSettings {
  const { text } = settings;
  let out = "";
  let last = 0;
  for (const segment of splitProse(text).segments) {
    if (segment.kind !== "value") continue;
    const { name, nameStart, nameEnd } = segment.value;
    const next = rename(name);
    if (next === name) continue;
    out += text.slice(last, nameStart) + next;
    last = nameEnd;
  }
  if (last === 0) return settings;
  return { ...settings, text: out + text.slice(last) };
}

/** Names of the cells whose values the prose shows, in order of first use. */
export function proseDependencies(settings: ProseSettings): string[] {
  return collectReferences(settings, mapProseReferences);
}
