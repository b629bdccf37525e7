// The browser side of the editor benchmark: a study served by the real server
// (cells/server/start-server.ts) on 127.0.0.1 and a port the system picks, opened in
// headless Chromium (/usr/bin/chromium through playwright-core), and the in-page
// probes — long tasks, timer lateness, mutation times — read through the editor's
// test hooks (docs/editor.md, "Hooks for browser tests").
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { type Browser, type BrowserContext, type Page, chromium } from "playwright-core";
import { type StudyDocument, serializeStudy } from "../../cells/document";
import { type RunningServer, startServer } from "../../cells/server/start-server";

/** Debian's browser, as the end-to-end tests use it. */
export const CHROMIUM_PATH = "/usr/bin/chromium";

/** Launch flags from /work/shared/TOOLCHAIN.md: headless, no sandbox, no background traffic. */
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"];

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS, timeout: 60_000 });
}

/** A study written to a scratch folder, served, and open in a page. */
export interface OpenStudy {
  readonly page: Page;
  readonly context: BrowserContext;
  readonly server: RunningServer;
  /** Page errors and console errors seen so far. */
  readonly problems: string[];
  close(): Promise<void>;
}

/**
 * Writes `study` to a fresh temporary folder, serves it with startServer, opens it
 * in a new browser context with the long-task recorder installed before any page
 * script runs, and waits until every cell is done. The caller must have pointed
 * COUPLET_TRUST_FILE at a scratch file (the trust list is per user).
 */
export async function openStudy(browser: Browser, study: StudyDocument, settleTimeout: number): Promise<OpenStudy> {
  const root = await mkdtemp(join(tmpdir(), "couplet-bench-editor-"));
  await writeFile(join(root, "bench.couplet.json"), serializeStudy(study));
  const server = await startServer({ root, study: "bench.couplet.json", port: 0, host: "127.0.0.1" });
  const context = await browser.newContext({ viewport: { width: 1440, height: 960 }, deviceScaleFactor: 1 });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on("pageerror", (e) => problems.push(`page error: ${e.message}`));
  page.on("console", (m) => {
    if (m.type() === "error") problems.push(`console: ${m.text()}`);
  });
  await page.addInitScript(() => {
    const w = window as unknown as { __longTasks: { start: number; duration: number }[] };
    w.__longTasks = [];
    try {
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.__longTasks.push({ start: e.startTime, duration: e.duration });
      }).observe({ type: "longtask", buffered: true });
    } catch {
      // No long-task support: the row says "not measured".
    }
  });
  await page.goto(server.url);
  await page.waitForSelector('[data-testid="cell"]', { timeout: 60_000 });
  await allCellsDone(page, settleTimeout);
  return {
    page,
    context,
    server,
    problems,
    async close() {
      await context.close();
      await server.close();
      await rm(root, { recursive: true, force: true });
    },
  };
}

/** Waits until every cell card says data-state="done" (throws on timeout with the states seen). */
export async function allCellsDone(page: Page, timeout: number): Promise<void> {
  try {
    await page.waitForFunction(() => {
      const cards = Array.from(document.querySelectorAll<HTMLElement>('[data-testid="cell"]'));
      return cards.length > 0 && cards.every((c) => c.dataset.state === "done");
    }, null, { timeout, polling: 100 });
  } catch (error) {
    const states = await page.$$eval('[data-testid="cell"]', (cards) => cards.map((c) => `${(c as HTMLElement).dataset.cellId}=${(c as HTMLElement).dataset.state} "${c.querySelector('[data-testid="cell-state"]')?.textContent ?? ""}"`).join(", ")).catch(() => "?");
    throw new Error(`cells not all done within ${timeout} ms: ${states}`, { cause: error });
  }
}

/** The state line of a cell ("ready · 5.12 s"). */
export function stateLine(page: Page, cellId: string): Promise<string> {
  return page.evaluate((id) => document.querySelector(`[data-cell-id="${id}"] [data-testid="cell-state"]`)?.textContent ?? "", cellId);
}

/** Seconds in a state line such as "ready · 5.12 s" or "ready · 84 ms"; NaN when there are none. */
export function secondsInStateLine(line: string): number {
  const match = /(\d+(?:\.\d+)?)\s*(ms|s)\b/.exec(line);
  if (!match) return Number.NaN;
  return Number(match[1]) / (match[2] === "ms" ? 1000 : 1);
}

