import { describe, expect, it } from "vitest";
import { gaussianMixture, ring, subsample } from "../../../core/generators";
import type { GridMeasure, PointMeasure } from "../../../core/measure";
import { seededRandom } from "../../../core/random";
import { CellSettingError } from "../../../cells/kinds/cell-error";
import { defineDataCell, describeData } from "../../../cells/kinds/data/define";
import { makeStudy, outcome, run, valueOf } from "../study/study-helpers";
import { cellOf, computeContext, defineContext } from "./define-helpers";

/**
 * FNV-1a 32 written out from its specification (Fowler, Noll & Vo; offset basis
 * 2166136261, prime 16777619), independently of cells/document/seed.ts, to check
 * that data cells derive "study" seeds the way docs/format.md ("Seeds") says.
 */
function fnv1a(text: string): number {
  let h = 2166136261;
  for (const byte of Buffer.from(text, "utf8")) {
    h ^= byte;
    h = Number((BigInt(h) * 16777619n) % 4294967296n);
  }
  return h;
}

const mixture = { from: "generator", generator: "gaussian-mixture", n: 40, components: [{ mean: [0, 0], scale: 0.5 }, { weight: 2, mean: [3, 1], covariance: [[0.5, 0.1], [0.1, 0.3]] }] };

async function compute(cells: object[], id: string, inputs: Record<string, unknown> = {}, seed = 20261201) {
  const study = makeStudy(cells, seed);
  return defineDataCell(cellOf(study, id, "data"), defineContext(study)).compute(inputs, computeContext());
}

