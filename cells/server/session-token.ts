import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

/** Random bytes in a session token: 32 bytes = 256 bits (at least 128 is the usual bar for an unguessable secret; common practice, no source). */
export const TOKEN_BYTES = 32;

/**
 * A fresh per-run secret for the local server: {@link TOKEN_BYTES} bytes from the
 * operating system's secure random source, as base64url (43 characters, no padding),
 * so it can sit in a URL query and a cookie without escaping.
 */
export function newSessionToken(): string {
  return randomBytes(TOKEN_BYTES).toString("base64url");
}

function digest(text: string): Buffer {
  return createHash("sha256").update(text, "utf8").digest();
}

/**
 * True when `given` equals `expected`, compared in time that does not depend on
 * where they first differ or on the length of `given`: both are hashed to 32 bytes
 * first, then compared with crypto.timingSafeEqual (which itself needs equal
 * lengths). A missing token (`undefined`, `""`) never matches.
 */
export function tokensMatch(given: string | undefined | null, expected: string): boolean {
  if (typeof given !== "string" || given.length === 0 || expected.length === 0) return false;
  return timingSafeEqual(digest(given), digest(expected));
}
