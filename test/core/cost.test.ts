import { describe, expect, it } from "vitest";
import { checkCost, costExponent, costMatrix, costScale, resolveEpsilon } from "../../core/cost";
import { TransportInputError } from "../../core/errors";
import { pointMeasure } from "../../core/measure";
import { inputError } from "./expectations";

const source = pointMeasure([
  [0, 0],
  [1, 0],
]);
const target = pointMeasure([
  [0, 3],
  [4, 0],
  [1, 1],
]);

describe("costMatrix", () => {
  it("costMatrix(a, b, sqeuclidean) is |x−y|² without a ½ factor, row-major source × target", () => {
    const C = costMatrix(source, target, { kind: "sqeuclidean" });
    expect(C.rows).toBe(2);
    expect(C.cols).toBe(3);
    expect(Array.from(C.data)).toEqual([9, 16, 2, 10, 9, 1]);
  });

  it("costMatrix(a, b, euclidean) and power p = 3 are |x−y| and |x−y|³", () => {
    // 3-4-5 triangle: |(0,0) − (4,0)| = 4, |(1,0) − (0,3)| = √10.
    const E = costMatrix(source, target, { kind: "euclidean" });
    expect(E.data[1]).toBe(4);
    expect(E.data[3]).toBeCloseTo(Math.sqrt(10), 14);
    const P = costMatrix(source, target, { kind: "power", p: 3 });
    expect(P.data[1]).toBeCloseTo(64, 12);
    expect(P.data[0]).toBeCloseTo(27, 12);
  });

  it("costMatrix with a user matrix of the wrong shape throws naming cost.matrix", () => {
    const matrix = { data: new Float64Array(6), rows: 3, cols: 2 };
    const error = inputError(() => costMatrix(source, target, { kind: "matrix", matrix }));
    expect(error.field).toBe("cost.matrix");
    expect(error.message).toMatch(/3×2/);
  });

  it("costMatrix with a user matrix of the right shape returns it unchanged", () => {
    const matrix = { data: Float64Array.from([1, 2, 3, 4, 5, 6]), rows: 2, cols: 3 };
    expect(costMatrix(source, target, { kind: "matrix", matrix })).toBe(matrix);
  });

  it("costMatrix between 2-D and 1-D measures throws naming target.points: dimension mismatch", () => {
    const error = inputError(() => costMatrix(source, pointMeasure([0, 1]), { kind: "sqeuclidean" }));
    expect(error.field).toBe("target.points");
    expect(error.message).toMatch(/dimension mismatch/);
  });
});

