import { type IncomingHttpHeaders, request } from "node:http";

/** One answer of the server under test. */
export interface Answer {
  readonly status: number;
  readonly headers: IncomingHttpHeaders;
  readonly bytes: Buffer;
  readonly text: string;
  /** The body parsed as JSON, or undefined when it is not JSON. */
  readonly json: Record<string, unknown> | undefined;
}

/** What to send: the request target is sent exactly as given (no normalisation, unlike fetch). */
export interface Call {
  readonly method?: string;
  readonly path: string;
  readonly headers?: Record<string, string>;
  readonly body?: string | Buffer;
  /** Host header; default 127.0.0.1:PORT. */
  readonly host?: string;
}

/**
 * A raw HTTP/1.1 request to 127.0.0.1:port with node:http, which lets a test set
 * the Host header and send `..` or `%2e%2e` in the target unchanged.
 */
export function call(port: number, { method = "GET", path, headers = {}, body, host }: Call): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = request(
      { host: "127.0.0.1", port, method, path, agent: false, headers: { host: host ?? `127.0.0.1:${port}`, ...headers } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (chunk: Buffer) => chunks.push(chunk));
        res.on("end", () => {
          const bytes = Buffer.concat(chunks);
          const text = bytes.toString("utf8");
          let json: Record<string, unknown> | undefined;
          try {
            json = JSON.parse(text);
          } catch {
            json = undefined;
          }
          resolve({ status: res.statusCode ?? 0, headers: res.headers, bytes, text, json });
        });
        res.on("error", reject);
      },
    );
    req.on("error", reject);
    req.setTimeout(10_000, () => req.destroy(new Error(`no answer to ${method} ${path} within 10 s`)));
    req.end(body);
  });
}
