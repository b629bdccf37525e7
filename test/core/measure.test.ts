import { describe, expect, it } from "vitest";
import { TransportInputError } from "../../core/errors";
import { checkMass, gridMeasure, measureDimension, measurePoints, normalizeMeasure, pointMeasure, supportSize, totalMass } from "../../core/measure";
import { inputError } from "./expectations";

describe("pointMeasure", () => {
  it("pointMeasure(rows) copies rows into a row-major array with uniform mass 1/n", () => {
    const rows = [
      [1, 2],
      [3, 4],
      [5, 6],
    ];
    const m = pointMeasure(rows);
    expect(m).toMatchObject({ kind: "points", n: 3, dim: 2 });
    expect(Array.from(m.points)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(Array.from(m.mass)).toEqual([1 / 3, 1 / 3, 1 / 3]);
    rows[0][0] = 99;
    expect(m.points[0]).toBe(1);
  });

  it("pointMeasure(flat, mass, {dim}) reads flat coordinates and copies the masses", () => {
    const flat = new Float64Array([0, 0, 1, 1]);
    const mass = [0.25, 0.75];
    const m = pointMeasure(flat, mass, { dim: 2 });
    expect(m.n).toBe(2);
    expect(m.points).not.toBe(flat);
    expect(Array.from(m.mass)).toEqual(mass);
    expect(supportSize(m)).toBe(2);
    expect(measureDimension(m)).toBe(2);
    expect(totalMass(m)).toBe(1);
  });

  it("pointMeasure([]) throws naming points: empty measure", () => {
    const error = inputError(() => pointMeasure([], undefined, { name: "source" }));
    expect(error.field).toBe("source.points");
    expect(error.message).toMatch(/empty/);
  });

  it("pointMeasure with a NaN or infinite coordinate throws naming the coordinate", () => {
    expect(inputError(() => pointMeasure([[0, 1], [2, Number.NaN]], undefined, { name: "source" })).field).toBe("source.points[1][1]");
    const error = inputError(() => pointMeasure([0, Number.POSITIVE_INFINITY, 2]));
    expect(error.field).toBe("measure.points[1][0]");
    expect(error.message).toMatch(/Infinity/);
  });

  it("pointMeasure with rows of unequal length throws naming the row: dimension mismatch", () => {
    const error = inputError(() => pointMeasure([[0, 1], [2]], undefined, { name: "target" }));
    expect(error.field).toBe("target.points[1]");
    expect(error.message).toMatch(/dimension mismatch/);
    expect(inputError(() => pointMeasure([[0, 1]], undefined, { dim: 3 })).field).toBe("measure.points[0]");
  });

  it("pointMeasure with a null row or no points at all throws naming points (not a TypeError)", () => {
    expect(inputError(() => pointMeasure([[0, 1], null as unknown as number[]])).field).toBe("measure.points[1]");
    expect(inputError(() => pointMeasure(undefined as unknown as number[], undefined, { name: "source" })).field).toBe("source.points");
  });

  it("pointMeasure(flat, _, {dim}) with a length not a multiple of dim throws naming points", () => {
    expect(inputError(() => pointMeasure([1, 2, 3], undefined, { dim: 2 })).field).toBe("measure.points");
    expect(inputError(() => pointMeasure([1, 2], undefined, { dim: 0 })).field).toBe("measure.dim");
  });

  it("pointMeasure with a negative, NaN or infinite mass throws naming mass[i]", () => {
    expect(inputError(() => pointMeasure([0, 1], [0.5, -0.1], { name: "source" })).field).toBe("source.mass[1]");
    expect(inputError(() => pointMeasure([0, 1], [Number.NaN, 1])).field).toBe("measure.mass[0]");
    expect(inputError(() => pointMeasure([0, 1], [1, Number.POSITIVE_INFINITY])).field).toBe("measure.mass[1]");
  });

  it("pointMeasure with all masses zero throws naming mass: zero total mass", () => {
    const error = inputError(() => pointMeasure([0, 1], [0, 0]));
    expect(error.field).toBe("measure.mass");
    expect(error.message).toMatch(/total mass is zero/);
  });

  it("pointMeasure with more masses than points throws naming mass: length mismatch", () => {
    const error = inputError(() => pointMeasure([0, 1], [0.2, 0.3, 0.5]));
    expect(error.field).toBe("measure.mass");
    expect(error.message).toMatch(/length mismatch/);
  });
});

describe("gridMeasure", () => {
  it("gridMeasure([2, 3], mass, {origin, spacing}) lays cell centres out row-major, axis 0 first", () => {
    const g = gridMeasure([2, 3], [1, 2, 3, 4, 5, 6], { origin: [10, 0], spacing: [1, 0.5] });
    expect(supportSize(g)).toBe(6);
    expect(measureDimension(g)).toBe(2);
    expect(Array.from(measurePoints(g))).toEqual([10, 0, 10, 0.5, 10, 1, 11, 0, 11, 0.5, 11, 1]);
  });

  it("gridMeasure([4], mass) puts 1-D cell centres at origin + i·spacing (defaults 0 and 1)", () => {
    expect(Array.from(measurePoints(gridMeasure([4], [1, 1, 1, 1])))).toEqual([0, 1, 2, 3]);
  });

  it("gridMeasure with a bad shape, spacing, origin or mass throws naming the field", () => {
    expect(inputError(() => gridMeasure([2, 2, 2], new Float64Array(8).fill(1))).field).toBe("measure.shape");
    expect(inputError(() => gridMeasure([2, 0], [])).field).toBe("measure.shape[1]");
    expect(inputError(() => gridMeasure([2], [1, 1], { spacing: [0] })).field).toBe("measure.spacing[0]");
    expect(inputError(() => gridMeasure([2], [1, 1], { origin: [Number.NaN] })).field).toBe("measure.origin[0]");
    expect(inputError(() => gridMeasure([2], [1, 1], { origin: [0, 0] })).field).toBe("measure.origin");
    expect(inputError(() => gridMeasure([2, 2], [1, 1, 1], { name: "target" })).field).toBe("target.mass");
    expect(inputError(() => gridMeasure([2], [1, -1])).field).toBe("measure.mass[1]");
  });
});

describe("checkMass", () => {
  it("checkMass(mass, n, field) returns a copy and names field[i] on a bad entry", () => {
    const mass = [1, 2];
    const copy = checkMass(mass, 2, "a");
    expect(Array.from(copy)).toEqual(mass);
    expect(inputError(() => checkMass([1, Number.NaN], 2, "a")).field).toBe("a[1]");
  });
});

describe("normalizeMeasure", () => {
  it("normalizeMeasure(m) scales masses to total 1 and leaves m unchanged", () => {
    const m = pointMeasure([0, 1, 2], [1, 1, 2]);
    const n = normalizeMeasure(m);
    expect(Array.from(n.mass)).toEqual([0.25, 0.25, 0.5]);
    expect(Array.from(m.mass)).toEqual([1, 1, 2]);
    expect(n.points).toBe(m.points);
  });
});
