import { existsSync } from "node:fs";
import { open, realpath } from "node:fs/promises";
import type { ServerResponse } from "node:http";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { assetContentType } from "./content-types";
import { HttpError } from "./http-error";
import { plainPage } from "./plain-page";
import { resolveInRoot } from "./root-path";
import { securityHeaders } from "./security-headers";

/**
 * Where the bundled editor is: `dist/editor/` of the Couplet package, found by
 * walking up from this module to the folder holding package.json. That works from
 * the source (cells/server/) and from the CLI bundle (dist/couplet-cli.mjs).
 */
export function defaultEditorDir(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let up = 0; up < 6; up++) {
    if (existsSync(join(dir, "package.json"))) return join(dir, "dist", "editor");
    const parent = dirname(dir);
    if (parent === dir) break;
    dir = parent;
  }
  return join(process.cwd(), "dist", "editor");
}

/** The page shown when dist/editor/index.html does not exist. */
export const MISSING_BUILD_PAGE = plainPage("Couplet: the editor is not built yet", [
  "The server is running, but the bundled editor (dist/editor/index.html) is missing.",
  "Run `npm run build` in the Couplet folder, then reload this page.",
]);

/**
 * The path of an editor file named by a URL path: "/" is `index.html`; otherwise
 * each segment is percent-decoded once and must not decode to a "/" (`%2f`), then
 * the whole is checked like any relative path (no `..`, backslash, NUL, …).
 */
export function assetPath(urlPath: string): string {
  if (urlPath === "/") return "index.html";
  const segments = urlPath.slice(1).split("/").map((segment) => {
    let decoded: string;
    try {
      decoded = decodeURIComponent(segment);
    } catch {
      throw new HttpError(400, "bad-path", "the address holds a malformed %-escape");
    }
    if (decoded.includes("/")) throw new HttpError(400, "bad-path", 'the address holds an encoded "/" (%2f) inside a name');
    return decoded;
  });
  return segments.join("/");
}

/**
 * Sends one file of the bundled editor with the editor's security headers (and
 * `extraHeaders`, e.g. the token cookie). Files are confined to `editorDir` as
 * study files are to the root (resolveInRoot). A missing editor build answers 503
 * with {@link MISSING_BUILD_PAGE} for the page itself and 404 for anything else.
 */
export async function sendEditorFile(res: ServerResponse, editorDir: string, urlPath: string, extraHeaders: Record<string, string> = {}): Promise<void> {
  const relative = assetPath(urlPath);
  let root: string;
  try {
    root = await realpath(editorDir);
  } catch {
    if (relative !== "index.html") throw new HttpError(404, "not-found", "the editor is not built yet: run `npm run build`");
    res.writeHead(503, { ...securityHeaders("locked"), ...extraHeaders, "Content-Type": "text/html; charset=utf-8" });
    res.end(MISSING_BUILD_PAGE);
    return;
  }
  let target: string;
  try {
    target = (await resolveInRoot(root, relative)).absolute;
  } catch (error) {
    if (relative === "index.html" && error instanceof HttpError && error.status === 404) {
      res.writeHead(503, { ...securityHeaders("locked"), ...extraHeaders, "Content-Type": "text/html; charset=utf-8" });
      res.end(MISSING_BUILD_PAGE);
      return;
    }
    throw error;
  }
  const handle = await open(target, "r");
  try {
    const info = await handle.stat();
    if (!info.isFile()) throw new HttpError(404, "not-found", `no editor file ${JSON.stringify(relative)}`);
    const bytes = await handle.readFile();
    res.writeHead(200, { ...securityHeaders("editor"), ...extraHeaders, "Content-Type": assetContentType(relative), "Content-Length": String(bytes.length) });
    res.end(bytes);
  } finally {
    await handle.close();
  }
}
