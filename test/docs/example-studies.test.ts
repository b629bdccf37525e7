// The demo studies in docs/examples/ are part of the product: each must run, carry
// receipts, pass `couplet check`, and produce a report with its figures. The values
// themselves rest on the core's outside checks (HiGHS LP oracle, closed forms) in test/core.
import { cpSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { main } from "../../cells/cli/main";
import { parseStudy, serializeStudy } from "../../cells/document/index";
import { captureIO } from "../cells/cli/capture-io";

const EXAMPLES = fileURLToPath(new URL("../../docs/examples/", import.meta.url));
const studies = readdirSync(EXAMPLES).filter((f) => f.endsWith(".couplet.json"));

/** A scratch copy of docs/examples/ (studies and data), so runs never touch the originals. */
function scratch(): string {
  const dir = mkdtempSync(join(tmpdir(), "couplet-examples-"));
  cpSync(EXAMPLES, dir, { recursive: true });
  return dir;
}

describe("docs/examples", () => {
  it("has the three demo studies", () => {
    expect(studies.sort()).toEqual(["depots-and-shops.couplet.json", "epsilon-tuning.couplet.json", "sensor-survey-shift.couplet.json"]);
  });

  for (const name of studies) {
    it(`${name}: couplet check passes against its saved receipts`, async () => {
      const dir = scratch();
      const study = parseStudy(readFileSync(join(dir, name), "utf8"));
      expect(Object.keys(study.receipts ?? {}).length).toBeGreaterThan(0);
      const { io, out, err } = captureIO(dir);
      const code = await main(["check", name], io);
      expect(err()).not.toMatch(/error/i);
      expect(code, out()).toBe(0);
      expect(out()).toMatch(/0 drifted, 0 inputs changed, 0 without receipt, 0 failed/);
    });

    it(`${name}: couplet run --report writes a report with every figure as SVG and no failed cell`, async () => {
      const dir = scratch();
      const { io, out } = captureIO(dir);
      const code = await main(["run", name, "--report", "report.html"], io);
      expect(code, out()).toBe(0);
      expect(out()).toMatch(/ 0 failed, 0 held/);
      const html = readFileSync(join(dir, "report.html"), "utf8");
      const figures = parseStudy(readFileSync(join(dir, name), "utf8")).cells.filter((c) => c.kind === "figure").length;
      expect(html.match(/<svg/g)?.length ?? 0).toBeGreaterThanOrEqual(figures);
      expect(html).not.toMatch(/<script/i);
      expect(html).not.toMatch(/(src|href)=["']https?:/i);
    });
  }

  it("couplet check catches a drifted value in a demo study's receipts", async () => {
    const dir = scratch();
    const name = "depots-and-shops.couplet.json";
    const study = JSON.parse(readFileSync(join(dir, name), "utf8"));
    const receipt = study.receipts.tx;
    receipt.summary.cost *= 1 + 1e-6; // far above the exact method's 1e-9 relative tolerance
    writeFileSync(join(dir, name), serializeStudy(parseStudy(JSON.stringify(study))));
    const { io, out } = captureIO(dir);
    expect(await main(["check", name], io)).toBe(1);
    expect(out()).toMatch(/shapes[\s\S]*cost/);
  });
});
