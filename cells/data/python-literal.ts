/**
 * A value of the small Python literal language a .npy header is written in:
 * str → string, int → number, True/False → boolean, None → null,
 * list → array, tuple → {@link PythonTuple}, dict with str keys → Map.
 */
export type PythonValue = string | number | boolean | null | PythonValue[] | PythonTuple | Map<string, PythonValue>;

/** A Python tuple, kept apart from lists because the .npy `shape` must be a tuple. */
export interface PythonTuple {
  readonly tuple: PythonValue[];
}

/** Thrown by {@link parsePythonLiteral}; `offset` is the character position of the problem. */
export class PythonLiteralError extends Error {
  readonly offset: number;
  constructor(message: string, offset: number) {
    super(`${message} at character ${offset}`);
    this.name = "PythonLiteralError";
    this.offset = offset;
  }
}

/**
 * Parses one Python literal expression (surrounding whitespace allowed): the
 * subset `ast.literal_eval` needs for .npy headers — strings in single or
 * double quotes with backslash escapes, decimal integers (a Python 2 `L`
 * suffix is accepted, as numpy's reader does), True, False, None, and
 * lists, tuples and dicts with optional trailing commas. Floats, sets and
 * expressions are rejected, since no .npy header needs them.
 * Throws {@link PythonLiteralError}.
 */
export function parsePythonLiteral(text: string): PythonValue {
  const parser = new LiteralParser(text);
  const value = parser.value();
  parser.skipSpace();
  if (!parser.atEnd()) parser.fail("unexpected text after the literal");
  return value;
}

class LiteralParser {
  private pos = 0;
  constructor(private readonly text: string) {}

  atEnd(): boolean {
    return this.pos >= this.text.length;
  }

  fail(message: string): never {
    throw new PythonLiteralError(message, this.pos);
  }

  skipSpace(): void {
    while (this.pos < this.text.length && " \t\r\n\f\v".includes(this.text[this.pos])) this.pos++;
  }

  value(): PythonValue {
    this.skipSpace();
    const c = this.text[this.pos];
    if (c === undefined) this.fail("unexpected end of text");
    if (c === "{") return this.dict();
    if (c === "[") return this.sequence("[", "]");
    if (c === "(") return this.parenthesised();
    if (c === "'" || c === '"') return this.string();
    if (c === "-" || c === "+" || (c >= "0" && c <= "9")) return this.integer();
    const word = /^[A-Za-z_]\w*/.exec(this.text.slice(this.pos, this.pos + 32));
    if (word !== null) {
      const names: Record<string, PythonValue> = { True: true, False: false, None: null };
      if (Object.hasOwn(names, word[0])) {
        this.pos += word[0].length;
        return names[word[0]];
      }
      this.fail(`unknown name ${JSON.stringify(word[0])}`);
    }
    this.fail(`unexpected character ${JSON.stringify(c)}`);
  }

  private expect(c: string): void {
    this.skipSpace();
    if (this.text[this.pos] !== c) this.fail(`expected ${JSON.stringify(c)}`);
    this.pos++;
  }

  /** True (and consumes it) when the next non-space character is `c`. */
  private take(c: string): boolean {
    this.skipSpace();
    if (this.text[this.pos] !== c) return false;
    this.pos++;
    return true;
  }

  private dict(): Map<string, PythonValue> {
    this.expect("{");
    const map = new Map<string, PythonValue>();
    while (!this.take("}")) {
      this.skipSpace();
      const keyAt = this.pos;
      const key = this.value();
      if (typeof key !== "string") {
        this.pos = keyAt;
        this.fail("dictionary keys must be strings");
      }
      this.expect(":");
      // A repeated key keeps the last value in Python; a header that repeats one is damaged.
      if (map.has(key)) {
        this.pos = keyAt;
        this.fail(`key ${JSON.stringify(key)} appears twice`);
      }
      map.set(key, this.value());
      if (!this.take(",")) {
        this.expect("}");
        break;
      }
    }
    return map;
  }

  private sequence(open: string, close: string): PythonValue[] {
    this.expect(open);
    const items: PythonValue[] = [];
    while (!this.take(close)) {
      items.push(this.value());
      if (!this.take(",")) {
        this.expect(close);
        break;
      }
    }
    return items;
  }

  /** `()` and `(a,)` and `(a, b)` are tuples; `(a)` is just a. */
  private parenthesised(): PythonValue {
    this.expect("(");
    if (this.take(")")) return { tuple: [] };
    const first = this.value();
    if (this.take(")")) return first;
    this.expect(",");
    const items = [first];
    while (!this.take(")")) {
      items.push(this.value());
      if (!this.take(",")) {
        this.expect(")");
        break;
      }
    }
    return { tuple: items };
  }

  private integer(): number {
    const match = /^[+-]?\d+(?![.\deEjJ])/.exec(this.text.slice(this.pos));
    if (match === null) this.fail("expected an integer (floats do not occur in a .npy header)");
    this.pos += match[0].length;
    if (this.text[this.pos] === "L" || this.text[this.pos] === "l") this.pos++;
    const value = Number(match[0]);
    if (!Number.isSafeInteger(value)) this.fail(`integer ${match[0]} is too large`);
    return value;
  }

  private string(): string {
    const quote = this.text[this.pos];
    const start = this.pos;
    this.pos++;
    let out = "";
    for (;;) {
      const c = this.text[this.pos];
      if (c === undefined || c === "\n") {
        this.pos = start;
        this.fail("unterminated string");
      }
      this.pos++;
      if (c === quote) return out;
      if (c !== "\\") {
        out += c;
        continue;
      }
      out += this.escape();
    }
  }

  private escape(): string {
    const c = this.text[this.pos++];
    const simple: Record<string, string> = { "\\": "\\", "'": "'", '"': '"', n: "\n", t: "\t", r: "\r", "0": "\0", a: "\x07", b: "\b", f: "\f", v: "\v" };
    if (c !== undefined && Object.hasOwn(simple, c)) return simple[c];
    const hexLength = c === "x" ? 2 : c === "u" ? 4 : c === "U" ? 8 : 0;
    if (hexLength > 0) {
      const hex = this.text.slice(this.pos, this.pos + hexLength);
      if (!new RegExp(`^[0-9a-fA-F]{${hexLength}}$`).test(hex)) this.fail(`bad \\${c} escape`);
      this.pos += hexLength;
      const code = parseInt(hex, 16);
      if (code > 0x10ffff) this.fail(`\\${c} escape beyond Unicode`);
      return String.fromCodePoint(code);
    }
    // Python keeps an unknown escape as backslash plus character.
    return `\\${c ?? ""}`;
  }
}
