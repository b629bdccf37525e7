import { childPath } from "./study-issue";

/** Where something was found in a text: offset (UTF-16 units), 1-based line and column. */
export interface TextPosition {
  readonly offset: number;
  readonly line: number;
  readonly column: number;
}

/** A syntax error in JSON text, located, with a message that says what was expected. */
export interface JsonSyntaxProblem extends TextPosition {
  readonly message: string;
}

/** A key written twice in one object (JSON.parse silently keeps the last). */
export interface DuplicateKey extends TextPosition {
  /** Path of the object holding the key, as in study issues ("" = top level). */
  readonly path: string;
  readonly key: string;
}

/** What {@link scanJson} found. */
export interface JsonScan {
  /** The first syntax error, if the text is not JSON. */
  readonly error?: JsonSyntaxProblem;
  /** Keys repeated within an object, in text order (only up to the syntax error, if any). */
  readonly duplicates: readonly DuplicateKey[];
}

/** Converts an offset into a 1-based line and column (LF, CRLF and CR all end lines). */
export function positionAt(text: string, offset: number): TextPosition {
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || (c === 13 && text.charCodeAt(i + 1) !== 10)) {
      line++;
      lineStart = i + 1;
    }
  }
  return { offset, line, column: offset - lineStart + 1 };
}

class SyntaxStop {
  constructor(
    readonly offset: number,
    readonly message: string,
  ) {}
}

function describeChar(text: string, i: number): string {
  if (i >= text.length) return "the end of the text";
  const c = text.codePointAt(i)!;
  if (c < 0x20 || c === 0x7f) return `control character U+${c.toString(16).toUpperCase().padStart(4, "0")}`;
  return JSON.stringify(String.fromCodePoint(c));
}

/**
 * Checks JSON text (RFC 8259 grammar, as `JSON.parse` accepts it) and reports
 * the first syntax error with its line, column and what was expected, plus any
 * key repeated within an object. It builds no values: pair it with JSON.parse.
 */
