// Waiting for the editor's cells by condition (never by a fixed sleep), through
// the hooks of docs/editor.md: every cell card carries data-cell-id and
// data-state (waiting, running, done, failed, held), and its state line says why.
import type { Page } from "playwright-core";

/** A cell state as the card's data-state attribute gives it. */
export type CellStatus = "waiting" | "running" | "done" | "failed" | "held";

/** Longest wait for cells to reach a state, ms (the demos settle in about a second here). */
export const SETTLE_TIMEOUT = 30_000;

/** Each cell's data-state and state line, by cell id. */
export async function cellStates(page: Page): Promise<Record<string, { state: string; line: string }>> {
  return page.$$eval('[data-testid="cell"]', (cards) =>
    Object.fromEntries(
      cards.map((card) => [
        (card as HTMLElement).dataset.cellId ?? "",
        { state: (card as HTMLElement).dataset.state ?? "", line: card.querySelector('[data-testid="cell-state"]')?.textContent ?? "" },
      ]),
    ),
  );
}

/**
 * Waits until each listed cell is in its expected state (`"*"` as the key: every
 * cell of the page). On timeout, throws with the states the page showed then,
 * so a failure in CI says where the run stood.
 */
export async function waitForCells(page: Page, expected: Readonly<Record<string, CellStatus>>, timeout = SETTLE_TIMEOUT): Promise<void> {
  try {
    await page.waitForFunction(
      (want) => {
        const cards = Array.from(document.querySelectorAll<HTMLElement>('[data-testid="cell"]'));
        if (cards.length === 0) return false;
        const all = want["*"];
        if (all !== undefined && !cards.every((card) => card.dataset.state === all)) return false;
        return Object.entries(want).every(([id, state]) => id === "*" || cards.some((card) => card.dataset.cellId === id && card.dataset.state === state));
      },
      expected,
      { timeout, polling: "raf" },
    );
  } catch (error) {
    const now = await cellStates(page).catch(() => ({}));
    throw new Error(`cells did not reach ${JSON.stringify(expected)} within ${timeout} ms; they show ${JSON.stringify(now)}`, { cause: error });
  }
}

/**
 * Waits until the text of the first element matching `selector` is non-empty and
 * differs from `before`; returns the new text.
 */
export async function waitForNewText(page: Page, selector: string, before: string, timeout = SETTLE_TIMEOUT): Promise<string> {
  const handle = await page.waitForFunction(
    ([sel, old]) => {
      const text = document.querySelector(sel)?.textContent ?? "";
      return text !== "" && text !== old ? text : false;
    },
    [selector, before] as const,
    { timeout, polling: "raf" },
  );
  return (await handle.jsonValue()) as string;
}

/** Waits until the text of the first element matching `selector` is exactly `expected`. */
export async function waitForText(page: Page, selector: string, expected: string, timeout = SETTLE_TIMEOUT): Promise<void> {
  try {
    await page.waitForFunction(([sel, want]) => (document.querySelector(sel)?.textContent ?? "") === want, [selector, expected] as const, { timeout, polling: "raf" });
  } catch (error) {
    const now = await page.evaluate((sel) => document.querySelector(sel)?.textContent ?? null, selector).catch(() => null);
    throw new Error(`${selector} did not read ${JSON.stringify(expected)} within ${timeout} ms; it reads ${JSON.stringify(now)}`, { cause: error });
  }
}

/** The text of the first element matching `selector` ("" when there is none). */
export async function textOf(page: Page, selector: string): Promise<string> {
  return page.evaluate((sel) => document.querySelector(sel)?.textContent ?? "", selector);
}

/**
 * The markup of the picture a figure cell drew: the plot's own SVG, the direct
 * child of the cell's `figure` (the colour-key swatches are small SVGs inside spans).
 */
export async function figureSvg(page: Page, cellId: string): Promise<string> {
  return page.evaluate((id) => document.querySelector(`[data-cell-id="${id}"] [data-testid="figure"] > svg`)?.outerHTML ?? "", cellId);
}
