import { describe, expect, it } from "vitest";
import { draftName } from "../../../cells/server/draft-name";

describe("draftName", () => {
  it("draftName puts (draft N) before .couplet.json", () => {
    expect(draftName("harbour.couplet.json", 2)).toBe("harbour (draft 2).couplet.json");
    expect(draftName("a b.couplet.json", 10)).toBe("a b (draft 10).couplet.json");
  });

  it("draftName renumbers a draft instead of nesting", () => {
    expect(draftName("harbour (draft 2).couplet.json", 3)).toBe("harbour (draft 3).couplet.json");
  });

  it("draftName throws a RangeError for a name that is not a study or n < 2", () => {
    expect(() => draftName("harbour.json", 2)).toThrow(RangeError);
    expect(() => draftName("x/harbour.couplet.json", 2)).toThrow(RangeError);
    expect(() => draftName("harbour.couplet.json", 1)).toThrow("n must be an integer >= 2, got 1");
  });
});
