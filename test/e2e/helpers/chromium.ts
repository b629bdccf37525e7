// Headless Chromium for the end-to-end tests: Debian's /usr/bin/chromium driven by
// playwright-core (no browser download). CI installs it (.ci/run); elsewhere the
// suites skip and say why in their name.
import { existsSync } from "node:fs";
import { type Browser, chromium } from "playwright-core";

/** Where the browser is expected (Debian's `chromium` package). */
export const CHROMIUM_PATH = "/usr/bin/chromium";

/** Whether the browser is installed; the e2e suites are skipped when it is not. */
export const hasChromium: boolean = existsSync(CHROMIUM_PATH);

/**
 * Flags for a quiet headless run: no sandbox (containers lack the namespaces),
 * no GPU, and no background traffic of the browser's own (updates, sync, QUIC probes),
 * so the only requests are the page's own to 127.0.0.1. No `--user-data-dir`:
 * Playwright makes a fresh profile per launch.
 */
export const CHROMIUM_ARGS: readonly string[] = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
];

/** Starts one headless browser (one per test file; close it in afterAll). */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, args: [...CHROMIUM_ARGS], timeout: 30_000 });
}

/**
 * The name of an e2e suite: `name` itself when the browser is there, else `name`
 * with the reason it is skipped, so a skipped suite explains itself in the output.
 */
export function browserSuiteName(name: string): string {
  return hasChromium ? name : `${name} — skipped: no browser at ${CHROMIUM_PATH} (apt-get install chromium)`;
}
