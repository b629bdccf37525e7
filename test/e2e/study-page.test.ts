// The editor in a real browser on the depots-and-shops demo, opened through the
// real server (cells/server) with its token: what a user sees on opening, tuning
// epsilon with a mouse drag at the control desk, and a code cell that throws.
// Expected behaviour: docs/editor.md (the page, the control desk, cell states,
// "A cycle, an unknown name or a throw marks that cell and its dependents failed,
// and nothing else" in DESIGN.md). Expected numbers come from outside the page:
// the demo's data files, and the receipts `couplet run` recorded in the demo
// (computed in Node, not in this browser).
import { readFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { figureSvg, textOf, waitForCells, waitForNewText, waitForText } from "./helpers/cell-waits";
import { browserSuiteName, hasChromium, launchChromium } from "./helpers/chromium";
import { closeTo, numberAfter } from "./helpers/headline-numbers";
import { EXAMPLES_DIR, type ScratchServer, serveExamples } from "./helpers/scratch-server";
import { screenshot } from "./helpers/screenshots";
import { type StudyPage, openStudyPage } from "./helpers/study-page";

const STUDY = "depots-and-shops.couplet.json";
const demoText = readFileSync(join(EXAMPLES_DIR, STUDY), "utf8");
const demo = JSON.parse(demoText) as {
  title: string;
  cells: { id: string; settings: Record<string, unknown> }[];
  receipts: Record<string, { summary: Record<string, number> }>;
};
/** What `couplet run` recorded for the unbalanced transport `flexible` (cell tu) at ε = 0.01 × median cost. */
const flexibleReceipt = demo.receipts.tu.summary;
/** The demo's epsilon parameter: a log-range control. */
const epsSettings = demo.cells.find((c) => c.id === "eps")!.settings as { value: number; min: number; max: number };

/** Sum of the `mass` column of a CSV file of the demo (header line first). */
function csvMass(relative: string): number {
  const [header, ...rows] = readFileSync(join(EXAMPLES_DIR, relative), "utf8").trim().split(/\r?\n/);
  const column = header.split(",").indexOf("mass");
  return rows.reduce((sum, row) => sum + Number(row.split(",")[column]), 0);
}

const TEST_TIMEOUT = 45_000;

let browser: Browser;
let scratch: ScratchServer | undefined;
let view: StudyPage | undefined;

/** A fresh scratch copy of the demos, the study trusted (the user's own), opened in a new context. */
async function openDemo(): Promise<StudyPage> {
  scratch = await serveExamples({ study: STUDY, trusted: [STUDY] });
  view = await openStudyPage(browser, scratch.url);
  return view;
}

describe.skipIf(!hasChromium)(browserSuiteName("the study page in a browser"), () => {
  beforeAll(async () => {
    browser = await launchChromium();
  });

  afterEach(async () => {
    await view?.close();
    await scratch?.close();
    view = undefined;
    scratch = undefined;
  });

  afterAll(async () => {
    await browser?.close();
  });

  it(
    "opening depots-and-shops through the server link shows its title, its prose with live values and the control desk",
    async () => {
      const { page, problems } = await openDemo();
      // The token leaves the address bar once loaded (docs/editor.md, "Opening a study").
      expect(page.url()).not.toContain("token=");
      expect(await page.inputValue('[data-testid="study-title"]')).toBe(demo.title);
      expect(await textOf(page, '[data-testid="study-path"]')).toBe(STUDY);
      expect(await page.title()).toContain(demo.title);

      await waitForCells(page, { "*": "done" });
      expect(await textOf(page, '[data-testid="run-summary"]')).toBe(`${demo.cells.length} ready`);

      // Prose: the heading, and the totals computed by the code cell from the CSV files.
      const prose = '[data-cell-id="intro"] [data-testid="prose"]';
      expect(await textOf(page, `${prose} h1`)).toBe("Depots and shops");
      const text = await textOf(page, prose);
      expect(text).toContain(`depots hold ${csvMass("data/depots.csv").toFixed(3)} thousand crates a day`);
      expect(text).toContain(`shops want ${csvMass("data/shops.csv").toFixed(3)}`);

      // The control desk: both parameters of the study, with their labels and values from the file.
      expect(await page.isVisible('[data-testid="control-desk"]')).toBe(true);
      const desk = await page.$$eval('[data-testid="desk-parameter"]', (nodes) =>
        nodes.map((n) => ({ name: (n as HTMLElement).dataset.param, label: n.querySelector("label")?.textContent, value: (n.querySelector(".cp-param-entry") as HTMLInputElement).value })),
      );
      expect(desk).toEqual([
        { name: "rho", label: "mass penalty ρ (km²)", value: "4" },
        { name: "eps", label: "epsilon, relative to the median cost", value: "0.01" },
      ]);

      // The transport solved in the page's worker agrees with what `couplet run` recorded in Node.
      const headline = await textOf(page, '[data-cell-id="tu"] [data-testid="headline"]');
      expect(closeTo(numberAfter(headline, "UOT_ε = "), flexibleReceipt.objective, 5e-4)).toBe(true);
      expect(closeTo(numberAfter(headline, "mass "), flexibleReceipt.mass, 5e-4)).toBe(true);
      expect(closeTo(numberAfter(headline, ", ε = "), flexibleReceipt.epsilon, 5e-3)).toBe(true);
      expect(headline).toContain(`${flexibleReceipt.iterations} it`);
      expect(await figureSvg(page, "fu")).toMatch(/^<svg/);

      await screenshot(page, "01-depots-opened");
      expect(problems).toEqual([]);
    },
    TEST_TIMEOUT,
  );

  it(
    "dragging the epsilon slider at the desk changes the value shown, re-solves the unbalanced transport and redraws its figure",
    async () => {
      const { page, problems } = await openDemo();
      await waitForCells(page, { "*": "done" });
      const headlineAt = '[data-cell-id="tu"] [data-testid="headline"]';
      const before = { headline: await textOf(page, headlineAt), plan: await figureSvg(page, "fu"), convergence: await figureSvg(page, "fc"), prose: await textOf(page, '[data-cell-id="intro"] [data-testid="prose"]') };
      expect(await textOf(page, '[data-cell-id="eps"] [data-testid="parameter-value"]')).toBe("= 0.01");

      // A real drag: press on the thumb, move right in steps, release.
      const slider = page.locator('[data-param="eps"] input[type="range"]');
      const box = (await slider.boundingBox())!;
      const y = box.y + box.height / 2;
      const from = Number(await slider.inputValue()) / 1000;
      await page.mouse.move(box.x + box.width * from, y);
      await page.mouse.down();
      await page.mouse.move(box.x + box.width * 0.75, y, { steps: 8 });
      await page.mouse.up();
      const position = Number(await slider.inputValue());
      expect(position).toBeGreaterThan(from * 1000 + 100);

      // The log slider's value at that position: min·(max/min)^(position/1000), to 3
      // significant digits (docs/editor.md, "Parameters at the control desk").
      const { min, max } = epsSettings;
      const value = Number((min * Math.pow(max / min, position / 1000)).toPrecision(3));
      await page.waitForFunction((v) => (document.querySelector('[data-param="eps"] .cp-param-entry') as HTMLInputElement).value === String(v), value);
      await waitForText(page, '[data-cell-id="eps"] [data-testid="parameter-value"]', `= ${value}`);

      // The transport re-solved with the new epsilon: ε = relative value × median cost
      // (docs/format.md), the median cost being what the receipt recorded at 0.01.
      const medianCost = flexibleReceipt.epsilon / epsSettings.value;
      await page.waitForFunction(
        ([at, eps]) => {
          const text = document.querySelector(at)?.textContent ?? "";
          const match = /, ε = ([\d.]+)/.exec(text);
          return match !== null && Math.abs(Number(match[1]) - eps) <= 5e-3 * eps;
        },
        [headlineAt, value * medianCost] as const,
      );
      await waitForCells(page, { "*": "done" });
      const after = { headline: await textOf(page, headlineAt), plan: await figureSvg(page, "fu"), convergence: await figureSvg(page, "fc"), prose: await textOf(page, '[data-cell-id="intro"] [data-testid="prose"]') };
      expect(after.headline).not.toBe(before.headline);
      // A larger epsilon spreads the plan and prices mass differently: a new value.
      expect(numberAfter(after.headline, "UOT_ε = ")).not.toBe(numberAfter(before.headline, "UOT_ε = "));
      expect(after.plan).toMatch(/^<svg/);
      expect(after.plan).not.toBe(before.plan);
      expect(after.convergence).not.toBe(before.convergence);
      // The prose quotes the transported mass live: it follows the new solve.
      const mass = numberAfter(after.headline, "mass ");
      expect(after.prose).toContain(`moves ${mass.toFixed(3)} thousand crates`);
      expect(after.prose).not.toBe(before.prose);

      await page.locator('[data-cell-id="fu"]').scrollIntoViewIfNeeded();
      await screenshot(page, "02-epsilon-dragged");
      expect(problems).toEqual([]);
    },
    TEST_TIMEOUT,
  );

  it(
    "typing a throw into a code cell marks that cell failed with the message, while the other cells keep working",
    async () => {
      const { page, problems } = await openDemo();
      await waitForCells(page, { "*": "done" });

      // Edit the code of `totals` by typing in its CodeMirror editor, then run it (Ctrl+Enter).
      await page.click('[data-cell-id="tot"] .cm-content');
      await page.keyboard.press("ControlOrMeta+KeyA");
      await page.keyboard.type('throw new Error("stock count unavailable");');
      await page.keyboard.press("ControlOrMeta+Enter");

      // The cell itself and the prose that quotes it fail; nothing else does.
      await waitForCells(page, { tot: "failed", intro: "failed", dep: "done", shp: "done", tx: "done", tu: "done", fx: "done", fu: "done", sw: "done", fs: "done", fc: "done", tab: "done", note: "done", rho: "done", eps: "done" });
      expect(await textOf(page, '[data-cell-id="tot"] [data-testid="cell-state"]')).toBe("failed: stock count unavailable (error in this cell)");
      expect(await textOf(page, '[data-cell-id="tot"] [data-testid="cell-failure"]')).toContain("stock count unavailable");
      expect(await textOf(page, '[data-cell-id="intro"] [data-testid="cell-state"]')).toContain("because totals failed");
      // The prose still reads, with "—" where the failed values would be.
      expect(await textOf(page, '[data-cell-id="intro"] [data-testid="prose"]')).toContain("depots hold — thousand crates");
      expect(await textOf(page, '[data-testid="run-summary"]')).toBe(`${demo.cells.length - 2} ready · 2 failed`);
      expect(await textOf(page, '[data-cell-id="tu"] [data-testid="cell-state"]')).toMatch(/^ready/);
      await page.locator('[data-cell-id="tot"]').scrollIntoViewIfNeeded();
      await screenshot(page, "03-code-cell-failed");

      // A parameter change still re-solves the transport while `totals` stays failed.
      const headlineAt = '[data-cell-id="tu"] [data-testid="headline"]';
      const before = await textOf(page, headlineAt);
      const plan = await figureSvg(page, "fu");
      const rho = page.locator('[data-param="rho"] .cp-param-entry');
      await rho.fill("20");
      await rho.press("Enter");
      const after = await waitForNewText(page, headlineAt, before);
      await waitForCells(page, { tu: "done", fu: "done", tot: "failed" });
      // A dearer mass penalty (ρ from 4 to 20) pushes the plan towards the marginals: more mass moves.
      expect(numberAfter(after, "mass ")).toBeGreaterThan(numberAfter(before, "mass "));
      expect(await figureSvg(page, "fu")).not.toBe(plan);

      // Correct code runs again and the prose recovers (redefining a failed cell recovers).
      await page.click('[data-cell-id="tot"] .cm-content');
      await page.keyboard.press("ControlOrMeta+KeyA");
      await page.keyboard.type("return {supply: core.totalMass(depots), demand: core.totalMass(shops)};");
      await page.keyboard.press("ControlOrMeta+Enter");
      await waitForCells(page, { "*": "done" });
      expect(await textOf(page, '[data-cell-id="intro"] [data-testid="prose"]')).toContain(`depots hold ${csvMass("data/depots.csv").toFixed(3)} thousand crates`);
      expect(problems).toEqual([]);
    },
    TEST_TIMEOUT,
  );
});
