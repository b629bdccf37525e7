import { describe, expect, it } from "vitest";
import { downloadName, tableCsv, tableJson, tableRecords } from "../../../cells/editor/export/table-download";

describe("table downloads", () => {
  it("tableRecords reads {columns, rows} with rows as records, keeping the column order", () => {
    const t = tableRecords({ columns: ["epsilon", "cost"], rows: [{ cost: 1.5, epsilon: 0.1, extra: 1 }] });
    expect(t).toEqual({ fields: ["epsilon", "cost"], records: [{ epsilon: 0.1, cost: 1.5 }] });
  });

  it("tableRecords reads rows given as arrays in column order, and column specs", () => {
    expect(tableRecords({ columns: [{ field: "a" }, "b"], rows: [[1, 2]] })?.records).toEqual([{ a: 1, b: 2 }]);
  });

  it("tableRecords takes the fields of an array of records in order of first appearance", () => {
    expect(tableRecords([{ a: 1 }, { b: 2, a: 3 }])?.fields).toEqual(["a", "b"]);
  });

  it("tableRecords returns undefined for a value that is not a table", () => {
    expect(tableRecords(3)).toBeUndefined();
    expect(tableRecords({ rows: 3 })).toBeUndefined();
  });

  it("tableCsv quotes fields holding commas, quotes or line breaks and doubles quotes (RFC 4180, Shafranovich 2005, §2 rules 6-7)", () => {
    const csv = tableCsv({ fields: ["name", "note"], records: [{ name: 'say "hi"', note: "a,b" }, { name: "x\ny", note: null }] });
    expect(csv).toBe('name,note\r\n"say ""hi""","a,b"\r\n"x\ny",\r\n');
  });

  it("tableCsv writes numbers in their shortest exact form, not rounded for display", () => {
    expect(tableCsv({ fields: ["v"], records: [{ v: 0.1 + 0.2 }, { v: 1e-7 }] })).toBe("v\r\n0.30000000000000004\r\n1e-7\r\n");
  });

  it("tableJson writes numbers JSON cannot hold as text", () => {
    expect(JSON.parse(tableJson({ fields: ["v"], records: [{ v: Infinity }, { v: NaN }] }))).toEqual([{ v: "Infinity" }, { v: "NaN" }]);
  });

  it("downloadName keeps letters and digits of any script and replaces the rest", () => {
    expect(downloadName("ε sweep/2", "csv")).toBe("ε-sweep-2.csv");
    expect(downloadName("///", "json")).toBe("table.json");
  });
});
