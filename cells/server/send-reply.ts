import type { ServerResponse } from "node:http";
import { plainPage } from "./plain-page";
import { HttpError } from "./http-error";
import { securityHeaders } from "./security-headers";

/** Sends `body` as JSON with the locked-down security headers. */
export function sendJson(res: ServerResponse, status: number, body: unknown, extraHeaders: Record<string, string> = {}): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    ...securityHeaders("locked"),
    ...extraHeaders,
    "Content-Type": "application/json; charset=utf-8",
    "Content-Length": String(Buffer.byteLength(text)),
  });
  res.end(text);
}

/**
 * The JSON of a refused request: `{error, code, ...details}`. `error` is the
 * sentence for a person (the editor shows it), `code` the stable word for programs.
 */
export function errorBody(error: HttpError): Record<string, unknown> {
  return { error: error.message, code: error.code, ...error.details };
}

/**
 * Answers a refused request: JSON for API calls, a small HTML page for page loads.
 * A 413 also closes the connection, so the rest of an oversized body is never read.
 */
export function sendError(res: ServerResponse, error: HttpError, as: "json" | "html", extraHeaders: Record<string, string> = {}): void {
  const headers = error.status === 413 ? { ...extraHeaders, Connection: "close" } : extraHeaders;
  if (as === "json") {
    sendJson(res, error.status, errorBody(error), headers);
    return;
  }
  const text = plainPage(`Couplet: ${error.status === 403 ? "not allowed" : "cannot show this"}`, [error.message]);
  res.writeHead(error.status, { ...securityHeaders("locked"), ...headers, "Content-Type": "text/html; charset=utf-8", "Content-Length": String(Buffer.byteLength(text)) });
  res.end(text);
}

/** Maps a file system error to the HTTP error to answer with, or undefined for a real fault (500). */
export function fileSystemHttpError(error: unknown): HttpError | undefined {
  const code = (error as { code?: unknown } | null)?.code;
  if (code === "ENOENT" || code === "ENOTDIR") return new HttpError(404, "not-found", "no such file in the opened folder");
  if (code === "EACCES" || code === "EPERM") return new HttpError(403, "no-permission", "the operating system does not allow this file to be read or written");
  if (code === "EISDIR") return new HttpError(400, "not-a-file", "that is a folder, not a file");
  if (code === "ENOSPC" || code === "EDQUOT") return new HttpError(507, "disk-full", "the disk is full; nothing was changed");
  if (code === "EROFS") return new HttpError(403, "read-only", "the folder is on a read-only file system");
  return undefined;
}
