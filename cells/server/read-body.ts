import type { IncomingMessage } from "node:http";
import { HttpError } from "./http-error";

/**
 * Reads a request body of at most `limit` bytes. A declared Content-Length over the
 * limit is refused (413 `body-too-large`) before a byte is read; a body without a
 * declared length is counted as it arrives and refused as soon as it passes the
 * limit. Either way the rest is never read: the caller answers and closes the
 * connection.
 */
export function readBody(req: IncomingMessage, limit: number): Promise<Buffer> {
  const tooLarge = () => new HttpError(413, "body-too-large", `request body larger than ${limit} bytes (the limit of this request; see docs/server.md)`);
  const declared = req.headers["content-length"];
  if (declared !== undefined && !(Number(declared) <= limit)) return Promise.reject(tooLarge());
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    const cleanup = () => {
      req.off("data", onData);
      req.off("end", onEnd);
      req.off("error", onError);
    };
    const onData = (chunk: Buffer) => {
      size += chunk.length;
      if (size > limit) {
        cleanup();
        req.pause();
        reject(tooLarge());
        return;
      }
      chunks.push(chunk);
    };
    const onEnd = () => {
      cleanup();
      resolve(Buffer.concat(chunks, size));
    };
    const onError = (error: Error) => {
      cleanup();
      reject(error);
    };
    req.on("data", onData);
    req.on("end", onEnd);
    req.on("error", onError);
  });
}

/**
 * Reads a JSON object body of at most `limit` bytes. The request must say
 * `Content-Type: application/json` (415 `json-required`): an HTML form on another
 * site cannot send that type without a CORS preflight, which this server never
 * grants. Not JSON, or not an object: 400 `bad-json`.
 */
export async function readJsonBody(req: IncomingMessage, limit: number): Promise<Record<string, unknown>> {
  const type = (req.headers["content-type"] ?? "").split(";")[0].trim().toLowerCase();
  if (type !== "application/json") throw new HttpError(415, "json-required", `send the body as Content-Type: application/json, got ${JSON.stringify(type)}`);
  const bytes = await readBody(req, limit);
  let value: unknown;
  try {
    value = JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
  } catch {
    throw new HttpError(400, "bad-json", "the request body is not valid UTF-8 JSON");
  }
  if (typeof value !== "object" || value === null || Array.isArray(value)) throw new HttpError(400, "bad-json", "the request body must be a JSON object");
  return value as Record<string, unknown>;
}
