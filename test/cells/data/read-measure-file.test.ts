import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { DataImportError } from "../../../cells/data/import-error";
import { readMeasureFile } from "../../../cells/data/read-measure-file";
import { FIXTURES, expected, thrown } from "./fixtures";

const scratch = mkdtempSync(join(tmpdir(), "couplet-read-measure-"));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

function column(rows: number[][], k: number): number[] {
  return rows.map((r) => r[k]);
}

describe("readMeasureFile", () => {
  // Expected values: numpy.loadtxt / json readings of the fixtures, recorded by make_fixtures.py.
  it("readMeasureFile(depots.csv) gives coordinates x, y and masses from the mass column", () => {
    const want = expected.text["depots.csv"].rows;
    const m = readMeasureFile("depots.csv", { relativeTo: FIXTURES });
    expect([m.n, m.dim]).toEqual([4, 2]);
    expect(Array.from(m.points)).toEqual(want.flatMap((r) => [r[0], r[1]]));
    expect(Array.from(m.mass)).toEqual(column(want, 2));
  });

  it("readMeasureFile gives the same measure from the CSV, TSV, BOM/CRLF CSV and both JSON fixtures", () => {
    const reference = readMeasureFile("depots.csv", { relativeTo: FIXTURES });
    for (const name of ["depots.tsv", "depots_crlf_bom.csv", "depots_records.json", "depots_table.json"]) {
      expect(readMeasureFile(name, { relativeTo: FIXTURES }), name).toEqual(reference);
    }
  });

  it("readMeasureFile with coordinates reads a file that keeps a label column", () => {
    const m = readMeasureFile(join(FIXTURES, "depots_labelled.csv"), { coordinates: ["x_km", "y_km"] });
    const want = expected.text["depots_labelled.csv"].rows; // Python csv module reading
    expect(Array.from(m.points)).toEqual(want.flatMap((r) => [r[0], r[1]]));
    expect(Array.from(m.mass)).toEqual(column(want, 2));
  });

  it("readMeasureFile of a .npy with a separate .npy mass file pairs them (numpy .npy format, numpy.lib.format / NEP 1)", () => {
    const m = readMeasureFile("points_f8.npy", { relativeTo: FIXTURES, massFile: "masses_f8.npy" });
    expect(Array.from(m.points)).toEqual(expected.npy["points_f8.npy"].values);
    expect(Array.from(m.mass)).toEqual(expected.npy["masses_f8.npy"].values);
  });

  it("readMeasureFile takes masses from a one-column CSV mass file", () => {
    const m = readMeasureFile("points_f8.npy", { relativeTo: FIXTURES, massFile: "masses.csv" });
    expect(Array.from(m.mass)).toEqual(column(expected.text["masses.csv"].rows, 0));
  });

  it("readMeasureFile with a mass file of the wrong length names that file", () => {
    const error = thrown(() => readMeasureFile("points_v2.npy", { relativeTo: FIXTURES, massFile: "masses_f8.npy" }));
    expect(error.message).toBe("masses_f8.npy: the separate mass array has 5 values for 3 points");
  });

  it("readMeasureFile with a negative mass in a CSV mass file names its line", () => {
    writeFileSync(join(scratch, "w.csv"), "mass\n1\n\n-2\n");
    writeFileSync(join(scratch, "p.csv"), "x\n0\n1\n");
    expect(thrown(() => readMeasureFile("p.csv", { relativeTo: scratch, massFile: "w.csv" })).message).toBe('w.csv: row 4, column "mass": mass must be >= 0, got -2');
  });

  it("readMeasureFile of a missing file names the resolved path", () => {
    const error = thrown(() => readMeasureFile("missing.csv", { relativeTo: scratch }));
    expect(error).toBeInstanceOf(DataImportError);
    expect(error.reason).toBe(`file not found (looked for ${join(scratch, "missing.csv")})`);
  });

  it("readMeasureFile of a refused .npy passes the parser's reason on", () => {
    expect(thrown(() => readMeasureFile("object_O.npy", { relativeTo: FIXTURES })).message).toMatch(/^object_O\.npy: unsupported dtype "\|O": object arrays/);
  });

  it("readMeasureFile with massColumn null ignores a mass column", () => {
    const m = readMeasureFile("depots.csv", { relativeTo: FIXTURES, massColumn: null });
    expect(m.dim).toBe(3);
    expect(Array.from(m.mass)).toEqual([0.25, 0.25, 0.25, 0.25]);
  });

  it("readMeasureFile with coordinates and an explicit mass column parses only those", () => {
    writeFileSync(join(scratch, "sites.csv"), "name,lon,lat,w\nA,1,2,3\nB,4,5,6\n");
    const m = readMeasureFile("sites.csv", { relativeTo: scratch, coordinates: ["lat", "lon"], massColumn: "w" });
    expect(Array.from(m.points)).toEqual([2, 1, 5, 4]);
    expect(Array.from(m.mass)).toEqual([3, 6]);
  });
});

describe("readMeasureFile name", () => {
  it("readMeasureFile({name}) keeps file positions in messages and returns the same measure", () => {
    const a = readMeasureFile("depots.csv", { relativeTo: FIXTURES, name: "source" });
    expect(a).toEqual(readMeasureFile("depots.csv", { relativeTo: FIXTURES }));
  });
});
