import { describe, expect, it } from "vitest";
import { DataImportError } from "../../../cells/data/import-error";
import { parseDelimited } from "../../../cells/data/parse-delimited";
import { expected, fixtureText, thrown } from "./fixtures";

describe("parseDelimited on fixtures", () => {
  // depots*.csv/tsv were written by numpy.savetxt (format '%.18e') and read back by numpy.loadtxt;
  // depots_labelled.csv was read back by Python's csv module (RFC 4180 quoting). Those readings,
  // in expected.json, are the outside reference.
  for (const [name, delimiter] of [["depots.csv", ","], ["depots.tsv", "\t"], ["depots_crlf_bom.csv", ","]] as const) {
    it(`parseDelimited(${name}) matches numpy.loadtxt value for value`, () => {
      const table = parseDelimited(fixtureText(name), { delimiter, name });
      expect(table.columns).toEqual(expected.text[name].columns);
      expect(table.rows).toEqual(expected.text[name].rows);
    });

    it(`parseDelimited(${name}, {delimiter: "auto"}) picks the same separator`, () => {
      expect(parseDelimited(fixtureText(name)).rows).toEqual(expected.text[name].rows);
    });
  }

  it("parseDelimited(depots_crlf_bom.csv) drops the byte-order mark from the first column name", () => {
    const text = fixtureText("depots_crlf_bom.csv");
    expect(text.charCodeAt(0)).toBe(0xfeff);
    expect(text).toContain("\r\n");
    expect(parseDelimited(text).columns[0]).toBe("x");
  });

  it("parseDelimited(depots_labelled.csv, {columns}) skips a quoted label column and the blank line, as Python's csv module reads it", () => {
    const table = parseDelimited(fixtureText("depots_labelled.csv"), { columns: ["x_km", "y_km", "mass"], name: "depots_labelled.csv" });
    expect(table.columns).toEqual(expected.text["depots_labelled.csv"].columns);
    expect(table.rows).toEqual(expected.text["depots_labelled.csv"].rows);
    expect(table.rowNumbers).toEqual([2, 4]);
  });

  it("parseDelimited(depots_labelled.csv) without columns stops at the label naming row, column and cell", () => {
    const error = thrown(() => parseDelimited(fixtureText("depots_labelled.csv"), { name: "depots_labelled.csv" }));
    expect(error.message).toBe('depots_labelled.csv: row 2, column "site": not a number: "Depot, North"');
  });
});

describe("parseDelimited errors", () => {
  it("parseDelimited with a decimal comma names file, line, column and the cell", () => {
    // Lines 1-6 are fine; the bad cell is on line 7. The quoted cell keeps its comma.
    const text = 'x,y\n1,2\n3,4\n5,6\n7,8\n9,10\n"12,5",11\n';
    const error = thrown(() => parseDelimited(text, { name: "depots.csv" }));
    expect(error).toBeInstanceOf(DataImportError);
    expect(error.message).toBe('depots.csv: row 7, column "x": not a number: "12,5"');
    expect({ file: error.file, row: error.row, column: error.column, reason: error.reason }).toEqual({ file: "depots.csv", row: 7, column: "x", reason: 'not a number: "12,5"' });
  });

  it("parseDelimited refuses NaN, inf, hex, thousands separators and words", () => {
    for (const cell of ["NaN", "inf", "-Infinity", "0x10", "1_000", "1 000", "two", "1e", ".", "+-1", "1.2.3"]) {
      const error = thrown(() => parseDelimited(`x\n${cell}\n`));
      expect(error.reason, cell).toBe(`not a number: ${JSON.stringify(cell)}`);
    }
  });

  it("parseDelimited accepts signs, exponents, leading or trailing points and spaces around numbers", () => {
    const table = parseDelimited("x,y\n+1.5, -2e-3\n.5 ,7.\n1E+2,-0\n");
    expect(table.rows).toEqual([[1.5, -0.002], [0.5, 7], [100, -0]]);
  });

  it("parseDelimited refuses an empty cell and a number too large for a double", () => {
    expect(thrown(() => parseDelimited("x,y\n1,\n")).message).toBe('delimited text: row 2, column "y": empty cell: a number is needed');
    expect(thrown(() => parseDelimited("x\n1e400\n")).reason).toBe('number out of range: "1e400"');
  });

  it("parseDelimited with a short row names the first missing column", () => {
    const error = thrown(() => parseDelimited("x,y,mass\n1,2,3\n4,5\n", { name: "a.csv" }));
    expect(error.message).toBe('a.csv: row 3, column "mass": missing cell: the row has 2 cells, the header 3 ("x", "y", "mass")');
  });

  it("parseDelimited with a long row says how many cells each has", () => {
    const error = thrown(() => parseDelimited("x,y\n1,2\n\n3,4,5\n", { name: "a.csv" }));
    expect(error.message).toBe('a.csv: row 4: the row has 3 cells, the header 2 ("x", "y")');
  });

  it("parseDelimited of a file whose first row is numbers says the header is missing", () => {
    const error = thrown(() => parseDelimited("1.5,2\n3,4\n", { name: "noheader.csv" }));
    expect(error.row).toBe(1);
    expect(error.reason).toMatch(/^header row missing: the first row holds only numbers \(1\.5, 2\); add a first line naming the columns, e\.g\. x1,x2$/);
  });

  it("parseDelimited of empty or blank text says there is no header", () => {
    expect(thrown(() => parseDelimited("")).reason).toMatch(/^no header row/);
    expect(thrown(() => parseDelimited("\n \r\n")).reason).toMatch(/^no header row/);
  });

  it("parseDelimited refuses empty and repeated column names", () => {
    expect(thrown(() => parseDelimited("x,,y\n1,2,3\n")).reason).toBe("header cell 2 is empty: every column needs a name");
    expect(thrown(() => parseDelimited("x,y,x\n1,2,3\n")).message).toBe('delimited text: row 1, column "x": column name used twice (header cells 1 and 3)');
  });

  it("parseDelimited with an unterminated quote says malformed quotes and the line it starts on", () => {
    const error = thrown(() => parseDelimited('x,y\n1,2\n"3,4\n5,6\n'));
    expect(error.row).toBe(3);
    expect(error.reason).toMatch(/^malformed quotes: /);
  });

  it("parseDelimited with requested columns the header lacks names the missing one", () => {
    expect(thrown(() => parseDelimited("x,y\n1,2\n", { columns: ["x", "z"] })).message).toBe('delimited text: column "z": no such column; the columns are "x", "y"');
  });
});

