// Screenshots of what the tests see, for a person to look at: written to a
// temporary folder (never into the repository), one file per view, replaced on
// each run. COUPLET_E2E_SHOTS names another folder.
import { mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";

/** Where the screenshots go. */
export const SCREENSHOT_DIR: string = process.env.COUPLET_E2E_SHOTS ?? join(tmpdir(), "couplet-e2e-shots");

/** Saves the visible part of the page as `SCREENSHOT_DIR/name.png`; returns the file's path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const path = join(SCREENSHOT_DIR, `${name}.png`);
  await page.screenshot({ path, animations: "disabled" });
  return path;
}
