import type { ServerResponse } from "node:http";
import { open } from "node:fs/promises";
import { dataFileType } from "./content-types";
import { HttpError } from "./http-error";
import { pathSegments, relativeToRoot, resolveInRoot } from "./root-path";
import { securityHeaders } from "./security-headers";
import type { ServerContext } from "./server-context";
import { SERVER_LIMITS } from "./server-limits";

/**
 * GET /api/data?path=P: the raw bytes of a data file for a data cell, P relative to
 * the opened folder (the editor joins a study's data path to the study's folder; a
 * data path with `..` is refused like any other). Only csv, tsv, json and npy files
 * (415 `not-a-data-file` otherwise, judged by the real name after links), up to
 * SERVER_LIMITS.dataBytes (413 `file-too-large`). Content type by extension.
 */
export async function sendDataFile(ctx: ServerContext, res: ServerResponse, query: URLSearchParams): Promise<void> {
  const path = query.get("path") ?? undefined;
  const refuse = (name: string) =>
    new HttpError(415, "not-a-data-file", `path: ${JSON.stringify(name)} is not a data file the editor reads (csv, tsv, json, npy)`);
  // Confinement first: a path that leaves the folder is refused as such (403), whatever its name.
  pathSegments(path);
  if (typeof path === "string" && !dataFileType(path)) throw refuse(path);
  const { absolute } = await resolveInRoot(ctx.root, path);
  const relative = relativeToRoot(ctx.root, absolute);
  const type = dataFileType(relative);
  if (!type) throw refuse(relative);
  const handle = await open(absolute, "r");
  try {
    const info = await handle.stat();
    if (!info.isFile()) throw new HttpError(400, "not-a-file", "that is a folder, not a data file");
    if (info.size > SERVER_LIMITS.dataBytes) throw new HttpError(413, "file-too-large", `${relative} is ${info.size} bytes; the editor reads data files up to ${SERVER_LIMITS.dataBytes} bytes (couplet run has no such limit)`);
    const bytes = await handle.readFile();
    res.writeHead(200, { ...securityHeaders("locked"), "Content-Type": type.contentType, "Content-Length": String(bytes.length) });
    res.end(bytes);
  } finally {
    await handle.close();
  }
}
