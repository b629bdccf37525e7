import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, realpathSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { request } from "node:http";
import { createHash } from "node:crypto";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { parseStudy } from "../../../cells/document/parse-study";
import { type RunningServer, startServer } from "../../../cells/server/start-server";
import { trustFilePath } from "../../../cells/server/trust-list";
import { type Answer, type Call, call } from "./http-client";

const depotText = readFileSync(new URL("../../fixtures/studies/depot-supply.couplet.json", import.meta.url), "utf8");
const craneText = readFileSync(new URL("../../fixtures/studies/harbour-cranes.couplet.json", import.meta.url), "utf8");

let dir: string;
let root: string;
let outside: string;
let server: RunningServer;

beforeEach(async () => {
  // realpath: the temporary folder may sit behind a symbolic link (macOS); the server resolves links.
  dir = realpathSync(mkdtempSync(join(tmpdir(), "couplet-server-")));
  root = join(dir, "root");
  outside = join(dir, "outside");
  process.env.COUPLET_TRUST_FILE = join(dir, "user", "trusted-studies.json");
  mkdirSync(join(root, "data"), { recursive: true });
  mkdirSync(join(root, "editor"));
  mkdirSync(outside);
  writeFileSync(join(root, "depots.couplet.json"), depotText);
  writeFileSync(join(root, "data", "shops.csv"), "x,y\n1,2\n3,4\n");
  writeFileSync(join(root, "notes.txt"), "not data");
  writeFileSync(join(outside, "secret.csv"), "secret,1\n");
  writeFileSync(join(outside, "stolen.couplet.json"), craneText);
  writeFileSync(join(root, "editor", "index.html"), "<!doctype html><title>editor</title><script type=module src=app.js></script>");
  writeFileSync(join(root, "editor", "app.js"), "console.log('editor');\n");
  server = await startServer({ root, study: "depots.couplet.json", port: 0, host: "127.0.0.1", editorDir: join(root, "editor") });
});

afterEach(async () => {
  await server.close();
  rmSync(dir, { recursive: true, force: true });
});

/** A request with the token in the x-couplet-token header. */
function api(request: Call): Promise<Answer> {
  return call(server.port, { ...request, headers: { "x-couplet-token": server.token, ...(request.body === undefined ? {} : { "content-type": "application/json" }), ...request.headers } });
}

function put(path: string, body: unknown): Promise<Answer> {
  return api({ method: "PUT", path: `/api/study?path=${encodeURIComponent(path)}`, body: JSON.stringify(body) });
}

async function revisionOf(path: string): Promise<string> {
  const answer = await api({ path: `/api/study?path=${encodeURIComponent(path)}` });
  expect(answer.status).toBe(200);
  return answer.json?.revision as string;
}

