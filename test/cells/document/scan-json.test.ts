import { readFileSync, readdirSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { seededRandom } from "../../../core/random";
import { positionAt, scanJson } from "../../../cells/document/scan-json";

const fixtureDir = new URL("../../fixtures/studies/", import.meta.url);
const fixtures = readdirSync(fixtureDir).filter((f) => f.endsWith(".json")).map((f) => readFileSync(new URL(f, fixtureDir), "utf8"));

function parses(text: string): boolean {
  try {
    JSON.parse(text);
    return true;
  } catch {
    return false;
  }
}

describe("scanJson", () => {
  it("scanJson accepts every fixture study and finds no repeated keys", () => {
    for (const text of fixtures) expect(scanJson(text)).toEqual({ duplicates: [] });
  });

  it("scanJson agrees with JSON.parse on which texts are JSON, over 2000 seeded one-character edits", () => {
    // Oracle: the engine's JSON.parse (ECMA-262 JSON.parse, grammar of ECMA-404 / RFC 8259).
    const random = seededRandom(20261201);
    const alphabet = ['"', "{", "}", "[", "]", ",", ":", "0", "-", ".", "e", "+", "\\", "u", "t", "n", " ", "\n", "\t", "\u0001", "x", "1", "/", "'", "N"];
    const base = fixtures[0];
    for (let trial = 0; trial < 2000; trial++) {
      const at = Math.floor(random() * base.length);
      const op = random();
      const ch = alphabet[Math.floor(random() * alphabet.length)];
      const text = op < 0.4 ? base.slice(0, at) + base.slice(at + 1) : op < 0.7 ? base.slice(0, at) + ch + base.slice(at) : base.slice(0, at) + ch + base.slice(at + 1);
      const scan = scanJson(text);
      if ((scan.error === undefined) !== parses(text)) {
        throw new Error(`disagreement on edit ${trial} at offset ${at}: scan ${JSON.stringify(scan.error)} vs JSON.parse ${parses(text)}\n${text.slice(Math.max(0, at - 40), at + 40)}`);
      }
    }
  });

  it("scanJson agrees with JSON.parse on small tricky texts", () => {
    const cases = [
      "0", "-0", "01", "1.", ".5", "1e", "1e+", "1E-2", "-", "--1", "true", "tru", "nul", "null ", " [ ] ", "[1,]", "[,1]", "{,}", '{"a":1,}',
      '{"a" 1}', '{"a":}', '{a:1}', "'a'", '"\\x"', '"\\u12"', '"\\u12ab"', '"\t"', '"\\/"', '"a', "[1] [2]", "NaN", "Infinity", "-Infinity",
      '"\ud800"', "\u00a0[]", "[1]\u000b", "{}", "[[[[]]]]", '{"":0}', "1 2", "[1 2]",
    ];
    for (const text of cases) expect([text, scanJson(text).error === undefined]).toEqual([text, parses(text)]);
  });

  it("scanJson explains common hand-editing mistakes", () => {
    expect(scanJson('{"a": 1 // note\n}').error?.message).toBe("comments are not allowed in JSON");
    expect(scanJson("{'a': 1}").error?.message).toBe('strings must be in double quotes ("), not single quotes');
    expect(scanJson('{"a": [1, 2,]}').error?.message).toBe('expected a value after ",": a trailing comma is not allowed in JSON');
    expect(scanJson('{"a": 1,}').error?.message).toBe('expected a property name after ",": a trailing comma is not allowed in JSON');
    expect(scanJson('{"a": 1 "b": 2}').error?.message).toBe('expected "," or "}" after a property value, got "\\""');
    expect(scanJson('{"a": NaN}').error?.message).toBe("NaN is not a JSON value");
    expect(scanJson('{"a": 012}').error?.message).toBe("invalid number: leading zeros are not allowed");
    expect(scanJson('{"a": "line\nbreak"}').error?.message).toBe("control character U+000A inside a string: write it as an escape such as \\n or \\t");
    expect(scanJson('{"a": "open').error?.message).toBe('unterminated string: the closing " is missing');
    expect(scanJson('{"a": 1}}').error?.message).toBe('unexpected "}" after the end of the JSON value');
  });

  it("scanJson locates an error by 1-based line and column", () => {
    expect(scanJson('{\n  "a": 1,\n  "b": ]\n}').error).toEqual({ offset: 19, line: 3, column: 8, message: 'expected a value, got "]"' });
    // An unterminated string is reported where it opens.
    expect(scanJson('[\n "abc').error).toMatchObject({ line: 2, column: 2 });
  });

  it("scanJson reports keys repeated within one object with their path, but not across objects", () => {
    const scan = scanJson('{"a": {"x": 1, "y": 2, "x": 3}, "b": [{"x": 1}, {"x": 2, "x": 2}]}');
    expect(scan.duplicates).toEqual([
      { path: "a", key: "x", offset: 23, line: 1, column: 24 },
      { path: "b[1]", key: "x", offset: 57, line: 1, column: 58 },
    ]);
  });

  it("scanJson compares keys after unescaping", () => {
    expect(scanJson('{"ab": 1, "a\\u0062": 2}').duplicates).toHaveLength(1);
  });
});

describe("positionAt", () => {
  it("positionAt counts LF, CRLF and CR as one line end each", () => {
    expect(positionAt("a\nb\r\nc\rd", 7)).toEqual({ offset: 7, line: 4, column: 1 });
    expect(positionAt("a\r\nb", 3)).toEqual({ offset: 3, line: 2, column: 1 });
  });
});
