import { describe, expect, it } from "vitest";
import { PythonLiteralError, parsePythonLiteral } from "../../../cells/data/python-literal";

// The grammar follows Python's literal syntax as ast.literal_eval accepts it
// (Python Language Reference, "Literals" and "Parenthesized forms"); common practice, no other source.
describe("parsePythonLiteral", () => {
  it("parsePythonLiteral reads a numpy header dict with its trailing comma and padding", () => {
    const value = parsePythonLiteral("{'descr': '<f8', 'fortran_order': False, 'shape': (3, 2), }          \n");
    expect(value).toEqual(new Map<string, unknown>([["descr", "<f8"], ["fortran_order", false], ["shape", { tuple: [3, 2] }]]));
  });

  it("parsePythonLiteral tells tuples from parenthesised values: (3,) is a tuple, (3) is 3, () is empty", () => {
    expect(parsePythonLiteral("(3,)")).toEqual({ tuple: [3] });
    expect(parsePythonLiteral("(3)")).toBe(3);
    expect(parsePythonLiteral("()")).toEqual({ tuple: [] });
  });

  it("parsePythonLiteral reads lists, None, double quotes and escapes", () => {
    expect(parsePythonLiteral("[('x', '<f8'), (\"y\", None)]")).toEqual([{ tuple: ["x", "<f8"] }, { tuple: ["y", null] }]);
    expect(parsePythonLiteral("'a\\'b\\x41\\u00e9\\n'")).toBe("a'bA\u00e9\n");
  });

  it("parsePythonLiteral rejects floats, unknown names, repeated keys and trailing text with a PythonLiteralError", () => {
    for (const text of ["1.5", "(1e3,)", "true", "{'a': 1, 'a': 2}", "{'a': 1} x", "{1: 2}", "'open", "{'a' 1}", ""]) {
      expect(() => parsePythonLiteral(text), text).toThrow(PythonLiteralError);
    }
  });

  it("parsePythonLiteral reports the character position of the problem", () => {
    try {
      parsePythonLiteral("{'shape': (2, x)}");
      expect.unreachable();
    } catch (error) {
      expect((error as PythonLiteralError).offset).toBe(14);
      expect((error as Error).message).toBe('unknown name "x" at character 14');
    }
  });
});