describe("startServer: listening", () => {
  it("startServer listens on 127.0.0.1 only and prints a URL with a >= 128-bit base64url token", () => {
    // Binding the IPv4 loopback address alone keeps other machines out (common practice, no source).
    expect(server.server.address()).toEqual({ address: "127.0.0.1", family: "IPv4", port: server.port });
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/?token=${server.token}`);
    expect(server.token).toMatch(/^[A-Za-z0-9_-]+$/);
    expect(Buffer.from(server.token, "base64url").length * 8).toBeGreaterThanOrEqual(128);
  });

  it("startServer draws a new token on every start", async () => {
    const other = await startServer({ root, port: 0 });
    try {
      expect(other.token).not.toBe(server.token);
      expect(other.port).not.toBe(server.port);
    } finally {
      await other.close();
    }
  });

  it("startServer refuses any host but 127.0.0.1", async () => {
    await expect(startServer({ root, host: "0.0.0.0" as "127.0.0.1" })).rejects.toThrow(/host must be "127.0.0.1"/);
  });

  it("startServer refuses a study path that leaves the root", async () => {
    await expect(startServer({ root, study: "../outside/stolen.couplet.json" })).rejects.toThrow(/leave the opened folder/);
  });
});

describe("startServer: token", () => {
  it("GET /api/session without a token answers 403 token-missing as JSON", async () => {
    const answer = await call(server.port, { path: "/api/session" });
    expect(answer.status).toBe(403);
    expect(answer.headers["content-type"]).toBe("application/json; charset=utf-8");
    expect(answer.json?.code).toBe("token-missing");
  });

  it("GET /api/session with a wrong token of the same length answers 403 token-wrong", async () => {
    const wrong = `${server.token[0] === "A" ? "B" : "A"}${server.token.slice(1)}`;
    const answer = await call(server.port, { path: "/api/session", headers: { "x-couplet-token": wrong } });
    expect(answer.status).toBe(403);
    expect(answer.json?.code).toBe("token-wrong");
  });

  it("GET /api/session with a token of another length (a prefix, a longer one) answers 403", async () => {
    for (const wrong of [server.token.slice(0, 10), `${server.token}x`, "x"]) {
      const answer = await call(server.port, { path: "/api/session", headers: { "x-couplet-token": wrong } });
      expect(answer.status, wrong).toBe(403);
      expect(answer.json?.code).toBe("token-wrong");
    }
  });

  it("GET /api/session does not take the token from ?token= (only page loads do)", async () => {
    const answer = await call(server.port, { path: `/api/session?token=${server.token}` });
    expect(answer.status).toBe(403);
  });

  it("a wrong x-couplet-token header is refused even with a good cookie", async () => {
    const answer = await call(server.port, { path: "/api/session", headers: { "x-couplet-token": "nope", cookie: `couplet-token-${server.port}=${server.token}` } });
    expect(answer.status).toBe(403);
  });

  it("GET /api/session with the token answers the session", async () => {
    const answer = await api({ path: "/api/session" });
    expect(answer.status).toBe(200);
    expect(answer.json).toEqual({
      studyPath: "depots.couplet.json",
      folder: "root",
      tokenProtected: true,
      version: JSON.parse(readFileSync(new URL("../../../package.json", import.meta.url), "utf8")).version,
      trusted: false,
      limits: { studyBytes: 20 * 1024 * 1024, dataBytes: 100 * 1024 * 1024 },
    });
  });
});

describe("startServer: the editor page and the cookie", () => {
  it("GET /?token= serves index.html and sets an HttpOnly SameSite=Strict cookie named after the port", async () => {
    const answer = await call(server.port, { path: `/?token=${server.token}` });
    expect(answer.status).toBe(200);
    expect(answer.text).toContain("<title>editor</title>");
    expect(answer.headers["content-type"]).toBe("text/html; charset=utf-8");
    // RFC 6265bis (SameSite) and RFC 6265 section 4.1.2.6 (HttpOnly); cookies ignore ports (RFC 6265 section 8.5), hence the port in the name.
    expect(answer.headers["set-cookie"]).toEqual([`couplet-token-${server.port}=${server.token}; Path=/; HttpOnly; SameSite=Strict`]);
  });

  it("GET / and its scripts work with the cookie and are refused without it", async () => {
    const cookie = `couplet-token-${server.port}=${server.token}`;
    const script = await call(server.port, { path: "/app.js", headers: { cookie } });
    expect(script.status).toBe(200);
    expect(script.headers["content-type"]).toBe("text/javascript; charset=utf-8");
    const noCookie = await call(server.port, { path: "/app.js" });
    expect(noCookie.status).toBe(403);
    expect(noCookie.headers["content-type"]).toBe("text/html; charset=utf-8");
    expect(noCookie.text).toContain("open the link that <code>couplet open</code> printed");
    const otherPort = await call(server.port, { path: "/", headers: { cookie: `couplet-token-1=${server.token}` } });
    expect(otherPort.status).toBe(403);
  });

  it("API calls accept the cookie as proof of the token", async () => {
    const answer = await call(server.port, { path: "/api/files", headers: { cookie: `couplet-token-${server.port}=${server.token}` } });
    expect(answer.status).toBe(200);
  });

  it("GET / answers 503 with a page saying to run npm run build when the editor is not built", async () => {
    const bare = await startServer({ root, editorDir: join(dir, "no-such-build") });
    try {
      const answer = await call(bare.port, { path: `/?token=${bare.token}` });
      expect(answer.status).toBe(503);
      expect(answer.text).toContain("<code>npm run build</code>");
      expect((await call(bare.port, { path: "/app.js", headers: { "x-couplet-token": bare.token } })).status).toBe(404);
    } finally {
      await bare.close();
    }
  });

  it("editor files: traversal out of the editor folder is refused", async () => {
    const headers = { "x-couplet-token": server.token };
    for (const path of ["/../depots.couplet.json", "/%2e%2e/depots.couplet.json", "/..%2fdepots.couplet.json", "/a%5c..%5cb", "/%00", "//etc/passwd"]) {
      const answer = await call(server.port, { path, headers });
      expect([400, 403], path).toContain(answer.status);
    }
  });
});

describe("startServer: security headers", () => {
  it("API replies carry no-store, nosniff, no-referrer and a CSP that allows nothing", async () => {
    const answer = await api({ path: "/api/session" });
    expect(answer.headers["cache-control"]).toBe("no-store");
    expect(answer.headers["x-content-type-options"]).toBe("nosniff");
    expect(answer.headers["referrer-policy"]).toBe("no-referrer");
    expect(answer.headers["content-security-policy"]).toMatch(/^default-src 'none';/);
    expect(answer.headers["access-control-allow-origin"]).toBeUndefined();
  });

  it("the editor page's CSP allows only this server, plus eval for code cells", async () => {
    const answer = await call(server.port, { path: `/?token=${server.token}` });
    const csp = String(answer.headers["content-security-policy"]);
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self' 'unsafe-eval'");
    expect(csp).toContain("connect-src 'self'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/);
    expect(csp).not.toMatch(/\*|https?:/);
    expect(answer.headers["cache-control"]).toBe("no-store");
    expect(answer.headers["referrer-policy"]).toBe("no-referrer");
    expect(answer.headers["x-content-type-options"]).toBe("nosniff");
  });
});

describe("startServer: Host and Origin", () => {
  it("a spoofed Host header is refused with 403 even with the token (DNS rebinding defence; common practice, no source)", async () => {
    for (const host of ["evil.example", `evil.example:${server.port}`, `127.0.0.1:${server.port + 1}`, `[::1]:${server.port}`, `127.0.0.1.evil.example:${server.port}`]) {
      const answer = await api({ path: "/api/session", host });
      expect(answer.status, host).toBe(403);
      expect(answer.json?.code).toBe("host-not-allowed");
    }
    const page = await call(server.port, { path: `/?token=${server.token}`, host: "evil.example" });
    expect(page.status).toBe(403);
    expect(page.headers["set-cookie"]).toBeUndefined();
  });

  it("Host localhost:PORT is accepted like 127.0.0.1:PORT", async () => {
    expect((await api({ path: "/api/session", host: `localhost:${server.port}` })).status).toBe(200);
  });

  it("a write from another Origin is refused with 403, one from the editor's origin is accepted", async () => {
    const trust = (origin: string) => api({ method: "POST", path: "/api/trust", body: JSON.stringify({ path: "depots.couplet.json" }), headers: { origin } });
    for (const origin of ["http://evil.example", `http://127.0.0.1:${server.port + 1}`, "null"]) {
      const answer = await trust(origin);
      expect(answer.status, origin).toBe(403);
      expect(answer.json?.code).toBe("origin-not-allowed");
    }
    expect((await trust(`http://127.0.0.1:${server.port}`)).status).toBe(200);
  });

  it("a write proven only by the cookie needs an Origin header", async () => {
    const cookie = `couplet-token-${server.port}=${server.token}`;
    const body = JSON.stringify({ path: "depots.couplet.json" });
    const without = await call(server.port, { method: "POST", path: "/api/trust", body, headers: { cookie, "content-type": "application/json" } });
    expect(without.status).toBe(403);
    expect(without.json?.code).toBe("origin-missing");
    const withOrigin = await call(server.port, { method: "POST", path: "/api/trust", body, headers: { cookie, "content-type": "application/json", origin: `http://127.0.0.1:${server.port}` } });
    expect(withOrigin.status).toBe(200);
  });

  it("an API call the browser marks Sec-Fetch-Site: same-site or cross-site is refused", async () => {
    // Fetch Metadata request headers (W3C Working Draft): same-site covers other ports of 127.0.0.1.
    for (const site of ["same-site", "cross-site"]) {
      const answer = await api({ path: "/api/session", headers: { "sec-fetch-site": site } });
      expect(answer.status, site).toBe(403);
    }
    expect((await api({ path: "/api/session", headers: { "sec-fetch-site": "same-origin" } })).status).toBe(200);
  });

  it("a write whose body is not declared application/json is refused with 415 (HTML forms cannot send it)", async () => {
    const answer = await api({ method: "POST", path: "/api/trust", body: "path=depots.couplet.json", headers: { "content-type": "application/x-www-form-urlencoded" } });
    expect(answer.status).toBe(415);
  });
});

