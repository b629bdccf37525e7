import { describe, expect, it } from "vitest";
import { parkMiller, seededRandom } from "../../../core/random";
import { isCellId } from "../../../cells/document/cell-name";
import { newStudyId } from "../../../cells/document/new-study-id";

describe("newStudyId", () => {
  it("newStudyId with a random source gives six characters, a letter first, valid as a cell id", () => {
    const random = seededRandom(1);
    for (let k = 0; k < 200; k++) {
      const id = newStudyId(random);
      expect(id).toMatch(/^[a-z][a-z0-9]{5}$/);
      expect(isCellId(id)).toBe(true);
    }
  });

  it("newStudyId gives the same ids for the same seed", () => {
    const a = seededRandom(42);
    const b = seededRandom(42);
    expect([newStudyId(a), newStudyId(a)]).toEqual([newStudyId(b), newStudyId(b)]);
  });

  it("newStudyId draws again while the id is taken", () => {
    const first = newStudyId(parkMiller(9));
    const second = newStudyId(parkMiller(9), new Set([first]));
    expect(second).not.toBe(first);
  });

  it("newStudyId lengthens ids when a source keeps colliding", () => {
    // A constant source always draws the same characters: "aaaaaa" is taken, so after
    // 100 tries the id grows to seven characters.
    expect(newStudyId(() => 0, ["aaaaaa"])).toBe("aaaaaaa");
  });

  it("newStudyId with a counter gives c<n in base 36>, skipping taken ids", () => {
    expect(newStudyId(0)).toBe("c0");
    expect(newStudyId(35)).toBe("cz");
    expect(newStudyId(36, ["c10", "c11"])).toBe("c12");
    expect(() => newStudyId(-1)).toThrow(RangeError);
  });
});
