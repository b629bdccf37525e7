import { basename } from "node:path";
import { listFiles } from "./list-files";
import type { ServerContext } from "./server-context";
import { SERVER_LIMITS } from "./server-limits";
import { type ApiReply, isTrusted, resolveStudy } from "./study-endpoints";
import { readTrustList } from "./trust-list";

/**
 * GET /api/session → `{studyPath, folder, tokenProtected, version, trusted, limits}`:
 * the study `couplet open` was given (relative to the root; null when a folder was
 * opened), the opened folder's name (not its full path), the Couplet version,
 * whether that study is in the trust list (false without a study or when it is
 * missing), and the size limits in bytes.
 */
export async function getSession(ctx: ServerContext): Promise<ApiReply> {
  let trusted = false;
  if (ctx.studyPath !== null) {
    try {
      trusted = await isTrusted(ctx, (await resolveStudy(ctx, ctx.studyPath)).relative);
    } catch {
      trusted = false; // the study is missing or unreadable: the editor will say so when it loads it
    }
  }
  return {
    status: 200,
    body: {
      studyPath: ctx.studyPath,
      folder: basename(ctx.root),
      tokenProtected: true,
      version: ctx.version,
      trusted,
      limits: { studyBytes: SERVER_LIMITS.studyBytes, dataBytes: SERVER_LIMITS.dataBytes },
    },
  };
}

/**
 * GET /api/files → `{studies: [{path, trusted}], data: [{path, format, bytes}], truncated}`:
 * the study and data files under the root (see listFiles for the bounds).
 */
export async function getFiles(ctx: ServerContext): Promise<ApiReply> {
  const [files, trust] = await Promise.all([listFiles(ctx.root), readTrustList(ctx.root)]);
  return {
    status: 200,
    body: {
      studies: files.studies.map((path) => ({ path, trusted: trust.studies.has(path) })),
      data: files.data,
      truncated: files.truncated,
    },
  };
}
