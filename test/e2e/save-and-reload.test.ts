// Saving from the editor in a real browser: an edit, Ctrl+S, the bytes on disk,
// and a reload that shows the edit. Expected behaviour: docs/editor.md ("Saving")
// and docs/server.md (PUT /api/study: the canonical text, written atomically, the
// old file kept as NAME.couplet.json.previous). The expected file is built from
// the demo's own bytes with the two edited values replaced, not by the project's
// serializer: the demos are stored in canonical form (load → save changes nothing).
import { readFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { join } from "node:path";
import type { Browser, Request } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { parseStudy } from "../../cells/document";
import { textOf, waitForCells } from "./helpers/cell-waits";
import { browserSuiteName, hasChromium, launchChromium } from "./helpers/chromium";
import { EXAMPLES_DIR, type ScratchServer, serveExamples } from "./helpers/scratch-server";
import { screenshot } from "./helpers/screenshots";
import { type StudyPage, openStudyPage } from "./helpers/study-page";

const STUDY = "depots-and-shops.couplet.json";
const demoText = readFileSync(join(EXAMPLES_DIR, STUDY), "utf8");
const demoTitle = (JSON.parse(demoText) as { title: string }).title;
const NEW_TITLE = "Island depots and shops, rainy season";
const NEW_EPS = 0.02;

/** `text` with `pattern` replaced, checking that it occurred exactly once. */
function replaceOnce(text: string, pattern: RegExp, replacement: string): string {
  const hits = text.match(new RegExp(pattern.source, `${pattern.flags.replace("g", "")}g`)) ?? [];
  if (hits.length !== 1) throw new Error(`expected one match of ${pattern} in the demo, found ${hits.length}`);
  return text.replace(pattern, replacement);
}

/** The demo's bytes with the new title and the parameter `eps` at NEW_EPS. */
const expectedText = replaceOnce(
  replaceOnce(demoText, new RegExp(`"title": ${JSON.stringify(demoTitle).replace(/[?.]/g, "\\$&")}`), `"title": ${JSON.stringify(NEW_TITLE)}`),
  /("id": "eps",\s*"kind": "parameter",\s*"name": "eps",\s*"settings": \{\s*"control": "log-range",\s*"value": )0\.01,/,
  `$1${NEW_EPS},`,
);

let browser: Browser;
let scratch: ScratchServer | undefined;
let view: StudyPage | undefined;

describe.skipIf(!hasChromium)(browserSuiteName("saving a study from the browser"), () => {
  beforeAll(async () => {
    browser = await launchChromium();
    scratch = await serveExamples({ study: STUDY, trusted: [STUDY] });
  });

  afterAll(async () => {
    await view?.close();
    await browser?.close();
    await scratch?.close();
  });

  it(
    "Ctrl+S after an edit writes the canonical study text to disk, and a reload shows the edit",
    async () => {
      view = await openStudyPage(browser, scratch!.url);
      const { page, problems } = view;
      const file = scratch!.file(STUDY);
      const saves: Request[] = [];
      page.on("request", (request) => {
        if (request.method() === "PUT" && new URL(request.url()).pathname === "/api/study") saves.push(request);
      });
      await waitForCells(page, { "*": "done" });

      // Two edits: the title in the masthead, epsilon in the desk's exact entry.
      await page.fill('[data-testid="study-title"]', NEW_TITLE);
      await page.press('[data-testid="study-title"]', "Enter");
      const eps = page.locator('[data-param="eps"] .cp-param-entry');
      await eps.fill(String(NEW_EPS));
      await eps.press("Enter");
      // Ctrl+S from outside any text field.
      await page.locator('[data-testid="sheet"]').focus();
      await page.keyboard.press("ControlOrMeta+KeyS");
      // The key starts the write at once: the status has left "unsaved changes — saving
      // shortly" (which an autosave would end only 1.5 s after the last edit).
      expect(await textOf(page, '[data-testid="save-status"]')).toMatch(/^(saving…|saved)/);
      await page.waitForFunction(() => /^saved/.test(document.querySelector('[data-testid="save-status"]')?.textContent ?? ""));
      expect(saves.length).toBeGreaterThan(0);

      // What the page sent last is what the server answered as written byte for byte, and what the disk holds.
      const last = saves[saves.length - 1];
      const sent = (JSON.parse(last.postData() ?? "{}") as { text: string }).text;
      const reply = (await (await last.response())!.json()) as { canonical: boolean; written: boolean; backup: string | null };
      expect(reply).toMatchObject({ canonical: true, backup: `${STUDY}.previous` });
      const disk = await readFile(file, "utf8");
      expect(disk).toBe(sent);
      expect(disk).toBe(expectedText);
      // It parses as a study holding the edits.
      const study = parseStudy(disk, { path: STUDY });
      expect(study.title).toBe(NEW_TITLE);
      expect(study.cells.find((c) => c.id === "eps")?.settings).toMatchObject({ value: NEW_EPS });
      // The replaced file is kept beside it, unchanged (docs/format.md, "Saving").
      expect(await readFile(`${file}.previous`, "utf8")).toBe(demoText);

      // Reload: the page reads the file again and shows the edits.
      await page.reload();
      await page.waitForSelector('[data-testid="cell"]');
      await page.waitForFunction((title) => (document.querySelector('[data-testid="study-title"]') as HTMLInputElement | null)?.value === title, NEW_TITLE);
      expect(await page.inputValue('[data-param="eps"] .cp-param-entry')).toBe(String(NEW_EPS));
      await waitForCells(page, { "*": "done" });
      expect(await textOf(page, '[data-cell-id="eps"] [data-testid="parameter-value"]')).toBe(`= ${NEW_EPS}`);
      expect(await textOf(page, '[data-testid="save-status"]')).toMatch(/^saved/);
      // Nothing was written by opening and running it again.
      expect(await readFile(file, "utf8")).toBe(expectedText);
      await screenshot(page, "04-saved-and-reloaded");
      expect(problems).toEqual([]);
    },
    45_000,
  );
});
