/** Where JSON text stops being valid: character offset, 1-based line and column, and what was expected. */
export interface JsonSyntaxProblem {
  readonly offset: number;
  readonly line: number;
  readonly column: number;
  readonly expected: string;
}

/**
 * Finds the first syntax error of JSON text (RFC 8259 grammar), or returns
 * undefined when the text is valid JSON. Used only after `JSON.parse` failed,
 * because engines differ in whether their message gives a position.
 * Line breaks for the line count are LF, CRLF and CR.
 */
export function findJsonSyntaxError(text: string): JsonSyntaxProblem | undefined {
  const scanner = new JsonScanner(text);
  try {
    scanner.space();
    scanner.value();
    scanner.space();
    if (scanner.pos < text.length) scanner.fail("end of text after the value");
    return undefined;
  } catch (error) {
    if (!(error instanceof Stop)) throw error;
    return { offset: error.offset, ...lineAndColumn(text, error.offset), expected: error.expected };
  }
}

/** RFC 8259 number; sticky so it matches exactly at lastIndex. */
const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;

class Stop {
  constructor(
    readonly offset: number,
    readonly expected: string,
  ) {}
}

class JsonScanner {
  pos = 0;
  constructor(private readonly text: string) {}

  fail(expected: string): never {
    throw new Stop(this.pos, expected);
  }

  space(): void {
    while (this.pos < this.text.length && " \t\n\r".includes(this.text[this.pos])) this.pos++;
  }

  value(): void {
    const c = this.text[this.pos];
    if (c === "{") return this.object();
    if (c === "[") return this.array();
    if (c === '"') return this.string();
    if (c === "-" || (c >= "0" && c <= "9")) return this.number();
    for (const word of ["true", "false", "null"]) {
      if (this.text.startsWith(word, this.pos)) {
        this.pos += word.length;
        return;
      }
    }
    this.fail("a value (number, string, array, object, true, false or null)");
  }

  private object(): void {
    this.pos++;
    this.space();
    if (this.text[this.pos] === "}") {
      this.pos++;
      return;
    }
    for (;;) {
      if (this.text[this.pos] !== '"') this.fail('a key in double quotes');
      this.string();
      this.space();
      if (this.text[this.pos] !== ":") this.fail('":" after the key');
      this.pos++;
      this.space();
      this.value();
      this.space();
      const c = this.text[this.pos];
      if (c === "}") {
        this.pos++;
        return;
      }
      if (c !== ",") this.fail('"," or "}"');
      this.pos++;
      this.space();
    }
  }

  private array(): void {
    this.pos++;
    this.space();
    if (this.text[this.pos] === "]") {
      this.pos++;
      return;
    }
    for (;;) {
      this.value();
      this.space();
      const c = this.text[this.pos];
      if (c === "]") {
        this.pos++;
        return;
      }
      if (c !== ",") this.fail('"," or "]"');
      this.pos++;
      this.space();
    }
  }

  private string(): void {
    this.pos++;
    for (;;) {
      const c = this.text[this.pos];
      if (c === undefined) this.fail('a closing "');
      if (c === '"') {
        this.pos++;
        return;
      }
      if (c < " ") this.fail("no raw control character inside a string (write \\n, \\t, …)");
      if (c === "\\") {
        const e = this.text[this.pos + 1];
        if (e !== undefined && '"\\/bfnrt'.includes(e)) this.pos += 2;
        else if (e === "u" && /^[0-9a-fA-F]{4}$/.test(this.text.slice(this.pos + 2, this.pos + 6))) this.pos += 6;
        else this.fail("a valid escape (\\\", \\\\, \\/, \\b, \\f, \\n, \\r, \\t or \\uXXXX)");
      } else {
        this.pos++;
      }
    }
  }

  private number(): void {
    NUMBER.lastIndex = this.pos;
    if (!NUMBER.test(this.text)) this.fail("a number");
    this.pos = NUMBER.lastIndex;
  }
}

function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let k = 0; k < offset; k++) {
    const c = text[k];
    if (c === "\n" || (c === "\r" && text[k + 1] !== "\n")) {
      line++;
      lineStart = k + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}
