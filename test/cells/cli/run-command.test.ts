import { existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseStudy } from "../../../cells/document";
import { main } from "../../../cells/cli/main";
import { makeRunCommand } from "../../../cells/cli/run-command";
import { UsageError } from "../../../cells/cli/usage-error";
import { captureIO, scratchWith } from "./capture-io";
import { fakeStudyRunner } from "./fake-study-run";

// These tests drive `couplet run` with a stand-in study run (fake-study-run.ts), to
// reach failures and receipts on demand; study-commands.e2e.test.ts runs the real one.

async function usageProblem(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
  } catch (error) {
    expect(error).toBeInstanceOf(UsageError);
    return (error as Error).message;
  }
  throw new Error("expected a UsageError");
}

describe("makeRunCommand(fake runner)", () => {
  it("run STUDY prints one line per cell and a closing line with the counts, and exits 0", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const { io, out, err } = captureIO(dir);
    const code = await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json"], io);
    expect(code).toBe(0);
    const lines = out().trimEnd().split("\n");
    expect(lines).toHaveLength(6);
    expect(lines[0]).toMatch(/^done {10}1 ms {2}slack \(parameter\)$/);
    expect(lines[3]).toMatch(/^done {10}1 ms {2}assignment \(transport\) {2}cost 5$/);
    expect(lines[5]).toBe("5 cells: 5 done, 0 failed, 0 held in 10 ms");
    // Not a terminal: plain progress lines on stderr, one per finished cell.
    expect(err()).toContain("[5/5] withSlack (transport) done in 0.00 s\n");
    expect(err()).not.toMatch(/\r|\u001b/);
  });

  it("run STUDY with a failing cell prints its message and cause and exits 1", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const file = join(dir, "harbour-cranes.couplet.json");
    writeFileSync(file, readFileSync(file, "utf8").replace('"name": "withSlack"', '"name": "broken"'));
    const { io, out } = captureIO(dir);
    expect(await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json"], io)).toBe(1);
    expect(out()).toMatch(/^FAILED {8}1 ms {2}broken \(transport\)\n {20}broken on purpose\n {20}cause: own-error$/m);
    expect(out()).toContain("5 cells: 4 done, 1 failed, 0 held");
  });

  it("run STUDY --set passes typed values to the run and --hold-code holds code", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const runner = fakeStudyRunner();
    const { io } = captureIO(dir);
    expect(await makeRunCommand(runner)(["harbour-cranes.couplet.json", "--set", "slack=2.5", "--hold-code"], io)).toBe(0);
    expect(runner.calls[0].options).toMatchObject({ overrides: { slack: 2.5 }, runCode: false, studyPath: join(dir, "harbour-cranes.couplet.json") });
  });

  it("run STUDY --set with a bad value throws a UsageError naming the parameter before anything runs", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const runner = fakeStudyRunner();
    const { io } = captureIO(dir);
    expect(await usageProblem(makeRunCommand(runner)(["harbour-cranes.couplet.json", "--set", "slack=20"], io))).toContain('parameter "slack" (log-range): 20 is outside');
    expect(await usageProblem(makeRunCommand(runner)(["harbour-cranes.couplet.json", "--set", "width=2"], io))).toContain("its parameters are slack");
    expect(runner.calls).toHaveLength(0);
  });

  it("run STUDY --report FILE writes a report with the parameter values used, marking --set values", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const { io, err } = captureIO(dir);
    expect(await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json", "--set", "slack=2.5", "--report", "out.html"], io)).toBe(0);
    const html = readFileSync(join(dir, "out.html"), "utf8");
    expect(html).toContain('<tr><th scope="row">slack</th><td class="cf-num">2.5</td><td>log-range · set for this run (file: 0.5)</td></tr>');
    expect(html).toContain('<p class="cf-headline">cost 5</p>');
    expect(html).not.toMatch(/<script|https?:\/\//);
    expect(html).toContain("<dt>Run</dt><dd>2026-12-01T09:30:00.000Z</dd>");
    expect(err()).toContain("wrote out.html\n");
  });

  it("run STUDY --report into a missing folder fails before running", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const runner = fakeStudyRunner();
    const { io } = captureIO(dir);
    expect(await usageProblem(makeRunCommand(runner)(["harbour-cranes.couplet.json", "--report", "nowhere/out.html"], io))).toContain('the folder "nowhere": no such file or folder');
    expect(runner.calls).toHaveLength(0);
  });

  it("run STUDY --report STUDY refuses to write over the study", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const runner = fakeStudyRunner();
    const { io } = captureIO(dir);
    expect(await usageProblem(makeRunCommand(runner)(["harbour-cranes.couplet.json", "--report", "harbour-cranes.couplet.json"], io))).toContain("that is the study itself");
    expect(await usageProblem(makeRunCommand(runner)(["harbour-cranes.couplet.json", "--report", "x", "--receipts", "x"], io))).toContain("name the same file");
    expect(runner.calls).toHaveLength(0);
  });

  it("run STUDY --receipts FILE writes the fresh receipts by cell id", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const { io } = captureIO(dir);
    await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json", "--receipts", "r.json"], io);
    const receipts = JSON.parse(readFileSync(join(dir, "r.json"), "utf8"));
    expect(Object.keys(receipts)).toEqual(["d1", "d2", "t1", "t2"]);
    expect(receipts.t1.summary).toEqual({ cost: 5, status: "converged" });
  });

  it("run STUDY --save-receipts stores the receipts in the study and keeps the previous file", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const file = join(dir, "harbour-cranes.couplet.json");
    const before = readFileSync(file, "utf8");
    const { io, err } = captureIO(dir);
    expect(await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json", "--save-receipts"], io)).toBe(0);
    const saved = parseStudy(readFileSync(file, "utf8"));
    expect(Object.keys(saved.receipts ?? {})).toEqual(["d1", "d2", "t1", "t2"]);
    expect(readFileSync(`${file}.previous`, "utf8")).toBe(before);
    expect(err()).toContain("saved 4 receipts in harbour-cranes.couplet.json");
    // The parameter values in the file are the file's, not the run's.
    expect(saved.cells[0].settings).toMatchObject({ value: 0.5 });
  });

  it("run STUDY --save-receipts refuses to save when a cell failed", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const file = join(dir, "harbour-cranes.couplet.json");
    writeFileSync(file, readFileSync(file, "utf8").replace('"name": "withSlack"', '"name": "broken"'));
    const before = readFileSync(file, "utf8");
    const { io, err } = captureIO(dir);
    expect(await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json", "--save-receipts"], io)).toBe(1);
    expect(readFileSync(file, "utf8")).toBe(before);
    expect(existsSync(`${file}.previous`)).toBe(false);
    expect(err()).toContain("receipts not saved in harbour-cranes.couplet.json: 1 cell failed");
  });

  it("run on a terminal draws the live line with \\r and clears it before the summary", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const { io, err } = captureIO(dir, { stderrIsTTY: true, columns: 100 });
    await makeRunCommand(fakeStudyRunner())(["harbour-cranes.couplet.json"], io);
    expect(err()).toMatch(/^\r\[0\/5\] running slack \(parameter\) · iteration 1 · marginal error 0\.5/);
    expect(err().endsWith("\r\u001b[K")).toBe(true);
  });

  it("run with no file, two files or a missing file throws a UsageError", async () => {
    const dir = scratchWith();
    const run = makeRunCommand(fakeStudyRunner());
    const { io } = captureIO(dir);
    expect(await usageProblem(run([], io))).toContain("run needs one study file; got 0");
    expect(await usageProblem(run(["a", "b"], io))).toContain("got 2");
    expect(await usageProblem(run(["missing.couplet.json"], io))).toBe('cannot read the study "missing.couplet.json": no such file or folder');
    expect(await usageProblem(run(["--colour"], io))).toContain("--colour");
  });

  it("run --help prints the options and exits 0", async () => {
    const { io, out } = captureIO(scratchWith());
    expect(await makeRunCommand(fakeStudyRunner())(["--help"], io)).toBe(0);
    for (const option of ["--set NAME=VALUE", "--report FILE.html", "--receipts FILE.json", "--save-receipts", "--hold-code", "--help"]) expect(out()).toContain(option);
  });
});

