// The study commands end to end, in process through main(argv, io), with the real
// headless study run (cells/study/run-study.ts), plus one spawn of the built bin.
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { beforeAll, describe, expect, it } from "vitest";
import { costMatrix } from "../../../core/cost";
import type { PointMeasure } from "../../../core/measure";
import { main } from "../../../cells/cli/main";
import { parseStudy } from "../../../cells/document";
import { runStudy } from "../../../cells/study/run-study";
import { starterStudy } from "../../../cells/study/starter-study";
import { solveTransportLp } from "../../oracle/lp-oracle";
import { captureIO, scratchWith } from "./capture-io";

const ROOT = fileURLToPath(new URL("../../../", import.meta.url));
// C0 and C1 control characters except the line feed: \r and ESC (ANSI) among them (ECMA-48).
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/;

let dir: string;
let runOut: string;
let runErr: string;
let runCode: number;
let html: string;

beforeAll(async () => {
  dir = scratchWith();
  const made = captureIO(dir);
  expect(await main(["new", "pickups.couplet.json"], made.io)).toBe(0);
  const { io, out, err } = captureIO(dir);
  runCode = await main(["run", "pickups.couplet.json", "--report", "report.html", "--receipts", "receipts.json", "--save-receipts"], io);
  runOut = out();
  runErr = err();
  html = readFileSync(join(dir, "report.html"), "utf8");
});

