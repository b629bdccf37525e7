import { describe, expect, it } from "vitest";
import { CELL_KIND_NAMES, createStudy, updateStudy } from "../../../cells/document";
import { duplicateCell, freeCellName, newCell } from "../../../cells/editor/model/new-cell";

describe("new cells", () => {
  it("newCell gives a valid cell of every kind that updateStudy accepts", () => {
    let study = createStudy({ title: "t" });
    CELL_KIND_NAMES.forEach((kind, k) => {
      study = updateStudy(study, [{ type: "insert-cell", cell: newCell(kind, `c${k}`, study) }]).study;
    });
    expect(study.cells.map((c) => c.kind)).toEqual([...CELL_KIND_NAMES]);
  });

  it("newCell for a transport takes the first two data cells", () => {
    let study = createStudy();
    study = updateStudy(study, [
      { type: "insert-cell", cell: newCell("data", "d1", study) },
      { type: "insert-cell", cell: { ...newCell("data", "d2", study), name: "other" } },
    ]).study;
    expect(newCell("transport", "t1", study).settings).toMatchObject({ source: "cloud", target: "other" });
  });

  it("freeCellName adds the first free number", () => {
    const study = updateStudy(createStudy(), [{ type: "insert-cell", cell: newCell("parameter", "p", createStudy()) }]).study;
    expect(freeCellName(study, "knob")).toBe("knob2");
    expect(freeCellName(study, "class")).toBe("class2");
  });

  it("duplicateCell gives the copy a new id and a free name", () => {
    const study = updateStudy(createStudy(), [{ type: "insert-cell", cell: newCell("data", "d1", createStudy()) }]).study;
    const copy = duplicateCell(study.cells[0], "d2", study);
    expect(copy).toMatchObject({ id: "d2", name: "cloud2", settings: study.cells[0].settings });
    expect(() => updateStudy(study, [{ type: "insert-cell", cell: copy }])).not.toThrow();
  });
});
