import { parse } from "acorn";
import { describe, expect, it } from "vitest";
import { RESERVED_NAMES, checkCellId, checkCellName, isCellId, isCellName, isIdentifierName } from "../../../cells/document/cell-name";
import type { StudyIssue } from "../../../cells/document/study-issue";

/** Oracle: can `name` be bound as a parameter in strict-mode module code? Decided by acorn's parser. */
function bindable(name: string): boolean {
  try {
    parse(`(function (${name}) { "use strict"; });`, { ecmaVersion: "latest", sourceType: "module" });
    return true;
  } catch {
    return false;
  }
}

const candidates = [
  "eps", "plan2", "_tmp", "$x", "ε", "σ_2", "Δt", "café", "x\u200d", "depotsNorth",
  "2eps", "my-name", "a b", "a.b", "x!", "🚚", "\u200dx",
  "class", "new", "let", "yield", "await", "static", "enum", "implements", "arguments", "eval", "null", "true",
  "async", "of", "get", "set", "from", "as", "target",
];

describe("isCellName", () => {
  it("isCellName agrees with acorn on which names strict module code can bind", () => {
    // acorn (JavaScript parser, ECMAScript "latest") is the oracle; undefined, NaN and
    // Infinity are excluded on purpose on top of it (shadowing them is legal but confusing).
    for (const name of candidates) expect([name, isCellName(name)]).toEqual([name, bindable(name)]);
  });

  it("isCellName rejects the empty string and non-strings", () => {
    expect([isCellName(""), isCellName(3), isCellName(null)]).toEqual([false, false, false]);
  });

  it("isCellName rejects the global values undefined, NaN and Infinity", () => {
    for (const name of ["undefined", "NaN", "Infinity"]) {
      expect(bindable(name)).toBe(true);
      expect(isCellName(name)).toBe(false);
    }
  });

  it("RESERVED_NAMES holds only identifier names", () => {
    for (const word of RESERVED_NAMES) expect(isIdentifierName(word)).toBe(true);
  });
});

describe("checkCellName", () => {
  it("checkCellName explains each kind of bad name", () => {
    const issues: StudyIssue[] = [];
    for (const v of [3, "2x", "class"]) checkCellName(v, "cells[0].name", issues);
    expect(issues).toEqual([
      { path: "cells[0].name", message: "must be a cell name (a string), got 3" },
      { path: "cells[0].name", message: '"2x" is not a valid JavaScript identifier (letters, digits, _ and $; not starting with a digit)' },
      { path: "cells[0].name", message: '"class" cannot be a cell name: it is reserved in JavaScript' },
    ]);
  });
});

describe("isCellId", () => {
  it("isCellId accepts a letter then up to 63 letters, digits, _ or -", () => {
    expect(["a", "k7q2", "t-1", "T_2", `a${"b".repeat(63)}`].every(isCellId)).toBe(true);
    expect(["", "1a", "-a", "a b", "é", `a${"b".repeat(64)}`, 5].some(isCellId)).toBe(false);
  });

  it("checkCellId explains a malformed id", () => {
    const issues: StudyIssue[] = [];
    checkCellId("1a", "cells[2].id", issues);
    checkCellId(null, "cells[3].id", issues);
    expect(issues).toEqual([
      { path: "cells[2].id", message: '"1a" is not a valid cell id (a letter, then up to 63 letters, digits, _ or -)' },
      { path: "cells[3].id", message: "must be a cell id (a string), got null" },
    ]);
  });
});
