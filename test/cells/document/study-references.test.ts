import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseStudy } from "../../../cells/document/parse-study";
import { cellDependencies, referenceIssues } from "../../../cells/document/study-references";
import { updateStudy } from "../../../cells/document/update-study";

const depots = parseStudy(readFileSync(new URL("../../fixtures/studies/depot-supply.couplet.json", import.meta.url), "utf8"));
const every = parseStudy(readFileSync(new URL("../../fixtures/studies/every-kind.couplet.json", import.meta.url), "utf8"));

describe("cellDependencies", () => {
  it("cellDependencies reads each kind's typed references", () => {
    const deps = Object.fromEntries(depots.cells.map((c) => [c.id, cellDependencies(c)]));
    expect(deps).toEqual({
      p1: ["eps", "plan"],
      k7q2: [],
      d1: [],
      d2: [],
      t1: ["depots", "shops", "eps"],
      f1: ["plan"],
      s1: ["plan"],
      f2: ["epsSweep"],
      tb1: ["epsSweep"],
    });
  });
});

describe("referenceIssues", () => {
  it("referenceIssues finds nothing in studies whose references all resolve", () => {
    expect(referenceIssues(depots)).toEqual([]);
    expect(referenceIssues(every)).toEqual([]);
  });

  it("referenceIssues reports names no cell has and references to the cell itself", () => {
    const { study } = updateStudy(depots, [
      { type: "rename", id: "d2", name: "stores", updateReferences: false },
      { type: "set-setting", id: "t1", path: "tolerance", value: { param: "plan" } },
    ]);
    expect(referenceIssues(study)).toEqual([
      { path: "cells[4].settings", message: 'refers to "shops", but no cell has that name' },
      { path: "cells[4].settings", message: 'refers to its own name "plan"' },
    ]);
  });
});
