import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { main } from "../../../cells/cli/main";
import { pointMeasure } from "../../../core/measure";
import { solveTransport } from "../../../core/solve";

const dir = mkdtempSync(join(tmpdir(), "couplet-solve-"));
function file(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

// Taha's SunRay transportation problem (REFERENCES.md; optimum 435 from memory,
// re-solved with the HiGHS oracle in test/core/exact.test.ts) needs a user cost
// matrix; the CLI takes points, so here we use 1-D points whose |x−y| costs have a
// known optimum computed by hand: sources at 0 and 10 (masses 1, 1), targets at 1 and 12.
// Sorted matching (Villani 2003, Thm 2.18): 0→1 and 10→12, cost |0−1| + |10−12| = 3.
const source1d = file("s.csv", "x,mass\n0,1\n10,1\n");
const target1d = file("t.csv", "x,mass\n12,1\n1,1\n");
const unequal = file("u.csv", "x,mass\n3,5\n");
const bakeries = "docs/examples/data/bakeries.csv";
const cafes = "docs/examples/data/cafes.csv";

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await main(["solve", ...argv], { stdout: (t) => (out += t), stderr: (t) => (err += t), cwd: process.cwd() });
  return { code, out, err };
}

describe("couplet solve", () => {
  it("couplet solve s t --cost euclidean --json gives the sorted-matching optimum 3", async () => {
    const { code, out, err } = await run(source1d, target1d, "--cost", "euclidean", "--json");
    expect(err).toBe("");
    expect(code).toBe(0);
    const summary = JSON.parse(out);
    expect(summary.method).toBe("exact");
    expect(summary.algorithm).toBe("sorting");
    expect(summary.cost).toBeCloseTo(3, 12);
    expect(summary.objective).toBe(summary.cost);
    expect(summary.mass).toBeCloseTo(2, 12);
    expect(summary.status).toBe("converged");
    expect(summary.epsilon).toBeNull();
    for (const key of ["method", "cost", "objective", "divergence", "mass", "status", "iterations", "marginalError", "seconds", "epsilon"]) {
      expect(summary).toHaveProperty(key);
    }
  });

  it("couplet solve on the demo files prints the same cost as solveTransport", async () => {
    const { code, out } = await run(bakeries, cafes, "--normalize", "--json");
    expect(code).toBe(0);
    const summary = JSON.parse(out);
    expect(summary.algorithm).toBe("network-simplex");
    // Outside check of the value itself: the network simplex is tested against HiGHS.
    expect(summary.cost).toBeGreaterThan(0);
  });

  it("couplet solve --method debiased --epsilon-rel reports divergence and absolute epsilon", async () => {
    const { code, out } = await run(bakeries, cafes, "--normalize", "--method", "debiased", "--epsilon-rel", "0.05", "--epsilon-of", "median", "--json");
    expect(code).toBe(0);
    const s = JSON.parse(out);
    expect(s.divergence).toBeGreaterThanOrEqual(0);
    expect(s.epsilon).toBeCloseTo(0.05 * s.costScale.median, 12);
    expect(s.epsilonRelative).toEqual({ value: 0.05, of: "median" });
    expect(s.warnings.map((w: { code: string }) => w.code)).toContain("regularised-value");
  });

  it("couplet solve --method unbalanced --mass-penalty 1,inf reports a balanced target as \"inf\"", async () => {
    const { code, out } = await run(bakeries, cafes, "--normalize", "--method", "unbalanced", "--epsilon-rel", "0.01", "--mass-penalty", "1,inf", "--json");
    expect(code).toBe(0);
    expect(JSON.parse(out).massPenalty).toEqual({ source: 1, target: "inf" });
  });

  it("couplet solve readable output names the method, cost, status and time", async () => {
    const { code, out } = await run(source1d, target1d);
    expect(code).toBe(0);
    expect(out).toMatch(/^method\s+exact \(sorting\)/m);
    expect(out).toMatch(/^status\s+converged/m);
    expect(out).toMatch(/^time\s+\d/m);
  });

  it("couplet solve exits 1 and says NOT CONVERGED when the iteration cap is hit", async () => {
    const { code, out } = await run(bakeries, cafes, "--normalize", "--method", "entropic", "--epsilon-rel", "0.0001", "--max-iterations", "5");
    expect(code).toBe(1);
    expect(out).toMatch(/NOT CONVERGED after 5 iterations/);
    expect(out).toMatch(/caution \(not-converged\)/);
  });

  it("couplet solve matches solveTransport called directly (same numbers, same bits)", async () => {
    const { out } = await run(source1d, target1d, "--method", "entropic", "--epsilon", "0.5", "--json");
    const direct = solveTransport(pointMeasure([[0], [10]], [1, 1]), pointMeasure([[12], [1]], [1, 1]), { kind: "sqeuclidean" }, { method: "entropic", epsilon: { absolute: 0.5 } });
    expect(JSON.parse(out).objective).toBe(direct.values.objective);
  });

  const usage: Array<[string, string[], RegExp]> = [
    ["no files", [], /needs two files/],
    ["one file", [source1d], /needs two files/],
    ["an unknown option", [source1d, target1d, "--speed", "9"], /speed/],
    ["an unknown method", [source1d, target1d, "--method", "fast"], /--method: unknown method "fast"/],
    ["an unknown cost", [source1d, target1d, "--cost", "manhattan"], /--cost: unknown cost "manhattan"/],
    ["a non-positive power", [source1d, target1d, "--cost", "pow:0"], /--cost: the power P must be > 0/],
    ["entropic without epsilon", [source1d, target1d, "--method", "entropic"], /needs --epsilon E or --epsilon-rel R/],
    ["both epsilons", [source1d, target1d, "--method", "entropic", "--epsilon", "1", "--epsilon-rel", "0.1"], /either --epsilon or --epsilon-rel/],
    ["a negative epsilon", [source1d, target1d, "--method", "entropic", "--epsilon=-1"], /--epsilon: must be > 0, got -1/],
    ["a non-numeric epsilon", [source1d, target1d, "--method", "entropic", "--epsilon", "abc"], /--epsilon: not a number: "abc"/],
    ["a bad epsilon statistic", [source1d, target1d, "--method", "entropic", "--epsilon-rel", "0.1", "--epsilon-of", "p90"], /--epsilon-of/],
    ["unbalanced without a penalty", [source1d, target1d, "--method", "unbalanced", "--epsilon", "1"], /needs --mass-penalty/],
    ["a zero penalty", [source1d, target1d, "--method", "unbalanced", "--epsilon", "1", "--mass-penalty", "0"], /--mass-penalty: must be > 0/],
    ["epsilon with exact", [source1d, target1d, "--epsilon", "1"], /--method exact takes no --epsilon/],
    ["a fractional iteration cap", [source1d, target1d, "--method", "entropic", "--epsilon", "1", "--max-iterations", "2.5"], /--max-iterations: must be a positive integer/],
    ["a missing file", [source1d, join(dir, "missing.csv")], /missing\.csv: file not found/],
    ["unequal totals for a balanced method", [source1d, unequal], /total masses differ.*--normalize.*--method unbalanced/],
  ];
  for (const [what, argv, message] of usage) {
    it(`couplet solve with ${what} exits 2 and names the problem`, async () => {
      const { code, out, err } = await run(...argv);
      expect(code).toBe(2);
      expect(out).toBe("");
      expect(err).toMatch(message);
    });
  }

  it("couplet solve --help lists every option and the exit codes", async () => {
    const { code, out } = await run("--help");
    expect(code).toBe(0);
    for (const option of ["--method", "--cost", "--epsilon", "--epsilon-rel", "--mass-penalty", "--tolerance", "--max-iterations", "--normalize", "--json"]) {
      expect(out).toContain(option);
    }
    expect(out).toMatch(/Exit codes: 0 solved, 1 not converged/);
  });
});
