import { createHash } from "node:crypto";

/**
 * Names one on-disk version of a file: `<sha256 of the bytes, hex>:<mtime in ms>`.
 * The page sends it back with a save, so the server can tell whether the file was
 * changed by something else in between. The hash decides (see
 * {@link sameContent}); the time is there so a person reading the string can tell
 * two versions apart at a glance.
 */
export function studyRevision(bytes: Uint8Array, mtimeMs: number): string {
  return `${createHash("sha256").update(bytes).digest("hex")}:${mtimeMs}`;
}

/**
 * True when two revisions name the same bytes. A file touched or rewritten with
 * identical content is not a conflict; only different bytes are.
 */
export function sameContent(a: string, b: string): boolean {
  const hashOf = (revision: string) => revision.split(":", 1)[0];
  return hashOf(a).length === 64 && hashOf(a) === hashOf(b);
}
