import { readFile } from "node:fs/promises";
import { join } from "node:path";
import { HttpError } from "./http-error";
import { writeFileAtomic } from "./write-file-atomic";

/** Name of the trust list, in the opened folder. */
export const TRUST_FILE = ".couplet-trust";

const TRUST_FORMAT = "couplet-trust";
const TRUST_NOTE = "Studies in this folder whose code cells Couplet may run without asking first. Paths relative to this folder.";

/** What the trust list holds: study paths relative to the opened folder, "/" between folders. */
export interface TrustList {
  readonly studies: ReadonlySet<string>;
  /** Why the file could not be used (then `studies` is empty), or undefined. */
  readonly problem?: string;
}

/**
 * Reads `<root>/.couplet-trust`: `{"format": "couplet-trust", "studies": [paths]}`.
 * A missing file is an empty list. A file that is not of this shape trusts nothing
 * and says why in `problem` (read errors other than "missing" are thrown).
 */
export async function readTrustList(root: string): Promise<TrustList> {
  let text: string;
  try {
    text = await readFile(join(root, TRUST_FILE), "utf8");
  } catch (error) {
    if ((error as { code?: string }).code === "ENOENT") return { studies: new Set() };
    throw error;
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return { studies: new Set(), problem: `${TRUST_FILE} is not JSON` };
  }
  const studies = (value as { studies?: unknown } | null)?.studies;
  if ((value as { format?: unknown } | null)?.format !== TRUST_FORMAT || !Array.isArray(studies) || !studies.every((s) => typeof s === "string")) {
    return { studies: new Set(), problem: `${TRUST_FILE} is not a trust list ({"format": "${TRUST_FORMAT}", "studies": [...]})` };
  }
  return { studies: new Set(studies as string[]) };
}

/**
 * Adds `study` (a path relative to the root) to the trust list and writes it
 * atomically (temporary file, flush, rename). Refuses with 409 `trust-file-unusable`
 * when an existing file cannot be read as a trust list, rather than overwrite what
 * someone wrote there. The caller serialises concurrent calls.
 */
export async function addToTrustList(root: string, study: string): Promise<void> {
  const list = await readTrustList(root);
  if (list.problem) throw new HttpError(409, "trust-file-unusable", `${list.problem}; fix or delete it, then try again`);
  if (list.studies.has(study)) return;
  const studies = [...list.studies, study].sort();
  const text = `${JSON.stringify({ format: TRUST_FORMAT, note: TRUST_NOTE, studies }, null, 2)}\n`;
  await writeFileAtomic(join(root, TRUST_FILE), new TextEncoder().encode(text));
}
