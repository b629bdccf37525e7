import { describe, expect, it } from "vitest";
import { dataDependencies, dataUsesStudySeed, formatFromPath, mapDataReferences, validateDataSettings, type DataSettings } from "../../../cells/kinds/data/settings";

const P = "cells[2].settings";
const issues = (settings: unknown) => validateDataSettings(settings, P);
const mixture = { from: "generator", generator: "gaussian-mixture", n: 100, components: [{ mean: [0, 0], scale: 1 }] };

describe("validateDataSettings", () => {
  it("validateDataSettings accepts every generator, a file and inline points", () => {
    expect(issues(mixture)).toEqual([]);
    expect(issues({ from: "generator", generator: "uniform-box", n: 5, lower: [0, 0], upper: [1, 0] })).toEqual([]);
    expect(issues({ from: "generator", generator: "ring", n: 5 })).toEqual([]);
    expect(issues({ from: "generator", generator: "two-moons", n: { param: "n" }, noise: 0.1, seed: 3 })).toEqual([]);
    expect(issues({ from: "generator", generator: "grid-histogram", shape: [2, 2], density: { values: [0, 1, 1, 0] } })).toEqual([]);
    expect(issues({ from: "file", path: "data/shops.tsv", columns: ["x", "y"], mass: "stock" })).toEqual([]);
    expect(issues({ from: "inline", points: [[0], [1]], mass: [1, 0], subsample: 1, seed: "study" })).toEqual([]);
  });

  it("validateDataSettings names the known origins and generators", () => {
    expect(issues({ from: "database" })).toEqual([{ path: `${P}.from`, message: 'must be one of "generator", "file", "inline", got "database"' }]);
    expect(issues({ from: "generator", generator: "spiral", n: 3 })).toEqual([
      { path: `${P}.generator`, message: 'must be one of "gaussian-mixture", "uniform-box", "ring", "two-moons", "grid-histogram", got "spiral"' },
    ]);
  });

  it("validateDataSettings requires a positive integer count n (or a reference)", () => {
    expect(issues({ ...mixture, n: 0 })).toEqual([{ path: `${P}.n`, message: "must be >= 1, got 0" }]);
    expect(issues({ ...mixture, n: 2.5 })).toEqual([{ path: `${P}.n`, message: "must be an integer, got 2.5" }]);
    expect(issues({ from: "generator", generator: "ring" })).toEqual([{ path: `${P}.n`, message: "missing (required)" }]);
  });

  it("validateDataSettings checks mixture components: dimensions agree, one of covariance or scale, symmetric covariance", () => {
    const comps = (components: unknown) => issues({ ...mixture, components });
    expect(comps([])).toEqual([{ path: `${P}.components`, message: "must have at least 1 item, got 0" }]);
    expect(comps([{ mean: [0, 0] }, { mean: [1, 1, 1] }])).toEqual([
      { path: `${P}.components[1].mean`, message: "dimension mismatch: components[0].mean has 2 coordinates, this one 3" },
    ]);
    expect(comps([{ mean: [0, 0], scale: 1, covariance: [[1, 0], [0, 1]] }])).toEqual([{ path: `${P}.components[0]`, message: 'give either "covariance" or "scale", not both' }]);
    expect(comps([{ mean: [0, 0], covariance: [[1, 0.5], [0.4, 1]] }])).toEqual([
      { path: `${P}.components[0].covariance[0][1]`, message: "must equal covariance[1][0] (0.4): a covariance is symmetric, got 0.5" },
    ]);
    expect(comps([{ mean: [0, 0], covariance: [[1, 0, 0], [0, 1, 0], [0, 0, 1]] }])).toEqual([
      { path: `${P}.components[0].covariance`, message: "must be 2×2 to match the mean, got 3 rows" },
    ]);
    expect(comps([{ mean: [0, 0], covariance: [[-1, 0], [0, 1]] }])).toEqual([{ path: `${P}.components[0].covariance[0][0]`, message: "a variance must be >= 0, got -1" }]);
    expect(comps([{ mean: [0, 0], scale: [1] }])).toEqual([{ path: `${P}.components[0].scale`, message: "must have 2 values, got 1" }]);
    expect(comps([{ mean: [0], weight: 0 }])).toEqual([{ path: `${P}.components`, message: "weights sum to zero: at least one component needs a positive weight" }]);
    expect(comps([{ mean: [0], weight: -1 }])[0]).toEqual({ path: `${P}.components[0].weight`, message: "must be >= 0, got -1" });
  });

  it("validateDataSettings checks box corners in order and ring and noise values", () => {
    expect(issues({ from: "generator", generator: "uniform-box", n: 5, lower: [0, 2], upper: [1, 1] })).toEqual([{ path: `${P}.upper[1]`, message: "must be >= lower[1] (2), got 1" }]);
    expect(issues({ from: "generator", generator: "uniform-box", n: 5, lower: [0, 2], upper: [1] })).toEqual([{ path: `${P}.upper`, message: "dimension mismatch: lower has 2 values, upper 1" }]);
    expect(issues({ from: "generator", generator: "ring", n: 5, center: [0, 0, 0] })).toEqual([{ path: `${P}.center`, message: "must have 2 values, got 3" }]);
    expect(issues({ from: "generator", generator: "ring", n: 5, radius: -1 })).toEqual([{ path: `${P}.radius`, message: "must be >= 0, got -1" }]);
    expect(issues({ from: "generator", generator: "two-moons", n: 5, noise: "lots" })).toEqual([
      { path: `${P}.noise`, message: 'must be a number or a reference {"param": name}, got "lots"' },
    ]);
  });

  it("validateDataSettings checks grid shapes and densities", () => {
    const grid = (extra: object) => issues({ from: "generator", generator: "grid-histogram", shape: [3], density: { values: [1, 1, 1] }, ...extra });
    expect(grid({ shape: [2, 2, 2] })).toEqual([{ path: `${P}.shape`, message: "a grid has 1 or 2 axes, got 3" }]);
    expect(grid({ shape: [0] })).toEqual([{ path: `${P}.shape[0]`, message: "must be >= 1, got 0" }]);
    expect(grid({ density: { values: [1, 1] } })).toEqual([{ path: `${P}.density.values`, message: "must have 3 values, got 2" }]);
    expect(grid({ density: { values: [0, 0, 0] } })).toEqual([{ path: `${P}.density.values`, message: "total is zero: at least one cell needs positive mass" }]);
    expect(grid({ density: {} })).toEqual([{ path: `${P}.density`, message: 'must hold one of "values", "components" or "cell"' }]);
    expect(grid({ density: { cell: "f", values: [1, 1, 1] } })).toEqual([{ path: `${P}.density`, message: 'give only one of "values", "components" or "cell", got "values" and "cell"' }]);
    expect(grid({ density: { components: [{ mean: [0, 0] }] } })).toEqual([
      { path: `${P}.density.components`, message: "dimension mismatch: the grid has 1 axis, the components 2 coordinates" },
    ]);
    expect(grid({ spacing: [0] })).toEqual([{ path: `${P}.spacing[0]`, message: "must be > 0, got 0" }]);
    expect(grid({ origin: [0, 0] })).toEqual([{ path: `${P}.origin`, message: "must have 1 value, got 2" }]);
  });

  it("validateDataSettings checks file paths are relative with / and have a known format", () => {
    expect(issues({ from: "file", path: "/home/me/shops.csv" })).toEqual([{ path: `${P}.path`, message: 'must be relative to the study file\'s folder, got "/home/me/shops.csv"' }]);
    expect(issues({ from: "file", path: "C:/shops.csv" })).toEqual([{ path: `${P}.path`, message: 'must be relative to the study file\'s folder, got "C:/shops.csv"' }]);
    expect(issues({ from: "file", path: "data\\shops.csv" })).toEqual([{ path: `${P}.path`, message: 'must use "/" between folders (the same on every system), got "data\\\\shops.csv"' }]);
    expect(issues({ from: "file", path: "shops.dat" })).toEqual([
      { path: `${P}.format`, message: 'missing (required: the extension of "shops.dat" does not tell; use one of "csv", "tsv", "json", "npy")' },
    ]);
    expect(issues({ from: "file", path: "shops.dat", format: "xlsx" })).toEqual([{ path: `${P}.format`, message: 'must be one of "csv", "tsv", "json", "npy", got "xlsx"' }]);
    expect(issues({ from: "file", path: "a.csv", columns: ["x", "x"] })).toEqual([{ path: `${P}.columns[1]`, message: 'repeats columns[0] ("x")' }]);
    expect(issues({ from: "file", path: "a.csv", columns: ["x", "m"], mass: "m" })).toEqual([
      { path: `${P}.mass`, message: '"m" is also listed in columns: a column is either a coordinate or the mass' },
    ]);
    expect(issues({ from: "file" })).toEqual([{ path: `${P}.path`, message: "missing (required)" }]);
  });

  it("validateDataSettings checks inline rows of one length and masses", () => {
    expect(issues({ from: "inline", points: [] })).toEqual([{ path: `${P}.points`, message: "must have at least 1 item, got 0" }]);
    expect(issues({ from: "inline", points: [[0, 0], [1]] })).toEqual([{ path: `${P}.points[1]`, message: "must have 2 values, got 1" }]);
    expect(issues({ from: "inline", points: [[0, 0], [1, "2"]] })).toEqual([{ path: `${P}.points[1][1]`, message: 'must be a number, got "2"' }]);
    expect(issues({ from: "inline", points: [[0], [1]], mass: [1] })).toEqual([{ path: `${P}.mass`, message: "must have 2 values, got 1" }]);
    expect(issues({ from: "inline", points: [[0], [1]], mass: [1, -1] })).toEqual([{ path: `${P}.mass[1]`, message: "must be >= 0, got -1" }]);
    expect(issues({ from: "inline", points: [[0], [1]], mass: [0, 0] })).toEqual([{ path: `${P}.mass`, message: "total mass is zero: at least one point needs positive mass" }]);
  });

  it("validateDataSettings checks subsample and seed", () => {
    expect(issues({ ...mixture, subsample: 0 })).toEqual([{ path: `${P}.subsample`, message: "must be >= 1, got 0" }]);
    expect(issues({ ...mixture, seed: "random" })).toEqual([{ path: `${P}.seed`, message: 'must be an integer seed, a reference {"param": name} or "study", got "random"' }]);
    expect(issues({ ...mixture, seed: 1.5 })).toEqual([{ path: `${P}.seed`, message: "must be an integer, got 1.5" }]);
  });
});

