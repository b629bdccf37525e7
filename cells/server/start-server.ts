import { type IncomingMessage, type Server, type ServerResponse, createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { realpath, stat } from "node:fs/promises";
import { version as COUPLET_VERSION } from "../../package.json";
import { sendDataFile } from "./data-endpoint";
import { defaultEditorDir, sendEditorFile } from "./editor-assets";
import { HttpError } from "./http-error";
import { type TokenProof, checkApiRequest, checkHost, checkToken, tokenCookie } from "./request-guard";
import { fileSystemHttpError, sendError, sendJson } from "./send-reply";
import { type ServerContext, keyedSerializer } from "./server-context";
import { newSessionToken } from "./session-token";
import { getFiles, getSession } from "./session-endpoints";
import { type ApiReply, copyStudy, getStudy, newStudy, putStudy, resolveStudy, trustStudy } from "./study-endpoints";

/** Options of {@link startServer}. */
export interface StartServerOptions {
  /** The folder whose files the editor may read and write. Must exist. */
  readonly root: string;
  /** The study to open first, relative to `root` ("/" between folders). Default: none (a folder was opened). */
  readonly study?: string;
  /** TCP port; 0 (default) lets the system pick a free one. */
  readonly port?: number;
  /** The only interface the server listens on. Default and only value: "127.0.0.1". */
  readonly host?: "127.0.0.1";
  /** Folder of the bundled editor. Default: dist/editor/ of the Couplet package. */
  readonly editorDir?: string;
  /** Called with unexpected errors (answered as 500); default: ignore. */
  readonly onError?: (error: unknown) => void;
}

/** A running server. */
export interface RunningServer {
  /** The address to open, token included: `http://127.0.0.1:PORT/?token=…`. */
  readonly url: string;
  /** The per-run secret: 32 random bytes as base64url. */
  readonly token: string;
  /** The port it listens on. */
  readonly port: number;
  /** The opened folder, a real path. */
  readonly root: string;
  /** The underlying Node server (for inspection, e.g. `server.address()`). */
  readonly server: Server;
  /** Stops listening, ends open connections, and resolves when closed. */
  close(): Promise<void>;
}

/** How long a connection refused with 413 may stay open after the answer, in ms. */
const LINGER_MS = 250;

type ApiHandler = (ctx: ServerContext, req: IncomingMessage, query: URLSearchParams, res: ServerResponse) => Promise<ApiReply | null>;

/** Routes of the JSON API: path → method → handler (null reply: the handler answered itself). */
const API: Readonly<Record<string, Readonly<Record<string, ApiHandler>>>> = {
  "/api/session": { GET: (ctx) => getSession(ctx) },
  "/api/files": { GET: (ctx) => getFiles(ctx) },
  "/api/study": { GET: (ctx, _req, query) => getStudy(ctx, query), PUT: (ctx, req, query) => putStudy(ctx, req, query) },
  "/api/study/copy": { POST: (ctx, req) => copyStudy(ctx, req) },
  "/api/data": {
    GET: async (ctx, _req, query, res) => {
      await sendDataFile(ctx, res, query);
      return null;
    },
  },
  "/api/new": { POST: (ctx, req) => newStudy(ctx, req) },
  "/api/trust": { POST: (ctx, req) => trustStudy(ctx, req) },
};

function asHttpError(error: unknown): HttpError | undefined {
  return error instanceof HttpError ? error : fileSystemHttpError(error);
}

/**
 * Starts the local server behind `couplet open`, listening on 127.0.0.1 only.
 * It serves the bundled editor and a JSON API over the files of `root`, and answers
 * only requests that carry the per-run token and name this server in their Host
 * header. See docs/server.md for the API and every safeguard.
 *
 * Throws if `root` is not a folder, if `study` is not a study path inside it, or if
 * the port cannot be bound (the listen error, e.g. code EADDRINUSE).
 */
export async function startServer(options: StartServerOptions): Promise<RunningServer> {
  const { port: wanted = 0, host = "127.0.0.1", onError = () => undefined } = options;
  if (host !== "127.0.0.1") throw new RangeError(`startServer: host must be "127.0.0.1" (the server never listens on other interfaces), got ${JSON.stringify(host)}`);
  if (!(Number.isInteger(wanted) && wanted >= 0 && wanted <= 65535)) throw new RangeError(`startServer: port must be an integer in [0, 65535], got ${wanted}`);
  const root = await realpath(options.root);
  if (!(await stat(root)).isDirectory()) throw new RangeError(`startServer: root must be a folder, got ${JSON.stringify(options.root)}`);
  const editorDir = options.editorDir ?? defaultEditorDir();
  const token = newSessionToken();
  const ctx: ServerContext = { root, studyPath: options.study ?? null, version: COUPLET_VERSION, serialize: keyedSerializer() };
  if (ctx.studyPath !== null) await resolveStudy(ctx, ctx.studyPath, true).catch((error) => {
    throw new RangeError(`startServer: study ${JSON.stringify(ctx.studyPath)}: ${(error as Error).message}`);
  });

  let port = 0;
  const handle = async (req: IncomingMessage, res: ServerResponse): Promise<void> => {
    const target = req.url ?? "";
    const queryAt = target.indexOf("?");
    const path = queryAt < 0 ? target : target.slice(0, queryAt);
    const query = new URLSearchParams(queryAt < 0 ? "" : target.slice(queryAt + 1));
    const isApi = path === "/api" || path.startsWith("/api/");
    const method = req.method ?? "GET";
    try {
      checkHost(req.headers, port);
      // Only origin-form targets ("/path?query"); "http://host/x" or "*" are not for us.
      if (!path.startsWith("/")) throw new HttpError(400, "bad-request", "the request target must be a path starting with /");
      if (isApi) {
        const proof: TokenProof = checkToken(req.headers, port, token);
        checkApiRequest(method, req.headers, port, proof);
        const route = Object.hasOwn(API, path) ? API[path] : undefined;
        if (!route) throw new HttpError(404, "no-such-endpoint", `no API endpoint ${path}`);
        const handler = Object.hasOwn(route, method) ? route[method] : undefined;
        if (!handler) throw new HttpError(405, "method-not-allowed", `${path} accepts ${Object.keys(route).join(", ")}, not ${method}`, { allow: Object.keys(route) });
        const reply = await handler(ctx, req, query, res);
        if (reply) sendJson(res, reply.status, reply.body);
        return;
      }
      if (method !== "GET") throw new HttpError(405, "method-not-allowed", `the editor's files are read with GET, not ${method}`);
      const proof = checkToken(req.headers, port, token, query.get("token"));
      // A page load that brought the token in its address gets the cookie, so its
      // scripts, styles and later reloads need not carry the token themselves.
      await sendEditorFile(res, editorDir, path, proof === "query" ? { "Set-Cookie": tokenCookie(port, token) } : {});
    } catch (error) {
      const known = asHttpError(error);
      if (!known) onError(error);
      const reply = known ?? new HttpError(500, "internal-error", "the server failed unexpectedly; see the terminal running couplet open");
      if (res.headersSent) {
        res.destroy();
        return;
      }
      sendError(res, reply, isApi ? "json" : "html", reply.status === 405 && Array.isArray(reply.details.allow) ? { Allow: (reply.details.allow as string[]).join(", ") } : {});
      if (reply.status === 413) {
        // Stop reading the oversized body: once the answer has gone out, send FIN and,
        // shortly after, drop the connection. The short linger lets the client read
        // the answer before the reset that closing with unread data causes.
        const socket = req.socket;
        res.on("finish", () => {
          socket.end();
          setTimeout(() => socket.destroy(), LINGER_MS).unref();
        });
      }
    }
  };

  const server = createServer((req, res) => {
    void handle(req, res);
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen({ port: wanted, host, exclusive: true }, () => {
      server.off("error", reject);
      resolve();
    });
  });
  port = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${port}/?token=${token}`,
    token,
    port,
    root,
    server,
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        server.closeAllConnections();
      }),
  };
}
