import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { migrateStudy, rawFormatVersion } from "../../../cells/document/migrate-study";
import { parseStudy } from "../../../cells/document/parse-study";
import { serializeStudy } from "../../../cells/document/serialize-study";
import type { StudyDocument } from "../../../cells/document/study-types";

const fixture = (name: string) => readFileSync(new URL(`../../fixtures/studies/${name}`, import.meta.url), "utf8");
const v1 = (cells: unknown[], extra: object = {}) => ({ format: "couplet-study", formatVersion: 1, title: "t", cells, ...extra });

describe("migrateStudy", () => {
  it("migrateStudy turns the version 1 harbour study into the expected version 2 file, byte for byte", () => {
    // The expected file was produced once and checked line by line against the v1 → v2 rules in docs/format.md.
    const migrated = migrateStudy(JSON.parse(fixture("v1/harbour-cranes.v1.couplet.json")));
    expect(serializeStudy(migrated as StudyDocument)).toBe(fixture("harbour-cranes.couplet.json"));
  });

  it("migrateStudy renames description to about in the same place", () => {
    const out = migrateStudy({ format: "couplet-study", formatVersion: 1, title: "t", description: "d", seed: 1, cells: [] }) as Record<string, unknown>;
    expect(Object.keys(out)).toEqual(["format", "formatVersion", "title", "about", "seed", "cells"]);
    expect(out.about).toBe("d");
    expect(out.formatVersion).toBe(2);
  });

  it("migrateStudy turns a relative v1 epsilon with a reference into one object", () => {
    const cell = { id: "t", kind: "transport", name: "p", settings: { source: "a", epsilon: 0.1, epsilonIsRelative: true, epsilonReference: "mean", target: "b" } };
    const out = migrateStudy(v1([cell])) as { cells: { settings: object }[] };
    expect(out.cells[0].settings).toEqual({ source: "a", epsilon: { relative: 0.1, reference: "mean" }, target: "b" });
    expect(Object.keys(out.cells[0].settings)).toEqual(["source", "epsilon", "target"]);
  });

  it("migrateStudy turns an absolute v1 epsilon into {absolute} and a null penalty into \"balanced\"", () => {
    const cell = { id: "t", kind: "transport", name: "p", settings: { epsilon: 2, epsilonIsRelative: false, massPenalty: null } };
    const out = migrateStudy(v1([cell])) as { cells: { settings: object }[] };
    expect(out.cells[0].settings).toEqual({ epsilon: { absolute: 2 }, massPenalty: "balanced" });
  });

  it("migrateStudy treats a v1 epsilon without the flag as absolute", () => {
    const out = migrateStudy(v1([{ id: "t", kind: "transport", settings: { epsilon: 0.3 } }])) as { cells: { settings: object }[] };
    expect(out.cells[0].settings).toEqual({ epsilon: { absolute: 0.3 } });
  });

  it("migrateStudy renames a data cell's source to from", () => {
    const out = migrateStudy(v1([{ id: "d", kind: "data", name: "x", settings: { source: "inline", points: [[1]] } }])) as { cells: { settings: object }[] };
    expect(out.cells[0].settings).toEqual({ from: "inline", points: [[1]] });
  });

  it("migrateStudy leaves fields of unexpected shape for validation to report", () => {
    const cell = { id: "t", kind: "transport", name: "p", settings: { source: "a", target: "b", method: "entropic", epsilon: "small", epsilonIsRelative: "yes" } };
    const out = migrateStudy(v1([cell, 7])) as { cells: unknown[] };
    expect(out.cells).toEqual([cell, 7]);
  });

  it("migrateStudy does not mutate its input", () => {
    const raw = JSON.parse(fixture("v1/harbour-cranes.v1.couplet.json"));
    const copy = structuredClone(raw);
    migrateStudy(raw);
    expect(raw).toEqual(copy);
  });

  it("migrateStudy returns current, newer and malformed studies unchanged (the same object)", () => {
    for (const raw of [{ formatVersion: 2 }, { formatVersion: 7 }, { formatVersion: "1" }, { formatVersion: 0.5 }, [], null, "x"]) expect(migrateStudy(raw)).toBe(raw);
  });

  it("migrateStudy output parses as a valid current study", () => {
    const doc = parseStudy(JSON.stringify(migrateStudy(JSON.parse(fixture("v1/harbour-cranes.v1.couplet.json")))));
    expect(doc.cells.map((c) => c.name)).toEqual(["slack", "cranes", "berths", "assignment", "withSlack"]);
  });
});

describe("rawFormatVersion", () => {
  it("rawFormatVersion reads an integer formatVersion and nothing else", () => {
    expect(rawFormatVersion({ formatVersion: 1 })).toBe(1);
    expect(rawFormatVersion({ formatVersion: "1" })).toBeUndefined();
    expect(rawFormatVersion([])).toBeUndefined();
  });
});
