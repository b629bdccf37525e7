import { describe, expect, it } from "vitest";
import { DataImportError } from "../../../cells/data/import-error";
import type { NumericTable } from "../../../cells/data/numeric-table";
import { parseNpy } from "../../../cells/data/parse-npy";
import { tableToMeasure } from "../../../cells/data/table-to-measure";
import { expected, fixtureBytes, thrown } from "./fixtures";

const depots: NumericTable = {
  columns: ["x", "y", "mass"],
  rows: [
    [0, 1, 2],
    [3, 4, 0.5],
    [5, 6, 0],
  ],
  rowNumbers: [2, 3, 5],
};

describe("tableToMeasure on tables", () => {
  it("tableToMeasure takes every column but mass as coordinates and mass from the mass column", () => {
    const m = tableToMeasure(depots);
    expect(m).toMatchObject({ kind: "points", n: 3, dim: 2 });
    expect(Array.from(m.points)).toEqual([0, 1, 3, 4, 5, 6]);
    expect(Array.from(m.mass)).toEqual([2, 0.5, 0]);
  });

  it("tableToMeasure gives uniform masses 1/n when there is no mass column", () => {
    const m = tableToMeasure({ columns: ["a", "b"], rows: [[1, 2], [3, 4], [5, 6], [7, 8]] });
    expect(Array.from(m.mass)).toEqual([0.25, 0.25, 0.25, 0.25]);
  });

  it("tableToMeasure with coordinates uses them in the given order", () => {
    const m = tableToMeasure(depots, { coordinates: ["y", "x"] });
    expect(Array.from(m.points)).toEqual([1, 0, 4, 3, 6, 5]);
    expect(Array.from(m.mass)).toEqual([2, 0.5, 0]);
  });

  it("tableToMeasure with massColumn null treats the table as uniform and every column as a coordinate", () => {
    const m = tableToMeasure(depots, { massColumn: null });
    expect(m.dim).toBe(3);
    expect(Array.from(m.mass)).toEqual([1 / 3, 1 / 3, 1 / 3]);
  });

  it("tableToMeasure with another massColumn uses it and keeps 'mass' as a coordinate", () => {
    const m = tableToMeasure(depots, { massColumn: "y" });
    expect(Array.from(m.points)).toEqual([0, 2, 3, 0.5, 5, 0]);
    expect(Array.from(m.mass)).toEqual([1, 4, 6]);
  });

  it("tableToMeasure does not change the table it reads", () => {
    const copy = JSON.parse(JSON.stringify(depots));
    tableToMeasure(depots, { coordinates: ["y"] });
    expect(depots).toEqual(copy);
  });

  it("tableToMeasure with a negative mass names the file line and column", () => {
    const table: NumericTable = { columns: ["x", "mass"], rows: [[1, 1], [2, -0.5]], rowNumbers: [2, 9] };
    const error = thrown(() => tableToMeasure(table, { name: "depots.csv" }));
    expect(error).toBeInstanceOf(DataImportError);
    expect(error.message).toBe('depots.csv: row 9, column "mass": mass must be >= 0, got -0.5');
  });

  it("tableToMeasure with all masses zero says the total is zero", () => {
    const error = thrown(() => tableToMeasure({ columns: ["x", "mass"], rows: [[1, 0], [2, 0]] }, { name: "z.csv" }));
    expect(error.message).toBe('z.csv: column "mass": total mass is zero: at least one point needs a positive mass');
  });

  it("tableToMeasure names unknown, repeated and conflicting columns", () => {
    expect(thrown(() => tableToMeasure(depots, { coordinates: ["x", "z"] })).message).toBe('table: column "z": no such coordinate column; the columns are "x", "y", "mass"');
    expect(thrown(() => tableToMeasure(depots, { coordinates: ["x", "x"] })).reason).toBe("coordinate column listed twice");
    expect(thrown(() => tableToMeasure(depots, { coordinates: ["x", "mass"] })).reason).toBe("the column is both a coordinate and the mass");
    expect(thrown(() => tableToMeasure(depots, { massColumn: "weight" })).message).toBe('table: column "weight": no such mass column; the columns are "x", "y", "mass"');
  });

  it("tableToMeasure of a table with no rows or only a mass column refuses it", () => {
    expect(thrown(() => tableToMeasure({ columns: ["x"], rows: [] })).reason).toMatch(/^no data rows/);
    expect(thrown(() => tableToMeasure({ columns: ["mass"], rows: [[1]] })).reason).toBe('no coordinate columns: the only column, "mass", holds the mass; a point needs at least one coordinate');
    expect(thrown(() => tableToMeasure(depots, { coordinates: [] })).reason).toBe("no coordinate columns: the coordinates list is empty; name at least one column");
    expect(thrown(() => tableToMeasure({ columns: [], rows: [] })).reason).toBe("no coordinate columns: the table has no columns");
  });

  it("tableToMeasure with a separate mass array and a mass column asks which one", () => {
    expect(thrown(() => tableToMeasure(depots, { mass: [1, 1, 1] })).reason).toMatch(/^a separate mass array was given but the table also has a "mass" column/);
    expect(thrown(() => tableToMeasure(depots, { mass: [1, 1, 1], massColumn: "mass" })).reason).toMatch(/^two sources of mass/);
    const m = tableToMeasure(depots, { mass: [1, 2, 3], massColumn: null, coordinates: ["x", "y"] });
    expect(Array.from(m.mass)).toEqual([1, 2, 3]);
  });
});