describe("startServer: paths stay inside the root", () => {
  beforeEach(() => {
    symlinkSync(join(outside, "secret.csv"), join(root, "data", "leak.csv"));
    symlinkSync(outside, join(root, "elsewhere"));
    symlinkSync(join(outside, "stolen.couplet.json"), join(root, "stolen.couplet.json"));
    symlinkSync(join(root, "data", "shops.csv"), join(root, "shops-link.csv"));
    symlinkSync(join(root, "depots.couplet.json"), join(root, "depots-link.couplet.json"));
  });

  const refused = [
    ["..", "../outside/secret.csv"],
    ["nested ..", "data/../../outside/secret.csv"],
    ["absolute", join("/", "etc", "passwd.csv")],
    ["backslash", "data\\shops.csv"],
    ["backslash traversal", "..\\outside\\secret.csv"],
    ["NUL", "data/shops.csv\u0000.csv"],
    ["Windows drive", "C:/secret.csv"],
  ] as const;

  for (const [what, path] of refused) {
    it(`GET /api/data refuses a path with ${what} (400 or 403)`, async () => {
      const answer = await api({ path: `/api/data?path=${encodeURIComponent(path)}` });
      expect([400, 403]).toContain(answer.status);
      expect(answer.text).not.toContain("secret");
    });
  }

  it("GET /api/data refuses percent-encoded traversal (%2e%2e, %2f) in the raw query", async () => {
    for (const raw of ["%2e%2e%2foutside%2fsecret.csv", "..%2foutside%2fsecret.csv", "%2E%2E/outside/secret.csv", "data%2f..%2f..%2foutside%2fsecret.csv", "%2fetc%2fpasswd.csv", "data%5c..%5c..%5coutside%5csecret.csv", "data/shops.csv%00"]) {
      const answer = await api({ path: `/api/data?path=${raw}` });
      expect([400, 403, 415], raw).toContain(answer.status);
      expect(answer.text).not.toContain("secret,1");
    }
  });

  it("GET /api/data refuses a symbolic link that points outside the root (file or folder)", async () => {
    for (const path of ["data/leak.csv", "elsewhere/secret.csv"]) {
      const answer = await api({ path: `/api/data?path=${encodeURIComponent(path)}` });
      expect(answer.status, path).toBe(403);
      expect(answer.json?.code).toBe("path-outside-root");
    }
  });

  it("GET /api/study and PUT /api/study refuse a study linked from outside the root", async () => {
    expect((await api({ path: "/api/study?path=stolen.couplet.json" })).status).toBe(403);
    const answer = await put("stolen.couplet.json", { text: depotText, baseRevision: null });
    expect(answer.status).toBe(403);
    expect(readFileSync(join(outside, "stolen.couplet.json"), "utf8")).toBe(craneText);
  });

  it("a symbolic link inside the root works", async () => {
    const data = await api({ path: "/api/data?path=shops-link.csv" });
    expect(data.status).toBe(200);
    expect(data.text).toBe("x,y\n1,2\n3,4\n");
    const study = await api({ path: "/api/study?path=depots-link.couplet.json" });
    expect(study.status).toBe(200);
    expect(study.json?.path).toBe("depots.couplet.json");
  });

  it("POST /api/new and /api/study/copy refuse folders outside the root", async () => {
    const made = await api({ method: "POST", path: "/api/new", body: JSON.stringify({ path: "elsewhere/new.couplet.json" }) });
    expect(made.status).toBe(403);
    const copied = await api({ method: "POST", path: "/api/study/copy", body: JSON.stringify({ path: "../outside/x.couplet.json", text: depotText }) });
    expect(copied.status).toBe(403);
    expect(readdirSync(outside).sort()).toEqual(["secret.csv", "stolen.couplet.json"]);
  });
});

