import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { type ReceiptComparer, makeCheckCommand } from "../../../cells/cli/check-command";
import { makeRunCommand } from "../../../cells/cli/run-command";
import { UsageError } from "../../../cells/cli/usage-error";
import { captureIO, scratchWith } from "./capture-io";
import { fakeStudyRunner } from "./fake-study-run";

// `couplet check` with the stand-in study run (fake-study-run.ts) and a stand-in
// comparison: every number of the summary within 1e-9 of the saved one. The real run
// and comparison are exercised in study-commands.e2e.test.ts.
const TOLERANCE = 1e-9;
const compare: ReceiptComparer = (saved, fresh) => {
  if (saved.fingerprint !== fresh.fingerprint) {
    return { ok: false, drifts: [{ field: "fingerprint", saved: saved.fingerprint, fresh: fresh.fingerprint, tolerance: 0, kind: "inputs" }], coreVersionChanged: false };
  }
  const drifts: Array<{ field: string; saved: unknown; fresh: unknown; tolerance: number; kind: "value" }> = [];
  for (const [key, value] of Object.entries(saved.summary)) {
    const now = fresh.summary[key];
    if (typeof value === "number" ? !(typeof now === "number" && Math.abs(now - value) <= TOLERANCE) : now !== value) {
      drifts.push({ field: `summary.${key}`, saved: value, fresh: now, tolerance: TOLERANCE, kind: "value" });
    }
  }
  return { ok: drifts.length === 0, drifts, coreVersionChanged: false };
};

async function recorded(): Promise<string> {
  const dir = scratchWith("harbour-cranes.couplet.json");
  const { io } = captureIO(dir);
  expect(await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json", "--save-receipts"], io)).toBe(0);
  return dir;
}

describe("makeCheckCommand(fake runner)", () => {
  it("check STUDY with matching receipts prints ok for every computing cell and exits 0", async () => {
    const dir = await recorded();
    const { io, out } = captureIO(dir);
    expect(await makeCheckCommand(fakeStudyRunner(), async () => compare)(["harbour-cranes.couplet.json"], io)).toBe(0);
    expect(out()).toBe(
      ["ok              cranes (data)", "ok              berths (data)", "ok              assignment (transport)", "ok              withSlack (transport)", "check: 4 ok, 0 drifted, 0 inputs changed, 0 without receipt, 0 failed (10 ms)", ""].join("\n"),
    );
  });

  it("check STUDY after a drift of the solver prints each drifted field with saved, fresh and tolerance and exits 1", async () => {
    const dir = await recorded();
    const { io, out } = captureIO(dir);
    expect(await makeCheckCommand(fakeStudyRunner({ drift: 1e-6 }), async () => compare)(["harbour-cranes.couplet.json"], io)).toBe(1);
    expect(out()).toContain("DRIFTED         assignment (transport)\n                  summary.cost: saved 5, fresh 5.000001, tolerance 1e-9\n");
    expect(out()).toContain("check: 2 ok, 2 drifted");
  });

  it("check STUDY with a perturbed saved receipt value reports the drift and exits 1", async () => {
    const dir = await recorded();
    const file = join(dir, "harbour-cranes.couplet.json");
    const study = JSON.parse(readFileSync(file, "utf8"));
    study.receipts.t2.summary.cost = 5.5;
    writeFileSync(file, JSON.stringify(study, null, 2));
    const { io, out } = captureIO(dir);
    expect(await makeCheckCommand(fakeStudyRunner(), async () => compare)(["harbour-cranes.couplet.json"], io)).toBe(1);
    expect(out()).toContain("DRIFTED         withSlack (transport)\n                  summary.cost: saved 5.5, fresh 5, tolerance 1e-9\n");
  });

  it("check STUDY --set with other values than recorded reports inputs changed, not compared, and exits 1", async () => {
    const dir = await recorded();
    const { io, out, err } = captureIO(dir);
    expect(await makeCheckCommand(fakeStudyRunner(), async () => compare)(["harbour-cranes.couplet.json", "--set", "slack=1"], io)).toBe(1);
    expect(out()).toMatch(/^inputs changed  assignment \(transport\): fingerprint fake:\d+ → fake:\d+: its settings or input data differ from the recorded run$/m);
    expect(err()).toContain("couplet run harbour-cranes.couplet.json --save-receipts");
  });

  it("check STUDY with a failing cell prints FAILED and exits 1", async () => {
    const dir = await recorded();
    const file = join(dir, "harbour-cranes.couplet.json");
    // Rename the cell in the file only (receipts stay keyed by id).
    writeFileSync(file, readFileSync(file, "utf8").replace('"name": "withSlack"', '"name": "broken"'));
    const { io, out } = captureIO(dir);
    expect(await makeCheckCommand(fakeStudyRunner(), async () => compare)(["harbour-cranes.couplet.json"], io)).toBe(1);
    expect(out()).toContain("FAILED          broken (transport): broken on purpose\n");
  });

  it("check STUDY with a receipt missing for one cell says no receipt and exits 0", async () => {
    const dir = await recorded();
    const file = join(dir, "harbour-cranes.couplet.json");
    const study = JSON.parse(readFileSync(file, "utf8"));
    delete study.receipts.d2;
    writeFileSync(file, JSON.stringify(study, null, 2));
    const { io, out } = captureIO(dir);
    expect(await makeCheckCommand(fakeStudyRunner(), async () => compare)(["harbour-cranes.couplet.json"], io)).toBe(0);
    expect(out()).toContain("no receipt      berths (data)\n");
  });

  it("check STUDY with no receipts at all throws a UsageError telling how to record them", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const runner = fakeStudyRunner();
    const { io } = captureIO(dir);
    await expect(makeCheckCommand(runner, async () => compare)(["harbour-cranes.couplet.json"], io)).rejects.toThrow(
      new UsageError("harbour-cranes.couplet.json has no receipts to check against; record them first with: couplet run harbour-cranes.couplet.json --save-receipts"),
    );
    expect(runner.calls).toHaveLength(0);
  });

  it("check --help prints the verdicts and options and exits 0", async () => {
    const { io, out } = captureIO(scratchWith());
    expect(await makeCheckCommand(fakeStudyRunner(), async () => compare)(["--help"], io)).toBe(0);
    for (const word of ["DRIFTED", "inputs changed", "no receipt", "--set NAME=VALUE", "--hold-code"]) expect(out()).toContain(word);
  });
});