describe("couplet new + run (real study run)", () => {
  it("run on a new starter study exits 0 with one done line per cell and the closing counts", () => {
    expect(runCode).toBe(0);
    const lines = runOut.trimEnd().split("\n");
    expect(lines.at(-1)).toMatch(/^9 cells: 9 done, 0 failed, 0 held in \S+ m?s$/);
    const names = ["intro (prose)", "eps (parameter)", "morning (data)", "evening (data)", "moved (transport)", "gap (transport)", "lines (figure)", "converge (figure)", "findings (prose)"];
    const cellLines = lines.filter((l) => /^(done|FAILED|held) /.test(l));
    expect(cellLines.map((l) => names.find((n) => l.includes(`  ${n}`)))).toEqual(names);
    expect(cellLines.every((l) => l.startsWith("done "))).toBe(true);
  });

  it("run not on a terminal writes plain progress lines, one per finished cell, without \\r or escape codes", () => {
    const progress = runErr.split("\n").filter((l) => l.startsWith("["));
    expect(progress).toHaveLength(9);
    expect(progress.at(-1)).toMatch(/^\[9\/9\] /);
    expect(runErr).not.toMatch(CONTROL);
  });

  it("run --report writes a self-contained report: inline SVG figures, the parameter table, the prose values, no script, no http(s)", () => {
    expect(html.match(/<figure class="cf-figure"/g)).toHaveLength(2);
    expect(html).toContain('<tr><th scope="row">eps</th><td class="cf-num">0.05</td><td>log range 0.005 – 1</td></tr>');
    expect(html).toContain('With epsilon = <span class="cf-value" data-name="eps">0.050</span>');
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/https?:\/\//);
    expect(html).not.toMatch(/<link\b|@import|url\(\s*['"]?(?!#)/i);
    expect(html).toContain("Appendix: receipts");
  });

  it("run reports the exact transport cost that the HiGHS LP solver finds for the same two clouds", async () => {
    // Oracle: HiGHS dual simplex (Huangfu & Hall 2018) on the transportation LP of the
    // starter's two generated clouds (60 × 80 points, |x−y|², uniform masses).
    const run = await runStudy(starterStudy(), { offThread: false });
    const cloud = (name: string) => run.outcomes.find((o) => o.name === name)!.value as PointMeasure;
    const [morning, evening] = [cloud("morning"), cloud("evening")];
    const lp = await solveTransportLp(morning.mass, evening.mass, costMatrix(morning, evening, { kind: "sqeuclidean" }));
    const receipts = JSON.parse(readFileSync(join(dir, "receipts.json"), "utf8"));
    expect(receipts.exact.summary.cost).toBeCloseTo(lp.cost, 9);
    // The prose quotes it to 4 significant digits (@{moved.values.cost:4}).
    expect(html).toContain(`mean squared distance of <span class="cf-value" data-name="moved.values.cost">${lp.cost.toPrecision(4)}</span>`);
  });

  it("run --save-receipts stores a receipt for every data and transport cell in the study", () => {
    const saved = parseStudy(readFileSync(join(dir, "pickups.couplet.json"), "utf8"));
    expect(Object.keys(saved.receipts ?? {})).toEqual(["morning", "evening", "exact", "debiased"]);
    expect(existsSync(join(dir, "pickups.couplet.json.previous"))).toBe(true);
    expect(JSON.parse(readFileSync(join(dir, "receipts.json"), "utf8"))).toEqual(saved.receipts);
  });
});

describe("couplet check (real study run)", () => {
  it("check right after run --save-receipts finds every cell ok and exits 0", async () => {
    const { io, out } = captureIO(dir);
    expect(await main(["check", "pickups.couplet.json"], io)).toBe(0);
    expect(out()).toMatch(/^ok +morning \(data\)\nok +evening \(data\)\nok +moved \(transport\)\nok +gap \(transport\)\ncheck: 4 ok, 0 drifted, 0 inputs changed, 0 without receipt, 0 failed \(/);
  });

  it("check with a perturbed saved value prints the drift (field, saved, fresh, tolerance) and exits 1", async () => {
    const copy = scratchWith();
    const study = JSON.parse(readFileSync(join(dir, "pickups.couplet.json"), "utf8"));
    const fresh = study.receipts.exact.summary.cost;
    study.receipts.exact.summary.cost = fresh * 1.001;
    writeFileSync(join(copy, "p.couplet.json"), JSON.stringify(study, null, 2));
    const { io, out } = captureIO(copy);
    expect(await main(["check", "p.couplet.json"], io)).toBe(1);
    // An exact solve is held to 1e-9 relative (cells/study/receipts.ts).
    expect(out()).toContain(`DRIFTED         moved (transport)\n                  summary.cost: saved ${fresh * 1.001}, fresh ${fresh}, tolerance 1e-9\n`);
    expect(out()).toContain("check: 3 ok, 1 drifted");
  });

  it("check --set with another epsilon reports the debiased cell's inputs as changed and exits 1", async () => {
    const { io, out, err } = captureIO(dir);
    expect(await main(["check", "pickups.couplet.json", "--set", "eps=0.1"], io)).toBe(1);
    expect(out()).toMatch(/^inputs changed  gap \(transport\): fingerprint sha256:[0-9a-f]{16}… → sha256:[0-9a-f]{16}…: its settings or input data differ from the recorded run$/m);
    expect(out()).toMatch(/^ok +moved \(transport\)$/m);
    expect(err()).toContain("couplet run pickups.couplet.json --save-receipts");
  });
});

describe("couplet run --set (real study run)", () => {
  // One parameter of every control, each quoted in the prose, so the report shows the values the run used.
  const study = {
    format: "couplet-study",
    formatVersion: 2,
    title: "Every control",
    cells: [
      { id: "pa", kind: "parameter", name: "width", settings: { control: "number", value: 1, min: 0, max: 10 } },
      { id: "pb", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.05, min: 0.001, max: 1 } },
      { id: "pc", kind: "parameter", name: "n", settings: { control: "integer", value: 20, min: 2, max: 500 } },
      { id: "pd", kind: "parameter", name: "method", settings: { control: "choice", value: "exact", options: ["exact", "debiased"] } },
      { id: "pe", kind: "parameter", name: "rho", settings: { control: "choice", value: 1, options: [0.1, 1, 10] } },
      { id: "pf", kind: "parameter", name: "lines", settings: { control: "toggle", value: true } },
      { id: "pg", kind: "parameter", name: "note", settings: { control: "text", value: "draft" } },
      { id: "ph", kind: "parameter", name: "draw", settings: { control: "seed", value: 7 } },
      { id: "t", kind: "prose", name: "summary", settings: { text: "values: @{width} | @{eps} | @{n} | @{method} | @{rho} | @{lines} | @{note} | @{draw}" } },
    ],
  };

  it("run --set for every control runs with the typed values and shows them in the report", async () => {
    const d = scratchWith();
    writeFileSync(join(d, "c.couplet.json"), JSON.stringify(study));
    const sets = ["width=2.5", "eps=1e-2", "n=40", "method=debiased", "rho=10", "lines=no", "note=second pass", "draw=4294967295"];
    const { io, out } = captureIO(d);
    expect(await main(["run", "c.couplet.json", "--report", "r.html", ...sets.flatMap((s) => ["--set", s])], io)).toBe(0);
    expect(out()).toContain("9 cells: 9 done");
    const report = readFileSync(join(d, "r.html"), "utf8");
    const shown = [...report.matchAll(/<span class="cf-value" data-name="(\w+)">([^<]*)<\/span>/g)].map((m) => `${m[1]}=${m[2]}`);
    expect(shown).toEqual(["width=2.5", "eps=0.01", "n=40", "method=debiased", "rho=10", "lines=false", "note=second pass", "draw=4294967295"]);
    expect(report).toContain('<tr><th scope="row">n</th><td class="cf-num">40</td><td>integer 2 – 500 · set for this run (file: 20)</td></tr>');
  });

  it("run --set with a bad value for each control exits 2 naming the parameter and the problem", async () => {
    const d = scratchWith();
    writeFileSync(join(d, "c.couplet.json"), JSON.stringify(study));
    const cases: Array<[string, string]> = [
      ["width=11", 'parameter "width" (number): 11 is outside the parameter\'s range [0, 10]'],
      ["eps=zero", 'parameter "eps" (log-range): not a number: "zero"'],
      ["n=2.5", 'parameter "n" (integer): not a whole number: "2.5"'],
      ["method=greedy", 'parameter "method" (choice): "greedy" is not one of the options: exact, debiased'],
      ["rho=5", 'parameter "rho" (choice): "5" is not one of the options: 0.1, 1, 10'],
      ["lines=perhaps", 'parameter "lines" (toggle): an on/off parameter takes true/false'],
      ["draw=-3", 'parameter "draw" (seed): a seed is a whole number in [0, 4294967295], got "-3"'],
      ["summary=1", '"summary" is a prose cell, not a parameter'],
      ["size=1", 'the study has no parameter "size"; its parameters are width, eps, n, method, rho, lines, note, draw'],
    ];
    for (const [set, message] of cases) {
      const { io, err, out } = captureIO(d);
      expect(await main(["run", "c.couplet.json", "--set", set], io)).toBe(2);
      expect(err()).toContain(`couplet run: --set ${set}: `);
      expect(err()).toContain(message);
      expect(out()).toBe("");
    }
  });
});

describe("couplet run --hold-code (real study run)", () => {
  it("run --hold-code holds code cells and the cells using them, and exits 0", async () => {
    const d = scratchWith();
    const study = {
      format: "couplet-study",
      formatVersion: 2,
      title: "Held code",
      cells: [
        { id: "c1", kind: "code", name: "total", settings: { code: "1 + 2" } },
        { id: "p1", kind: "prose", settings: { text: "total: @{total}" } },
      ],
    };
    writeFileSync(join(d, "h.couplet.json"), JSON.stringify(study));
    const held = captureIO(d);
    expect(await main(["run", "h.couplet.json", "--hold-code"], held.io)).toBe(0);
    expect(held.out()).toMatch(/^held +— {2}total \(code\)\n {20}\S/m);
    expect(held.out()).toMatch(/^held +— {2}p1 \(prose\)$/m);
    expect(held.out()).toContain("2 cells: 0 done, 0 failed, 2 held");
    const ran = captureIO(d);
    expect(await main(["run", "h.couplet.json"], ran.io)).toBe(0);
    expect(ran.out()).toMatch(/^done +\S+ m?s {2}total \(code\)/m);
  });
});

describe("the couplet bin", () => {
  const bundle = join(ROOT, "dist/couplet-cli.mjs");
  // The bin loads dist/couplet-cli.mjs, which `npm test` builds first (pretest).
  it.skipIf(!existsSync(bundle))("node cells/cli/bin.mjs run STUDY runs the starter study in a child process and exits 0", () => {
    const result = spawnSync(process.execPath, [join(ROOT, "cells/cli/bin.mjs"), "run", "pickups.couplet.json", "--hold-code"], { cwd: dir, encoding: "utf8", env: { ...process.env, NO_COLOR: "1" } });
    expect(result.status).toBe(0);
    expect(result.stdout).toMatch(/^9 cells: 9 done, 0 failed, 0 held in /m);
    expect(result.stderr).not.toMatch(CONTROL);
  });
});
