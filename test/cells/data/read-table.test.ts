import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { DataImportError } from "../../../cells/data/import-error";
import { formatFromPath, readTable } from "../../../cells/data/read-table";
import { FIXTURES, expected, thrown } from "./fixtures";

const scratch = mkdtempSync(join(tmpdir(), "couplet-read-table-"));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

describe("formatFromPath", () => {
  it("formatFromPath maps .csv, .tsv, .json and .npy case-insensitively and nothing else", () => {
    expect(["a.csv", "b.TSV", "d.Json", "e.npy", "c.tab", "f.txt", "g", "h.npz", "dir.csv/x"].map(formatFromPath)).toEqual(["csv", "tsv", "json", "npy", undefined, undefined, undefined, undefined, undefined]);
  });
});

describe("readTable", () => {
  // Expected values: numpy.loadtxt / json / numpy.load readings recorded by make_fixtures.py.
  it("readTable reads each text fixture by extension, relative to a directory", () => {
    for (const name of ["depots.csv", "depots.tsv", "depots_crlf_bom.csv", "depots_records.json", "depots_table.json"]) {
      const file = readTable(name, { relativeTo: FIXTURES });
      expect(file.path).toBe(join(FIXTURES, name));
      expect(file.table).toMatchObject({ columns: expected.text[name].columns, rows: expected.text[name].rows });
    }
  });

  it("readTable reads a .npy fixture as numpy does (numpy .npy format, numpy.lib.format / NEP 1)", () => {
    const file = readTable(join(FIXTURES, "points_v2.npy"));
    expect(file.format).toBe("npy");
    expect(file.table).toMatchObject({ shape: expected.npy["points_v2.npy"].shape });
    expect(Array.from((file.table as { data: Float64Array }).data)).toEqual(expected.npy["points_v2.npy"].values);
  });

  it("readTable with a format overrides the extension", () => {
    writeFileSync(join(scratch, "points.txt"), "x\ty\n1\t2\n");
    expect(readTable("points.txt", { relativeTo: scratch, format: "tsv" }).table).toMatchObject({ rows: [[1, 2]] });
  });

  it("readTable of an unknown extension asks for a format", () => {
    expect(thrown(() => readTable("points.txt", { relativeTo: scratch })).message).toBe('points.txt: cannot tell the format from the extension ".txt"; use .csv, .tsv, .json or .npy, or give the format');
  });

  it("readTable of a missing file names the path as given and the absolute path looked for", () => {
    const error = thrown(() => readTable("data/nowhere.csv", { relativeTo: scratch }));
    expect(error).toBeInstanceOf(DataImportError);
    expect(error.file).toBe("data/nowhere.csv");
    expect(error.message).toBe(`data/nowhere.csv: file not found (looked for ${join(scratch, "data", "nowhere.csv")})`);
  });

  it("readTable of a directory says it is not a file", () => {
    const dir = join(scratch, "folder.csv");
    mkdirSync(dir);
    expect(thrown(() => readTable(dir)).reason).toMatch(/^is a directory/);
  });

  it("readTable messages name the file as the caller wrote it", () => {
    writeFileSync(join(scratch, "bad.csv"), "x,y\n1,2\n3,oops\n");
    expect(thrown(() => readTable("bad.csv", { relativeTo: scratch })).message).toBe('bad.csv: row 3, column "y": not a number: "oops"');
  });
});