describe("dataDependencies", () => {
  it("dataDependencies lists number references, the seed reference and a density cell", () => {
    const s = {
      from: "generator",
      generator: "gaussian-mixture",
      n: { param: "count" },
      seed: { param: "s" },
      subsample: { param: "k" },
      components: [{ mean: [0], weight: { param: "w" }, scale: { param: "spread" } }],
    } as unknown as DataSettings;
    expect(dataDependencies(s)).toEqual(["count", "k", "s", "w", "spread"]);
    const grid = { from: "generator", generator: "grid-histogram", shape: [4], density: { cell: "bump" } } as unknown as DataSettings;
    expect(dataDependencies(grid)).toEqual(["bump"]);
    expect(dataDependencies({ from: "inline", points: [[0]] } as DataSettings)).toEqual([]);
  });

  it("mapDataReferences renames inside components and keeps untouched objects", () => {
    const s = { from: "generator", generator: "gaussian-mixture", n: 5, components: [{ mean: [0], scale: { param: "a" } }, { mean: [1] }] } as unknown as DataSettings;
    const out = mapDataReferences(s, (n) => (n === "a" ? "b" : n)) as typeof s & { components: unknown[] };
    expect(out.components[0]).toEqual({ mean: [0], scale: { param: "b" } });
    expect(out.components[1]).toBe((s as unknown as { components: unknown[] }).components[1]);
  });

  it("dataUsesStudySeed is true for random data with seed omitted or \"study\"", () => {
    expect(dataUsesStudySeed(mixture as DataSettings)).toBe(true);
    expect(dataUsesStudySeed({ ...mixture, seed: 5 } as DataSettings)).toBe(false);
    expect(dataUsesStudySeed({ from: "inline", points: [[0]] } as DataSettings)).toBe(false);
    expect(dataUsesStudySeed({ from: "inline", points: [[0]], subsample: 1 } as DataSettings)).toBe(true);
    expect(dataUsesStudySeed({ from: "generator", generator: "grid-histogram", shape: [1], density: { values: [1] } } as DataSettings)).toBe(false);
  });

  it("formatFromPath reads the extension case-insensitively", () => {
    expect(formatFromPath("a/b.CSV")).toBe("csv");
    expect(formatFromPath("b.npy")).toBe("npy");
    expect(formatFromPath("b")).toBeUndefined();
  });
});