describe("startServer: body size", () => {
  /**
   * Sends the headers and a first piece of a large body, then waits for an answer
   * without sending the rest: an answer proves the server did not wait to read it all.
   */
  function oversized(headers: Record<string, string>, firstBytes: number): Promise<{ status: number; code: unknown }> {
    return new Promise((resolve, reject) => {
      const req = request(
        { host: "127.0.0.1", port: server.port, method: "PUT", path: "/api/study?path=depots.couplet.json", agent: false, headers: { "x-couplet-token": server.token, "content-type": "application/json", ...headers } },
        (res) => {
          let text = "";
          res.on("data", (chunk) => {
            text += chunk;
          });
          res.on("end", () => {
            req.destroy();
            resolve({ status: res.statusCode ?? 0, code: JSON.parse(text).code });
          });
        },
      );
      req.on("error", reject);
      req.setTimeout(10_000, () => req.destroy(new Error("no answer within 10 s")));
      const chunk = Buffer.alloc(1024 * 1024, 0x20);
      let sent = 0;
      const pump = () => {
        while (sent < firstBytes) {
          sent += chunk.length;
          if (!req.write(chunk)) {
            req.once("drain", pump);
            return;
          }
        }
      };
      pump();
    });
  }

  it("PUT /api/study with a declared length over 20 MiB answers 413 after 1 MiB was sent", async () => {
    const answer = await oversized({ "content-length": String(64 * 1024 * 1024) }, 1024 * 1024);
    expect(answer).toEqual({ status: 413, code: "body-too-large" });
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(depotText);
  });

  it("PUT /api/study with an unbounded chunked body answers 413 once 20 MiB are passed, never reaching the end", async () => {
    const answer = await oversized({ "transfer-encoding": "chunked" }, 22 * 1024 * 1024);
    expect(answer).toEqual({ status: 413, code: "body-too-large" });
  });

  it("POST /api/trust takes at most 64 KiB", async () => {
    const answer = await api({ method: "POST", path: "/api/trust", body: JSON.stringify({ path: "depots.couplet.json", pad: "x".repeat(70_000) }) });
    expect(answer.status).toBe(413);
  });
});

