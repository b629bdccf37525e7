import { describe, expect, it } from "vitest";
import { TOKEN_BYTES, newSessionToken, tokensMatch } from "../../../cells/server/session-token";

describe("newSessionToken", () => {
  it("newSessionToken gives 32 random bytes as unpadded base64url (RFC 4648, section 5)", () => {
    const token = newSessionToken();
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(token, "base64url")).toHaveLength(TOKEN_BYTES);
    // At least 128 bits: the usual bar for an unguessable secret (common practice, no source).
    expect(TOKEN_BYTES * 8).toBeGreaterThanOrEqual(128);
  });

  it("newSessionToken never repeats over 1000 draws", () => {
    expect(new Set(Array.from({ length: 1000 }, newSessionToken)).size).toBe(1000);
  });
});

describe("tokensMatch", () => {
  it("tokensMatch accepts the same token and refuses any other, whatever its length", () => {
    const token = newSessionToken();
    expect(tokensMatch(token, token)).toBe(true);
    expect(tokensMatch(`${token}`.slice(0), token)).toBe(true);
    for (const other of [newSessionToken(), token.slice(1), `${token}=`, token.toUpperCase(), " ".repeat(43)]) expect(tokensMatch(other, token)).toBe(false);
  });

  it("tokensMatch refuses a missing or empty token", () => {
    expect(tokensMatch(undefined, "abc")).toBe(false);
    expect(tokensMatch(null, "abc")).toBe(false);
    expect(tokensMatch("", "")).toBe(false);
  });
});
