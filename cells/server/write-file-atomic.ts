import { link, open, rename, unlink } from "node:fs/promises";
import { basename, dirname, join } from "node:path";

async function writeTemp(target: string, data: Uint8Array): Promise<string> {
  const dir = dirname(target);
  // Exclusive create with a counter gives a fresh name without randomness (as cells/document/study-file.ts does).
  for (let attempt = 0; ; attempt++) {
    const temp = join(dir, `.${basename(target)}.saving-${process.pid}-${attempt}`);
    let handle: Awaited<ReturnType<typeof open>>;
    try {
      handle = await open(temp, "wx", 0o644);
    } catch (error) {
      if ((error as { code?: string }).code !== "EEXIST" || attempt >= 99) throw error;
      continue;
    }
    try {
      await handle.writeFile(data);
      await handle.sync();
    } catch (error) {
      await handle.close().catch(() => undefined);
      await unlink(temp).catch(() => undefined);
      throw error;
    }
    await handle.close();
    return temp;
  }
}

/**
 * Writes `data` to `target` so that no reader ever sees a partial file: the bytes go
 * to a temporary file in the same folder, are flushed to disk, and then
 * - `exclusive: false` (default): renamed over `target` (POSIX rename replaces in one
 *   step; POSIX.1-2017, rename);
 * - `exclusive: true`: hard-linked as `target`, which fails with EEXIST when the name
 *   is taken (POSIX.1-2017, link), so an existing file is never replaced, even by a
 *   racing writer.
 * The temporary file is removed in every case. Errors of the file system are thrown
 * as they come (with `code`).
 */
export async function writeFileAtomic(target: string, data: Uint8Array, options: { exclusive?: boolean } = {}): Promise<void> {
  const temp = await writeTemp(target, data);
  try {
    if (options.exclusive) {
      await link(temp, target);
      await unlink(temp);
    } else {
      await rename(temp, target);
    }
  } catch (error) {
    await unlink(temp).catch(() => undefined);
    throw error;
  }
  try {
    const folder = await open(dirname(target), "r");
    await folder.sync().finally(() => folder.close());
  } catch {
    // Some systems cannot fsync a folder; the file itself is on disk already.
  }
}
