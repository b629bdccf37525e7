import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { main } from "../../../cells/cli/main";
import { captureIO, scratchWith } from "./capture-io";

// Exit code 2 for bad usage or a bad input file, 0 for --help: common practice for
// command-line tools (no source).

describe("main", () => {
  it("main([]) prints every command and exits 2; main(['--help']) prints them on stdout and exits 0", async () => {
    const a = captureIO(scratchWith());
    expect(await main([], a.io)).toBe(2);
    for (const name of ["run", "check", "new", "solve"]) expect(a.err()).toMatch(new RegExp(`^  ${name} `, "m"));
    const b = captureIO(scratchWith());
    expect(await main(["--help"], b.io)).toBe(0);
    expect(b.out()).toContain("  check ");
  });

  it("main(['run', malformed study]) exits 2 and prints every problem with its path in the file", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const file = join(dir, "harbour-cranes.couplet.json");
    const study = JSON.parse(readFileSync(file, "utf8"));
    study.cells[0].settings.value = 50; // slack: log-range 0.01 – 10
    study.cells[3].settings.epsilon.relative = -1;
    study.cells[4].kind = "plot";
    writeFileSync(file, JSON.stringify(study, null, 2));
    for (const command of ["run", "check"]) {
      const { io, err, out } = captureIO(dir);
      expect(await main([command, "harbour-cranes.couplet.json"], io)).toBe(2);
      expect(out()).toBe("");
      expect(err()).toBe(
        `couplet ${command}: harbour-cranes.couplet.json: 3 problems\n` +
          "  cells[0].settings.value: must be within [0.01, 10], got 50\n" +
          "  cells[3].settings.epsilon.relative: must be > 0, got -1\n" +
          '  cells[4].kind: unknown cell kind "plot"; known kinds: prose, parameter, data, transport, sweep, figure, code, table\n',
      );
    }
  });

  it("main(['run', file that is not JSON]) exits 2 naming the line and column", async () => {
    const dir = scratchWith();
    writeFileSync(join(dir, "bad.couplet.json"), '{\n  "format": "couplet-study",\n  "title": \'x\'\n}\n');
    const { io, err } = captureIO(dir);
    expect(await main(["run", "bad.couplet.json"], io)).toBe(2);
    expect(err()).toMatch(/^couplet run: bad\.couplet\.json: 1 problem\n {2}\(study\): .*line 3, column 12/);
  });

  it("main(['run', missing file]) exits 2 with the reason", async () => {
    const { io, err } = captureIO(scratchWith());
    expect(await main(["run", "nothing.couplet.json"], io)).toBe(2);
    expect(err()).toBe('couplet run: cannot read the study "nothing.couplet.json": no such file or folder\n');
  });

  it("main(['check', study without receipts]) exits 2 and tells how to record them", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const { io, err } = captureIO(dir);
    expect(await main(["check", "harbour-cranes.couplet.json"], io)).toBe(2);
    expect(err()).toContain("record them first with: couplet run harbour-cranes.couplet.json --save-receipts");
  });

  it("main(['run', STUDY, '--set', bad value]) exits 2 naming the parameter and the problem", async () => {
    const dir = scratchWith("harbour-cranes.couplet.json");
    const { io, err } = captureIO(dir);
    expect(await main(["run", "harbour-cranes.couplet.json", "--set", "slack=lots"], io)).toBe(2);
    expect(err()).toBe('couplet run: --set slack=lots: parameter "slack" (log-range): not a number: "lots"\n');
  });
});
