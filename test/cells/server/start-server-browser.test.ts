import { existsSync, mkdirSync, mkdtempSync, readFileSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { type Browser, chromium } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type RunningServer, startServer } from "../../../cells/server/start-server";

// Checks the safeguards where they matter: in a real browser (headless Chromium, when installed).
// Behaviours relied on: SameSite cookies are sent on same-site requests and ports do not
// separate sites (RFC 6265bis, "same-site"; RFC 6265 section 8.5); a cross-origin fetch
// without CORS headers is unreadable (WHATWG Fetch, CORS check); CSP connect-src blocks
// fetch to other origins and 'unsafe-eval' allows new Function (W3C CSP Level 3).
const CHROMIUM = "/usr/bin/chromium";
const depotText = readFileSync(new URL("../../fixtures/studies/depot-supply.couplet.json", import.meta.url), "utf8");

let dir: string;
let server: RunningServer;
let browser: Browser;
let stranger: ReturnType<typeof createServer>;
let strangerPort = 0;

describe.skipIf(!existsSync(CHROMIUM))("startServer in a browser", () => {
  beforeAll(async () => {
    dir = realpathSync(mkdtempSync(join(tmpdir(), "couplet-browser-")));
    mkdirSync(join(dir, "editor"));
    writeFileSync(join(dir, "depots.couplet.json"), depotText);
    writeFileSync(join(dir, "editor", "index.html"), '<!doctype html><meta charset="utf-8"><title>editor</title><script type="module" src="app.js"></script>');
    writeFileSync(join(dir, "editor", "app.js"), "window.appLoaded = true;\n");
    server = await startServer({ root: dir, study: "depots.couplet.json", editorDir: join(dir, "editor") });
    // Another local web page, on another port of 127.0.0.1: the "same site" as the editor for cookies.
    stranger = createServer((_req, res) => {
      res.writeHead(200, { "Content-Type": "text/html" });
      res.end("<!doctype html><title>stranger</title>");
    });
    await new Promise<void>((resolve) => stranger.listen(0, "127.0.0.1", resolve));
    strangerPort = (stranger.address() as AddressInfo).port;
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"],
    });
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    await new Promise((resolve) => stranger?.close(resolve));
    rmSync(dir, { recursive: true, force: true });
  });

  it("the printed link loads the editor, whose scripts and API calls then work through the cookie", async () => {
    const page = await browser.newPage();
    try {
      await page.goto(server.url);
      await page.waitForFunction(() => (window as unknown as { appLoaded?: boolean }).appLoaded === true);
      const result = await page.evaluate(async () => {
        const session = await fetch("/api/session");
        const trust = await fetch("/api/trust", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ path: "depots.couplet.json" }) });
        return { session: session.status, studyPath: (await session.json()).studyPath, trust: trust.status, cookieVisible: document.cookie };
      });
      expect(result).toEqual({ session: 200, studyPath: "depots.couplet.json", trust: 200, cookieVisible: "" });
    } finally {
      await page.close();
    }
  });

  it("the editor page may compile code with new Function but cannot connect to another origin (CSP)", async () => {
    const page = await browser.newPage();
    try {
      await page.goto(server.url);
      const result = await page.evaluate(async (port) => {
        const compiled = new Function("a", "b", "return a + b")(2, 3);
        let leaked = "sent";
        try {
          await fetch(`http://127.0.0.1:${port}/`, { mode: "no-cors" });
        } catch {
          leaked = "blocked";
        }
        return { compiled, leaked };
      }, strangerPort);
      expect(result).toEqual({ compiled: 5, leaked: "blocked" });
    } finally {
      await page.close();
    }
  });

  it("a page on another local port cannot read the API nor write through it, even with the cookie set", async () => {
    const page = await browser.newPage();
    try {
      await page.goto(server.url); // the browser now holds the cookie
      await page.goto(`http://127.0.0.1:${strangerPort}/`);
      const result = await page.evaluate(async (port) => {
        const base = `http://127.0.0.1:${port}`;
        let read = "readable";
        try {
          await (await fetch(`${base}/api/study?path=depots.couplet.json`, { credentials: "include" })).text();
        } catch {
          read = "blocked";
        }
        // A no-cors write: the browser sends it (cookie and Origin included) but hides the
        // answer; Cross-Origin-Resource-Policy even turns the hidden answer into a network error.
        let write = "sent";
        try {
          await fetch(`${base}/api/new`, { method: "POST", mode: "no-cors", credentials: "include", headers: { "content-type": "text/plain" }, body: JSON.stringify({ path: "planted.couplet.json" }) });
        } catch {
          write = "answer hidden";
        }
        return { read, write };
      }, server.port);
      expect(result).toEqual({ read: "blocked", write: "answer hidden" });
      expect(existsSync(join(dir, "planted.couplet.json"))).toBe(false);
    } finally {
      await page.close();
    }
  });
});
