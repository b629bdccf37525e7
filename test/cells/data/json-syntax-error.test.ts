import { describe, expect, it } from "vitest";
import { findJsonSyntaxError } from "../../../cells/data/json-syntax-error";

describe("findJsonSyntaxError", () => {
  it("findJsonSyntaxError returns undefined for valid JSON", () => {
    for (const text of ['{"columns": ["x"], "rows": [[1.5e-3], [-0]]}', " [ ] ", '"a\\u00e9\\n"', "null", "-0.5E+2"]) {
      expect(findJsonSyntaxError(text), text).toBeUndefined();
    }
  });

  it("findJsonSyntaxError gives line, column and what was expected", () => {
    expect(findJsonSyntaxError('{\n "rows": [[1],\n  [2,]]}')).toEqual({ offset: 22, line: 3, column: 6, expected: "a value (number, string, array, object, true, false or null)" });
    expect(findJsonSyntaxError("{'x': 1}")).toMatchObject({ line: 1, column: 2, expected: "a key in double quotes" });
    expect(findJsonSyntaxError("[1, 2")).toMatchObject({ offset: 5, expected: '"," or "]"' });
    expect(findJsonSyntaxError("[1]\r\n x")).toMatchObject({ line: 2, column: 2, expected: "end of text after the value" });
    expect(findJsonSyntaxError("[01]")).toMatchObject({ offset: 2 });
    expect(findJsonSyntaxError("[NaN]")).toMatchObject({ offset: 1 });
  });

  it("findJsonSyntaxError agrees with JSON.parse on validity over 3000 seeded mutations", () => {
    // Oracle: the engine's JSON.parse (ECMA-262 JSON.parse implements RFC 8259 / ECMA-404).
    // Mutations come from the Park–Miller minimal standard generator (Park & Miller 1988, CACM 31).
    let state = 1;
    const next = (m: number): number => {
      state = (state * 16807) % 2147483647;
      return state % m;
    };
    const base = '{"columns": ["x", "y"], "rows": [[1.5, -2e3], [0, 0.25]], "s": "a\\"b\\u0041"}';
    const alphabet = '{}[],:"\\ -+.eE0123456789tfnulrsaxy\n\t\u0001';
    for (let trial = 0; trial < 3000; trial++) {
      let text = base;
      const edits = 1 + next(3);
      for (let e = 0; e < edits; e++) {
        const at = next(text.length + 1);
        const kind = next(3);
        const c = alphabet[next(alphabet.length)];
        text = kind === 0 ? text.slice(0, at) + text.slice(at + 1) : kind === 1 ? text.slice(0, at) + c + text.slice(at) : text.slice(0, at) + c + text.slice(at + 1);
      }
      let valid = true;
      try {
        JSON.parse(text);
      } catch {
        valid = false;
      }
      expect(findJsonSyntaxError(text) === undefined, JSON.stringify(text)).toBe(valid);
    }
  });
});
