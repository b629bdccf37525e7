import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { seededRandom } from "../../../core/random";
import { newStudyId } from "../../../cells/document/new-study-id";
import { parseStudy } from "../../../cells/document/parse-study";
import { serializeStudy } from "../../../cells/document/serialize-study";
import { StudyFormatError } from "../../../cells/document/study-issue";
import type { Cell, StudyDocument } from "../../../cells/document/study-types";
import { type StudyChange, updateStudy } from "../../../cells/document/update-study";

const fixture = (name: string) => parseStudy(readFileSync(new URL(`../../fixtures/studies/${name}`, import.meta.url), "utf8"));
const depots = fixture("depot-supply.couplet.json");
const every = fixture("every-kind.couplet.json");
const ids = (s: StudyDocument) => s.cells.map((c) => c.id);
const cell = (s: StudyDocument, id: string) => s.cells.find((c) => c.id === id) as Cell & { settings: Record<string, any> };

function issuesOf(run: () => unknown) {
  try {
    run();
  } catch (error) {
    if (error instanceof StudyFormatError) return error.issues;
    throw error;
  }
  throw new Error("no StudyFormatError");
}

const codeCell = (id: string, name?: string): Cell => ({ id, kind: "code", ...(name ? { name } : {}), settings: { code: "return 1" } }) as Cell;

