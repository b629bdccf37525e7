import { describe, expect, it } from "vitest";
import { cellDependencies, parseStudy, referenceIssues, serializeStudy } from "../../../cells/document";
import { STARTER_TITLE, starterStudy } from "../../../cells/study/starter-study";

describe("starterStudy", () => {
  it("starterStudy() is a valid study that survives a save and a load unchanged", () => {
    const study = starterStudy();
    const text = serializeStudy(study);
    expect(serializeStudy(parseStudy(text))).toBe(text);
    expect(study.title).toBe(STARTER_TITLE);
    expect(study.receipts).toBeUndefined();
  });

  it("starterStudy() has the promised cells and no reference to a missing cell", () => {
    const study = starterStudy();
    expect(study.cells.map((c) => `${c.kind}:${c.name ?? c.id}`)).toEqual([
      "prose:intro",
      "parameter:eps",
      "data:morning",
      "data:evening",
      "transport:moved",
      "transport:gap",
      "figure:lines",
      "figure:converge",
      "prose:findings",
    ]);
    expect(referenceIssues(study)).toEqual([]);
    const gap = study.cells.find((c) => c.name === "gap")!;
    expect(gap.settings).toMatchObject({ method: "debiased", epsilon: { relative: { param: "eps" }, reference: "median" } });
    // The closing prose quotes live values of both transports and of the parameter.
    expect(cellDependencies(study.cells.find((c) => c.id === "findings")!).sort()).toEqual(["eps", "gap", "moved"]);
  });

  it("starterStudy({title}) uses the title, and a title holding @{ is not read as a live value", () => {
    const study = starterStudy({ title: "Pickups @{not_a_value}" });
    expect(study.title).toBe("Pickups @{not_a_value}");
    expect(cellDependencies(study.cells[0])).toEqual([]);
  });
});
