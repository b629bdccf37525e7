import { describe, expect, it } from "vitest";
import { createStudy } from "../../../cells/document/create-study";
import { parseStudy } from "../../../cells/document/parse-study";
import { serializeStudy } from "../../../cells/document/serialize-study";

describe("createStudy", () => {
  it("createStudy gives an empty valid study with fields in the usual order", () => {
    const study = createStudy({ title: "Bakery routes", seed: 12, about: "invented" });
    expect(serializeStudy(study)).toBe('{\n  "format": "couplet-study",\n  "formatVersion": 2,\n  "title": "Bakery routes",\n  "about": "invented",\n  "seed": 12,\n  "cells": []\n}\n');
    expect(parseStudy(serializeStudy(study))).toEqual(study);
    expect(Object.isFrozen(study)).toBe(true);
  });

  it("createStudy defaults to an empty title and seed 0", () => {
    expect(createStudy()).toEqual({ format: "couplet-study", formatVersion: 2, title: "", seed: 0, cells: [] });
  });

  it("createStudy rejects a seed outside [0, 4294967295]", () => {
    expect(() => createStudy({ seed: 2 ** 32 })).toThrow("seed: must be <= 4294967295, got 4294967296");
  });
});
