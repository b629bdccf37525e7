import { describe, expect, it } from "vitest";
import type { Receipt } from "../../../cells/document/study-types";
import { parseStudy } from "../../../cells/document/parse-study";
import { serializeStudy } from "../../../cells/document/serialize-study";
import { updateStudy } from "../../../cells/document/update-study";
import { compareReceipt } from "../../../cells/study/receipts";
import { makeStudy, outcome, run } from "./study-helpers";

// Receipts are our own drift check (docs/cells.md, "Checking"); the checks below are
// its stated rules. The hash is SHA-256 (see fingerprint.test.ts for its test vector).
const cells = [
  { id: "p1", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.1, min: 0.001, max: 1 } },
  { id: "d1", kind: "data", name: "a", settings: { from: "generator", generator: "gaussian-mixture", n: 30, components: [{ mean: [0, 0] }] } },
  { id: "d2", kind: "data", name: "b", settings: { from: "inline", points: [[0, 1], [1, 1], [2, 0.5]] } },
  { id: "t1", kind: "transport", name: "smooth", settings: { source: "a", target: "b", method: "entropic", epsilon: { relative: { param: "eps" } }, tolerance: 1e-8 } },
  { id: "t2", kind: "transport", name: "sharp", settings: { source: "a", target: "b", method: "exact" } },
  { id: "s1", kind: "sweep", name: "sizes", settings: { transport: "smooth", vary: "sampleSize.source", values: [10, 20], replicates: 2, record: ["cost", "iterations", "seconds", "status"] } },
];

const receiptsOf = async (study = makeStudy(cells)) => {
  const result = await run(study);
  return Object.fromEntries(result.outcomes.filter((o) => o.receipt).map((o) => [o.cellId, o.receipt!])) as Record<string, Receipt>;
};

const perturb = (receipt: Receipt, field: string, factor: number): Receipt => ({ ...receipt, summary: { ...receipt.summary, [field]: (receipt.summary[field] as number) * factor } });

describe("receipts", () => {
  it("runStudy(same study twice) gives identical fingerprints, and compareReceipt finds no drift", async () => {
    const first = await receiptsOf();
    const second = await receiptsOf();
    expect(Object.keys(first)).toEqual(["d1", "d2", "t1", "t2", "s1"]);
    for (const id of Object.keys(first)) {
      expect(second[id].fingerprint).toBe(first[id].fingerprint);
      expect(compareReceipt(first[id], second[id])).toEqual({ ok: true, drifts: [], coreVersionChanged: false });
    }
  });

  it("runStudy(changed data) changes the fingerprints of the data and of everything computed from it, reported as inputs changed", async () => {
    const before = await receiptsOf();
    const { study } = updateStudy(makeStudy(cells), [{ type: "set-setting", id: "d2", path: "points", value: [[0, 1], [1, 1], [2, 0.6]] }]);
    const after = await receiptsOf(study);
    expect(after.d1.fingerprint).toBe(before.d1.fingerprint);
    for (const id of ["d2", "t1", "t2", "s1"]) expect(after[id].fingerprint).not.toBe(before[id].fingerprint);
    expect(compareReceipt(before.t2, after.t2).drifts).toEqual([{ field: "fingerprint", saved: before.t2.fingerprint, fresh: after.t2.fingerprint, tolerance: 0, kind: "inputs" }]);
  });

  it("runStudy(a new parameter value) changes the transport's fingerprint and records the value in its settings", async () => {
    const before = await receiptsOf();
    const result = await run(makeStudy(cells), { overrides: { eps: 0.2 } });
    const after = outcome(result, "t1").receipt!;
    expect(after.fingerprint).not.toBe(before.t1.fingerprint);
    expect(after.settings).toMatchObject({ source: "a", target: "b", method: "entropic", epsilon: { relative: 0.2, reference: "max" }, tolerance: 1e-8 });
  });

  it("compareReceipt(exact, value moved by 1e-7 relative) reports the drift with the 1e-9 tolerance", async () => {
    const { t2 } = await receiptsOf();
    const moved = perturb(t2, "cost", 1 + 1e-7);
    expect(compareReceipt(t2, moved)).toMatchObject({ ok: false, drifts: [{ field: "summary.cost", saved: t2.summary.cost, fresh: moved.summary.cost, tolerance: 1e-9, kind: "value" }] });
    expect(compareReceipt(t2, perturb(t2, "cost", 1 + 1e-11)).ok).toBe(true);
  });

  it("compareReceipt(entropic) allows max(10 · tolerance, 1e-9) relative and catches more", async () => {
    const { t1 } = await receiptsOf();
    expect(compareReceipt(t1, perturb(t1, "objective", 1 + 5e-8)).ok).toBe(true); // 10 · 1e-8 = 1e-7
    const moved = perturb(t1, "objective", 1 + 1e-6);
    expect(compareReceipt(t1, moved).drifts).toEqual([{ field: "summary.objective", saved: t1.summary.objective, fresh: moved.summary.objective, tolerance: 1e-7, kind: "value" }]);
  });

  it("compareReceipt(iterations and status) gives iterations a slack of max(2, 10 %) and requires equal text", async () => {
    const { t1 } = await receiptsOf();
    const iterations = t1.summary.iterations as number;
    const withIterations = (k: number): Receipt => ({ ...t1, summary: { ...t1.summary, iterations: k } });
    expect(compareReceipt(t1, withIterations(iterations + 2)).ok).toBe(true);
    expect(compareReceipt(t1, withIterations(iterations + Math.max(3, Math.ceil(0.11 * iterations)))).drifts[0]).toMatchObject({ field: "summary.iterations", kind: "count" });
    expect(compareReceipt(t1, { ...t1, summary: { ...t1.summary, status: "not-converged" } }).drifts).toEqual([
      { field: "summary.status", saved: "converged", fresh: "not-converged", tolerance: 0, kind: "mismatch" },
    ]);
  });

  it("compareReceipt(sweep) compares every row and ignores seconds", async () => {
    const { s1 } = await receiptsOf();
    const rows = s1.summary.rows as Record<string, unknown>[];
    expect(rows).toHaveLength(4);
    expect(rows[0]).not.toHaveProperty("seconds");
    const moved = { ...s1, summary: { ...s1.summary, rows: rows.map((r, k) => (k === 3 ? { ...r, cost: (r.cost as number) * 1.01 } : r)) } };
    expect(compareReceipt(s1, moved).drifts).toMatchObject([{ field: "summary.rows[3].cost", kind: "value" }]);
    const fewer = { ...s1, summary: { ...s1.summary, rows: rows.slice(0, 3) } };
    expect(compareReceipt(s1, fewer).drifts).toEqual([{ field: "summary.rows.length", saved: 4, fresh: 3, tolerance: 0, kind: "mismatch" }]);
  });

  it("createReceipt(any computing cell) is plain JSON the study file can save and read back unchanged", async () => {
    const receipts = await receiptsOf();
    const { study } = updateStudy(makeStudy(cells), Object.entries(receipts).map(([id, receipt]) => ({ type: "set-receipt" as const, id, receipt })));
    const text = serializeStudy(study);
    const again = parseStudy(text);
    expect(again.receipts).toEqual(JSON.parse(JSON.stringify(receipts)));
    expect(again.receipts!.s1.summary).toEqual(receipts.s1.summary);
    expect(receipts.d1.settings.seed).toEqual(expect.any(Number)); // "study" written as the seed used
  });
});
