import { describe, expect, it } from "vitest";
import { energyDistance } from "../../../core/energy-distance";
import { pointMeasure } from "../../../core/measure";
import { CellHeldError } from "../../../cells/kinds/cell-error";
import { defineCodeCell, describeCode } from "../../../cells/kinds/code/define";
import { makeStudy, outcome, run, valueOf } from "../study/study-helpers";
import { cellOf, computeContext, defineContext } from "./define-helpers";

// Code cells follow the study format (docs/format.md, "code"): JavaScript whose free
// names are other cells, plus the globals `core` and `Plot`.
const codeCell = (code: string, name = "x") => makeStudy([{ id: "c1", kind: "code", name, settings: { code } }]);

describe("defineCodeCell", () => {
  it("defineCodeCell(code) depends on the code's free names and computes what it returns", async () => {
    const study = codeCell("const k = 2;\nreturn rows.map((r) => r * k + offset);");
    const def = defineCodeCell(cellOf(study, "c1", "code"), defineContext(study));
    expect(def.inputs).toEqual(["rows", "offset"]);
    expect(await def.compute({ rows: [1, 2], offset: 1 }, computeContext())).toEqual([3, 5]);
  });

  it("defineCodeCell(code that does not parse) has no inputs and fails with the line and column", async () => {
    const study = codeCell("const a = 1;\nreturn a +;");
    const def = defineCodeCell(cellOf(study, "c1", "code"), defineContext(study));
    expect(def.inputs).toEqual([]);
    await expect(def.compute({}, computeContext())).rejects.toThrow("Unexpected token (line 2, column 11)");
  });

  it("defineCodeCell(code, runCode false) has no inputs and throws CellHeldError instead of running", async () => {
    const study = codeCell("globalThis.ran = true; 1");
    const def = defineCodeCell(cellOf(study, "c1", "code"), defineContext(study, { runCode: false }));
    expect(def.inputs).toEqual([]);
    await expect(def.compute({}, computeContext())).rejects.toBeInstanceOf(CellHeldError);
    expect((globalThis as { ran?: boolean }).ran).toBeUndefined();
  });

  it("runStudy(code using core) sees the transport core as `core` (energy distance of two data cells)", async () => {
    const study = makeStudy([
      { id: "d1", kind: "data", name: "a", settings: { from: "inline", points: [[0], [1]] } },
      { id: "d2", kind: "data", name: "b", settings: { from: "inline", points: [[2], [4]] } },
      { id: "c1", kind: "code", name: "gap", settings: { code: "core.energyDistance(a, b)" } },
      { id: "c2", kind: "code", name: "version", settings: { code: "core.CORE_VERSION" } },
    ]);
    const result = await run(study);
    expect(valueOf(result, "c1")).toBe(energyDistance(pointMeasure([[0], [1]]), pointMeasure([[2], [4]])));
    expect(typeof valueOf(result, "c2")).toBe("string");
  });

  it("runStudy(code with a typo) fails that cell with the unknown name and leaves the others done", async () => {
    const study = makeStudy([
      { id: "c1", kind: "code", name: "a", settings: { code: "1 + 1" } },
      { id: "c2", kind: "code", name: "b", settings: { code: "a + missingName" } },
      { id: "c3", kind: "code", name: "c", settings: { code: "b * 2" } },
    ]);
    const result = await run(study);
    expect(valueOf(result, "c1")).toBe(2);
    expect(outcome(result, "c2")).toMatchObject({ status: "failed", error: { cause: 'unknown name "missingName"' } });
    expect(outcome(result, "c3")).toMatchObject({ status: "failed", error: { cause: 'failed input "b"' } });
  });

  it("describeCode(cell, value) gives the value in one line", () => {
    const study = codeCell("1");
    const cell = cellOf(study, "c1", "code");
    expect(describeCode(cell, 1 / 3).headline).toBe("0.333333");
    expect(describeCode(cell, [1, 2, 3]).headline).toBe("[3 items]");
    expect(describeCode(cell, pointMeasure([[0, 1]])).headline).toBe("1 point in 2-D");
    expect(describeCode(cell, (x: number) => x).headline).toBe("function");
  });
});
