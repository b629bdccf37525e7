import { lstat, realpath } from "node:fs/promises";
import { basename, dirname, join, sep } from "node:path";
import { HttpError } from "./http-error";
import { SERVER_LIMITS } from "./server-limits";

/**
 * Splits a path a request names into its folder and file names, refusing any that
 * could point anywhere but below the opened folder. Paths are relative to the root,
 * folders separated by "/", as a study writes data paths (docs/format.md).
 *
 * Refused with 403 `path-outside-root`: absolute paths (`/x`, `C:x`, `//host`) and
 * any `..` segment. Refused with 400 `bad-path`: empty text, text longer than
 * SERVER_LIMITS.pathLength, a backslash, NUL or other control characters, and empty
 * or `.` segments (`a//b`, `./a`, `a/`), so every accepted path has one spelling.
 * Percent-decoding is the caller's job and happens once, before this check: `%2e%2e`
 * arrives here as `..` and is refused.
 *
 * @param field the query or body field, named in the error message.
 */
export function pathSegments(text: unknown, field = "path"): string[] {
  if (typeof text !== "string" || text.length === 0) throw new HttpError(400, "bad-path", `${field}: give a path relative to the opened folder`);
  if (text.length > SERVER_LIMITS.pathLength) throw new HttpError(400, "bad-path", `${field}: longer than ${SERVER_LIMITS.pathLength} characters`);
  if (/[\u0000-\u001f\u007f]/.test(text)) throw new HttpError(400, "bad-path", `${field}: contains a control character (NUL, newline, …)`);
  if (text.includes("\\")) throw new HttpError(400, "bad-path", `${field}: use "/" between folders, not "\\"`);
  if (text.startsWith("/") || /^[A-Za-z]:/.test(text)) throw new HttpError(403, "path-outside-root", `${field}: must be relative to the opened folder, got an absolute path`);
  const segments = text.split("/");
  for (const segment of segments) {
    if (segment === "..") throw new HttpError(403, "path-outside-root", `${field}: ".." would leave the opened folder`);
    if (segment === "" || segment === ".") throw new HttpError(400, "bad-path", `${field}: empty or "." folder name in ${JSON.stringify(text)}`);
  }
  return segments;
}

/** True when the real path `path` is `root` or below it (both real, absolute paths). */
export function isInsideRoot(root: string, path: string): boolean {
  return path === root || path.startsWith(root.endsWith(sep) ? root : root + sep);
}

function hasCode(error: unknown, code: string): boolean {
  return typeof error === "object" && error !== null && (error as { code?: unknown }).code === code;
}

/** Where a relative path lands: its real absolute path, and whether something is there. */
export interface ResolvedPath {
  /** Absolute path with every symbolic link resolved (for a new file: its real folder joined with its name). */
  readonly absolute: string;
  /** False when nothing exists at the path yet (only when `allowMissing`). */
  readonly exists: boolean;
}

/**
 * Resolves a request's relative path inside `root` and proves it stays there:
 * after the checks of {@link pathSegments}, the target's real path (every symbolic
 * link followed, by realpath) must be `root` or below it, so a link that points out
 * of the folder is refused with 403 `path-outside-root` while a link between two
 * places inside it works. A path that does not exist is a 404 `not-found`, unless
 * `allowMissing`: then its folder must exist and be inside, and the name must not
 * be a dangling link (which a write would follow to who knows where).
 *
 * The check and the later open are two steps: someone who can change the folder
 * between them could swap in a link. That needs write access to the folder, which
 * already means control of it; the server defends against requests, not local users.
 *
 * @param root the opened folder, already a real path (realpath).
 */
export async function resolveInRoot(root: string, text: unknown, options: { field?: string; allowMissing?: boolean } = {}): Promise<ResolvedPath> {
  const { field = "path", allowMissing = false } = options;
  const lexical = join(root, ...pathSegments(text, field));
  let real: string;
  try {
    real = await realpath(lexical);
  } catch (error) {
    if (!hasCode(error, "ENOENT") && !hasCode(error, "ENOTDIR")) throw error;
    if (!allowMissing) throw new HttpError(404, "not-found", `${field}: ${JSON.stringify(text)} does not exist in the opened folder`);
    let folder: string;
    try {
      folder = await realpath(dirname(lexical));
    } catch {
      throw new HttpError(404, "not-found", `${field}: the folder of ${JSON.stringify(text)} does not exist in the opened folder`);
    }
    if (!isInsideRoot(root, folder)) throw new HttpError(403, "path-outside-root", `${field}: its folder is a link that leads out of the opened folder`);
    const named = await lstat(lexical).catch(() => null);
    if (named !== null) throw new HttpError(403, "path-outside-root", `${field}: a symbolic link to a missing target`);
    return { absolute: join(folder, basename(lexical)), exists: false };
  }
  if (!isInsideRoot(root, real)) throw new HttpError(403, "path-outside-root", `${field}: a symbolic link that leads out of the opened folder`);
  return { absolute: real, exists: true };
}

/** The path of `absolute` relative to `root`, with "/" between folders (both real paths; `absolute` inside `root`). */
export function relativeToRoot(root: string, absolute: string): string {
  if (absolute === root) return "";
  return absolute.slice(root.length + (root.endsWith(sep) ? 0 : 1)).split(sep).join("/");
}