describe("couplet run --require-converged", () => {
  // A solve capped at 3 Sinkhorn iterations at a tiny epsilon cannot reach 1e-9
  // (Sinkhorn converges linearly, Franklin & Lorenz 1989): common practice, no source.
  const capped = {
    format: "couplet-study",
    formatVersion: 2,
    title: "capped",
    cells: [
      { id: "a", kind: "data", name: "a", settings: { from: "inline", points: [[0], [1], [2]] } },
      { id: "b", kind: "data", name: "b", settings: { from: "inline", points: [[0.5], [1.7], [3]] } },
      { id: "t", kind: "transport", name: "t", settings: { source: "a", target: "b", method: "entropic", epsilon: { relative: 0.001 }, tolerance: 1e-9, maxIterations: 3 } },
    ],
  };

  it("run STUDY counts an unconverged solve in the closing line and exits 0; with --require-converged exits 1", async () => {
    const dir = mkdtempSync(join(tmpdir(), "couplet-capped-"));
    writeFileSync(join(dir, "capped.couplet.json"), JSON.stringify(capped));
    const plain = captureIO(dir);
    expect(await main(["run", "capped.couplet.json"], plain.io)).toBe(0);
    expect(plain.out()).toMatch(/3 cells: 3 done, 0 failed, 0 held in .*; 1 solve NOT CONVERGED/);
    const strict = captureIO(dir);
    expect(await main(["run", "capped.couplet.json", "--require-converged"], strict.io)).toBe(1);
  });
});
