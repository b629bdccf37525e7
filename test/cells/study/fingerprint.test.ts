import { sha256 } from "@noble/hashes/sha2.js";
import { bytesToHex } from "@noble/hashes/utils.js";
import { describe, expect, it } from "vitest";
import { fingerprint } from "../../../cells/study/fingerprint";

describe("fingerprint", () => {
  it("sha256 (the hash under fingerprint) gives the FIPS 180-2 example digest of 'abc'", () => {
    // FIPS 180-2, Appendix B.1: SHA-256("abc") = ba7816bf 8f01cfea 414140de 5dae2223 b00361a3 96177a9c b410ff61 f20015ad.
    expect(bytesToHex(sha256(new TextEncoder().encode("abc")))).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });

  it("fingerprint(value) is 'sha256:' and 64 hex digits, the same for equal values", () => {
    const value = { a: [1, 2.5, "x"], b: Float64Array.of(0.1, 0.2), c: null, d: true };
    expect(fingerprint(value)).toMatch(/^sha256:[0-9a-f]{64}$/);
    expect(fingerprint(structuredClone(value))).toBe(fingerprint(value));
  });

  it("fingerprint(object) ignores key order and undefined fields", () => {
    expect(fingerprint({ a: 1, b: 2 })).toBe(fingerprint({ b: 2, a: 1, c: undefined }));
  });

  it("fingerprint(value) changes with the last bit of a number, a typed array's type, and nesting", () => {
    const base = fingerprint([0.1]);
    expect(fingerprint([0.1 + 2 ** -56])).not.toBe(base);
    expect(fingerprint(Float64Array.of(0.1))).not.toBe(base);
    expect(fingerprint(Float32Array.of(0.1))).not.toBe(fingerprint(Float64Array.of(0.1)));
    expect(fingerprint([["ab"]])).not.toBe(fingerprint([["a", "b"]]));
    expect(fingerprint({ a: "1" })).not.toBe(fingerprint({ a: 1 }));
  });

  it("fingerprint(a function) throws a TypeError naming where it is", () => {
    expect(() => fingerprint({ f: () => 1 })).toThrow("fingerprint: value.f is a function, which has no stable bytes");
  });
});
