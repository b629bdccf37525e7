// The server's refusals seen from the editor page itself (same origin, cookie
// set): paths that leave the folder, and requests without the session token.
// Expected answers: docs/server.md ("The token and the cookie", "Paths", the
// table of codes). `credentials: "omit"` is the Fetch standard's way to send a
// request without cookies (WHATWG Fetch, "credentials mode").
import { randomBytes } from "node:crypto";
import { readFile, rm, writeFile } from "node:fs/promises";
import { basename, dirname, join } from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { browserSuiteName, hasChromium, launchChromium } from "./helpers/chromium";
import { type ScratchServer, serveExamples } from "./helpers/scratch-server";
import { type StudyPage, VIEWPORT, openStudyPage } from "./helpers/study-page";

const STUDY = "depots-and-shops.couplet.json";
/** A secret in a study file next to the served folder, never inside it. */
const SECRET = `outside-${randomBytes(8).toString("hex")}`;

let browser: Browser;
let scratch: ScratchServer;
let view: StudyPage | undefined;
let outside: string;

/** One fetch made by the page: status, the answer's `code`, and whether the secret leaked. */
interface Answer {
  readonly status: number;
  readonly code: string | undefined;
  readonly leaked: boolean;
}

describe.skipIf(!hasChromium)(browserSuiteName("refused requests from the editor page"), () => {
  beforeAll(async () => {
    browser = await launchChromium();
    scratch = await serveExamples({ study: STUDY });
    outside = join(dirname(scratch.root), `${basename(scratch.root)}-outside.couplet.json`);
    const text = await readFile(scratch.file(STUDY), "utf8");
    await writeFile(outside, text.replace(/"title": "[^"]*"/, `"title": "${SECRET}"`));
    view = await openStudyPage(browser, scratch.url);
  });

  afterAll(async () => {
    await view?.close();
    await browser?.close();
    await scratch?.close();
    if (outside) await rm(outside, { force: true });
  });

  it(
    "fetch from the page of a path outside the folder is refused with 403 path-outside-root, even when the file exists",
    async () => {
      const { page, problems } = view!;
      const name = basename(outside);
      const answers = await page.evaluate(
        async ({ name, absolute, secret, study }) => {
          const ask = async (url: string): Promise<Answer> => {
            const response = await fetch(url);
            const text = await response.text();
            let code: string | undefined;
            try {
              code = (JSON.parse(text) as { code?: string }).code;
            } catch {
              code = undefined;
            }
            return { status: response.status, code, leaked: text.includes(secret) };
          };
          return {
            // The control: the same page and cookie may read the study it opened.
            inside: await ask(`/api/study?path=${encodeURIComponent(study)}`),
            existing: await ask(`/api/study?path=../${encodeURIComponent(name)}`),
            encoded: await ask(`/api/study?path=%2e%2e/${encodeURIComponent(name)}`),
            absolute: await ask(`/api/study?path=${encodeURIComponent(absolute)}`),
            data: await ask(`/api/data?path=../${encodeURIComponent(name)}`),
          };
        },
        { name, absolute: outside, secret: SECRET, study: STUDY },
      );
      const refused = { status: 403, code: "path-outside-root", leaked: false };
      expect(answers).toEqual({ inside: { status: 200, code: undefined, leaked: false }, existing: refused, encoded: refused, absolute: refused, data: refused });
      expect(problems).toEqual([]);
    },
    30_000,
  );

  // Confinement is checked before the file's name (docs/server.md, "Paths").
  it(
    "fetch('/api/study?path=../x') from the page, a path outside the folder of any name, is refused with 403 path-outside-root",
    async () => {
      const { page } = view!;
      const answers = await page.evaluate(async () => {
        const ask = async (url: string) => {
          const response = await fetch(url);
          return { status: response.status, code: ((await response.json()) as { code?: string }).code };
        };
        return { study: await ask("/api/study?path=../x"), data: await ask("/api/data?path=../x"), absolute: await ask("/api/study?path=%2Fetc%2Fpasswd") };
      });
      const refused = { status: 403, code: "path-outside-root" };
      expect(answers).toEqual({ study: refused, data: refused, absolute: refused });
    },
    30_000,
  );

  it(
    "fetch from the page without the token (no cookie, no header) or with a wrong one is refused with 403, and writes nothing",
    async () => {
      const { page, problems } = view!;
      const before = await readFile(scratch.file(STUDY), "utf8");
      const answers = await page.evaluate(async (study) => {
        const ask = async (init: RequestInit, method = "GET"): Promise<{ status: number; code: string | undefined }> => {
          const response = await fetch(`/api/study?path=${encodeURIComponent(study)}`, { method, ...init });
          const body = (await response.json()) as { code?: string };
          return { status: response.status, code: body.code };
        };
        const put = { headers: { "content-type": "application/json" }, body: JSON.stringify({ text: "{}", baseRevision: null }) };
        return {
          noCookie: await ask({ credentials: "omit" }),
          wrongHeader: await ask({ credentials: "omit", headers: { "x-couplet-token": "not-the-token" } }),
          // A non-empty header decides on its own: a wrong one is refused even with the good cookie.
          wrongHeaderWithCookie: await ask({ headers: { "x-couplet-token": "not-the-token" } }),
          writeNoCookie: await ask({ credentials: "omit", ...put }, "PUT"),
          session: (await fetch("/api/session", { credentials: "omit" })).status,
        };
      }, STUDY);
      expect(answers).toEqual({
        noCookie: { status: 403, code: "token-missing" },
        wrongHeader: { status: 403, code: "token-wrong" },
        wrongHeaderWithCookie: { status: 403, code: "token-wrong" },
        writeNoCookie: { status: 403, code: "token-missing" },
        session: 403,
      });
      expect(await readFile(scratch.file(STUDY), "utf8")).toBe(before);
      expect(problems).toEqual([]);
    },
    30_000,
  );

  it(
    "opening the editor's address without the token, in a browser that has no cookie, answers 403 and shows no study",
    async () => {
      const context = await browser.newContext({ viewport: VIEWPORT });
      try {
        const page = await context.newPage();
        const bare = await page.goto(`http://127.0.0.1:${scratch.server.port}/`);
        expect(bare?.status()).toBe(403);
        expect(await page.locator('[data-testid="cell"]').count()).toBe(0);
        // The refusal says what to do: open the printed link, which carries the token.
        expect(await page.textContent("body")).toMatch(/no session token: open the link that .?couplet open.? printed/);
        const wrong = await page.goto(`http://127.0.0.1:${scratch.server.port}/?token=${randomBytes(32).toString("base64url")}`);
        expect(wrong?.status()).toBe(403);
        expect(await page.locator('[data-testid="cell"]').count()).toBe(0);
      } finally {
        await context.close();
      }
    },
    30_000,
  );
});
