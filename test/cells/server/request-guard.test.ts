import { describe, expect, it } from "vitest";
import { HttpError } from "../../../cells/server/http-error";
import { checkApiRequest, checkHost, checkToken, tokenCookie } from "../../../cells/server/request-guard";

function codeOf(run: () => unknown): string | undefined {
  try {
    run();
  } catch (error) {
    return error instanceof HttpError ? error.code : "other";
  }
  return undefined;
}

describe("checkHost", () => {
  it("checkHost accepts 127.0.0.1:PORT and localhost:PORT, in any letter case", () => {
    for (const host of ["127.0.0.1:5000", "localhost:5000", "LocalHost:5000"]) expect(codeOf(() => checkHost({ host }, 5000)), host).toBeUndefined();
  });

  it("checkHost refuses other names, ports and a missing Host (DNS rebinding defence; common practice, no source)", () => {
    for (const host of [undefined, "", "127.0.0.1", "127.0.0.1:5001", "evil.example:5000", "localhost.evil.example:5000", "[::1]:5000", "0.0.0.0:5000"]) {
      expect(codeOf(() => checkHost({ host }, 5000)), String(host)).toBe("host-not-allowed");
    }
  });
});

describe("checkToken", () => {
  const token = "s3cret-token-value";
  it("checkToken prefers the header, then the page's ?token=, then the cookie of this port", () => {
    expect(checkToken({ "x-couplet-token": token }, 5000, token)).toBe("header");
    expect(checkToken({}, 5000, token, token)).toBe("query");
    expect(checkToken({ cookie: `a=b; couplet-token-5000=${token}; c=d` }, 5000, token)).toBe("cookie");
  });

  it("checkToken refuses a missing token, a wrong one, and the cookie of another port", () => {
    expect(codeOf(() => checkToken({}, 5000, token))).toBe("token-missing");
    expect(codeOf(() => checkToken({ "x-couplet-token": "wrong" }, 5000, token))).toBe("token-wrong");
    expect(codeOf(() => checkToken({ cookie: `couplet-token-5001=${token}` }, 5000, token))).toBe("token-missing");
    expect(codeOf(() => checkToken({ "x-couplet-token": "wrong", cookie: `couplet-token-5000=${token}` }, 5000, token))).toBe("token-wrong");
  });

  it("tokenCookie is HttpOnly and SameSite=Strict, for the whole site path", () => {
    expect(tokenCookie(5000, token)).toBe(`couplet-token-5000=${token}; Path=/; HttpOnly; SameSite=Strict`);
  });
});

describe("checkApiRequest", () => {
  it("checkApiRequest lets reads through from the page itself or a program", () => {
    expect(codeOf(() => checkApiRequest("GET", {}, 5000, "cookie"))).toBeUndefined();
    expect(codeOf(() => checkApiRequest("GET", { "sec-fetch-site": "same-origin" }, 5000, "cookie"))).toBeUndefined();
  });

  it("checkApiRequest refuses requests a browser marks as coming from another site or port", () => {
    expect(codeOf(() => checkApiRequest("GET", { "sec-fetch-site": "same-site" }, 5000, "header"))).toBe("cross-site-request");
    expect(codeOf(() => checkApiRequest("GET", { "sec-fetch-site": "cross-site" }, 5000, "cookie"))).toBe("cross-site-request");
  });

  it("checkApiRequest checks the Origin of writes", () => {
    expect(codeOf(() => checkApiRequest("PUT", { origin: "http://127.0.0.1:5000" }, 5000, "cookie"))).toBeUndefined();
    expect(codeOf(() => checkApiRequest("POST", { origin: "http://localhost:5000" }, 5000, "cookie"))).toBeUndefined();
    expect(codeOf(() => checkApiRequest("PUT", { origin: "http://127.0.0.1:5001" }, 5000, "header"))).toBe("origin-not-allowed");
    expect(codeOf(() => checkApiRequest("PUT", { origin: "null" }, 5000, "header"))).toBe("origin-not-allowed");
    expect(codeOf(() => checkApiRequest("PUT", {}, 5000, "cookie"))).toBe("origin-missing");
    expect(codeOf(() => checkApiRequest("PUT", {}, 5000, "header"))).toBeUndefined();
  });
});
