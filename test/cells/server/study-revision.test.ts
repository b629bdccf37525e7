import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { sameContent, studyRevision } from "../../../cells/server/study-revision";

describe("studyRevision", () => {
  it("studyRevision is the sha256 of the bytes and the modification time", () => {
    // SHA-256 of "abc" (FIPS 180-2, appendix B.1 test vector).
    expect(studyRevision(new TextEncoder().encode("abc"), 1700000000123.5)).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad:1700000000123.5");
    expect(createHash("sha256").update("abc").digest("hex")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });

  it("sameContent compares the hashes and ignores the time", () => {
    const bytes = new TextEncoder().encode("{}");
    expect(sameContent(studyRevision(bytes, 1), studyRevision(bytes, 2))).toBe(true);
    expect(sameContent(studyRevision(bytes, 1), studyRevision(new TextEncoder().encode("{ }"), 1))).toBe(false);
    expect(sameContent("", "")).toBe(false);
    expect(sameContent("garbage", "garbage")).toBe(false);
  });
});
