import type { Dirent } from "node:fs";
import { readdir, realpath, stat } from "node:fs/promises";
import { join } from "node:path";
import { dataFileType, isStudyPath } from "./content-types";
import { isInsideRoot } from "./root-path";
import { SERVER_LIMITS } from "./server-limits";

/** One data file the file list found. */
export interface DataFileEntry {
  /** Relative to the root, "/" between folders. */
  readonly path: string;
  /** `csv`, `tsv`, `json` or `npy`. */
  readonly format: string;
  /** Size in bytes. */
  readonly bytes: number;
}

/** The study and data files under the opened folder, each list sorted by path. */
export interface FileList {
  readonly studies: readonly string[];
  readonly data: readonly DataFileEntry[];
  /** True when a limit (depth, entries looked at, files returned) cut the search short. */
  readonly truncated: boolean;
}

const SKIPPED_FOLDERS = new Set(["node_modules"]);

/**
 * Lists study files (`*.couplet.json`) and data files (csv, tsv, json, npy) under
 * `root`, breadth first, within the bounds of SERVER_LIMITS (listDepth,
 * listEntries, listFiles). Hidden entries (names starting with ".") and
 * node_modules are skipped. Folders reached through symbolic links are not
 * entered; a linked file is listed only when its real path is inside `root`.
 *
 * @param root the opened folder, a real path.
 */
export async function listFiles(root: string): Promise<FileList> {
  const studies: string[] = [];
  const data: DataFileEntry[] = [];
  let truncated = false;
  let seen = 0;
  let level: string[] = [""];
  for (let depth = 0; level.length > 0 && !truncated; depth++) {
    const next: string[] = [];
    for (const folder of level) {
      let entries: Dirent[];
      try {
        entries = await readdir(join(root, ...folder.split("/").filter(Boolean)), { withFileTypes: true });
      } catch {
        continue; // unreadable folder: leave it out
      }
      entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
      for (const entry of entries) {
        if (++seen > SERVER_LIMITS.listEntries || studies.length + data.length >= SERVER_LIMITS.listFiles) {
          truncated = true;
          break;
        }
        if (entry.name.startsWith(".")) continue;
        const path = folder === "" ? entry.name : `${folder}/${entry.name}`;
        if (entry.isDirectory()) {
          if (SKIPPED_FOLDERS.has(entry.name)) continue;
          if (depth + 1 > SERVER_LIMITS.listDepth) truncated = true;
          else next.push(path);
          continue;
        }
        const study = isStudyPath(path);
        const type = study ? undefined : dataFileType(path);
        if (!study && !type) continue;
        const absolute = join(root, ...path.split("/"));
        let bytes: number;
        try {
          if (entry.isSymbolicLink() && !isInsideRoot(root, await realpath(absolute))) continue;
          const info = await stat(absolute);
          if (!info.isFile()) continue;
          bytes = info.size;
        } catch {
          continue; // dangling link or vanished file
        }
        if (study) studies.push(path);
        else if (type) data.push({ path, format: type.format, bytes });
      }
      if (truncated) break;
    }
    level = next;
  }
  studies.sort();
  data.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  return { studies, data, truncated };
}
