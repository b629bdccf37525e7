import { describe, expect, it } from "vitest";
import { freeNames } from "../../../cells/runtime/free-names";

// Scoping rules checked here are those of ECMA-262 (ECMAScript 2024 Language
// Specification, Ecma International 2024): §8.2 scope analysis, §14.3 declarations,
// §14.7 iteration statements, §14.15 try/catch, §15 functions and classes.
// Expected name lists are worked out by hand from those rules.
const names = (source: string) => {
  const result = freeNames(source);
  expect(result.error).toBeUndefined();
  return [...result.names].sort();
};

describe("freeNames", () => {
  it("freeNames(source) lists identifiers read but not declared, in order of first use", () => {
    expect(freeNames("b + a * b").names).toEqual(["b", "a"]);
  });

  it("freeNames(source) ignores property keys, member names and labels", () => {
    // Member names and non-computed keys are not references (ECMA-262 §13.3, §13.2.5).
    expect(names("const o = {key: value, [computed]: 1, method() { return 1 } }; o.key; outer: for (;;) { break outer; } a.b.c; a[d]")).toEqual(["a", "computed", "d", "value"]);
  });

  it("freeNames(source) keeps shorthand properties as references", () => {
    expect(names("({x, y: z})")).toEqual(["x", "z"]);
  });

  it("freeNames(source) binds function parameters, including destructured and default ones", () => {
    expect(names("function f(a, {b, c: [d, ...e]}, g = h, ...rest) { return a + b + d + e + g + rest + k } f")).toEqual(["h", "k"]);
  });

  it("freeNames(source) binds arrow parameters only inside the arrow", () => {
    expect(names("xs.map((x, i) => x * i + y); x")).toEqual(["x", "xs", "y"]);
  });

  it("freeNames(source) scopes let and const to their block and hoists var to the function", () => {
    // §14.3.1 (let/const are block scoped) and §14.3.2 (var is function scoped).
    expect(names("{ let a = 1; var b = 2; } a; b")).toEqual(["a"]);
    expect(names("function f() { if (p) { var v = 1 } return v } v")).toEqual(["p", "v"]);
  });

  it("freeNames(source) counts a declaration later in the body (hoisting and TDZ are not its concern)", () => {
    expect(names("use(x); const x = 1; g(); function g() {}")).toEqual(["use"]);
  });

  it("freeNames(source) scopes block-level function declarations to the block (strict code)", () => {
    // Annex B.3.3 hoisting does not apply in strict code; code cells are strict.
    expect(names("{ function inner() {} } inner()")).toEqual(["inner"]);
  });

  it("freeNames(source) binds a class name in its scope, and walks extends, computed keys and fields", () => {
    expect(names("class A extends Base { [k] = v; #p = 1; static s = A; m() { return this.#p + A + w } static { let t = 1; t } } new A()")).toEqual([
      "Base",
      "k",
      "v",
      "w",
    ]);
  });

  it("freeNames(source) binds a named class or function expression only inside itself", () => {
    expect(names("const f = function self(n) { return n ? self(n - 1) : 0 }; const C = class Me { m() { return Me } }; self; Me")).toEqual(["Me", "self"]);
  });

  it("freeNames(source) binds catch parameters, including destructured ones, only in the handler", () => {
    expect(names("try { risky() } catch ({message, code = fallback}) { message + code } message")).toEqual(["fallback", "message", "risky"]);
    expect(names("try {} catch (e) { e } e")).toEqual(["e"]);
  });

  it("freeNames(source) binds for-of and for-in let/const variables to the loop only", () => {
    expect(names("for (const [k, v] of entries) { k + v } for (let i = 0; i < n; i++) {} for (const key in obj) key; k; i")).toEqual(["entries", "i", "k", "n", "obj"]);
  });

  it("freeNames(source) treats assignment targets without a declaration as free", () => {
    expect(names("total = 0; [a, b] = pair; ({c: d.e} = f)")).toEqual(["a", "b", "d", "f", "pair", "total"]);
  });

  it("freeNames(source) shares one scope across switch cases", () => {
    expect(names("switch (mode) { case 1: let z = 2; break; default: z }")).toEqual(["mode"]);
  });

  it("freeNames(source) accepts top-level await and return, and never reports arguments", () => {
    expect(names("const r = await fetchIt(url); return r + arguments.length")).toEqual(["fetchIt", "url"]);
  });

  it("freeNames(source) reports a syntax error with its 1-based line and column", () => {
    const result = freeNames("const a = 1;\nconst = 2");
    expect(result.names).toEqual([]);
    expect(result.error).toMatchObject({ line: 2, column: 7 });
    expect(result.error!.message).toMatch(/unexpected token/i);
  });

  it("freeNames(source) rejects import and export declarations and import.meta", () => {
    expect(freeNames("import x from 'y'").error?.message).toMatch(/import declarations/);
    expect(freeNames("export const a = 1").error?.message).toMatch(/export declarations/);
    expect(freeNames("\n  import.meta.url").error).toMatchObject({ line: 2, column: 3 });
  });

  it("freeNames(source) treats code cells as strict code (with is a syntax error)", () => {
    expect(freeNames("with (o) { x }").error).toBeDefined();
  });
});

describe("freeNames and dynamic import", () => {
  // Couplet's own rule (docs/kinds/code.md): code cells reach only what the study puts in scope.
  it("freeNames(\"return import('node:fs')\") reports an error naming import() with its position", () => {
    const { error } = freeNames("const x = 1;\nreturn import('node:fs');");
    expect(error?.message).toMatch(/import\(\) is not available in a code cell/);
    expect(error?.line).toBe(2);
  });
});
