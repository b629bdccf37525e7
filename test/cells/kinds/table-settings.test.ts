import { describe, expect, it } from "vitest";
import { mapTableReferences, tableDependencies, validateTableSettings, type TableSettings } from "../../../cells/kinds/table/settings";

const P = "cells[7].settings";
const issues = (settings: unknown) => validateTableSettings(settings, P);

describe("validateTableSettings", () => {
  it("validateTableSettings accepts rows from a cell or inline, with formatted columns", () => {
    expect(issues({ of: "sweep1", columns: [{ field: "cost", digits: 3, notation: "fixed" }, { field: "epsilon", label: "ε" }] })).toEqual([]);
    expect(issues({ rows: [{ a: 1, b: "x", c: true, d: null }], columns: [{ field: "a", digits: 0, notation: "scientific" }] })).toEqual([]);
    expect(issues({ rows: [] })).toEqual([]);
  });

  it("validateTableSettings requires exactly one of of and rows", () => {
    expect(issues({})).toEqual([{ path: P, message: 'must hold "of" (the name of a cell giving rows) or "rows" (inline rows)' }]);
    expect(issues({ of: "a", rows: [] })).toEqual([{ path: P, message: 'give either "of" (a cell name) or "rows" (inline), not both' }]);
  });

  it("validateTableSettings checks inline cells are plain values", () => {
    expect(issues({ rows: [{ a: [1] }] })).toEqual([{ path: `${P}.rows[0].a`, message: "must be text, a number, true/false or null, got an array" }]);
    expect(issues({ rows: [3] })).toEqual([{ path: `${P}.rows[0]`, message: "must be an object, got 3" }]);
  });

  it("validateTableSettings checks columns: a field, no repeats, digits valid for the notation", () => {
    expect(issues({ of: "s", columns: [{ label: "x" }] })).toEqual([{ path: `${P}.columns[0].field`, message: "missing (required)" }]);
    expect(issues({ of: "s", columns: [{ field: "a" }, { field: "a" }] })).toEqual([{ path: `${P}.columns[1].field`, message: 'repeats columns[0].field ("a")' }]);
    expect(issues({ of: "s", columns: [{ field: "a", digits: 0, notation: "significant" }] })).toEqual([{ path: `${P}.columns[0].digits`, message: "must be >= 1, got 0" }]);
    expect(issues({ of: "s", columns: [{ field: "a", digits: 21 }] })).toEqual([{ path: `${P}.columns[0].digits`, message: "must be <= 20, got 21" }]);
    expect(issues({ of: "s", columns: [{ field: "a", digits: 2.5, notation: "fixed" }] })).toEqual([{ path: `${P}.columns[0].digits`, message: "must be an integer, got 2.5" }]);
    expect(issues({ of: "s", columns: [{ field: "a", notation: "percent" }] })).toEqual([
      { path: `${P}.columns[0].notation`, message: 'must be one of "auto", "fixed", "significant", "scientific", got "percent"' },
    ]);
    expect(issues({ of: "s", columns: [] })).toEqual([{ path: `${P}.columns`, message: "must have at least 1 item, got 0" }]);
  });
});

describe("tableDependencies", () => {
  it("tableDependencies is the source cell, or nothing for inline rows", () => {
    expect(tableDependencies({ of: "sweep1" })).toEqual(["sweep1"]);
    expect(tableDependencies({ rows: [] })).toEqual([]);
    const s: TableSettings = { of: "a", columns: [{ field: "x" }] };
    expect(mapTableReferences(s, () => "b")).toEqual({ of: "b", columns: [{ field: "x" }] });
  });
});
