import type { IncomingHttpHeaders } from "node:http";
import { HttpError } from "./http-error";
import { tokensMatch } from "./session-token";

/** The request header that carries the session token (the editor sends it on every API call). */
export const TOKEN_HEADER = "x-couplet-token";

/**
 * Name of the cookie that carries the token after the first page load. Cookies are
 * not separated by port (RFC 6265, section 8.5), so two servers on one machine would
 * overwrite each other's cookie under one name: the port is part of the name.
 */
export function tokenCookieName(port: number): string {
  return `couplet-token-${port}`;
}

/**
 * The Set-Cookie value that lets the page's later requests (scripts, styles, API
 * calls) prove the token without it in every URL. HttpOnly: page scripts, including
 * user code cells, cannot read it. SameSite=Strict: browsers leave it off requests
 * started by other sites. Path=/ and no expiry: it lasts until the browser closes.
 * No `Secure`: the server speaks plain HTTP on the loopback interface.
 */
export function tokenCookie(port: number, token: string): string {
  return `${tokenCookieName(port)}=${token}; Path=/; HttpOnly; SameSite=Strict`;
}

/** The Host header values this server answers to: its own address, by number or as localhost. */
export function allowedHosts(port: number): string[] {
  return [`127.0.0.1:${port}`, `localhost:${port}`];
}

/** The Origin header values a write may carry. */
export function allowedOrigins(port: number): string[] {
  return allowedHosts(port).map((host) => `http://${host}`);
}

/**
 * Refuses (403 `host-not-allowed`) a request whose Host header is not this server's
 * own loopback address and port. This is the usual defence against DNS rebinding: a
 * web page on `evil.example` can make its name resolve to 127.0.0.1 and then reach
 * this server as "same origin", but its requests still say `Host: evil.example`
 * (common practice, no source).
 */
export function checkHost(headers: IncomingHttpHeaders, port: number): void {
  const host = headers.host;
  if (host === undefined || !allowedHosts(port).includes(host.toLowerCase())) {
    throw new HttpError(403, "host-not-allowed", `this server answers only to ${allowedHosts(port).join(" or ")}, not to Host ${JSON.stringify(host ?? "")}`);
  }
}

function cookieValue(header: string | undefined, name: string): string | undefined {
  if (!header) return undefined;
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq > 0 && part.slice(0, eq).trim() === name) return part.slice(eq + 1).trim();
  }
  return undefined;
}

/** How a request proved it holds the token. */
export type TokenProof = "header" | "cookie" | "query";

/**
 * Checks the session token of a request and says where it came from. A non-empty
 * `x-couplet-token` header decides on its own (a wrong header is refused even with a
 * good cookie); otherwise the cookie of this port is used; `query` is the `?token=`
 * of a page load, consulted only when the caller passes it. Refuses with 403
 * `token-missing` or `token-wrong`; every comparison runs in constant time
 * ({@link tokensMatch}).
 */
export function checkToken(headers: IncomingHttpHeaders, port: number, token: string, query?: string | null): TokenProof {
  const header = headers[TOKEN_HEADER];
  const fromHeader = Array.isArray(header) ? header[0] : header;
  const candidates: [TokenProof, string | undefined][] = [
    ["header", fromHeader || undefined],
    ["query", query || undefined],
    ["cookie", cookieValue(headers.cookie, tokenCookieName(port))],
  ];
  const given = candidates.find(([, value]) => value !== undefined);
  if (!given) throw new HttpError(403, "token-missing", "no session token: open the link that `couplet open` printed (it ends in ?token=…)");
  if (!tokensMatch(given[1], token)) throw new HttpError(403, "token-wrong", "wrong session token: this link belongs to another run of `couplet open`; use the link it printed this time");
  return given[0];
}

/**
 * Extra checks for API calls, which reach files:
 * - `Sec-Fetch-Site`, when the browser sends it, must be `same-origin` or `none`
 *   (403 `cross-site-request`). SameSite cookies do not separate ports
 *   (127.0.0.1:8080 and this server are one "site"), so this stops another local
 *   web page from riding on the cookie.
 * - A write (anything but GET and HEAD) must carry an allowed Origin (403
 *   `origin-not-allowed`); without an Origin header it is accepted only with the
 *   token in the header, which a browser page of another origin cannot add without
 *   a CORS preflight this server never grants (403 `origin-missing` otherwise).
 */
export function checkApiRequest(method: string, headers: IncomingHttpHeaders, port: number, proof: TokenProof): void {
  const site = headers["sec-fetch-site"];
  if (site !== undefined && site !== "same-origin" && site !== "none") {
    throw new HttpError(403, "cross-site-request", `API calls must come from the editor page itself (Sec-Fetch-Site: ${site})`);
  }
  if (method === "GET" || method === "HEAD") return;
  const origin = headers.origin;
  if (origin === undefined) {
    if (proof !== "header") throw new HttpError(403, "origin-missing", "a write without an Origin header must carry the token in the x-couplet-token header");
    return;
  }
  if (!allowedOrigins(port).includes(origin.toLowerCase())) {
    throw new HttpError(403, "origin-not-allowed", `writes are accepted only from ${allowedOrigins(port).join(" or ")}, not from Origin ${JSON.stringify(origin)}`);
  }
}