describe("updateStudy", () => {
  it("updateStudy set-setting changes one setting in place and reports the cell", () => {
    const { study, changed } = updateStudy(depots, [{ type: "set-setting", id: "t1", path: "tolerance", value: 1e-8 }]);
    expect(cell(study, "t1").settings.tolerance).toBe(1e-8);
    expect(Object.keys(cell(study, "t1").settings)).toEqual(Object.keys(cell(depots, "t1").settings));
    expect([...changed]).toEqual(["t1"]);
    expect(cell(depots, "t1").settings.tolerance).toBe(1e-6);
  });

  it("updateStudy set-setting reaches nested settings by dotted or array path and creates missing objects", () => {
    let s = updateStudy(depots, [{ type: "set-setting", id: "t1", path: ["massPenalty", "target"], value: 4 }]).study;
    expect(cell(s, "t1").settings.massPenalty).toEqual({ source: 1, target: 4 });
    s = updateStudy(depots, [{ type: "set-setting", id: "d1", path: "components.1.weight", value: 3 }]).study;
    expect(cell(s, "d1").settings.components[1].weight).toBe(3);
    s = updateStudy(depots, [{ type: "set-setting", id: "f1", path: "options.extra.deep", value: "x" }]).study;
    expect(cell(s, "f1").settings.options.extra).toEqual({ deep: "x" });
  });

  it("updateStudy set-setting with undefined removes the key", () => {
    const { study } = updateStudy(depots, [{ type: "set-setting", id: "t1", path: "warmStart", value: undefined }]);
    expect("warmStart" in cell(study, "t1").settings).toBe(false);
  });

  it("updateStudy shares unchanged cells and returns the same study when nothing changes", () => {
    const { study } = updateStudy(depots, [{ type: "set-setting", id: "t1", path: "tolerance", value: 1e-8 }]);
    study.cells.forEach((c, i) => {
      if (c.id !== "t1") expect(c).toBe(depots.cells[i]);
    });
    const same = updateStudy(depots, [{ type: "set-setting", id: "t1", path: "tolerance", value: 1e-6 }, { type: "set-title", title: depots.title }]);
    expect(same.study).toBe(depots);
    expect(same.changed.size).toBe(0);
  });

  it("updateStudy returns a frozen study and does not keep the caller's value objects", () => {
    const value = { relative: 0.2, reference: "max" };
    const { study } = updateStudy(depots, [{ type: "set-setting", id: "t1", path: "epsilon", value }]);
    expect(Object.isFrozen(study)).toBe(true);
    expect(Object.isFrozen(cell(study, "t1").settings.epsilon)).toBe(true);
    expect(Object.isFrozen(value)).toBe(false);
    value.relative = 9;
    expect(cell(study, "t1").settings.epsilon.relative).toBe(0.2);
  });

  it("updateStudy validates the result and changes nothing on failure", () => {
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-setting", id: "t1", path: "epsilon.relative", value: 0 }]))).toEqual([
      { path: "cells[4].settings.epsilon.relative", message: "must be > 0, got 0" },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-setting", id: "k7q2", path: "value", value: 5 }]))).toEqual([
      { path: "cells[1].settings.value", message: "must be within [0.001, 1], got 5" },
    ]);
    expect(cell(depots, "k7q2").settings.value).toBe(0.05);
  });

  it("updateStudy validates once after all changes, so a list may pass through invalid states", () => {
    const { study } = updateStudy(depots, [
      { type: "set-setting", id: "k7q2", path: "value", value: 5 },
      { type: "set-setting", id: "k7q2", path: "max", value: 10 },
    ]);
    expect(cell(study, "k7q2").settings).toMatchObject({ value: 5, max: 10 });
  });

  it("updateStudy reports a change that cannot apply by its index in the list", () => {
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-title", title: "x" }, { type: "remove-cell", id: "zz" }]))).toEqual([
      { path: "changes[1].id", message: 'no cell has id "zz"' },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "move-cell", id: "t1", index: 9 }]))).toEqual([{ path: "changes[0].index", message: "must be an integer in [0, 8], got 9" }]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "insert-cell", cell: codeCell("z"), index: -1 }]))).toEqual([
      { path: "changes[0].index", message: "must be an integer in [0, 9], got -1" },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-setting", id: "t1", path: "tolerance", value: Number.NaN }]))).toEqual([
      { path: "changes[0].value", message: "must be a finite number (JSON has no NaN)" },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-setting", id: "t1", path: "tolerance.x", value: 1 }]))).toEqual([
      { path: "changes[0].path", message: 'tolerance is 0.000001, not an object: cannot set "x" inside it' },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-setting", id: "t1", path: "", value: 1 }]))).toEqual([
      { path: "changes[0].path", message: 'must name a setting such as "epsilon.relative", got ""' },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "paint" } as unknown as StudyChange]))[0].path).toBe("changes[0].type");
  });

  it("updateStudy insert-cell adds a cell with fields in the usual order, then remove-cell gives back an equal study", () => {
    const inserted = updateStudy(depots, [{ type: "insert-cell", cell: { settings: { code: "1" }, note: "n", kind: "code", id: "c9", name: "nine" } as unknown as Cell, index: 2 }]);
    expect(ids(inserted.study)).toEqual(["p1", "k7q2", "c9", "d1", "d2", "t1", "f1", "s1", "f2", "tb1"]);
    expect(Object.keys(inserted.study.cells[2])).toEqual(["id", "kind", "name", "settings", "note"]);
    expect([...inserted.changed]).toEqual(["c9"]);
    const removed = updateStudy(inserted.study, [{ type: "remove-cell", id: "c9" }]).study;
    expect(removed).toEqual(depots);
    expect(serializeStudy(removed)).toBe(serializeStudy(depots));
  });

  it("updateStudy insert-cell rejects a duplicate id or name and a bad cell", () => {
    expect(issuesOf(() => updateStudy(depots, [{ type: "insert-cell", cell: codeCell("t1") }]))).toEqual([{ path: "cells[9].id", message: 'duplicate id "t1" (also used by cells[4])' }]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "insert-cell", cell: codeCell("c1", "plan") }]))).toEqual([
      { path: "cells[9].name", message: 'duplicate name "plan" (also used by cells[4])' },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "insert-cell", cell: { id: "c1", kind: "code", settings: {} } as Cell }]))).toEqual([
      { path: "cells[9].settings.code", message: "missing (required)" },
    ]);
  });

  it("updateStudy remove-cell drops the cell's receipt too", () => {
    const { study, changed } = updateStudy(depots, [{ type: "remove-cell", id: "t1" }]);
    expect(study.receipts).toEqual({});
    expect([...changed]).toEqual(["t1"]);
  });

  it("updateStudy move-cell permutes the cells, over 200 seeded random move lists", () => {
    const random = seededRandom(7);
    for (let trial = 0; trial < 200; trial++) {
      const changes: StudyChange[] = [];
      for (let k = 0, n = 1 + Math.floor(random() * 6); k < n; k++) {
        changes.push({ type: "move-cell", id: every.cells[Math.floor(random() * every.cells.length)].id, index: Math.floor(random() * every.cells.length) });
      }
      const { study } = updateStudy(every, changes);
      const input = `trial ${trial}: ${JSON.stringify(changes)}`;
      expect([input, [...ids(study)].sort()]).toEqual([input, [...ids(every)].sort()]);
      for (const c of study.cells) expect(c).toBe(every.cells.find((o) => o.id === c.id));
      // Moving each cell back to its old index restores the study.
      const back = every.cells.map((c, i): StudyChange => ({ type: "move-cell", id: c.id, index: i }));
      expect([input, ids(updateStudy(study, back).study)]).toEqual([input, ids(every)]);
    }
  });

  it("updateStudy move-cell puts the cell at the given final index", () => {
    expect(ids(updateStudy(depots, [{ type: "move-cell", id: "p1", index: 3 }]).study).slice(0, 5)).toEqual(["k7q2", "d1", "d2", "p1", "t1"]);
    expect(ids(updateStudy(depots, [{ type: "move-cell", id: "tb1", index: 0 }]).study)[0]).toBe("tb1");
    expect(updateStudy(depots, [{ type: "move-cell", id: "d1", index: 2 }]).study).toBe(depots);
  });

  it("updateStudy insert then remove gives back an equal study, over 100 seeded random cells and places", () => {
    const random = seededRandom(11);
    for (let trial = 0; trial < 100; trial++) {
      const id = newStudyId(random, new Set(ids(every)));
      const index = Math.floor(random() * (every.cells.length + 1));
      const added = updateStudy(every, [{ type: "insert-cell", cell: codeCell(id, `v${id}`), index }]).study;
      expect(added.cells[index].id).toBe(id);
      expect(updateStudy(added, [{ type: "remove-cell", id }]).study).toEqual(every);
    }
  });

  it("updateStudy rename rewrites typed references in other cells and reports them", () => {
    const { study, changed } = updateStudy(depots, [{ type: "rename", id: "k7q2", name: "epsRel" }]);
    expect(cell(study, "k7q2").name).toBe("epsRel");
    expect(cell(study, "t1").settings.epsilon.relative).toEqual({ param: "epsRel" });
    expect(cell(study, "p1").settings.text).toContain("@{epsRel:3f}");
    expect([...changed].sort()).toEqual(["k7q2", "p1", "t1"]);
  });

  it("updateStudy rename of a transport follows it into figures, sweeps, tables and prose", () => {
    const { study } = updateStudy(depots, [{ type: "rename", id: "t1", name: "route" }]);
    expect(cell(study, "f1").settings.of).toEqual(["route"]);
    expect(cell(study, "s1").settings.transport).toBe("route");
    expect(cell(study, "p1").settings.text).toContain("@{route.values.cost:4}");
  });

  it("updateStudy rename with updateReferences false leaves other cells alone", () => {
    const { study, changed } = updateStudy(depots, [{ type: "rename", id: "k7q2", name: "epsRel", updateReferences: false }]);
    expect(cell(study, "t1")).toBe(cell(depots, "t1"));
    expect([...changed]).toEqual(["k7q2"]);
  });

  it("updateStudy rename rejects invalid, reserved and taken names", () => {
    // The rewritten references are reported too: every place the bad name would land.
    expect(issuesOf(() => updateStudy(depots, [{ type: "rename", id: "k7q2", name: "new" }]))).toEqual([
      { path: "cells[0].settings.text", message: 'line 3, column 16: live value "@{new:3f}": "new" is reserved in JavaScript and cannot name a cell' },
      { path: "cells[1].name", message: '"new" cannot be a cell name: it is reserved in JavaScript' },
      { path: "cells[4].settings.epsilon.relative.param", message: '"new" cannot be a cell name: it is reserved in JavaScript' },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "rename", id: "k7q2", name: "shops" }]))).toEqual([
      { path: "cells[3].name", message: 'duplicate name "shops" (also used by cells[1])' },
    ]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "rename", id: "k7q2", name: undefined }]))).toEqual([
      { path: "cells[1].name", message: "missing (required for a parameter cell: other cells refer to it by name)" },
    ]);
  });

  it("updateStudy can swap two names within one change list, references following their cells", () => {
    const { study } = updateStudy(depots, [
      { type: "rename", id: "d1", name: "tmp" },
      { type: "rename", id: "d2", name: "depots" },
      { type: "rename", id: "d1", name: "shops" },
    ]);
    // t1 still draws from d1 (now "shops") to d2 (now "depots").
    expect(cell(study, "t1").settings).toMatchObject({ source: "shops", target: "depots" });
    expect([cell(study, "d1").name, cell(study, "d2").name]).toEqual(["shops", "depots"]);
  });

  it("updateStudy set-seed reports the cells whose randomness derives from the study seed", () => {
    const { study, changed } = updateStudy(depots, [{ type: "set-seed", seed: 1 }]);
    expect(study.seed).toBe(1);
    // d1 (mixture, seed omitted) and s1 (sweep, seed omitted) derive theirs; d2 has seed 7.
    expect([...changed].sort()).toEqual(["d1", "s1"]);
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-seed", seed: -1 }]))).toEqual([{ path: "seed", message: "must be >= 0, got -1" }]);
  });

  it("updateStudy set-title and set-about change no cell and keep field order", () => {
    const { study, changed } = updateStudy(depots, [{ type: "set-title", title: "New" }, { type: "set-about", about: undefined }]);
    expect(changed.size).toBe(0);
    expect(Object.keys(study)).toEqual(["format", "formatVersion", "title", "seed", "cells", "receipts"]);
    const back = updateStudy(study, [{ type: "set-about", about: "x" }]).study;
    expect(Object.keys(back)).toEqual(["format", "formatVersion", "title", "about", "seed", "cells", "receipts"]);
  });

  it("updateStudy set-receipt records and drops receipts, checked for shape", () => {
    const receipt = { fingerprint: "f2", settings: {}, coreVersion: "0.1.0", summary: { cost: 1 }, seconds: 0.5, recordedAt: "2026-12-02T08:00:00Z" };
    const { study, changed } = updateStudy(depots, [{ type: "set-receipt", id: "d1", receipt }]);
    expect(study.receipts?.d1).toEqual(receipt);
    expect(changed.size).toBe(0);
    expect(updateStudy(study, [{ type: "set-receipt", id: "d1", receipt: undefined }]).study).toEqual(depots);
    expect(issuesOf(() => updateStudy(depots, [{ type: "set-receipt", id: "d1", receipt: { ...receipt, seconds: -1 } }]))).toEqual([
      { path: "receipts.d1.seconds", message: "must be >= 0, got -1" },
    ]);
  });

  it("updateStudy set-settings replaces the whole settings object", () => {
    const { study } = updateStudy(depots, [{ type: "set-settings", id: "f1", settings: { view: "plan-matrix", of: ["plan"] } }]);
    expect(cell(study, "f1").settings).toEqual({ view: "plan-matrix", of: ["plan"] });
  });

  it("updateStudy results serialize and parse back to equal studies", () => {
    const { study } = updateStudy(every, [
      { type: "rename", id: "pb", name: "penalty" },
      { type: "move-cell", id: "intro", index: 10 },
      { type: "set-setting", id: "tc", path: "epsilon", value: { absolute: 0.5 } },
    ]);
    const text = serializeStudy(study);
    expect(parseStudy(text)).toEqual(study);
    expect(serializeStudy(parseStudy(text))).toBe(text);
  });
});
