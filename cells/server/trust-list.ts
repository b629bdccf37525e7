import { createHash } from "node:crypto";
import { mkdir, readFile } from "node:fs/promises";
import { homedir } from "node:os";
import { dirname, join, relative, sep } from "node:path";
import { HttpError } from "./http-error";
import { writeFileAtomic } from "./write-file-atomic";

const TRUST_FORMAT = "couplet-trust";
const TRUST_NOTE = "Studies whose code cells Couplet may run without asking first: a study is trusted only while its bytes have the recorded SHA-256.";

/**
 * Where the trust list lives: `$COUPLET_TRUST_FILE`, else
 * `$XDG_CONFIG_HOME/couplet/trusted-studies.json` (default `~/.config/...`).
 * Per user and outside every opened folder, so a folder from someone else cannot
 * bring a list that trusts its own studies.
 */
export function trustFilePath(): string {
  if (process.env.COUPLET_TRUST_FILE) return process.env.COUPLET_TRUST_FILE;
  const config = process.env.XDG_CONFIG_HOME || join(homedir(), ".config");
  return join(config, "couplet", "trusted-studies.json");
}

/** One trusted study: its real absolute path and the SHA-256 (hex) of the bytes the user trusted. */
interface TrustEntry {
  readonly path: string;
  readonly sha256: string;
}

/** Studies under a root that are trusted now (their bytes still match), as paths relative to the root. */
export interface TrustList {
  readonly studies: ReadonlySet<string>;
  /** Why the trust file could not be used (then `studies` is empty), or undefined. */
  readonly problem?: string;
}

async function readEntries(): Promise<{ entries: TrustEntry[]; problem?: string }> {
  const file = trustFilePath();
  let text: string;
  try {
    text = await readFile(file, "utf8");
  } catch (error) {
    if ((error as { code?: string }).code === "ENOENT") return { entries: [] };
    throw error;
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return { entries: [], problem: `${file} is not JSON` };
  }
  const studies = (value as { studies?: unknown } | null)?.studies;
  const valid = Array.isArray(studies) && studies.every((s) => s && typeof s.path === "string" && typeof s.sha256 === "string");
  if ((value as { format?: unknown } | null)?.format !== TRUST_FORMAT || !valid) {
    return { entries: [], problem: `${file} is not a trust list ({"format": "${TRUST_FORMAT}", "studies": [{path, sha256}]})` };
  }
  return { entries: studies as TrustEntry[] };
}

async function contentHash(absolute: string): Promise<string | null> {
  try {
    return createHash("sha256").update(await readFile(absolute)).digest("hex");
  } catch (error) {
    if ((error as { code?: string }).code === "ENOENT") return null;
    throw error;
  }
}

function relativeUnder(root: string, absolute: string): string | null {
  const rel = relative(root, absolute);
  if (rel === "" || rel.startsWith("..") || rel.startsWith(sep) || /^[a-zA-Z]:/.test(rel)) return null;
  return rel.split(sep).join("/");
}

/**
 * The studies under `root` that are trusted now: listed in the user's trust file
 * with the SHA-256 of their current bytes. A study changed by anything but a save
 * from this editor (a pull, a download, another program) is no longer trusted.
 * A trust file of the wrong shape trusts nothing and says why in `problem`.
 */
export async function readTrustList(root: string): Promise<TrustList> {
  const { entries, problem } = await readEntries();
  const studies = new Set<string>();
  for (const entry of entries) {
    const rel = relativeUnder(root, entry.path);
    if (rel !== null && (await contentHash(entry.path)) === entry.sha256) studies.add(rel);
  }
  return problem ? { studies, problem } : { studies };
}

/**
 * Records the study at `study` (relative to `root`) as trusted with the SHA-256 of
 * its current bytes, replacing an older record of the same path; written
 * atomically. Refuses with 409 `trust-file-unusable` when an existing trust file
 * cannot be read as a trust list, rather than overwrite it. Callers serialise
 * concurrent calls on {@link trustFilePath}.
 */
export async function addToTrustList(root: string, study: string): Promise<void> {
  const { entries, problem } = await readEntries();
  if (problem) throw new HttpError(409, "trust-file-unusable", `${problem}; fix or delete it, then try again`);
  const path = join(root, ...study.split("/"));
  const sha256 = await contentHash(path);
  if (sha256 === null) throw new HttpError(404, "not-found", `${study} does not exist`);
  if (entries.some((e) => e.path === path && e.sha256 === sha256)) return;
  const studies = [...entries.filter((e) => e.path !== path), { path, sha256 }].sort((x, y) => (x.path < y.path ? -1 : 1));
  const file = trustFilePath();
  await mkdir(dirname(file), { recursive: true });
  const text = `${JSON.stringify({ format: TRUST_FORMAT, note: TRUST_NOTE, studies }, null, 2)}\n`;
  await writeFileAtomic(file, new TextEncoder().encode(text));
}
