import { describe, expect, it } from "vitest";
import type { Measure, PointMeasure } from "../../../core/measure";
import { solveTransport } from "../../../core/solve";
import { loadStudyFile } from "../../../cells/document/study-file";
import { updateStudy } from "../../../cells/document/update-study";
import type { ProseCellValue } from "../../../cells/kinds/prose/define";
import type { SweepCellValue } from "../../../cells/kinds/sweep/sweep-value";
import type { TableCellValue } from "../../../cells/kinds/table/define";
import type { TransportCellValue } from "../../../cells/kinds/transport/transport-value";
import { StudyRunError, runStudy } from "../../../cells/study/run-study";
import { makeStudy, outcome, run, valueOf } from "./study-helpers";

const DEPOTS = "test/fixtures/studies/depot-supply.couplet.json";

// The transport values below are compared with solveTransport called directly on the
// same measures: the study layer must hand the core exactly the problem the file
// describes. The core's own numbers are checked against outside oracles in
// test/core (network simplex and Sinkhorn against the HiGHS LP solver and closed forms).
describe("runStudy", () => {
  it("runStudy(depot-supply) computes every cell, with the transport equal to solveTransport on the data cells' measures", async () => {
    const study = await loadStudyFile(DEPOTS);
    const result = await runStudy(study, { studyPath: DEPOTS, now: () => new Date("2026-12-01T09:30:00Z") });
    expect(result.outcomes.map((o) => [o.cellId, o.status])).toEqual(study.cells.map((c) => [c.id, "done"]));
    const depots = valueOf<Measure>(result, "d1");
    const shops = valueOf<Measure>(result, "d2");
    const plan = valueOf<TransportCellValue>(result, "t1");
    const direct = solveTransport(depots, shops, { kind: "sqeuclidean" }, {
      method: "unbalanced",
      epsilon: { relative: 0.05, reference: "median" },
      massPenalty: { source: 1, target: Infinity },
      tolerance: 1e-6,
      maxIterations: 5000,
    });
    expect(plan.values).toEqual(direct.values);
    expect(plan.diagnostics.iterations).toBe(direct.diagnostics.iterations);
    expect(plan.potentials).toEqual(direct.potentials);
    // Prose: @{eps:3f} and @{plan.values.cost:4} (docs/format.md, "prose").
    const prose = valueOf<ProseCellValue>(result, "p1").html;
    expect(prose).toContain('<span class="cf-value" data-name="eps">0.050</span>');
    expect(prose).toContain(`<span class="cf-value" data-name="plan.values.cost">${plan.values.cost.toPrecision(4)}</span>`);
    const sweep = valueOf<SweepCellValue>(result, "s1");
    expect(sweep.rows).toHaveLength(9);
    expect(sweep.rows[0].epsilon).toBe(0.005);
    const table = valueOf<TableCellValue>(result, "tb1");
    expect(table.text[0]).toEqual(["0.00500", sweep.rows[0].cost !== undefined ? (sweep.rows[0].cost as number).toFixed(4) : ""]);
    expect(outcome(result, "t1").headline).toMatch(/^UOT_ε = .* \(unbalanced, ε = .*, mass .*, converged, \d+ it\)$/);
    expect(outcome(result, "t1").receipt).toMatchObject({ coreVersion: expect.any(String), recordedAt: "2026-12-01T09:30:00.000Z" });
    expect(result.parameters).toEqual([{ name: "eps", value: 0.05, control: "log range 0.001 – 1" }]);
  });

  it("runStudy(depot-supply made exact) gives the exact cost solveTransport gives, solved off-thread", async () => {
    const loaded = await loadStudyFile(DEPOTS);
    const { study } = updateStudy(loaded, [
      { type: "set-setting", id: "t1", path: "method", value: "exact" },
      { type: "remove-cell", id: "s1" },
      { type: "remove-cell", id: "f2" },
      { type: "remove-cell", id: "tb1" },
    ]);
    const result = await runStudy(study, { studyPath: DEPOTS, offThread: true });
    const plan = valueOf<TransportCellValue>(result, "t1");
    const direct = solveTransport(valueOf<Measure>(result, "d1"), valueOf<Measure>(result, "d2"), { kind: "sqeuclidean" }, { method: "exact" });
    expect(plan.method).toBe("exact");
    expect(plan.values).toEqual(direct.values);
    expect(outcome(result, "t1").headline).toMatch(/^cost = .* \(exact, network-simplex, converged, \d+ it\)$/);
  });

  it("runStudy(every-kind) finishes every cell, each failure staying with its cause and its dependents", async () => {
    const path = "test/fixtures/studies/every-kind.couplet.json";
    const result = await runStudy(await loadStudyFile(path), { studyPath: path, offThread: false });
    const failed = Object.fromEntries(result.outcomes.filter((o) => o.status !== "done").map((o) => [o.cellId, o.error?.cause]));
    expect(failed).toEqual({
      dh: "own error", // data/bakeries.csv is not in the fixtures
      di: "own error", // nor data/archive.bin
      cb: 'unknown name "costMatrixFrom"',
      tc: 'failed input "bakeries"',
      td: "own error", // 3-D box against a 2-D ring
      te: 'failed input "roadCost"',
      sa: 'failed input "bakeries"',
      sb: 'failed input "gap"',
      fb: 'failed input "bakeries"',
      fd: 'failed input "gap"',
      tbb: 'failed input "bakeries"',
    });
    expect(outcome(result, "td").error?.message).toBe("target.points: dimension mismatch: source has 3 coordinates, target has 2");
    expect(valueOf<Measure>(result, "dg")).toMatchObject({ kind: "grid", shape: [50] }); // density from the code cell "bump"
  });

  it("runStudy(overrides) applies each parameter type and the dependent results change", async () => {
    const study = makeStudy([
      { id: "p1", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.1, min: 0.001, max: 1 } },
      { id: "p2", kind: "parameter", name: "spread", settings: { control: "number", value: 0.5, min: 0, max: 2 } },
      { id: "p3", kind: "parameter", name: "count", settings: { control: "integer", value: 20, min: 5, max: 100 } },
      { id: "p4", kind: "parameter", name: "mode", settings: { control: "choice", value: "a", options: ["a", "b"] } },
      { id: "p5", kind: "parameter", name: "flip", settings: { control: "toggle", value: false } },
      { id: "p6", kind: "parameter", name: "note", settings: { control: "text", value: "x" } },
      { id: "p7", kind: "parameter", name: "draw", settings: { control: "seed", value: 1 } },
      { id: "d1", kind: "data", name: "a", settings: { from: "generator", generator: "gaussian-mixture", n: { param: "count" }, components: [{ mean: [0, 0], scale: { param: "spread" } }], seed: { param: "draw" } } },
      { id: "d2", kind: "data", name: "b", settings: { from: "generator", generator: "ring", n: 15 } },
      { id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "entropic", epsilon: { relative: { param: "eps" } } } },
      { id: "c1", kind: "code", name: "words", settings: { code: "`${mode}-${flip}-${note}`" } },
    ]);
    const before = await run(study);
    const after = await run(study, { overrides: { eps: 0.3, spread: 1.5, count: 40, mode: "b", flip: true, note: "y", draw: 2 } });
    const a0 = valueOf<PointMeasure>(before, "d1");
    const a1 = valueOf<PointMeasure>(after, "d1");
    expect([a0.n, a1.n]).toEqual([20, 40]);
    expect(valueOf<TransportCellValue>(before, "t1").epsilon?.relative).toBe(0.1);
    expect(valueOf<TransportCellValue>(after, "t1").epsilon?.relative).toBe(0.3);
    expect(valueOf<TransportCellValue>(after, "t1").values.objective).not.toBe(valueOf<TransportCellValue>(before, "t1").values.objective);
    expect([valueOf(before, "c1"), valueOf(after, "c1")]).toEqual(["a-false-x", "b-true-y"]);
    // spread and draw change the points themselves: compare with a run changing only count.
    const countOnly = valueOf<PointMeasure>(await run(study, { overrides: { count: 40 } }), "d1");
    const spreadOnly = valueOf<PointMeasure>(await run(study, { overrides: { count: 40, spread: 1.5 } }), "d1");
    expect(spreadOnly.points[0]).toBeCloseTo(countOnly.points[0] * 3, 12); // same draws, scale 0.5 → 1.5
    expect(a1.points).not.toEqual(spreadOnly.points); // the seed changed too
    expect(after.parameters.map((p) => p.value)).toEqual([0.3, 1.5, 40, "b", true, "y", 2]);
  });

  it("runStudy(bad overrides) throws a StudyRunError naming the parameter, before computing", async () => {
    const study = makeStudy([
      { id: "p1", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.1, min: 0.001, max: 1 } },
      { id: "p2", kind: "parameter", name: "count", settings: { control: "integer", value: 20, min: 5 } },
      { id: "c1", kind: "code", name: "x", settings: { code: "1" } },
    ]);
    const attempt = (overrides: Record<string, unknown>) => run(study, { overrides });
    await expect(attempt({ eps: 3 })).rejects.toThrow(new StudyRunError("eps: must be within [0.001, 1], got 3", "eps"));
    await expect(attempt({ count: 2.5 })).rejects.toThrow("count: must be an integer, got 2.5");
    await expect(attempt({ epsilon: 0.1 })).rejects.toThrow('unknown parameter "epsilon"; the parameters are eps, count');
    await expect(attempt({ x: 1 })).rejects.toThrow('"x" is a code cell, not a parameter');
    await expect(attempt({ eps: 3 })).rejects.toMatchObject({ name: "StudyRunError", parameter: "eps" });
  });

  it("runStudy(a code cell that throws) fails it and its dependents only; every other cell is done", async () => {
    const study = makeStudy([
      { id: "d1", kind: "data", name: "a", settings: { from: "inline", points: [[0], [1]] } },
      { id: "d2", kind: "data", name: "b", settings: { from: "inline", points: [[2], [3]] } },
      { id: "c1", kind: "code", name: "broken", settings: { code: "throw new Error('boom')" } },
      { id: "c2", kind: "code", name: "after", settings: { code: "broken + 1" } },
      { id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact" } },
      { id: "p1", kind: "prose", settings: { text: "cost @{plan.values.cost}" } },
    ]);
    const result = await run(study);
    expect(outcome(result, "c1")).toMatchObject({ status: "failed", error: { message: "boom", cause: "own error" } });
    expect(outcome(result, "c2")).toMatchObject({ status: "failed", error: { cause: 'failed input "broken"' } });
    for (const id of ["d1", "d2", "t1", "p1"]) expect(outcome(result, id).status).toBe("done");
    expect(valueOf<TransportCellValue>(result, "t1").values.cost).toBe(4);
  });

  it("runStudy(a cycle) fails the cells on it with the cycle in words and leaves the rest", async () => {
    const study = makeStudy([
      { id: "c1", kind: "code", name: "a", settings: { code: "b + 1" } },
      { id: "c2", kind: "code", name: "b", settings: { code: "a + 1" } },
      { id: "d1", kind: "data", name: "x", settings: { from: "inline", points: [[0]] } },
      { id: "t1", kind: "transport", name: "loop", settings: { source: "x", target: "x", method: "entropic", epsilon: { absolute: { param: "a" } } } },
    ]);
    const result = await run(study);
    expect(outcome(result, "c1")).toMatchObject({ status: "failed", error: { cause: "cycle through a, b" } });
    expect(outcome(result, "c2")).toMatchObject({ status: "failed", error: { cause: "cycle through b, a" } });
    expect(outcome(result, "t1").status).toBe("failed");
    expect(outcome(result, "d1").status).toBe("done");
  });

  it("runStudy(runCode false) holds code cells, code figures and what depends on them; the rest computes", async () => {
    const study = makeStudy([
      { id: "d1", kind: "data", name: "a", settings: { from: "inline", points: [[0], [1]] } },
      { id: "c1", kind: "code", name: "shift", settings: { code: "2" } },
      { id: "d2", kind: "data", name: "b", settings: { from: "inline", points: [[2], [3]] } },
      { id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact", cost: { kind: "power", p: { param: "shift" } } } },
      { id: "t2", kind: "transport", name: "plain", settings: { source: "a", target: "b", method: "exact" } },
      { id: "f1", kind: "figure", settings: { view: "code", code: "Plot.lineY([1, 2])" } },
    ]);
    const result = await run(study, { runCode: false });
    expect(outcome(result, "c1")).toMatchObject({ status: "held", error: { cause: "code held" } });
    expect(outcome(result, "f1")).toMatchObject({ status: "held", error: { cause: "code held" } });
    expect(outcome(result, "t1")).toMatchObject({ status: "held", error: { message: 'input "shift" is held (code not run)', cause: 'held input "shift"' } });
    for (const id of ["d1", "d2", "t2"]) expect(outcome(result, id).status).toBe("done");
  });

  it("runStudy(onProgress) reports each cell's states with its id and name, ending done", async () => {
    const study = makeStudy([
      { id: "d1", kind: "data", name: "a", settings: { from: "inline", points: [[0], [1]] } },
      { id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "a", method: "exact" } },
    ]);
    const events: string[] = [];
    await run(study, { onProgress: ({ cellId, name, state }) => events.push(`${cellId}:${name}:${state.status}`) });
    expect(events.filter((e) => e.startsWith("t1:"))).toEqual(["t1:plan:waiting", "t1:plan:running", "t1:plan:done"]);
  });
});