describe("defineDataCell", () => {
  it("defineDataCell(generator, seed 'study') draws with FNV-1a-32('<study seed>:<cell id>') as docs/format.md says", async () => {
    const measure = (await compute([{ id: "d1", kind: "data", name: "depots", settings: mixture }], "d1")) as PointMeasure;
    const expected = gaussianMixture({ n: 40, components: mixture.components as never, random: seededRandom(fnv1a("20261201:d1")) });
    expect(measure.points).toEqual(expected.points);
    expect(measure.mass).toEqual(expected.mass);
  });

  it("defineDataCell(generator) draws the same bits again, and other bits for another cell id or study seed", async () => {
    const cells = (id: string) => [{ id, kind: "data", name: "depots", settings: mixture }];
    const a = (await compute(cells("d1"), "d1")) as PointMeasure;
    const again = (await compute(cells("d1"), "d1")) as PointMeasure;
    const otherId = (await compute(cells("d7"), "d7")) as PointMeasure;
    const otherSeed = (await compute(cells("d1"), "d1", {}, 5)) as PointMeasure;
    expect(again.points).toEqual(a.points);
    expect(otherId.points).not.toEqual(a.points);
    expect(otherSeed.points).not.toEqual(a.points);
  });

  it("defineDataCell(ring with references) resolves n, radius, noise and a seed reference from its inputs", async () => {
    const cells = [
      { id: "p1", kind: "parameter", name: "count", settings: { control: "integer", value: 30, min: 1 } },
      { id: "p2", kind: "parameter", name: "s", settings: { control: "seed", value: 9 } },
      { id: "d1", kind: "data", name: "shops", settings: { from: "generator", generator: "ring", n: { param: "count" }, radius: 2.5, noise: { param: "count" }, seed: { param: "s" } } },
    ];
    const study = makeStudy(cells);
    const def = defineDataCell(cellOf(study, "d1", "data"), defineContext(study));
    expect(def.inputs).toEqual(["count", "s"]);
    const measure = def.compute({ count: 30, s: 9 }, computeContext()) as PointMeasure;
    expect(measure.points).toEqual(ring({ n: 30, radius: 2.5, noise: 30, random: seededRandom(9) }).points);
  });

  it("defineDataCell(n from a reference) throws a CellSettingError naming the setting and the reference when the value is out of bounds", async () => {
    const cells = [{ id: "d1", kind: "data", name: "x", settings: { from: "generator", generator: "two-moons", n: { param: "count" } } }];
    await expect(compute(cells, "d1", { count: 2.5 })).rejects.toThrow(CellSettingError);
    await expect(compute(cells, "d1", { count: 2.5 })).rejects.toThrow("n (from count): must be an integer, got 2.5");
    await expect(compute(cells, "d1", { count: "many" })).rejects.toThrow('n (from count): must be an integer, got "many"');
  });

  it("defineDataCell(subsample) keeps k of the points the same seed generates, drawn after them from one stream", async () => {
    const full = (await compute([{ id: "d1", kind: "data", name: "x", settings: mixture }], "d1")) as PointMeasure;
    const sub = (await compute([{ id: "d1", kind: "data", name: "x", settings: { ...mixture, subsample: 12 } }], "d1")) as PointMeasure;
    const random = seededRandom(fnv1a("20261201:d1"));
    const expected = subsample(gaussianMixture({ n: 40, components: mixture.components as never, random }), 12, random);
    expect(sub.points).toEqual(expected.points);
    const rows = (m: PointMeasure) => Array.from({ length: m.n }, (_, i) => `${m.points[2 * i]},${m.points[2 * i + 1]}`);
    const all = new Set(rows(full));
    expect(rows(sub).every((r) => all.has(r))).toBe(true);
  });

  it("defineDataCell(subsample larger than the measure) fails saying how many points there are", async () => {
    const cells = [{ id: "d1", kind: "data", name: "x", settings: { from: "inline", points: [[0], [1], [2]], mass: [1, 0, 1], subsample: 3 } }];
    await expect(compute(cells, "d1")).rejects.toThrow("subsample: asks for 3 points, but the measure has 2 with positive mass");
  });

  it("defineDataCell(inline) keeps the written points and masses", async () => {
    const measure = (await compute([{ id: "d1", kind: "data", name: "x", settings: { from: "inline", points: [[0, 0], [1, 0.5]], mass: [0.2, 0.8] } }], "d1")) as PointMeasure;
    expect(Array.from(measure.points)).toEqual([0, 0, 1, 0.5]);
    expect(Array.from(measure.mass)).toEqual([0.2, 0.8]);
  });

  it("defineDataCell(grid values) keeps the masses as written, on the grid given", async () => {
    const settings = { from: "generator", generator: "grid-histogram", shape: [4], origin: [1], spacing: [0.5], density: { values: [0, 1, 2, 3] } };
    const grid = (await compute([{ id: "d1", kind: "data", name: "x", settings }], "d1")) as GridMeasure;
    expect(grid).toMatchObject({ kind: "grid", shape: [4], origin: [1], spacing: [0.5] });
    expect(Array.from(grid.mass)).toEqual([0, 1, 2, 3]);
  });

  it("defineDataCell(grid components) gives masses proportional to the Gaussian density at cell centres", async () => {
    // Normal density ratio p(x)/p(m) = exp(−(x−m)²/(2σ²)) (1-D) and exp(−½ xᵀΣ⁻¹x) (2-D): textbook facts, no source.
    const oneD = { from: "generator", generator: "grid-histogram", shape: [5], density: { components: [{ mean: [2], scale: 1 }] } };
    const g1 = (await compute([{ id: "d1", kind: "data", name: "x", settings: oneD }], "d1")) as GridMeasure;
    expect(g1.mass[0] / g1.mass[2]).toBeCloseTo(Math.exp(-2), 14);
    const total = g1.mass.reduce((s, w) => s + w, 0);
    expect(total).toBeCloseTo(1, 14);
    const twoD = { from: "generator", generator: "grid-histogram", shape: [3, 3], origin: [-1, -1], density: { components: [{ mean: [0, 0], covariance: [[2, 0.5], [0.5, 1]] }] } };
    const g2 = (await compute([{ id: "d1", kind: "data", name: "x", settings: twoD }], "d1")) as GridMeasure;
    // Cell (0, 2) is at x = (−1, 1); Σ⁻¹ = [[1, −0.5], [−0.5, 2]] / 1.75, so xᵀΣ⁻¹x = (1 + 1 + 2) / 1.75.
    expect(g2.mass[2] / g2.mass[4]).toBeCloseTo(Math.exp(-0.5 * (4 / 1.75)), 14);
  });

  it("defineDataCell(grid density from a cell) evaluates the cell's function, and fails naming it when it is not a function", async () => {
    const settings = { from: "generator", generator: "grid-histogram", shape: [3], density: { cell: "bump" } };
    const cells = [{ id: "d1", kind: "data", name: "x", settings }];
    const grid = (await compute(cells, "d1", { bump: (x: number) => x + 1 })) as GridMeasure;
    expect(Array.from(grid.mass)).toEqual([1 / 6, 2 / 6, 3 / 6]);
    await expect(compute(cells, "d1", { bump: 3 })).rejects.toThrow('density.cell: "bump" gives 3, not a function');
  });

  it("defineDataCell(file) without a file reader fails saying files cannot be read here", async () => {
    await expect(compute([{ id: "d1", kind: "data", name: "x", settings: { from: "file", path: "a.csv" } }], "d1")).rejects.toThrow("path: data files cannot be read here");
  });

  it("runStudy(file data) reads the file relative to the study's folder, mass column included", async () => {
    // test/fixtures/data/depots.csv was written by numpy (make_fixtures.py); its first row is 0.1, −2.5, mass 1.
    const study = makeStudy([{ id: "d1", kind: "data", name: "depots", settings: { from: "file", path: "../data/depots.csv" } }]);
    const result = await run(study, { studyPath: "test/fixtures/studies/virtual.couplet.json" });
    const measure = valueOf<PointMeasure>(result, "d1");
    expect(measure.dim).toBe(2);
    expect([measure.points[0], measure.points[1], measure.mass[0]]).toEqual([0.1, -2.5, 1]);
    expect(outcome(result, "d1").headline).toBe(`${measure.n} points in 2-D`);
  });

  it("describeData(cell, grid) names the grid's shape", () => {
    const study = makeStudy([{ id: "d1", kind: "data", name: "x", settings: { from: "inline", points: [[0]] } }]);
    const grid: GridMeasure = { kind: "grid", shape: [20, 30], origin: [0, 0], spacing: [1, 1], mass: new Float64Array(600).fill(1) };
    expect(describeData(cellOf(study, "d1", "data"), grid).headline).toBe("grid 20 × 30 (600 cells)");
  });
});