/** Types `value` into the desk entry of parameter `name` and presses Enter (one change, one undo step). */
export async function typeAtDesk(page: Page, name: string, value: number): Promise<void> {
  const entry = page.locator(`[data-testid="desk-parameter"][data-param="${name}"] .cp-param-entry`);
  await entry.fill(String(value));
  await entry.press("Enter");
}

/** Main-thread behaviour around one long solve. */
export interface LongSolveProbe {
  /** performance.now() of the Enter that started it, and of the transport card turning done. */
  readonly changeAt: number;
  readonly doneAt: number;
  /** Long tasks (> 50 ms, as Chromium reports them) overlapping [changeAt, doneAt]. */
  readonly during: readonly { readonly start: number; readonly duration: number }[];
  /**
   * Long tasks that start after the first progress report appears on the card's state
   * line and end before the last one: the solve itself, without the task that
   * handled the change nor the one that took in the result.
   */
  readonly midSolve: readonly { readonly start: number; readonly duration: number }[];
  /** performance.now() of the first and last progress text ("solving — iteration …") shown. */
  readonly firstProgressAt: number;
  readonly lastProgressAt: number;
  /** Long tasks in the 2 s after doneAt (drawing the result). */
  readonly after: readonly { readonly start: number; readonly duration: number }[];
  /** Largest lateness of a 20 ms interval timer during the solve (ms): blocking, long task or not. */
  readonly timerLateMs: number;
  /** Whether the page reports long tasks at all. */
  readonly supported: boolean;
}

/**
 * Starts a change at the desk (`start`, which presses Enter) and records the page's
 * main thread until the transport card `cellId` is done again, plus 2 s: long tasks
 * from the observer installed at load, and a 20 ms interval timer's lateness.
 */
export async function probeLongSolve(page: Page, cellId: string, start: () => Promise<void>, timeout: number): Promise<LongSolveProbe> {
  await page.evaluate((id) => {
    const w = window as unknown as { __probe: { changeAt: number; doneAt: number; late: number; sawRunning: boolean; firstProgressAt: number; lastProgressAt: number }; __probeTimer: ReturnType<typeof setInterval> };
    const probe = { changeAt: Number.NaN, doneAt: Number.NaN, late: 0, sawRunning: false, firstProgressAt: Number.NaN, lastProgressAt: Number.NaN };
    w.__probe = probe;
    document.addEventListener("keydown", (e) => {
      if (e.key === "Enter" && Number.isNaN(probe.changeAt)) probe.changeAt = performance.now();
    }, { capture: true });
    const card = () => document.querySelector<HTMLElement>(`[data-testid="cell"][data-cell-id="${id}"]`);
    new MutationObserver((_m, observer) => {
      const state = card()?.dataset.state;
      if (state === "running" || state === "waiting") probe.sawRunning = true;
      if (probe.sawRunning && state === "done" && Number.isNaN(probe.doneAt)) {
        probe.doneAt = performance.now();
        observer.disconnect();
      }
    }).observe(document.body, { subtree: true, attributes: true, attributeFilter: ["data-state"] });
    new MutationObserver((_m, observer) => {
      if (!Number.isNaN(probe.doneAt)) return observer.disconnect();
      const line = card()?.querySelector('[data-testid="cell-state"]')?.textContent ?? "";
      if (!/iteration \d+/.test(line) || Number.isNaN(probe.changeAt)) return;
      const now = performance.now();
      if (Number.isNaN(probe.firstProgressAt)) probe.firstProgressAt = now;
      probe.lastProgressAt = now;
    }).observe(document.body, { subtree: true, childList: true, characterData: true });
    let expected = performance.now() + 20;
    w.__probeTimer = setInterval(() => {
      const now = performance.now();
      if (!Number.isNaN(probe.changeAt) && Number.isNaN(probe.doneAt)) probe.late = Math.max(probe.late, now - expected);
      expected = now + 20;
    }, 20);
  }, cellId);
  await start();
  await page.waitForFunction(() => !Number.isNaN((window as unknown as { __probe: { doneAt: number } }).__probe.doneAt), null, { timeout, polling: 200 });
  await page.waitForTimeout(2000);
  return page.evaluate(() => {
    const w = window as unknown as { __probe: { changeAt: number; doneAt: number; late: number; firstProgressAt: number; lastProgressAt: number }; __probeTimer: ReturnType<typeof setInterval>; __longTasks?: { start: number; duration: number }[] };
    clearInterval(w.__probeTimer);
    const { changeAt, doneAt, late, firstProgressAt, lastProgressAt } = w.__probe;
    const tasks = w.__longTasks ?? [];
    return {
      changeAt,
      doneAt,
      firstProgressAt,
      lastProgressAt,
      during: tasks.filter((t) => t.start + t.duration >= changeAt && t.start <= doneAt),
      midSolve: tasks.filter((t) => t.start >= firstProgressAt && t.start + t.duration <= lastProgressAt),
      after: tasks.filter((t) => t.start > doneAt && t.start <= doneAt + 2000),
      timerLateMs: late,
      supported: typeof PerformanceObserver !== "undefined" && (PerformanceObserver.supportedEntryTypes ?? []).includes("longtask"),
    };
  });
}