describe("parseDelimited layout", () => {
  it("parseDelimited counts file lines in row numbers across blank lines, CRLF and a quoted line break", () => {
    const text = '\r\nx,label\r\n1,a\r\n\r\n2,"two\r\nlines"\r\n3,c\r\nq,d\r\n';
    const error = thrown(() => parseDelimited(text, { columns: ["x"] }));
    expect(error.row).toBe(8);
    const table = parseDelimited(text.replace("q,d\r\n", ""), { columns: ["x"] });
    expect(table.rows).toEqual([[1], [2], [3]]);
    expect(table.rowNumbers).toEqual([3, 5, 7]);
  });

  it("parseDelimited reads old Mac CR-only line ends", () => {
    const table = parseDelimited("x,y\r1,2\r3,4\r");
    expect(table.rows).toEqual([[1, 2], [3, 4]]);
    expect(table.rowNumbers).toEqual([2, 3]);
  });

  it("parseDelimited reads a one-column file, which has no separator to detect", () => {
    expect(parseDelimited("mass\n0.5\n1\n")).toEqual({ columns: ["mass"], rows: [[0.5], [1]], rowNumbers: [2, 3] });
  });

  it("parseDelimited({delimiter: 'auto'}) takes a tab when the header has one, so commas in TSV cells are errors, not splits", () => {
    const error = thrown(() => parseDelimited("x\ty\n1,5\t2\n"));
    expect(error.reason).toBe('not a number: "1,5"');
  });

  it("parseDelimited with a header only returns no rows", () => {
    expect(parseDelimited("x,y\n")).toEqual({ columns: ["x", "y"], rows: [], rowNumbers: [] });
  });

  it("parseDelimited with columns returns them in the requested order and keeps optional ones present", () => {
    const table = parseDelimited("name,y,x,mass\nA,1,2,3\n", { columns: ["x", "y"], optionalColumns: ["mass", "weight"] });
    expect(table.columns).toEqual(["x", "y", "mass"]);
    expect(table.rows).toEqual([[2, 1, 3]]);
  });

  it("parseDelimited reads 20000 rows with correct line numbers at the end", () => {
    const lines = ["x,y"];
    for (let i = 0; i < 20000; i++) lines.push(`${i},${i / 4}`);
    const table = parseDelimited(lines.join("\n"));
    expect(table.rows.length).toBe(20000);
    expect(table.rows[19999]).toEqual([19999, 19999 / 4]);
    expect(table.rowNumbers?.[19999]).toBe(20001);
  });
});
