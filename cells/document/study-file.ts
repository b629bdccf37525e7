import * as nodeFs from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { assertValidStudy, parseStudy } from "./parse-study";
import { serializeStudy } from "./serialize-study";
import type { StudyDocument } from "./study-types";

// Node-only: the browser editor imports cells/document/index.ts, which does not
// re-export this module.

/** An open file, as far as saving needs it (a subset of node:fs/promises FileHandle). */
export interface StudyFileHandle {
  writeFile(data: string | Uint8Array): Promise<void>;
  sync(): Promise<void>;
  close(): Promise<void>;
}

/**
 * The file operations loading and saving use: a subset of node:fs/promises.
 * Tests pass a wrapper that fails on purpose; everyone else uses the default.
 */
export interface StudyFileSystem {
  readFile(path: string): Promise<Uint8Array>;
  open(path: string, flags: string, mode?: number): Promise<StudyFileHandle>;
  rename(from: string, to: string): Promise<void>;
  unlink(path: string): Promise<void>;
  stat(path: string): Promise<{ mode: number }>;
  realpath(path: string): Promise<string>;
}

const defaultFs: StudyFileSystem = nodeFs as unknown as StudyFileSystem;

/** Where the previous version of a study file is kept: `<file>.previous`, beside it. */
export function backupPathFor(path: string): string {
  return `${path}.previous`;
}

/** Options of {@link saveStudyFile} and {@link loadStudyFile}. */
export interface StudyFileOptions {
  /** File operations to use. Default: node:fs/promises. */
  readonly fs?: StudyFileSystem;
  /** Keep the replaced file as `<file>.previous`. Default true. */
  readonly backup?: boolean;
}

/** What {@link saveStudyFile} did. */
export interface SaveReport {
  /** The file written (symbolic links resolved). */
  readonly path: string;
  /** False when the file already held exactly this text (nothing was touched). */
  readonly written: boolean;
  /** The backup written, or null when there was no previous file or backups are off. */
  readonly backupPath: string | null;
}

function hasCode(error: unknown, ...codes: string[]): boolean {
  return typeof error === "object" && error !== null && codes.includes((error as { code?: string }).code ?? "");
}

function sameBytes(a: Uint8Array, b: Uint8Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * Writes `data` to `target` atomically: a new temporary file in the same folder
 * (so the rename stays on one file system), flushed to disk, then renamed over
 * the target. POSIX rename() replaces the target in one step (POSIX.1-2017,
 * rename): a reader sees the old file or the new one, never a mixture. On any
 * failure the temporary file is removed and the target is untouched.
 */
async function writeAtomic(fs: StudyFileSystem, target: string, data: Uint8Array, mode: number): Promise<void> {
  const dir = dirname(target);
  let temp = "";
  let handle: StudyFileHandle | undefined;
  // Exclusive create ("wx") with a counter gives a fresh name without randomness.
  for (let attempt = 0; handle === undefined; attempt++) {
    temp = join(dir, `.${basename(target)}.saving-${process.pid}-${attempt}`);
    try {
      handle = await fs.open(temp, "wx", mode);
    } catch (error) {
      if (!hasCode(error, "EEXIST") || attempt >= 99) throw error;
    }
  }
  try {
    try {
      await handle.writeFile(data);
      await handle.sync();
    } finally {
      await handle.close();
    }
    await fs.rename(temp, target);
  } catch (error) {
    await fs.unlink(temp).catch(() => undefined);
    throw error;
  }
}

/** Flushes a folder's entries (the rename) to disk where the system allows it. */
async function syncFolder(fs: StudyFileSystem, dir: string): Promise<void> {
  try {
    const handle = await fs.open(dir, "r");
    try {
      await handle.sync();
    } finally {
      await handle.close();
    }
  } catch {
    // Some systems cannot open or fsync a folder; the file itself is already on disk.
  }
}

/**
 * Saves a study to `path` in its canonical text (see serializeStudy), safely:
 * 1. validates the study (a StudyFormatError leaves everything untouched);
 * 2. if the file already holds exactly this text, does nothing;
 * 3. otherwise writes the previous file's bytes to `<path>.previous` and then
 *    the new text to `path`, each through a temporary file in the same folder,
 *    fsync and rename, so a failed write (full disk, no permission, crash)
 *    never leaves a half-written study or backup behind.
 * File permissions of an existing file are kept; a symbolic link is followed
 * (its target is replaced, the link stays). Errors of the file system are
 * thrown as they come (they carry `code` and `path`).
 */
export async function saveStudyFile(path: string, study: StudyDocument, options: StudyFileOptions = {}): Promise<SaveReport> {
  const { fs = defaultFs, backup = true } = options;
  assertValidStudy(study, { path });
  const data = new TextEncoder().encode(serializeStudy(study));
  let target = resolve(path);
  try {
    target = await fs.realpath(target);
  } catch (error) {
    if (!hasCode(error, "ENOENT")) throw error;
  }
  let previous: Uint8Array | null = null;
  let mode = 0o644;
  try {
    previous = await fs.readFile(target);
    mode = (await fs.stat(target)).mode & 0o777;
  } catch (error) {
    if (!hasCode(error, "ENOENT")) throw error;
  }
  if (previous !== null && sameBytes(previous, data)) return { path: target, written: false, backupPath: null };
  let backupPath: string | null = null;
  if (backup && previous !== null) {
    backupPath = backupPathFor(target);
    await writeAtomic(fs, backupPath, previous, mode);
  }
  await writeAtomic(fs, target, data, mode);
  await syncFolder(fs, dirname(target));
  return { path: target, written: true, backupPath };
}

/**
 * Reads and parses a study file (see parseStudy): a StudyFormatError names
 * the file and every problem; a missing or unreadable file throws the file
 * system's error.
 */
export async function loadStudyFile(path: string, options: Pick<StudyFileOptions, "fs"> = {}): Promise<StudyDocument> {
  const { fs = defaultFs } = options;
  const bytes = await fs.readFile(path);
  return parseStudy(new TextDecoder().decode(bytes), { path });
}
