// Code from someone else, in a real browser: a study that is not on the user's
// trust list opens with its code cells held, says why, and runs them only when
// the user chooses. Expected behaviour: docs/editor.md ("Code from someone else")
// and docs/server.md ("Trust": the list is per user, keyed by the study's real
// path and the SHA-256 of its bytes).
//
// The study is the depots demo as a colleague might send it: its code cell also
// counts its own runs on the page's global object (reached through a constructor,
// as global-resolver.ts says a determined cell can). A held cell must leave that
// count undefined: proof that its JavaScript did not run, not only a state line.
import { createHash } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import { readFile, writeFile } from "node:fs/promises";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { textOf, waitForCells } from "./helpers/cell-waits";
import { browserSuiteName, hasChromium, launchChromium } from "./helpers/chromium";
import { EXAMPLES_DIR, type ScratchServer, serveExamples } from "./helpers/scratch-server";
import { screenshot } from "./helpers/screenshots";
import { type StudyPage, openStudyPage } from "./helpers/study-page";

const STUDY = "depots-from-a-colleague.couplet.json";
const demoText = readFileSync(join(EXAMPLES_DIR, "depots-and-shops.couplet.json"), "utf8");
const DEMO_CODE = "return {supply: core.totalMass(depots), demand: core.totalMass(shops)};";
const PROBE_CODE = `const page = Object.constructor("return this")(); page.coupletProbeRuns = (page.coupletProbeRuns ?? 0) + 1; ${DEMO_CODE}`;
if (!demoText.includes(JSON.stringify(DEMO_CODE))) throw new Error("the depots demo's code cell changed: update this test");
const colleagueText = demoText.replace(JSON.stringify(DEMO_CODE), JSON.stringify(PROBE_CODE));

/** Every cell of the study except the code cell and the prose quoting it. */
const RUNS_ANYWAY = { dep: "done", shp: "done", tx: "done", tu: "done", fx: "done", fu: "done", sw: "done", fs: "done", fc: "done", tab: "done", note: "done", rho: "done", eps: "done" } as const;

/** How many times the code cell ran in this document (undefined: never). */
function probeRuns(page: Page): Promise<number | undefined> {
  return page.evaluate(() => (globalThis as { coupletProbeRuns?: number }).coupletProbeRuns);
}

let browser: Browser;
let scratch: ScratchServer | undefined;
let view: StudyPage | undefined;

/** The colleague's study in a fresh folder, with an empty trust list, opened in a new context. */
async function openForeignStudy(): Promise<StudyPage> {
  scratch = await serveExamples({ study: STUDY, prepare: (root) => writeFile(join(root, STUDY), colleagueText) });
  view = await openStudyPage(browser, scratch.url);
  return view;
}

/** The page holds the code: the notice with the reason, the cell held, its code not run. */
async function expectHeld(page: Page): Promise<void> {
  await waitForCells(page, { tot: "held", intro: "held", ...RUNS_ANYWAY });
  const notice = page.locator('[data-testid="notice-trust"]');
  expect(await notice.isVisible()).toBe(true);
  expect(await notice.locator(".cp-notice-title").textContent()).toBe("One code cell is held, not run.");
  const why = (await notice.textContent()) ?? "";
  expect(why).toContain("This study is not on your trust list, so its JavaScript (totals) has not run");
  expect(await textOf(page, '[data-cell-id="tot"] [data-testid="cell-state"]')).toBe("held: code from a study you have not chosen to run");
  expect(await textOf(page, '[data-cell-id="tot"] [data-testid="cell-held"]')).toContain("Not run");
  expect(await page.locator('[data-cell-id="tot"] [data-testid="headline"]').count()).toBe(0);
  // Prose quoting the held value still reads, with "—" in its place.
  expect(await textOf(page, '[data-cell-id="intro"] [data-testid="prose"]')).toContain("depots hold — thousand crates");
  expect(await probeRuns(page)).toBeUndefined();
}

describe.skipIf(!hasChromium)(browserSuiteName("code held in a study from someone else"), () => {
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
    "opening a study not on the trust list holds its code with the reason, until 'Run the code this time', which trusts nothing for later",
    async () => {
      const { page, problems } = await openForeignStudy();
      expect(existsSync(scratch!.trustFile)).toBe(false);
      await expectHeld(page);
      await screenshot(page, "05-held-code");

      await page.click('[data-testid="run-code-once"]');
      await waitForCells(page, { "*": "done" });
      expect(await probeRuns(page)).toBe(1);
      expect(await page.locator('[data-testid="notice-trust"]').count()).toBe(0);
      expect(await textOf(page, '[data-cell-id="tot"] [data-testid="headline"]')).toContain('"supply":1.15');
      // This page only: no trust recorded, and a reload holds the code again.
      expect(existsSync(scratch!.trustFile)).toBe(false);
      await page.reload();
      await page.waitForSelector('[data-testid="cell"]');
      await expectHeld(page);
      expect(problems).toEqual([]);
    },
    45_000,
  );

  it(
    "'Always run this study's code' runs it and adds the study's real path and SHA-256 to the user's trust list, so it opens running",
    async () => {
      const { page, problems } = await openForeignStudy();
      await expectHeld(page);
      const trusted = page.waitForResponse((r) => new URL(r.url()).pathname === "/api/trust" && r.request().method() === "POST");
      await page.click('[data-testid="trust-study"]');
      expect((await trusted).status()).toBe(200);
      await waitForCells(page, { "*": "done" });
      expect(await probeRuns(page)).toBe(1);

      // The per-user list (COUPLET_TRUST_FILE, outside the folder) names the file by real path and hash of its bytes.
      const bytes = await readFile(scratch!.file(STUDY));
      const list = JSON.parse(await readFile(scratch!.trustFile, "utf8")) as { format: string; studies: { path: string; sha256: string }[] };
      expect(list.format).toBe("couplet-trust");
      expect(list.studies).toEqual([{ path: scratch!.file(STUDY), sha256: createHash("sha256").update(bytes).digest("hex") }]);

      // Opened again, the code runs at once: no notice, nothing held.
      await page.reload();
      await page.waitForSelector('[data-testid="cell"]');
      await waitForCells(page, { "*": "done" });
      expect(await page.locator('[data-testid="notice-trust"]').count()).toBe(0);
      expect(await probeRuns(page)).toBe(1);
      expect(problems).toEqual([]);
    },
    45_000,
  );
});
