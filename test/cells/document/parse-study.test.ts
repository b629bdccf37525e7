import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { type StudyIssue, StudyFormatError } from "../../../cells/document/study-issue";
import { parseStudy } from "../../../cells/document/parse-study";
import { serializeStudy } from "../../../cells/document/serialize-study";

const fixture = (name: string) => readFileSync(new URL(`../../fixtures/studies/${name}`, import.meta.url), "utf8");

/** The issues parseStudy reports for `text` (fails the test if it does not throw a StudyFormatError). */
function issuesOf(text: string): readonly StudyIssue[] {
  try {
    parseStudy(text);
  } catch (error) {
    if (error instanceof StudyFormatError) return error.issues;
    throw error;
  }
  throw new Error("parseStudy accepted the text");
}

const study = (cells: unknown[], extra: object = {}) => JSON.stringify({ format: "couplet-study", formatVersion: 2, title: "t", cells, ...extra });
const transport = (settings: object, extra: object = {}) => ({ id: "t1", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact", ...settings }, ...extra });

describe("parseStudy", () => {
  it("parseStudy reads a valid study and returns it frozen", () => {
    const doc = parseStudy(fixture("depot-supply.couplet.json"));
    expect(doc.title).toBe("Depot supply vs shop demand");
    expect(doc.cells.map((c) => c.kind)).toEqual(["prose", "parameter", "data", "data", "transport", "figure", "sweep", "figure", "table"]);
    expect(Object.isFrozen(doc)).toBe(true);
    expect(Object.isFrozen(doc.cells[4].settings)).toBe(true);
  });

  it("parseStudy reports bad JSON with its line and column", () => {
    expect(issuesOf('{\n  "format": "couplet-study",\n  "title": "x",,\n}')).toEqual([
      { path: "", message: 'invalid JSON at line 3, column 16: expected a property name in double quotes, got ","', line: 3, column: 16 },
    ]);
    expect(issuesOf('{"cells": [1, 2,]}')).toEqual([
      { path: "", message: 'invalid JSON at line 1, column 17: expected a value after ",": a trailing comma is not allowed in JSON', line: 1, column: 17 },
    ]);
    expect(issuesOf("")).toEqual([{ path: "", message: "invalid JSON at line 1, column 1: unexpected end of the text: expected a value", line: 1, column: 1 }]);
  });

  it("parseStudy names the file in the error message", () => {
    expect(() => parseStudy("{", { path: "studies/a.couplet.json" })).toThrow(
      'studies/a.couplet.json: 1 problem\n  (study): invalid JSON at line 1, column 2: unexpected end of the text: expected a property name in double quotes',
    );
  });

  it("parseStudy rejects a value that is not a study object", () => {
    expect(issuesOf("[]")).toEqual([{ path: "", message: "a study must be a JSON object, got an array" }]);
    expect(issuesOf('{"title": "x"}')).toEqual([{ path: "format", message: 'missing (required): a study file starts with "format": "couplet-study"' }]);
    expect(issuesOf('{"format": "notebook", "cells": []}')).toEqual([{ path: "format", message: 'must be "couplet-study", got "notebook": this is not a Couplet study' }]);
  });

  it("parseStudy reports a missing, malformed, newer or unknown formatVersion", () => {
    expect(issuesOf('{"format": "couplet-study", "title": "t", "cells": []}')).toEqual([
      { path: "formatVersion", message: "missing (required): the format version, 2 for files written by this version of Couplet" },
    ]);
    expect(issuesOf('{"format": "couplet-study", "formatVersion": "2", "title": "t", "cells": []}')).toEqual([
      { path: "formatVersion", message: 'must be an integer, got "2"' },
    ]);
    expect(issuesOf('{"format": "couplet-study", "formatVersion": 3, "title": "t", "cells": []}')).toEqual([
      { path: "formatVersion", message: "3 is newer than this version of Couplet reads (1 to 2); update Couplet to open this study" },
    ]);
    expect(issuesOf('{"format": "couplet-study", "formatVersion": 0, "title": "t", "cells": []}')).toEqual([
      { path: "formatVersion", message: "0 is not a Couplet format version (known: 1 to 2)" },
    ]);
  });

  it("parseStudy reports missing and mistyped top-level fields together", () => {
    expect(issuesOf('{"format": "couplet-study", "formatVersion": 2, "about": 1, "seed": -3}')).toEqual([
      { path: "title", message: "missing (required)" },
      { path: "about", message: "must be a string, got 1" },
      { path: "seed", message: "must be >= 0, got -3" },
      { path: "cells", message: "missing (required)" },
    ]);
  });

  it("parseStudy names the known kinds for an unknown cell kind", () => {
    expect(issuesOf(study([{ id: "c1", kind: "plot", settings: {} }]))).toEqual([
      { path: "cells[0].kind", message: 'unknown cell kind "plot"; known kinds: prose, parameter, data, transport, sweep, figure, code, table' },
    ]);
  });

  it("parseStudy reports missing cell fields, and names required for named kinds", () => {
    expect(issuesOf(study([{ kind: "code" }]))).toEqual([
      { path: "cells[0].id", message: "missing (required)" },
      { path: "cells[0].settings", message: "missing (required)" },
    ]);
    expect(issuesOf(study([{ id: "p", kind: "parameter", settings: { control: "toggle", value: true } }]))).toEqual([
      { path: "cells[0].name", message: "missing (required for a parameter cell: other cells refer to it by name)" },
    ]);
    expect(issuesOf(study([5]))).toEqual([{ path: "cells[0]", message: "must be an object, got 5" }]);
  });

  it("parseStudy reports a bad value in a cell's settings with its full path", () => {
    const text = study([{ id: "p", kind: "prose", settings: { text: "" } }, { id: "q", kind: "prose", settings: { text: "" } }, { id: "r", kind: "code", settings: { code: "" } }, transport({ method: "entropic", epsilon: { relative: -1 } })]);
    expect(issuesOf(text)).toEqual([{ path: "cells[3].settings.epsilon.relative", message: "must be > 0, got -1" }]);
  });

  it("parseStudy reports duplicate ids and duplicate names, pointing at the first use", () => {
    const cells = [
      { id: "a1", kind: "code", name: "x", settings: { code: "1" } },
      { id: "a2", kind: "code", name: "y", settings: { code: "1" } },
      { id: "a1", kind: "code", name: "x", settings: { code: "1" } },
    ];
    expect(issuesOf(study(cells))).toEqual([
      { path: "cells[2].id", message: 'duplicate id "a1" (also used by cells[0])' },
      { path: "cells[2].name", message: 'duplicate name "x" (also used by cells[0])' },
    ]);
  });

  it("parseStudy rejects names that are not identifiers or are reserved words, and malformed ids", () => {
    const cells = [
      { id: "a", kind: "code", name: "2eps", settings: { code: "" } },
      { id: "b", kind: "code", name: "class", settings: { code: "" } },
      { id: "c", kind: "code", name: "my-name", settings: { code: "" } },
      { id: "d", kind: "code", name: "undefined", settings: { code: "" } },
      { id: "9e", kind: "code", settings: { code: "" } },
    ];
    expect(issuesOf(study(cells))).toEqual([
      { path: "cells[0].name", message: '"2eps" is not a valid JavaScript identifier (letters, digits, _ and $; not starting with a digit)' },
      { path: "cells[1].name", message: '"class" cannot be a cell name: it is reserved in JavaScript' },
      { path: "cells[2].name", message: '"my-name" is not a valid JavaScript identifier (letters, digits, _ and $; not starting with a digit)' },
      { path: "cells[3].name", message: '"undefined" cannot be a cell name: it is reserved in JavaScript' },
      { path: "cells[4].id", message: '"9e" is not a valid cell id (a letter, then up to 63 letters, digits, _ or -)' },
    ]);
  });

  it("parseStudy reports a key written twice in one object with where it repeats", () => {
    const text = '{"format": "couplet-study", "formatVersion": 2, "title": "t",\n "cells": [{"id": "c", "kind": "code", "settings": {"code": "1", "code": "2"}}]}';
    expect(issuesOf(text)).toEqual([{ path: "cells[0].settings.code", message: "written twice in one object (again at line 2, column 66); keep one", line: 2, column: 66 }]);
  });

  it("parseStudy reports all problems of a study, not only the first", () => {
    const cells = [
      { id: "a", kind: "parameter", name: "eps", settings: { control: "log-range", value: 5, min: 0.1, max: 1 } },
      transport({ method: "unbalanced", epsilon: { absolute: 0 } }),
      { id: "f", kind: "figure", settings: { view: "plan-matrix", of: [] } },
    ];
    expect(issuesOf(study(cells)).map((i) => i.path)).toEqual(["cells[0].settings.value", "cells[1].settings.epsilon.absolute", "cells[1].settings.massPenalty", "cells[2].settings.of"]);
  });

  it("parseStudy checks the outer shape of receipts and that each belongs to a cell", () => {
    const receipt = { fingerprint: "f", settings: {}, coreVersion: "0.1.0", summary: {}, seconds: 1, recordedAt: "2026-12-01T09:30:00Z" };
    const cells = [transport({})];
    expect(() => parseStudy(study(cells, { receipts: { t1: receipt } }))).not.toThrow();
    expect(issuesOf(study(cells, { receipts: { t9: receipt } }))).toEqual([{ path: "receipts.t9", message: 'no cell has id "t9": a receipt belongs to a cell of the study' }]);
    expect(issuesOf(study(cells, { receipts: { t1: { ...receipt, seconds: -1, recordedAt: "yesterday", summary: [] } } }))).toEqual([
      { path: "receipts.t1.summary", message: "must be an object, got an array" },
      { path: "receipts.t1.seconds", message: "must be >= 0, got -1" },
      { path: "receipts.t1.recordedAt", message: 'must be an ISO 8601 date-time with a time zone such as "2026-12-01T09:30:00Z", got "yesterday"' },
    ]);
    expect(issuesOf(study(cells, { receipts: { t1: { fingerprint: "f" } } })).map((i) => i.path)).toEqual([
      "receipts.t1.settings",
      "receipts.t1.summary",
      "receipts.t1.coreVersion",
      "receipts.t1.seconds",
      "receipts.t1.recordedAt",
    ]);
    expect(issuesOf(study(cells, { receipts: [] }))).toEqual([{ path: "receipts", message: "must be an object, got an array" }]);
  });

  it("parseStudy keeps unknown fields at every level, in their order", () => {
    const doc = parseStudy(fixture("extra-fields.couplet.json")) as unknown as Record<string, any>;
    expect(Object.keys(doc)).toEqual(["format", "formatVersion", "title", "editorLayout", "about", "seed", "cells", "receipts", "signature"]);
    expect(doc.editorLayout).toEqual({ columns: 2, theme: "paper", pinned: ["t1", "x1"] });
    expect(doc.cells[0].collapsed).toBe(true);
    expect(doc.cells[2].settings.epsilon.unitNote).toBe("km²");
    expect(doc.receipts.t1.host).toBe("laptop");
  });

  it("parseStudy keeps a \"__proto__\" key as an ordinary field without touching prototypes", () => {
    const doc = parseStudy(fixture("extra-fields.couplet.json")) as unknown as Record<string, any>;
    const slider = doc.cells[0].settings.slider;
    expect(Object.getPrototypeOf(slider)).toBe(Object.prototype);
    expect(Object.keys(slider)).toContain("__proto__");
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it("parseStudy ignores a leading byte-order mark", () => {
    const text = fixture("harbour-cranes.couplet.json");
    expect(serializeStudy(parseStudy(`\uFEFF${text}`))).toBe(text);
  });

  it("parseStudy migrates a version 1 study and validates the result", () => {
    const doc = parseStudy(fixture("v1/harbour-cranes.v1.couplet.json"));
    expect(doc.formatVersion).toBe(2);
    expect(doc.about).toContain("invented harbour");
  });

  it("parseStudy reports problems of a migrated study at their version 2 paths", () => {
    const v1 = JSON.stringify({ format: "couplet-study", formatVersion: 1, title: "t", cells: [transport({ method: "entropic", epsilon: -1, epsilonIsRelative: true })] });
    expect(issuesOf(v1)).toEqual([{ path: "cells[0].settings.epsilon.relative", message: "must be > 0, got -1" }]);
  });
});

describe("StudyFormatError", () => {
  it("StudyFormatError lists every issue on its own line", () => {
    const error = new StudyFormatError([
      { path: "title", message: "missing (required)" },
      { path: "cells[0].id", message: "missing (required)" },
    ]);
    expect(error.message).toBe("2 problems\n  title: missing (required)\n  cells[0].id: missing (required)");
    expect(error.name).toBe("StudyFormatError");
  });
});
