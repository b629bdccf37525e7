import { describe, expect, it } from "vitest";
import { DataImportError, quoteCell } from "../../../cells/data/import-error";

describe("DataImportError", () => {
  it("new DataImportError formats file, row, column and reason into the message", () => {
    const error = new DataImportError({ file: "depots.csv", row: 7, column: "x", reason: 'not a number: "12,5"' });
    expect(error.message).toBe('depots.csv: row 7, column "x": not a number: "12,5"');
    expect(error).toBeInstanceOf(Error);
    expect(error.name).toBe("DataImportError");
    expect({ file: error.file, row: error.row, column: error.column, reason: error.reason }).toEqual({ file: "depots.csv", row: 7, column: "x", reason: 'not a number: "12,5"' });
  });

  it("new DataImportError leaves out the parts that do not apply", () => {
    expect(new DataImportError({ file: "a.npy", reason: "truncated" }).message).toBe("a.npy: truncated");
    expect(new DataImportError({ file: "a.csv", row: 2, reason: "r" }).message).toBe("a.csv: row 2: r");
    expect(new DataImportError({ file: "a.csv", column: "y", reason: "r" }).message).toBe('a.csv: column "y": r');
    expect(new DataImportError({ file: "f", reason: "r" }).row).toBeUndefined();
  });

  it("new DataImportError keeps the cause it is given", () => {
    const cause = new Error("inner");
    expect(new DataImportError({ file: "f", reason: "r" }, { cause }).cause).toBe(cause);
  });
});

describe("quoteCell", () => {
  it("quoteCell quotes text as JSON and cuts it after 37 characters", () => {
    expect(quoteCell('a"b')).toBe('"a\\"b"');
    expect(quoteCell("x".repeat(50))).toBe(JSON.stringify(`${"x".repeat(37)}...`));
  });
});
