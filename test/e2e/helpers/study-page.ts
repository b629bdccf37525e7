// Opening the editor in its own browser context, and watching it for errors.
import type { Browser, BrowserContext, Page } from "playwright-core";

/** An editor page in a context of its own (its own cookies and storage). */
export interface StudyPage {
  readonly context: BrowserContext;
  readonly page: Page;
  /** Uncaught page errors and console errors seen so far, in words. */
  readonly problems: string[];
  close(): Promise<void>;
}

/** Width × height of the window the tests look through: a laptop screen. */
export const VIEWPORT = { width: 1400, height: 900 } as const;

/** Longest wait for a page load or a single browser action, ms. */
export const ACTION_TIMEOUT = 20_000;

/**
 * Opens `url` (the link the server printed, token included) in a fresh browser
 * context and waits until the editor has drawn its first cell. Page errors and
 * console errors are collected in `problems`; failed loads are left out, because
 * refused requests (403) are part of what the tests provoke.
 */
export async function openStudyPage(browser: Browser, url: string): Promise<StudyPage> {
  const context = await browser.newContext({ viewport: VIEWPORT, deviceScaleFactor: 1 });
  context.setDefaultTimeout(ACTION_TIMEOUT);
  const page = await context.newPage();
  const problems: string[] = [];
  page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
  page.on("console", (message) => {
    if (message.type() === "error" && !/Failed to load resource/.test(message.text())) problems.push(`console error: ${message.text()}`);
  });
  await page.goto(url);
  await page.waitForSelector('[data-testid="cell"]');
  return { context, page, problems, close: () => context.close() };
}
