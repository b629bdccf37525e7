import Ajv2020 from "ajv/dist/2020";
import { existsSync, readFileSync, readdirSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { seededRandom } from "../../../core/random";
import { parseStudy } from "../../../cells/document/parse-study";
import { StudyFormatError } from "../../../cells/document/study-issue";
import type { StudyDocument } from "../../../cells/document/study-types";
import { updateStudy } from "../../../cells/document/update-study";

// The JSON Schema in docs/ is checked by an independent validator, ajv (draft 2020-12),
// in strict mode: the schema itself must compile without warnings.
const root = new URL("../../../", import.meta.url);
const schema = JSON.parse(readFileSync(new URL("docs/study.schema.json", root), "utf8"));
const warnings: unknown[] = [];
const ajv = new Ajv2020({ allErrors: true, strict: true, logger: { log: () => undefined, warn: (...a: unknown[]) => warnings.push(a), error: (...a: unknown[]) => warnings.push(a) } });
const validate = ajv.compile(schema);
const schemaAccepts = (value: unknown) => validate(value) === true;

function studies(dir: string): { name: string; value: unknown }[] {
  const url = new URL(dir, root);
  if (!existsSync(url)) return [];
  return readdirSync(url)
    .filter((f) => f.endsWith(".couplet.json"))
    .map((f) => ({ name: dir + f, value: JSON.parse(readFileSync(new URL(f, url), "utf8")) }));
}

const depotsText = readFileSync(new URL("test/fixtures/studies/depot-supply.couplet.json", root), "utf8");
const depots = parseStudy(depotsText);

function parserAccepts(value: unknown): boolean {
  try {
    parseStudy(JSON.stringify(value));
    return true;
  } catch (error) {
    if (error instanceof StudyFormatError) return false;
    throw error;
  }
}

/** The depot study with one cell's settings edited by `edit` (a plain deep copy). */
function variant(edit: (s: any) => void): unknown {
  const copy = JSON.parse(depotsText);
  edit(copy);
  return copy;
}

describe("docs/study.schema.json", () => {
  it("study.schema.json compiles in ajv's strict mode without warnings", () => {
    expect(warnings).toEqual([]);
  });

  it("study.schema.json accepts every shipped study of the current version", () => {
    const all = [...studies("test/fixtures/studies/"), ...studies("docs/examples/")];
    expect(all.length).toBeGreaterThanOrEqual(4);
    for (const { name, value } of all) expect([name, schemaAccepts(value) ? "valid" : validate.errors]).toEqual([name, "valid"]);
  });

  it("study.schema.json describes version 2 only: a version 1 file does not match", () => {
    for (const { value } of studies("test/fixtures/studies/v1/")) expect(schemaAccepts(value)).toBe(false);
  });

  it("study.schema.json and parseStudy both reject mistakes the schema can express", () => {
    const mistakes: [string, (s: any) => void][] = [
      ["unknown kind", (s) => (s.cells[0].kind = "plot")],
      ["wrong version", (s) => (s.formatVersion = 3)],
      ["missing title", (s) => delete s.title],
      ["reserved name", (s) => (s.cells[1].name = "class")],
      ["bad identifier", (s) => (s.cells[1].name = "2eps")],
      ["bad id", (s) => (s.cells[1].id = "1x")],
      ["named kind without name", (s) => delete s.cells[2].name],
      ["negative relative epsilon", (s) => (s.cells[4].settings.epsilon.relative = -1)],
      ["absolute and relative epsilon", (s) => (s.cells[4].settings.epsilon.absolute = 1)],
      ["missing epsilon", (s) => delete s.cells[4].settings.epsilon],
      ["unbalanced without penalty", (s) => delete s.cells[4].settings.massPenalty],
      ["null penalty", (s) => (s.cells[4].settings.massPenalty.target = null)],
      ["unknown method", (s) => (s.cells[4].settings.method = "sinkhorn")],
      ["fractional iterations", (s) => (s.cells[4].settings.maxIterations = 2.5)],
      ["power cost without p", (s) => (s.cells[4].settings.cost = { kind: "power" })],
      ["unknown control", (s) => (s.cells[1].settings.control = "slider")],
      ["negative n", (s) => (s.cells[2].settings.n = -5)],
      ["both covariance and scale", (s) => (s.cells[2].settings.components[1].scale = 1)],
      ["absolute file path", (s) => (s.cells[3].settings = { from: "file", path: "/etc/data.csv" })],
      ["sweep range of one", (s) => (s.cells[6].settings.values.count = 1)],
      ["unknown output", (s) => s.cells[6].settings.record.push("wasserstein")],
      ["two transports on a plan matrix", (s) => (s.cells[5].settings = { view: "plan-matrix", of: ["a", "b"] })],
      ["code figure without code", (s) => (s.cells[5].settings = { view: "code" })],
      ["table with of and rows", (s) => (s.cells[8].settings.rows = [])],
      ["digits too large", (s) => (s.cells[8].settings.columns[0].digits = 50)],
      ["receipt without seconds", (s) => delete s.receipts.t1.seconds],
      ["bad receipt date", (s) => (s.receipts.t1.recordedAt = "yesterday")],
      ["seed too large", (s) => (s.seed = 2 ** 32)],
    ];
    for (const [what, edit] of mistakes) {
      const value = variant(edit);
      expect([what, schemaAccepts(value), parserAccepts(value)]).toEqual([what, false, false]);
    }
  });

  it("study.schema.json leaves to Couplet the rules docs/format.md lists as not checked by the schema", () => {
    const coupletOnly: [string, (s: any) => void][] = [
      ["duplicate ids", (s) => (s.cells[1].id = "p1")],
      ["duplicate names", (s) => (s.cells[3].name = "depots")],
      ["parameter value out of bounds", (s) => (s.cells[1].settings.value = 5)],
      ["min not below max", (s) => (s.cells[1].settings.min = 2)],
      ["means of different dimension", (s) => (s.cells[2].settings.components[0].mean = [0, 0, 0])],
      ["asymmetric covariance", (s) => (s.cells[2].settings.components[1].covariance[0][1] = 0.2)],
      ["malformed live value in prose", (s) => (s.cells[0].settings.text = "@{2x}")],
      ["receipt of a missing cell", (s) => (s.receipts.zz = s.receipts.t1)],
      ["sweep range with equal ends", (s) => (s.cells[6].settings.values.to = 0.005)],
      ["repeated table column fields", (s) => (s.cells[8].settings.columns[1].field = "epsilon")],
      ["file format the extension does not tell", (s) => (s.cells[3].settings = { from: "file", path: "data/shops.dat" })],
      ["all mixture weights zero", (s) => s.cells[2].settings.components.forEach((c: any) => (c.weight = 0))],
      ["inline masses of the wrong length", (s) => (s.cells[3].settings = { from: "inline", points: [[0], [1]], mass: [1] })],
    ];
    for (const [what, edit] of coupletOnly) {
      const value = variant(edit);
      expect([what, schemaAccepts(value), parserAccepts(value)]).toEqual([what, true, false]);
    }
    // A key written twice never reaches the schema: the parsed value holds only the last.
    const twice = depotsText.replace('"title": "Depot supply vs shop demand",', '"title": "a",\n  "title": "Depot supply vs shop demand",');
    expect(schemaAccepts(JSON.parse(twice))).toBe(true);
    expect(() => parseStudy(twice)).toThrow('title: written twice in one object');
  });

  it("study.schema.json accepts every study parseStudy accepts, over 300 seeded random edits", () => {
    // The schema may be looser than Couplet, never stricter.
    const random = seededRandom(2026);
    const pick = <T>(items: readonly T[]) => items[Math.floor(random() * items.length)];
    const values = [0, 1, -1, 0.5, 3, 1e-9, 5000, "balanced", "median", "log", true, false, null, "x", { param: "eps" }, [1, 2], ["plan"], { relative: 0.1 }, { absolute: 2 }];
    const targets: [string, string[]][] = [
      ["t1", ["epsilon", "epsilon.relative", "epsilon.reference", "massPenalty", "massPenalty.source", "tolerance", "maxIterations", "schedule", "warmStart", "method", "cost.kind"]],
      ["k7q2", ["value", "min", "max", "control"]],
      ["d2", ["n", "radius", "noise", "seed", "center", "subsample"]],
      ["s1", ["vary", "values", "values.count", "values.spacing", "replicates", "record"]],
      ["f1", ["view", "of", "options.maxLines", "options.width"]],
      ["tb1", ["of", "columns.0.digits", "columns.0.notation"]],
    ];
    let accepted = 0;
    for (let trial = 0; trial < 300; trial++) {
      const [id, paths] = pick(targets);
      const change = { type: "set-setting" as const, id, path: pick(paths), value: pick(values) };
      let study: StudyDocument;
      try {
        study = updateStudy(depots, [change]).study;
      } catch (error) {
        if (error instanceof StudyFormatError) continue;
        throw error;
      }
      accepted++;
      expect([JSON.stringify(change), schemaAccepts(study)]).toEqual([JSON.stringify(change), true]);
    }
    expect(accepted).toBeGreaterThan(30);
  });
});
