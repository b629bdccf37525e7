import { describe, expect, it } from "vitest";
import { checkSeedSetting, deriveCellSeed, deriveSeed, fnv1a32, usesStudySeed } from "../../../cells/document/seed";
import type { StudyIssue } from "../../../cells/document/study-issue";

describe("fnv1a32", () => {
  it("fnv1a32 matches the published FNV-1a 32-bit test vectors", () => {
    // Test vectors of the FNV reference code (Fowler, Noll & Vo; also in the IETF draft
    // "The FNV Non-Cryptographic Hash Algorithm", Eastlake et al.), values from memory,
    // re-checked with an independent Python implementation of the same definition.
    expect(fnv1a32("")).toBe(0x811c9dc5);
    expect(fnv1a32("a")).toBe(0xe40c292c);
    expect(fnv1a32("foobar")).toBe(0xbf9cf968);
  });

  it("fnv1a32 hashes the UTF-8 bytes of non-ASCII text", () => {
    // "é" is the two bytes C3 A9 in UTF-8 (RFC 3629).
    const manual = Math.imul(Math.imul(0x811c9dc5 ^ 0xc3, 0x01000193) >>> 0 ^ 0xa9, 0x01000193) >>> 0;
    expect(fnv1a32("é")).toBe(manual);
  });
});

describe("deriveSeed", () => {
  it("deriveSeed hashes \"<base>:<label>\" and gives a 32-bit unsigned integer", () => {
    expect(deriveSeed(20261201, "k7q2")).toBe(fnv1a32("20261201:k7q2"));
    expect(deriveCellSeed(20261201, "k7q2")).toBe(deriveSeed(20261201, "k7q2"));
    const s = deriveSeed(1, "x");
    expect(Number.isInteger(s) && s >= 0 && s <= 4294967295).toBe(true);
  });

  it("deriveSeed gives different seeds to different cells and replicates", () => {
    const seeds = new Set(["a", "b", "c", "replicate-0", "replicate-1"].map((label) => deriveSeed(7, label)));
    expect(seeds.size).toBe(5);
  });
});

describe("checkSeedSetting", () => {
  it("checkSeedSetting accepts integers in range, references and \"study\"", () => {
    const issues: StudyIssue[] = [];
    for (const v of [0, 4294967295, { param: "s" }, "study"]) checkSeedSetting(v, "seed", issues);
    expect(issues).toEqual([]);
  });

  it("checkSeedSetting reports out-of-range and malformed seeds", () => {
    const issues: StudyIssue[] = [];
    for (const v of [-1, 2 ** 32, 0.5, "random", null]) checkSeedSetting(v, "seed", issues);
    expect(issues.map((i) => i.message)).toEqual([
      "must be >= 0, got -1",
      "must be <= 4294967295, got 4294967296",
      "must be an integer, got 0.5",
      'must be an integer seed, a reference {"param": name} or "study", got "random"',
      'must be an integer seed, a reference {"param": name} or "study", got null',
    ]);
  });

  it("usesStudySeed is true for an omitted seed and for \"study\" only", () => {
    expect([undefined, "study", 3, { param: "s" }].map((s) => usesStudySeed(s as never))).toEqual([true, true, false, false]);
  });
});
