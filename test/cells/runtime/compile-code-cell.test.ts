import { describe, expect, it } from "vitest";
import { CodeCellCompileError, compileCodeCell } from "../../../cells/runtime/compile-code-cell";

// The semantics checked here follow ECMA-262 (ECMAScript 2024): an async function
// resolves to its return value (§27.7), strict code has `this` undefined in plain
// calls (§10.2.1.2), and an object-literal-looking statement is a block (§14.5).
// The last-expression convention is Couplet's own, documented in compile-code-cell.ts.
describe("compileCodeCell", () => {
  it("compileCodeCell(source, inputs) returns the last expression statement's value", async () => {
    const f = compileCodeCell("const s = a + b;\ns * 2", ["a", "b"]);
    await expect(f({ a: 1, b: 2 })).resolves.toBe(6);
  });

  it("compileCodeCell(source, inputs) keeps an explicit return and ignores a later expression", async () => {
    const f = compileCodeCell("if (x > 0) return 'positive';\n'other'", ["x"]);
    await expect(f({ x: 1 })).resolves.toBe("positive");
    // A body with its own return gets no implicit one: 'other' is not returned.
    await expect(f({ x: -1 })).resolves.toBeUndefined();
  });

  it("compileCodeCell(source, inputs) does not count returns inside nested functions as the cell's", async () => {
    const f = compileCodeCell("function g() { return 1 }\nconst h = () => { return 2 };\ng() + h()", []);
    await expect(f({})).resolves.toBe(3);
  });

  it("compileCodeCell(source, inputs) gives undefined when the body ends with a declaration", async () => {
    await expect(compileCodeCell("const x = 1", [])({})).resolves.toBeUndefined();
  });

  it("compileCodeCell(source, inputs) keeps a sequence expression's last value and drops a trailing comment", async () => {
    await expect(compileCodeCell("1, 2, 3 // three\n", [])({})).resolves.toBe(3);
    await expect(compileCodeCell("x /* note */ ;", ["x"])({ x: 7 })).resolves.toBe(7);
  });

  it("compileCodeCell(source, inputs) returns a multi-line last expression whole", async () => {
    const f = compileCodeCell("const k = 2;\nk\n  * 10\n  + 1", []);
    await expect(f({})).resolves.toBe(21);
  });

  it("compileCodeCell(source, inputs) treats {a: 1} at the end as a block, and ({a: 1}) as an object", async () => {
    await expect(compileCodeCell("({a: 1})", [])({})).resolves.toEqual({ a: 1 });
    await expect(compileCodeCell("{a: 1}", [])({})).resolves.toBeUndefined();
  });

  it("compileCodeCell(source, inputs) supports top-level await", async () => {
    const f = compileCodeCell("const v = await p;\nv + 1", ["p"]);
    await expect(f({ p: Promise.resolve(41) })).resolves.toBe(42);
  });

  it("compileCodeCell(source, inputs) runs as strict code", async () => {
    await expect(compileCodeCell("this", [])({})).resolves.toBeUndefined();
    await expect(compileCodeCell("undeclared = 1", [])({})).rejects.toThrow(ReferenceError);
  });

  it("compileCodeCell(source, inputs) rejects when the body throws", async () => {
    await expect(compileCodeCell("throw new RangeError('bad')", [])({})).rejects.toThrow("bad");
  });

  it("compileCodeCell(source, inputs) throws CodeCellCompileError with the position of a syntax error", () => {
    let caught: unknown;
    try {
      compileCodeCell("1 +\n+ )", []);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CodeCellCompileError);
    expect(caught).toMatchObject({ line: 2, column: 3 });
  });

  it("compileCodeCell(source, inputs) throws a TypeError naming the inputs when one is not a parameter name", () => {
    expect(() => compileCodeCell("1", ["class"])).toThrow(TypeError);
  });
});