export function scanJson(text: string): JsonScan {
  const duplicates: DuplicateKey[] = [];
  let i = 0;

  const ws = () => {
    for (;;) {
      const c = text.charCodeAt(i);
      if (c === 32 || c === 9 || c === 10 || c === 13) i++;
      else break;
    }
  };
  const stop = (message: string, at = i): never => {
    throw new SyntaxStop(at, message);
  };
  const unexpected = (expected: string): never => {
    if (i >= text.length) stop(`unexpected end of the text: expected ${expected}`);
    const c = text[i];
    if (c === "/" && (text[i + 1] === "/" || text[i + 1] === "*")) stop("comments are not allowed in JSON");
    if (c === "'") stop("strings must be in double quotes (\"), not single quotes");
    return stop(`expected ${expected}, got ${describeChar(text, i)}`);
  };

  /** Scans a string; builds its value only when `keep` (object keys), since values are not needed. */
  const string = (keep: boolean): string => {
    const start = i;
    i++; // opening quote
    let out = "";
    let run = i;
    for (;;) {
      if (i >= text.length) stop("unterminated string: the closing \" is missing", start);
      const c = text.charCodeAt(i);
      if (c === 34) {
        if (keep) out += text.slice(run, i);
        i++;
        return out;
      }
      if (c < 0x20) stop(`${describeChar(text, i)} inside a string: write it as an escape such as \\n or \\t`);
      if (c === 92) {
        if (keep) out += text.slice(run, i);
        const e = text[i + 1];
        const simple: Record<string, string> = { '"': '"', "\\": "\\", "/": "/", b: "\b", f: "\f", n: "\n", r: "\r", t: "\t" };
        if (e !== undefined && e in simple) {
          out += simple[e];
          i += 2;
        } else if (e === "u") {
          const hex = text.slice(i + 2, i + 6);
          if (!/^[0-9A-Fa-f]{4}$/.test(hex)) stop("invalid \\u escape: \\u must be followed by 4 hexadecimal digits");
          out += String.fromCharCode(parseInt(hex, 16));
          i += 6;
        } else if (e === undefined) {
          stop("unterminated string: the closing \" is missing", start);
        } else {
          stop(`invalid escape \\${e} in a string (valid: \\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX)`);
        }
        run = i;
        continue;
      }
      i++;
    }
  };

  const digits = () => {
    const start = i;
    while (text.charCodeAt(i) >= 48 && text.charCodeAt(i) <= 57) i++;
    return i - start;
  };

  const number = () => {
    const start = i;
    if (text[i] === "-") i++;
    if (text[i] === "0") {
      i++;
      if (text.charCodeAt(i) >= 48 && text.charCodeAt(i) <= 57) stop("invalid number: leading zeros are not allowed", start);
    } else if (digits() === 0) stop(`invalid number: expected a digit, got ${describeChar(text, i)}`);
    if (text[i] === ".") {
      i++;
      if (digits() === 0) stop(`invalid number: expected a digit after ".", got ${describeChar(text, i)}`);
    }
    if (text[i] === "e" || text[i] === "E") {
      i++;
      if (text[i] === "+" || text[i] === "-") i++;
      if (digits() === 0) stop(`invalid number: expected a digit in the exponent, got ${describeChar(text, i)}`);
    }
  };

  const literal = (word: string) => {
    if (text.startsWith(word, i)) i += word.length;
    else unexpected("a value");
  };

  const value = (path: string): void => {
    ws();
    const c = text[i];
    if (c === "{") return object(path);
    if (c === "[") return array(path);
    if (c === '"') {
      string(false);
      return;
    }
    if (c === "-" || (c !== undefined && c >= "0" && c <= "9")) return number();
    if (c === "t") return literal("true");
    if (c === "f") return literal("false");
    if (c === "n") return literal("null");
    if (c === "N" && text.startsWith("NaN", i)) stop("NaN is not a JSON value");
    if (c === "I" && text.startsWith("Infinity", i)) stop("Infinity is not a JSON value");
    unexpected("a value");
  };

  const object = (path: string): void => {
    i++; // {
    const seen = new Set<string>();
    ws();
    if (text[i] === "}") {
      i++;
      return;
    }
    for (;;) {
      ws();
      if (text[i] !== '"') {
        if (text[i] === "}") stop("expected a property name after \",\": a trailing comma is not allowed in JSON");
        unexpected("a property name in double quotes");
      }
      const keyAt = i;
      const key = string(true);
      if (seen.has(key)) duplicates.push({ ...positionAt(text, keyAt), path, key });
      seen.add(key);
      ws();
      if (text[i] !== ":") unexpected(`":" after the property name ${JSON.stringify(key)}`);
      i++;
      value(childPath(path, key));
      ws();
      if (text[i] === ",") {
        i++;
        continue;
      }
      if (text[i] === "}") {
        i++;
        return;
      }
      unexpected('"," or "}" after a property value');
    }
  };

  const array = (path: string): void => {
    i++; // [
    ws();
    if (text[i] === "]") {
      i++;
      return;
    }
    for (let index = 0; ; index++) {
      ws();
      if (text[i] === "]") stop("expected a value after \",\": a trailing comma is not allowed in JSON");
      value(childPath(path, index));
      ws();
      if (text[i] === ",") {
        i++;
        continue;
      }
      if (text[i] === "]") {
        i++;
        return;
      }
      unexpected('"," or "]" after an array item');
    }
  };

  try {
    value("");
    ws();
    if (i < text.length) stop(`unexpected ${describeChar(text, i)} after the end of the JSON value`);
    return { duplicates };
  } catch (caught) {
    if (caught instanceof SyntaxStop) return { error: { ...positionAt(text, caught.offset), message: caught.message }, duplicates };
    if (caught instanceof RangeError) return { error: { ...positionAt(text, i), message: "nested too deeply to read" }, duplicates };
    throw caught;
  }
}
