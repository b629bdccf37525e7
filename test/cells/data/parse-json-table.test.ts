import { describe, expect, it } from "vitest";
import { DataImportError } from "../../../cells/data/import-error";
import { parseJsonTable } from "../../../cells/data/parse-json-table";
import { expected, fixtureText, thrown } from "./fixtures";

describe("parseJsonTable on fixtures", () => {
  // Written by Python's json module (json.dumps) and read back with json.load in make_fixtures.py:
  // the values in expected.json are the outside reference (including 5e-324, 1e-300 and -0.0).
  for (const name of ["depots_records.json", "depots_table.json"]) {
    it(`parseJsonTable(${name}) returns Python's json reading`, () => {
      const table = parseJsonTable(fixtureText(name), { name });
      expect(table.columns).toEqual(expected.text[name].columns);
      expect(table.rows).toEqual(expected.text[name].rows);
    });
  }
});

describe("parseJsonTable shapes", () => {
  it("parseJsonTable of records takes the columns from the first record, in its order", () => {
    const table = parseJsonTable('[{"y": 2, "x": 1, "mass": 0.5}, {"x": 3, "mass": 1, "y": 4}]');
    expect(table).toEqual({ columns: ["y", "x", "mass"], rows: [[2, 1, 0.5], [4, 3, 1]], rowNumbers: [1, 2] });
  });

  it("parseJsonTable of {columns, rows} returns them as they are", () => {
    expect(parseJsonTable('{"columns": ["x", "y"], "rows": [[1, 2], [3, 4]]}')).toEqual({ columns: ["x", "y"], rows: [[1, 2], [3, 4]], rowNumbers: [1, 2] });
  });

  it("parseJsonTable with columns keeps only those, so label fields may hold text", () => {
    const table = parseJsonTable('[{"site": "A", "x": 1}, {"site": "B", "x": 2}]', { columns: ["x"] });
    expect(table.rows).toEqual([[1], [2]]);
    const other = parseJsonTable('{"columns": ["site", "x"], "rows": [["A", 1]]}', { columns: ["x"] });
    expect(other.rows).toEqual([[1]]);
  });

  it("parseJsonTable of an empty array returns an empty table", () => {
    expect(parseJsonTable("[]")).toEqual({ columns: [], rows: [], rowNumbers: [] });
  });

  it("parseJsonTable drops a byte-order mark", () => {
    expect(parseJsonTable('\ufeff[{"x": 1}]').rows).toEqual([[1]]);
  });
});

describe("parseJsonTable errors", () => {
  it("parseJsonTable of malformed JSON gives line, column and what was expected", () => {
    const error = thrown(() => parseJsonTable('{\n "columns": ["x"],\n "rows": [[1],\n  [2,]]}', { name: "t.json" }));
    expect(error).toBeInstanceOf(DataImportError);
    expect(error.message).toBe('t.json: malformed JSON: line 4, column 6: expected a value (number, string, array, object, true, false or null), found "]"');
  });

  it("parseJsonTable of truncated JSON says the text ended", () => {
    expect(thrown(() => parseJsonTable('[{"x": 1}, {"x"')).reason).toBe('malformed JSON: line 1, column 16: expected ":" after the key, found the end of the text');
  });

  it("parseJsonTable names record, column and path of a string value", () => {
    const error = thrown(() => parseJsonTable('[{"x": 1, "y": 2}, {"x": 3, "y": "4"}]', { name: "p.json" }));
    expect(error.message).toBe('p.json: row 2, column "y": not a number: "4" is a JSON string; write numbers without quotes (at [1].y)');
  });

  it("parseJsonTable names null, booleans, nested values and overflow", () => {
    expect(thrown(() => parseJsonTable('[{"x": null}]')).reason).toBe("missing value (null) (at [0].x)");
    expect(thrown(() => parseJsonTable('[{"x": true}]')).reason).toBe("not a number: got boolean true (at [0].x)");
    expect(thrown(() => parseJsonTable('{"columns": ["x"], "rows": [[[1]]]}')).reason).toBe("not a number: got an array (at rows[0][0])");
    expect(thrown(() => parseJsonTable('[{"x": 1e999}]')).reason).toBe("number out of range (at [0].x)");
  });

  it("parseJsonTable of records with a missing or extra key names it", () => {
    expect(thrown(() => parseJsonTable('[{"x": 1, "y": 2}, {"x": 3}]')).message).toBe('JSON text: row 2, column "y": missing: the record has no key "y" (at [1])');
    expect(thrown(() => parseJsonTable('[{"x": 1}, {"x": 3, "z": 0}]')).message).toBe('JSON text: row 2, column "z": not a column of the first record (columns are "x") (at [1])');
  });

  it("parseJsonTable of an array of arrays asks for column names", () => {
    expect(thrown(() => parseJsonTable("[[1, 2], [3, 4]]")).reason).toMatch(/^an array of arrays has no column names/);
  });

  it("parseJsonTable of a non-table value says what it got", () => {
    expect(thrown(() => parseJsonTable("42")).reason).toBe('expected an array of records or an object {"columns": [...], "rows": [[...]]}, got number 42');
    expect(thrown(() => parseJsonTable("[1, 2]")).reason).toBe("a record must be an object like {\"x\": 1, \"y\": 2}, got number 1 (at [0])");
    expect(thrown(() => parseJsonTable("[{}]")).reason).toMatch(/^the first record has no keys/);
  });

  it("parseJsonTable of {columns, rows} checks keys, names, and row lengths", () => {
    expect(thrown(() => parseJsonTable('{"columns": ["x"], "rows": [], "mass": []}')).reason).toBe('unexpected key "mass": a table object has only "columns" and "rows"');
    expect(thrown(() => parseJsonTable('{"columns": "x", "rows": []}')).reason).toMatch(/^"columns" must be an array/);
    expect(thrown(() => parseJsonTable('{"columns": ["x"]}')).reason).toMatch(/^"rows" must be an array/);
    expect(thrown(() => parseJsonTable('{"columns": ["x", ""], "rows": []}')).reason).toBe('columns[1] must be a non-empty string, got the string ""');
    expect(thrown(() => parseJsonTable('{"columns": ["x", "x"], "rows": []}')).message).toBe('JSON text: column "x": column name used twice (columns[0] and columns[1])');
    expect(thrown(() => parseJsonTable('{"columns": ["x", "y"], "rows": [[1, 2], [3]]}')).message).toBe('JSON text: row 2: the row has 1 values, "columns" names 2 ("x", "y") (at rows[1])');
    expect(thrown(() => parseJsonTable('{"columns": ["x"], "rows": [{"x": 1}]}')).reason).toMatch(/^a row must be an array of 1 numbers, got an object/);
  });

  it("parseJsonTable with a requested column the table lacks names it", () => {
    expect(thrown(() => parseJsonTable('[{"x": 1}]', { columns: ["y"] })).message).toBe('JSON text: column "y": no such column; the columns are "x"');
  });
});