/** Times of one desk change, from the Enter keydown (ms, page clock). */
export interface UpdateTimes {
  /** Until the transport's headline text changed. */
  readonly headline: number;
  /** Until each figure's SVG was replaced by a different one, in `figureIds` order. */
  readonly figures: readonly number[];
  /** Whether the transport says it was warm-started (the warm-start note). */
  readonly warm: boolean;
  /** Long tasks (> 50 ms) between the keydown and the last of those changes: [start after the keydown, duration] in ms. */
  readonly longTasks: readonly (readonly [number, number])[];
}

/**
 * Types `value` into parameter `name`'s desk entry and presses Enter, then measures
 * with a MutationObserver in the page until the headline of `transportId` reads
 * differently and each figure's `<svg>` (the plot, direct child of the figure) is a
 * new element with different markup. Times are performance.now() in the observer's
 * callback minus the keydown's: the DOM has changed; the frame may not be painted yet.
 */
export async function timeDeskUpdate(page: Page, name: string, value: number, transportId: string, figureIds: readonly string[], timeout: number): Promise<UpdateTimes> {
  await page.evaluate(
    ([tid, figs]) => {
      const q = (selector: string) => document.querySelector(selector);
      const headline = () => q(`[data-cell-id="${tid}"] [data-testid="headline"]`)?.textContent ?? "";
      const svgOf = (id: string) => q(`[data-cell-id="${id}"] [data-testid="figure"] > svg`);
      const before = { headline: headline(), svgs: figs.map((id) => ({ node: svgOf(id), html: svgOf(id)?.outerHTML ?? "" })) };
      const step = { t0: Number.NaN, headline: Number.NaN, figures: figs.map(() => Number.NaN), done: false };
      (window as unknown as { __step: typeof step }).__step = step;
      const check = () => {
        if (Number.isNaN(step.t0)) return;
        const now = performance.now();
        const text = headline();
        if (Number.isNaN(step.headline) && text !== "" && text !== before.headline) step.headline = now;
        figs.forEach((id, k) => {
          if (!Number.isNaN(step.figures[k])) return;
          const node = svgOf(id);
          if (node && node !== before.svgs[k].node && node.outerHTML !== before.svgs[k].html) step.figures[k] = now;
        });
        if (!Number.isNaN(step.headline) && step.figures.every((t) => !Number.isNaN(t))) {
          step.done = true;
          observer.disconnect();
        }
      };
      const observer = new MutationObserver(check);
      observer.observe(document.body, { subtree: true, childList: true, characterData: true });
      document.addEventListener("keydown", (e) => {
        if (e.key === "Enter" && Number.isNaN(step.t0)) step.t0 = performance.now();
      }, { capture: true, once: true });
    },
    [transportId, figureIds] as const,
  );
  await typeAtDesk(page, name, value);
  await page.waitForFunction(() => (window as unknown as { __step: { done: boolean } }).__step.done, null, { timeout, polling: 50 });
  const step = await page.evaluate(() => (window as unknown as { __step: { t0: number; headline: number; figures: number[] } }).__step);
  const end = Math.max(step.headline, ...step.figures);
  const tasks = await page.evaluate(
    ([from, to]) => ((window as unknown as { __longTasks?: { start: number; duration: number }[] }).__longTasks ?? []).filter((t) => t.start + t.duration >= from && t.start <= to).map((t) => [t.start - from, t.duration] as [number, number]),
    [step.t0, end] as const,
  );
  const warm = await page.evaluate((tid) => document.querySelector(`[data-cell-id="${tid}"] [data-testid="warm-note"]`) !== null, transportId);
  return { headline: step.headline - step.t0, figures: step.figures.map((t) => t - step.t0), warm, longTasks: tasks };
}
