import { describe, expect, it } from "vitest";
import { copyJsonData, jsonEqual, withKey } from "../../../cells/document/json-data";

describe("copyJsonData", () => {
  it("copyJsonData copies plain data deeply, keeping key order", () => {
    const value = { b: [1, { c: null }], a: "x" };
    const out = copyJsonData(value, "v") as { value: typeof value };
    expect(out.value).toEqual(value);
    expect(out.value).not.toBe(value);
    expect(out.value.b[1]).not.toBe(value.b[1]);
    expect(Object.keys(out.value)).toEqual(["b", "a"]);
  });

  it("copyJsonData names the path of the first value JSON cannot hold", () => {
    expect(copyJsonData({ a: [1, Infinity] }, "v")).toEqual({ issue: { path: "v.a[1]", message: "must be a finite number (JSON has no Infinity)" } });
    expect(copyJsonData({ a: new Map() }, "v")).toEqual({ issue: { path: "v.a", message: "must be plain JSON data, got [object Map]" } });
    expect(copyJsonData([undefined], "v")).toEqual({ issue: { path: "v[0]", message: "must be JSON data, got undefined" } });
  });
});

describe("jsonEqual", () => {
  it("jsonEqual compares values deeply, ignoring key order and undefined fields", () => {
    expect(jsonEqual({ a: 1, b: [1, { c: 2 }] }, { b: [1, { c: 2 }], a: 1, d: undefined })).toBe(true);
    expect(jsonEqual({ a: 1 }, { a: "1" })).toBe(false);
    expect(jsonEqual([1, 2], { 0: 1, 1: 2 })).toBe(false);
  });
});

describe("withKey", () => {
  it("withKey replaces in place, inserts in canonical order, and removes with undefined", () => {
    const order = ["a", "b", "c"];
    expect(Object.keys(withKey({ a: 1, c: 3, x: 0 }, "b", 2, order))).toEqual(["a", "b", "c", "x"]);
    expect(Object.keys(withKey({ c: 3, a: 1 }, "c", 9, order))).toEqual(["c", "a"]);
    expect(withKey({ a: 1, b: 2 }, "a", undefined)).toEqual({ b: 2 });
    expect(Object.keys(withKey({ x: 1 }, "y", 2))).toEqual(["x", "y"]);
  });
});
