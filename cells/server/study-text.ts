import { open } from "node:fs/promises";
import { HttpError } from "./http-error";
import { studyRevision } from "./study-revision";

/** A study file as it is on disk now. */
export interface StoredStudyText {
  readonly text: string;
  readonly revision: string;
}

/**
 * Reads the file at `absolute` (a real path already checked to be inside the root)
 * with its revision, taking size and modification time from the same open file as
 * the bytes. Returns null when there is no file. Larger than `limit` bytes: 413
 * `file-too-large`; a folder: 400 `not-a-file`.
 */
export async function readStudyText(absolute: string, limit: number): Promise<StoredStudyText | null> {
  let handle: Awaited<ReturnType<typeof open>>;
  try {
    handle = await open(absolute, "r");
  } catch (error) {
    if ((error as { code?: string }).code === "ENOENT") return null;
    throw error;
  }
  try {
    const info = await handle.stat();
    if (!info.isFile()) throw new HttpError(400, "not-a-file", "that is a folder, not a study file");
    if (info.size > limit) throw new HttpError(413, "file-too-large", `the study file is ${info.size} bytes; the editor opens studies up to ${limit} bytes`);
    const bytes = await handle.readFile();
    return { text: new TextDecoder().decode(bytes), revision: studyRevision(bytes, info.mtimeMs) };
  } finally {
    await handle.close();
  }
}
