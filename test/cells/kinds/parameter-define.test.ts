import { describe, expect, it } from "vitest";
import { defineParameterCell, describeParameter } from "../../../cells/kinds/parameter/define";
import { makeStudy } from "../study/study-helpers";
import { cellOf, computeContext, defineContext } from "./define-helpers";

// Behaviour checked against the study format's own rules (docs/format.md, "parameter"):
// a parameter's value is the cell's value; no outside source applies.
const study = makeStudy([
  { id: "k1", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.05, min: 0.001, max: 1, unit: "× median" } },
  { id: "k2", kind: "parameter", name: "method", settings: { control: "choice", value: "exact", options: ["exact", "debiased"] } },
]);

describe("defineParameterCell", () => {
  it("defineParameterCell(cell) has no inputs and computes the written value", () => {
    const def = defineParameterCell(cellOf(study, "k1", "parameter"), defineContext(study));
    expect(def).toMatchObject({ id: "k1", name: "eps", inputs: [] });
    expect(def.compute({}, computeContext())).toBe(0.05);
  });

  it("defineParameterCell(cell, {overrides}) computes the override and changes the version key", () => {
    const plain = defineParameterCell(cellOf(study, "k1", "parameter"), defineContext(study));
    const over = defineParameterCell(cellOf(study, "k1", "parameter"), defineContext(study, { overrides: new Map([["eps", 0.2]]) }));
    expect(over.compute({}, computeContext())).toBe(0.2);
    expect(over.version).not.toBe(plain.version);
  });

  it("describeParameter(cell, value) gives 'name = value unit', text quoted", () => {
    expect(describeParameter(cellOf(study, "k1", "parameter"), 0.05).headline).toBe("eps = 0.05 × median");
    expect(describeParameter(cellOf(study, "k2", "parameter"), "exact").headline).toBe('method = "exact"');
  });
});