describe("tableToMeasure on .npy arrays", () => {
  // Values as numpy.load reads the numpy-written fixtures (numpy .npy format, numpy.lib.format / NEP 1).
  it("tableToMeasure of a 2-D array uses its columns as coordinates and a 1-D array as separate masses", () => {
    const points = parseNpy(fixtureBytes("points_f8.npy"));
    const masses = parseNpy(fixtureBytes("masses_f8.npy"));
    const m = tableToMeasure(points, { mass: masses, name: "points_f8.npy" });
    expect(m.n).toBe(5);
    expect(m.dim).toBe(2);
    expect(Array.from(m.points)).toEqual(expected.npy["points_f8.npy"].values);
    expect(Array.from(m.mass)).toEqual(expected.npy["masses_f8.npy"].values);
  });

  it("tableToMeasure of a Fortran-order array gives row-major points", () => {
    const m = tableToMeasure(parseNpy(fixtureBytes("points_fortran_f8.npy")));
    expect([m.n, m.dim]).toEqual([3, 4]);
    expect(Array.from(m.points)).toEqual(expected.npy["points_fortran_f8.npy"].values);
  });

  it("tableToMeasure of a 1-D array gives points on a line", () => {
    const m = tableToMeasure(parseNpy(fixtureBytes("counts_i8.npy")));
    expect([m.n, m.dim]).toEqual([3, 1]);
  });

  it("tableToMeasure names .npy columns by index, so a column can hold the mass", () => {
    const m = tableToMeasure(parseNpy(fixtureBytes("bytes_u1.npy")), { massColumn: "2" });
    expect(Array.from(m.points)).toEqual([0, 255, 1, 2]);
    expect(Array.from(m.mass)).toEqual([7, 128]);
    expect(thrown(() => tableToMeasure(parseNpy(fixtureBytes("points_f8.npy")), { massColumn: "1", name: "p.npy" })).message).toBe('p.npy: row 1, column "1": mass must be >= 0, got -2.5');
  });

  it("tableToMeasure of an array holding NaN names the row and column", () => {
    const array = parseNpy(fixtureBytes("points_f8.npy"));
    const data = array.data.slice();
    data[7] = NaN;
    const error = thrown(() => tableToMeasure({ ...array, data }, { name: "nan.npy" }));
    expect(error.message).toBe('nan.npy: row 4, column "1": coordinate must be a finite number, got NaN');
  });

  it("tableToMeasure of an empty (0, 2) array refuses it", () => {
    expect(thrown(() => tableToMeasure(parseNpy(fixtureBytes("empty_0x2.npy")))).reason).toMatch(/^no data rows/);
  });

  it("tableToMeasure with a separate mass array of the wrong length or shape names the mass file", () => {
    const points = parseNpy(fixtureBytes("points_f8.npy"));
    expect(thrown(() => tableToMeasure(points, { mass: [1, 2], name: "p.npy", massName: "w.npy" })).message).toBe("w.npy: the separate mass array has 2 values for 5 points");
    const square = parseNpy(fixtureBytes("counts_be_i2.npy"));
    expect(thrown(() => tableToMeasure(points, { mass: square })).reason).toBe("the separate mass array must have shape (n,) or (n, 1), got (2, 2)");
  });
});