describe("checkCost", () => {
  it("checkCost({kind: power, p}) throws naming cost.p for p ≤ 0, NaN or Infinity", () => {
    for (const p of [0, -1, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(inputError(() => checkCost({ kind: "power", p })).field).toBe("cost.p");
    }
  });

  it("checkCost with an unknown kind throws naming cost.kind", () => {
    expect(inputError(() => checkCost({ kind: "manhattan" } as never)).field).toBe("cost.kind");
  });

  it("checkCost with a user matrix whose data length is not rows×cols or holds NaN throws naming it", () => {
    expect(inputError(() => checkCost({ kind: "matrix", matrix: { data: new Float64Array(5), rows: 2, cols: 3 } })).field).toBe("cost.matrix");
    const data = Float64Array.from([0, 1, 2, Number.NaN, 4, 5]);
    expect(inputError(() => checkCost({ kind: "matrix", matrix: { data, rows: 2, cols: 3 } })).field).toBe("cost.matrix[1][0]");
  });

  it("costExponent gives 2, 1, p and undefined for the four kinds", () => {
    expect(costExponent({ kind: "sqeuclidean" })).toBe(2);
    expect(costExponent({ kind: "euclidean" })).toBe(1);
    expect(costExponent({ kind: "power", p: 1.5 })).toBe(1.5);
    expect(costExponent({ kind: "matrix", matrix: { data: new Float64Array(1), rows: 1, cols: 1 } })).toBeUndefined();
  });
});

describe("costScale", () => {
  it("costScale(C) of [[9,16,2],[10,9,1]] is max 16, median 9, mean 47/6", () => {
    // Sorted entries 1 2 9 9 10 16: median (9+9)/2 = 9, by hand.
    const scale = costScale({ data: Float64Array.from([9, 16, 2, 10, 9, 1]), rows: 2, cols: 3 });
    expect(scale.max).toBe(16);
    expect(scale.median).toBe(9);
    expect(scale.mean).toBeCloseTo(47 / 6, 14);
  });

  it("costScale(C) of an odd count takes the middle entry and leaves C unsorted", () => {
    const data = Float64Array.from([5, 1, 3]);
    expect(costScale({ data, rows: 1, cols: 3 }).median).toBe(3);
    expect(Array.from(data)).toEqual([5, 1, 3]);
  });
});

describe("resolveEpsilon", () => {
  const scale = { max: 16, median: 9, mean: 8 };

  it("resolveEpsilon({relative: 0.05, reference: median}) is 0.05 × median cost", () => {
    expect(resolveEpsilon({ relative: 0.05, reference: "median" }, scale)).toEqual({ absolute: 0.45, relative: 0.05, reference: "median" });
  });

  it("resolveEpsilon({relative}) defaults to the max cost", () => {
    expect(resolveEpsilon({ relative: 0.5 }, scale)).toEqual({ absolute: 8, relative: 0.5, reference: "max" });
  });

  it("resolveEpsilon({absolute: 4}) reports the relative value against the max cost", () => {
    expect(resolveEpsilon({ absolute: 4 }, scale)).toEqual({ absolute: 4, relative: 0.25, reference: "max" });
  });

  it("resolveEpsilon with epsilon ≤ 0, NaN, or an unknown reference throws naming the field", () => {
    expect(inputError(() => resolveEpsilon({ absolute: 0 }, scale)).field).toBe("epsilon");
    expect(inputError(() => resolveEpsilon({ absolute: Number.NaN }, scale)).field).toBe("epsilon");
    expect(inputError(() => resolveEpsilon({ relative: -1 }, scale)).field).toBe("epsilon.relative");
    expect(inputError(() => resolveEpsilon({ relative: 0.1, reference: "mode" as never }, scale)).field).toBe("epsilon.reference");
  });

  it("resolveEpsilon(undefined) throws naming epsilon (not a TypeError)", () => {
    expect(inputError(() => resolveEpsilon(undefined as never, scale)).field).toBe("epsilon");
  });

  it("resolveEpsilon({relative}) on an all-zero cost throws: a relative epsilon has no scale", () => {
    const error = inputError(() => resolveEpsilon({ relative: 0.1 }, { max: 0, median: 0, mean: 0 }));
    expect(error.field).toBe("epsilon.relative");
  });
});

describe("costScale median by selection", () => {
  // Law: the median is the middle order statistic (mean of the two middle ones for an
  // even count) — common practice, no source. Checked against a full sort on seeded
  // matrices with many ties, odd and even sizes.
  it("costScale(C).median equals the sorted-array median on 200 seeded matrices", async () => {
    const { seededRandom } = await import("../../core/random");
    const { costScale } = await import("../../core/cost");
    const random = seededRandom(7);
    for (let trial = 0; trial < 200; trial++) {
      const rows = 1 + Math.floor(random() * 20);
      const cols = 1 + Math.floor(random() * 20);
      const levels = 1 + Math.floor(random() * 6);
      const data = Float64Array.from({ length: rows * cols }, () => (trial % 2 ? Math.floor(random() * levels) : random()));
      const sorted = Float64Array.from(data).sort();
      const h = sorted.length;
      const expected = h % 2 ? sorted[(h - 1) / 2] : 0.5 * (sorted[h / 2 - 1] + sorted[h / 2]);
      expect(costScale({ data, rows, cols }).median, `trial ${trial}: ${rows}×${cols}`).toBe(expected);
    }
  });
});
