import { existsSync, readFileSync, readdirSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseStudy } from "../../../cells/document/parse-study";
import { serializeStudy } from "../../../cells/document/serialize-study";
import { StudyFormatError } from "../../../cells/document/study-issue";
import type { StudyDocument } from "../../../cells/document/study-types";

const root = new URL("../../../", import.meta.url);
/** Every current-version study we ship: test fixtures and, when present, docs/examples. */
function shippedStudies(): { name: string; text: string }[] {
  const out: { name: string; text: string }[] = [];
  for (const dir of ["test/fixtures/studies/", "docs/examples/"]) {
    const url = new URL(dir, root);
    if (!existsSync(url)) continue;
    for (const f of readdirSync(url).filter((n) => n.endsWith(".couplet.json"))) out.push({ name: dir + f, text: readFileSync(new URL(f, url), "utf8") });
  }
  return out;
}

const minimal = { format: "couplet-study", formatVersion: 2, title: "t", cells: [] } as unknown as StudyDocument;

describe("serializeStudy", () => {
  it("serializeStudy(parseStudy(text)) gives back every shipped study byte for byte", () => {
    const studies = shippedStudies();
    expect(studies.length).toBeGreaterThanOrEqual(4);
    for (const { name, text } of studies) expect([name, serializeStudy(parseStudy(text))]).toEqual([name, text]);
  });

  it("serializeStudy of a study in any layout is a fixed point after one save", () => {
    for (const { text } of shippedStudies()) {
      const squeezed = JSON.stringify(JSON.parse(text));
      const spread = JSON.stringify(JSON.parse(text), null, "\t");
      const once = serializeStudy(parseStudy(squeezed));
      expect(once).toBe(text);
      expect(serializeStudy(parseStudy(spread))).toBe(text);
      expect(serializeStudy(parseStudy(once))).toBe(once);
    }
  });

  it("serializeStudy writes 2-space indentation, plain arrays on one line and a final newline", () => {
    const doc = { ...minimal, cells: [{ id: "d", kind: "data", name: "pts", settings: { from: "inline", points: [[0, 1.5], [2, -3]], mass: [0.25, 0.75] } }], empty: {}, none: [] };
    expect(serializeStudy(doc as unknown as StudyDocument)).toBe(
      [
        "{",
        '  "format": "couplet-study",',
        '  "formatVersion": 2,',
        '  "title": "t",',
        '  "cells": [',
        "    {",
        '      "id": "d",',
        '      "kind": "data",',
        '      "name": "pts",',
        '      "settings": {',
        '        "from": "inline",',
        '        "points": [',
        "          [0, 1.5],",
        "          [2, -3]",
        "        ],",
        '        "mass": [0.25, 0.75]',
        "      }",
        "    }",
        "  ],",
        '  "empty": {},',
        '  "none": []',
        "}",
        "",
      ].join("\n"),
    );
  });

  it("serializeStudy lays out number matrices and mixed matrices alike", () => {
    const numbers = serializeStudy({ ...minimal, m: [[1, 2.5], [3, -4e-9]] } as unknown as StudyDocument);
    const mixed = serializeStudy({ ...minimal, m: [[1, 2.5], [3, "x"]] } as unknown as StudyDocument);
    expect(numbers).toContain('  "m": [\n    [1, 2.5],\n    [3, -4e-9]\n  ]\n');
    expect(mixed).toContain('  "m": [\n    [1, 2.5],\n    [3, "x"]\n  ]\n');
    expect(serializeStudy({ ...minimal, m: [[1], []] } as unknown as StudyDocument)).toContain('  "m": [\n    [1],\n    []\n  ]\n');
  });

  it("serializeStudy keeps key order as given and leaves out undefined fields", () => {
    const doc = { title: "t", format: "couplet-study", about: undefined, formatVersion: 2, cells: [] } as unknown as StudyDocument;
    expect(serializeStudy(doc)).toBe('{\n  "title": "t",\n  "format": "couplet-study",\n  "formatVersion": 2,\n  "cells": []\n}\n');
  });

  it("serializeStudy writes numbers in shortest round-trip form and escapes strings as JSON does", () => {
    // Number::toString (ECMA-262 §6.1.6.1.20): shortest digits that read back as the same double.
    const doc = { ...minimal, n: [0.1, 1e-7, 1e21, -0, 123456789012345680000, 5e-324], s: "tab\t\"q\" \u0001 é 🚚" } as unknown as StudyDocument;
    const text = serializeStudy(doc);
    expect(text).toContain('"n": [0.1, 1e-7, 1e+21, 0, 123456789012345680000, 5e-324]');
    expect(text).toContain('"s": "tab\\t\\"q\\" \\u0001 é 🚚"');
    expect(JSON.parse(text)).toEqual(JSON.parse(JSON.stringify(doc)));
  });

  it("serializeStudy throws a StudyFormatError naming the path of a value JSON cannot hold", () => {
    const bad = (extra: object) => () => serializeStudy({ ...minimal, ...extra } as unknown as StudyDocument);
    expect(bad({ x: { y: [1, Number.NaN] } })).toThrow(new StudyFormatError([{ path: "x.y[1]", message: "cannot be saved: JSON holds finite numbers only, got NaN" }]));
    expect(bad({ x: Infinity })).toThrow("x: cannot be saved: JSON holds finite numbers only, got Infinity");
    expect(bad({ x: [undefined] })).toThrow("x[0]: cannot be saved: an array item is undefined");
    expect(bad({ x: [1, , 2] })).toThrow("x[1]: cannot be saved: an array item is undefined");
    expect(bad({ x: [[1, 2], [3, , 4]] })).toThrow("x[1][1]: cannot be saved: an array item is undefined");
    expect(bad({ x: new Float64Array(2) })).toThrow("x: cannot be saved: not plain JSON data ([object Float64Array])");
    expect(bad({ x: () => 1 })).toThrow("x: cannot be saved: not JSON data (function)");
  });
});