describe("startServer: reading and saving studies", () => {
  it("GET /api/study answers the text and a sha256-based revision", async () => {
    const answer = await api({ path: "/api/study?path=depots.couplet.json" });
    expect(answer.status).toBe(200);
    expect(answer.json?.text).toBe(depotText);
    // sha256 of the bytes (FIPS 180-4), checked here with node:crypto.
    const { createHash } = await import("node:crypto");
    expect(String(answer.json?.revision).split(":")[0]).toBe(createHash("sha256").update(depotText).digest("hex"));
    expect(answer.json?.trusted).toBe(false);
  });

  it("GET /api/study refuses a file that is not a .couplet.json (400) and a missing one (404)", async () => {
    expect((await api({ path: "/api/study?path=notes.txt" })).status).toBe(400);
    expect((await api({ path: "/api/study?path=missing.couplet.json" })).status).toBe(404);
  });

  it("PUT /api/study saves atomically: the file holds the text sent byte for byte and the old one is kept as .previous", async () => {
    const base = await revisionOf("depots.couplet.json");
    const edited = depotText.replace('"title": "Depot supply vs shop demand"', '"title": "Depot supply, second look"');
    expect(edited).not.toBe(depotText);
    const answer = await put("depots.couplet.json", { text: edited, baseRevision: base });
    expect(answer.status).toBe(200);
    expect(answer.json).toMatchObject({ path: "depots.couplet.json", written: true, backup: "depots.couplet.json.previous", canonical: true });
    expect(answer.json?.text).toBeUndefined();
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(edited);
    expect(readFileSync(join(root, "depots.couplet.json.previous"), "utf8")).toBe(depotText);
    expect(readdirSync(root).filter((name) => name.includes(".saving-"))).toEqual([]);
    expect(answer.json?.revision).toBe(await revisionOf("depots.couplet.json"));
  });

  it("PUT /api/study with a stale baseRevision answers 409 with the current text and leaves the file unchanged", async () => {
    const base = await revisionOf("depots.couplet.json");
    const theirs = depotText.replace("Depot supply vs shop demand", "Edited in another program");
    writeFileSync(join(root, "depots.couplet.json"), theirs);
    const answer = await put("depots.couplet.json", { text: depotText.replace("Depot supply vs shop demand", "Mine"), baseRevision: base });
    expect(answer.status).toBe(409);
    expect(answer.json?.code).toBe("changed-on-disk");
    expect(answer.json?.currentText).toBe(theirs);
    expect(answer.json?.currentRevision).toBe(await revisionOf("depots.couplet.json"));
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(theirs);
    expect(existsSync(join(root, "depots.couplet.json.previous"))).toBe(false);
  });

  it("PUT /api/study after the file was deleted answers 409 with null current text", async () => {
    const base = await revisionOf("depots.couplet.json");
    rmSync(join(root, "depots.couplet.json"));
    const answer = await put("depots.couplet.json", { text: depotText, baseRevision: base });
    expect(answer.status).toBe(409);
    expect(answer.json).toMatchObject({ currentRevision: null, currentText: null });
    expect(existsSync(join(root, "depots.couplet.json"))).toBe(false);
  });

  it("PUT /api/study with baseRevision null creates a new file and refuses to replace one", async () => {
    const created = await put("data/second.couplet.json", { text: craneText, baseRevision: null });
    expect(created.status).toBe(200);
    expect(readFileSync(join(root, "data", "second.couplet.json"), "utf8")).toBe(craneText);
    const again = await put("data/second.couplet.json", { text: depotText, baseRevision: null });
    expect(again.status).toBe(409);
    expect(readFileSync(join(root, "data", "second.couplet.json"), "utf8")).toBe(craneText);
  });

  it("PUT /api/study of an invalid study answers 422 with every issue's path and leaves the file unchanged", async () => {
    const base = await revisionOf("depots.couplet.json");
    const broken = JSON.parse(depotText);
    broken.seed = -1;
    broken.cells[0].kind = "plot";
    const answer = await put("depots.couplet.json", { text: JSON.stringify(broken), baseRevision: base });
    expect(answer.status).toBe(422);
    expect(answer.json?.code).toBe("invalid-study");
    const paths = (answer.json?.issues as { path: string }[]).map((issue) => issue.path);
    expect(paths).toContain("seed");
    expect(paths).toContain("cells[0].kind");
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(depotText);
  });

  it("PUT /api/study of text that is not JSON answers 422 with the line and column", async () => {
    const base = await revisionOf("depots.couplet.json");
    const answer = await put("depots.couplet.json", { text: "{\n  \"format\": ,\n}", baseRevision: base });
    expect(answer.status).toBe(422);
    expect((answer.json?.issues as { line?: number }[])[0].line).toBe(2);
  });

  it("PUT /api/study of valid but hand-formatted text saves the canonical text and returns it", async () => {
    const base = await revisionOf("depots.couplet.json");
    const compact = JSON.stringify(JSON.parse(depotText));
    const answer = await put("depots.couplet.json", { text: compact, baseRevision: base });
    expect(answer.status).toBe(200);
    expect(answer.json?.canonical).toBe(false);
    expect(answer.json?.text).toBe(depotText);
    // depot-supply is already canonical: the layout, not the content, differed, so nothing was written.
    expect(answer.json?.written).toBe(false);
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(depotText);
  });

  it("PUT /api/study with a malformed body answers 400", async () => {
    expect((await put("depots.couplet.json", { text: 3, baseRevision: null })).status).toBe(400);
    expect((await put("depots.couplet.json", { text: depotText, baseRevision: 7 })).status).toBe(400);
    expect((await api({ method: "PUT", path: "/api/study?path=depots.couplet.json", body: "{not json" })).status).toBe(400);
  });

  it("two PUTs from the same revision at once: one saves, the other gets 409", async () => {
    const base = await revisionOf("depots.couplet.json");
    const a = depotText.replace("Depot supply vs shop demand", "Version A");
    const b = depotText.replace("Depot supply vs shop demand", "Version B");
    const answers = await Promise.all([put("depots.couplet.json", { text: a, baseRevision: base }), put("depots.couplet.json", { text: b, baseRevision: base })]);
    expect(answers.map((answer) => answer.status).sort()).toEqual([200, 409]);
    const winner = answers[0].status === 200 ? a : b;
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(winner);
  });

  it("POST /api/study/copy writes NAME (draft 2), then (draft 3), never replacing a file", async () => {
    const mine = depotText.replace("Depot supply vs shop demand", "Mine");
    const first = await api({ method: "POST", path: "/api/study/copy", body: JSON.stringify({ path: "depots.couplet.json", text: mine }) });
    expect(first.status).toBe(201);
    expect(first.json).toMatchObject({ path: "depots (draft 2).couplet.json", trusted: false });
    const second = await api({ method: "POST", path: "/api/study/copy", body: JSON.stringify({ path: "depots (draft 2).couplet.json", text: mine }) });
    expect(second.json?.path).toBe("depots (draft 3).couplet.json");
    expect(readFileSync(join(root, "depots (draft 2).couplet.json"), "utf8")).toBe(mine);
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(depotText);
    const invalid = await api({ method: "POST", path: "/api/study/copy", body: JSON.stringify({ path: "depots.couplet.json", text: "{}" }) });
    expect(invalid.status).toBe(422);
  });
});

