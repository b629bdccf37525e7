// Opens the built editor in headless Chromium against the real server and takes
// the screenshots in docs/screenshots/, walking through what a user does: tuning
// at the desk, editing settings, inserting a cell, trusting code, a conflict with
// the disk, a server that went away, the keyboard help, a narrow window. Also
// checks the report and CSV downloads. Usage (after `node build.mjs`):
//   node cells/editor/dev/screenshots.mjs
// Not a test suite (browser tests live in test/); a way to look at the editor.
import { chromium } from "playwright-core";
import { cp, mkdir, mkdtemp, readFile, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { startDevServer } from "./dev-server.mjs";

const repo = resolve(fileURLToPath(new URL("../../..", import.meta.url)));
const shots = join(repo, "docs/screenshots");
await mkdir(shots, { recursive: true });

const root = await mkdtemp(join(tmpdir(), "couplet-shots-"));
// Never touch the user's own trust list.
process.env.COUPLET_TRUST_FILE = `${root}-trusted-studies.json`;
await cp(join(repo, "docs/examples"), root, { recursive: true });
await cp(join(repo, "cells/editor/dev/pier-demo.couplet.json"), join(root, "pier-demo.couplet.json"));

const browser = await chromium.launch({
  executablePath: "/usr/bin/chromium",
  args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"],
});
const problems = [];
let lastPort = 0;
const log = (...args) => console.log(...args);

async function open(study, viewport = { width: 1440, height: 960 }) {
  const server = await startDevServer(root, study);
  lastPort = server.port;
  const context = await browser.newContext({ viewport, acceptDownloads: true, deviceScaleFactor: 1 });
  const page = await context.newPage();
  page.on("pageerror", (e) => problems.push(`${study}: page error: ${e.message}`));
  page.on("console", (m) => {
    if (m.type() === "error" && !/Failed to load resource/.test(m.text())) problems.push(`${study}: console: ${m.text()}`);
  });
  await page.goto(server.url);
  await page.waitForSelector('[data-testid="cell"]');
  return { server, context, page };
}

const settled = (page, timeout = 90_000) =>
  page.waitForFunction(() => [...document.querySelectorAll('[data-testid="cell-state"]')].every((n) => !/^(queued|solving|sweeping|drawing|preparing|running|writing|working|gathering|reading)/.test(n.textContent ?? "")), null, { timeout });

const shot = async (page, name) => {
  await page.screenshot({ path: join(shots, name) });
  log("wrote", name);
};

const cell = (page, id) => page.locator(`[data-cell-id="${id}"]`).first();

// 1. A study with file data, opened and run: the column and the desk.
{
  const { server, context, page } = await open("depots-and-shops.couplet.json");
  await settled(page);
  await shot(page, "01-study-and-desk.png");
  // The report, as the page writes it.
  const [download] = await Promise.all([page.waitForEvent("download"), page.click('[data-testid="export-report"]')]);
  const html = await readFile(await download.path(), "utf8");
  if (!html.includes("Island depots and shops") || /<script/i.test(html)) problems.push("report: title missing or a script inside");
  log("report", download.suggestedFilename(), `${html.length} characters`);
  await context.close();
  await server.close();
}

// 2. Tuning: a small epsilon at the desk; the cells re-run in a worker and say how far they are.
{
  const { server, context, page } = await open("pier-demo.couplet.json");
  await settled(page);
  await shot(page, "02-held-code-and-desk.png");
  const entry = page.locator('[data-param="eps"] .cp-param-entry');
  await entry.fill("0.0015");
  await entry.press("Enter");
  await page.waitForFunction(() => [...document.querySelectorAll('[data-testid="cell-state"]')].some((n) => /iteration \d+/.test(n.textContent ?? "")), null, { timeout: 20_000 });
  await cell(page, "gap").scrollIntoViewIfNeeded();
  await page.evaluate(() => window.scrollBy(0, -120));
  await page.waitForTimeout(250);
  await shot(page, "03-solving-live.png");
  // The page stays responsive during the solve: a click on undo is handled at once.
  const undoMs = await page.evaluate(() => {
    const t0 = performance.now();
    document.querySelector('[data-testid="undo"]').click();
    return performance.now() - t0;
  });
  await page.waitForFunction(() => (document.querySelector('[data-param="eps"] .cp-param-entry')?.value ?? "") === "0.05");
  log(`undo during a solve: handled in ${undoMs.toFixed(0)} ms on the page's thread`);
  await settled(page);

  // 3. Transport settings in a form.
  await cell(page, "flex").locator('[data-testid="cell-settings-toggle"]').click();
  await cell(page, "flex").scrollIntoViewIfNeeded();
  await page.evaluate(() => window.scrollBy(0, -70));
  await shot(page, "04-transport-settings.png");
  // A refused value is shown beside its field, and the study keeps the old one.
  const tolerance = cell(page, "flex").locator('[data-field="tolerance"] input').first();
  await tolerance.fill("-1");
  await tolerance.press("Enter");
  await page.waitForSelector('[data-cell-id="flex"] [data-field="tolerance"] .cp-field-problem:not([hidden])');
  await shot(page, "05-refused-value.png");
  await tolerance.fill("");
  await tolerance.press("Enter");

  // 4. Data settings.
  await cell(page, "stalls").locator('[data-testid="cell-settings-toggle"]').click();
  await cell(page, "stalls").scrollIntoViewIfNeeded();
  await page.evaluate(() => window.scrollBy(0, -70));
  await shot(page, "06-data-settings.png");

  // 5. A failed cell (sorting is for one coordinate; these points have two), and its dependents untouched.
  await cell(page, "sorted").scrollIntoViewIfNeeded();
  await page.evaluate(() => window.scrollBy(0, -200));
  await shot(page, "07-failed-cell.png");

  // 6. Trusting the study runs its code.
  await page.evaluate(() => window.scrollTo(0, 0));
  await page.click('[data-testid="run-code-once"]');
  await settled(page);
  const haul = await cell(page, "haul").locator('[data-testid="headline"]').textContent();
  log("code cell after trust:", haul);
  if (!haul || !/\d/.test(haul)) problems.push(`code cell did not run after trust: ${haul}`);

  // 7. Inserting a cell with the keyboard: focus a cell, Alt+N, pick a kind.
  await cell(page, "gap").focus();
  await page.keyboard.press("Alt+KeyN");
  await page.waitForSelector('[data-testid="insert-menu"]');
  await shot(page, "08-insert-menu.png");
  await page.keyboard.press("ArrowDown");
  await page.keyboard.press("ArrowDown");
  await page.keyboard.press("Enter");
  await page.waitForTimeout(300);
  const kinds = await page.$$eval('[data-testid="cell"]', (n) => n.map((x) => x.dataset.kind));
  log("kinds after insert:", kinds.join(","));

  // 8. The sweep table with its downloads.
  await cell(page, "sw").scrollIntoViewIfNeeded();
  const [csv] = await Promise.all([page.waitForEvent("download"), cell(page, "sw").locator('[data-testid="download-csv"]').click()]);
  const csvText = await readFile(await csv.path(), "utf8");
  log("csv", csv.suggestedFilename(), csvText.split("\r\n")[0]);
  if (!csvText.startsWith("epsilon,replicate,divergence")) problems.push(`sweep CSV header: ${csvText.split("\r\n")[0]}`);

  // 9. Keyboard help.
  await page.keyboard.press("Control+/");
  await page.waitForSelector('[data-testid="keys-dialog"]');
  await shot(page, "09-keyboard.png");
  await page.keyboard.press("Escape");
  await context.close();
  await server.close();
}

// 10. The file changed on disk while the page had it open.
{
  const { server, context, page } = await open("epsilon-tuning.couplet.json");
  await settled(page);
  const file = join(root, "epsilon-tuning.couplet.json");
  const disk = JSON.parse(await readFile(file, "utf8"));
  disk.title = "Tuning epsilon (edited in another window)";
  await writeFile(file, `${JSON.stringify(disk, null, 2)}\n`);
  await page.fill('[data-testid="study-title"]', "Tuning epsilon, my version");
  await page.press('[data-testid="study-title"]', "Enter");
  await page.click('[data-testid="save"]');
  await page.waitForSelector('[data-testid="notice-conflict"]');
  await page.evaluate(() => window.scrollTo(0, 0));
  await shot(page, "10-conflict.png");
  await page.click('[data-testid="conflict-keep-both"]');
  await page.waitForSelector('[data-testid="notice-kept-both"]');
  log("after keep both:", await page.textContent('[data-testid="study-path"]'));

  // 11. The server went away: the edit is kept in the browser, with a way to retry.
  await server.close();
  await page.fill('[data-testid="study-title"]', "Tuning epsilon, offline edit");
  await page.press('[data-testid="study-title"]', "Enter");
  await page.click('[data-testid="save"]');
  await page.waitForSelector('[data-testid="notice-unwritten"]');
  const kept = await page.evaluate(() => Object.keys(localStorage).filter((k) => k.startsWith("couplet.draft:")));
  log("drafts kept:", kept.join(", "));
  if (kept.length === 0) problems.push("no draft kept in localStorage when the server was gone");
  await shot(page, "11-server-gone.png");
  // Back again on the same address (browser storage belongs to one origin, port included):
  // the page offers the draft this browser kept.
  const again = await startDevServer(root, "epsilon-tuning (draft 2).couplet.json", lastPort);
  await page.goto(again.url);
  await page.waitForSelector('[data-testid="notice-draft"]');
  await shot(page, "13-draft-offered.png");
  await page.click('[data-testid="restore-draft"]');
  await page.waitForFunction(() => document.querySelector('[data-testid="study-title"]')?.value === "Tuning epsilon, offline edit");
  await page.click('[data-testid="save"]');
  await page.waitForFunction(() => /saved/.test(document.querySelector('[data-testid="save-status"]')?.textContent ?? ""));
  const restored = JSON.parse(await readFile(join(root, "epsilon-tuning (draft 2).couplet.json"), "utf8"));
  log("title on disk after restoring the draft:", restored.title);
  if (restored.title !== "Tuning epsilon, offline edit") problems.push(`restored draft not saved: ${restored.title}`);
  await context.close();
  await again.close();
}

// 13. A folder: its studies, and a new one from the starter study.
{
  const server = await startDevServer(root);
  const context = await browser.newContext({ viewport: { width: 1100, height: 760 } });
  const page = await context.newPage();
  page.on("pageerror", (e) => problems.push(`folder page error: ${e.message}`));
  await page.goto(server.url);
  await page.waitForSelector('[data-testid="study-list"] li');
  await page.fill("#cp-new-name", "harbour-notes");
  await shot(page, "14-folder.png");
  await page.click("text=Create");
  await page.waitForSelector('[data-testid="cell"]');
  log("new study opened:", await page.textContent('[data-testid="study-path"]'));
  await context.close();
  await server.close();
}

// 12. A narrow window: the desk goes under the column.
{
  const { server, context, page } = await open("sensor-survey-shift.couplet.json", { width: 760, height: 1000 });
  await settled(page);
  await shot(page, "12-narrow.png");
  await context.close();
  await server.close();
}

await browser.close();
if (problems.length > 0) {
  console.log(`\n${problems.length} problem(s):\n${problems.join("\n")}`);
  process.exitCode = 1;
} else console.log("\nno problems seen");