describe("startServer: new studies, trust, files and data", () => {
  it("POST /api/new writes a valid starter study, trusts it, and refuses to overwrite", async () => {
    const made = await api({ method: "POST", path: "/api/new", body: JSON.stringify({ path: "data/fresh.couplet.json", title: "Fresh" }) });
    expect(made.status).toBe(201);
    expect(made.json).toMatchObject({ path: "data/fresh.couplet.json", trusted: true });
    const text = readFileSync(join(root, "data", "fresh.couplet.json"), "utf8");
    expect(parseStudy(text).title).toBe("Fresh");
    expect(made.json?.text).toBe(text);
    const again = await api({ method: "POST", path: "/api/new", body: JSON.stringify({ path: "data/fresh.couplet.json" }) });
    expect(again.status).toBe(409);
    expect((await api({ method: "POST", path: "/api/new", body: JSON.stringify({ path: "depots.couplet.json" }) })).status).toBe(409);
    expect(readFileSync(join(root, "depots.couplet.json"), "utf8")).toBe(depotText);
  });

  it("POST /api/trust records the study with its SHA-256 in the user's trust file and the session then reports trusted", async () => {
    expect((await api({ path: "/api/session" })).json?.trusted).toBe(false);
    const answer = await api({ method: "POST", path: "/api/trust", body: JSON.stringify({ path: "depots.couplet.json" }) });
    expect(answer.status).toBe(200);
    // SHA-256 of the bytes, so a later change by another program drops the trust.
    const sha256 = createHash("sha256").update(readFileSync(join(root, "depots.couplet.json"))).digest("hex");
    expect(JSON.parse(readFileSync(trustFilePath(), "utf8")).studies).toEqual([{ path: join(root, "depots.couplet.json"), sha256 }]);
    expect(existsSync(join(root, ".couplet-trust"))).toBe(false);
    expect((await api({ path: "/api/session" })).json?.trusted).toBe(true);
    expect((await api({ path: "/api/study?path=depots.couplet.json" })).json?.trusted).toBe(true);
  });

  it("a trusted study changed on disk by another program is held again; the editor's own save keeps it trusted", async () => {
    await api({ method: "POST", path: "/api/trust", body: JSON.stringify({ path: "depots.couplet.json" }) });
    const opened = await api({ path: "/api/study?path=depots.couplet.json" });
    const { text, revision } = opened.json as { text: string; revision: string };
    const edited = text.replace('"title": "', '"title": "Edited: ');
    const saved = await api({ method: "PUT", path: "/api/study?path=depots.couplet.json", body: JSON.stringify({ text: edited, baseRevision: revision }) });
    expect(saved.status).toBe(200);
    expect((await api({ path: "/api/session" })).json?.trusted).toBe(true);
    writeFileSync(join(root, "depots.couplet.json"), depotText);
    expect((await api({ path: "/api/session" })).json?.trusted).toBe(false);
  });

  it("a trust file placed in the opened folder trusts nothing", async () => {
    writeFileSync(join(root, ".couplet-trust"), JSON.stringify({ format: "couplet-trust", studies: ["depots.couplet.json"] }));
    expect((await api({ path: "/api/session" })).json?.trusted).toBe(false);
  });

  it("POST /api/trust of a missing study answers 404 and writes nothing", async () => {
    const answer = await api({ method: "POST", path: "/api/trust", body: JSON.stringify({ path: "nothing.couplet.json" }) });
    expect(answer.status).toBe(404);
    expect(existsSync(trustFilePath())).toBe(false);
  });

  it("GET /api/files lists studies and data files but not other files or the editor's own", async () => {
    const answer = await api({ path: "/api/files" });
    expect(answer.status).toBe(200);
    expect(answer.json).toEqual({
      studies: [{ path: "depots.couplet.json", trusted: false }],
      data: [{ path: "data/shops.csv", format: "csv", bytes: 12 }],
      truncated: false,
    });
  });

  it("GET /api/data answers the bytes with a content type by extension", async () => {
    const answer = await api({ path: "/api/data?path=data%2Fshops.csv" });
    expect(answer.status).toBe(200);
    expect(answer.text).toBe("x,y\n1,2\n3,4\n");
    expect(answer.headers["content-type"]).toBe("text/csv; charset=utf-8");
    expect(answer.headers["content-security-policy"]).toMatch(/^default-src 'none'/);
  });

  it("GET /api/data refuses files that are not data (415) and missing ones (404)", async () => {
    expect((await api({ path: "/api/data?path=notes.txt" })).status).toBe(415);
    expect((await api({ path: "/api/data?path=data/none.csv" })).status).toBe(404);
  });

  it("unknown endpoints answer 404 and wrong methods 405 with Allow", async () => {
    expect((await api({ path: "/api/nothing" })).status).toBe(404);
    const answer = await api({ method: "DELETE", path: "/api/study?path=depots.couplet.json" });
    expect(answer.status).toBe(405);
    expect(answer.headers.allow).toBe("GET, PUT");
  });
});
