import { mkdtempSync, readFileSync, readdirSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { TRUST_FILE, addToTrustList, readTrustList } from "../../../cells/server/trust-list";

let root: string;
beforeEach(() => {
  root = realpathSync(mkdtempSync(join(tmpdir(), "couplet-trust-")));
});
afterEach(() => rmSync(root, { recursive: true, force: true }));

describe("readTrustList and addToTrustList", () => {
  it("readTrustList of a folder without .couplet-trust trusts nothing", async () => {
    expect(await readTrustList(root)).toEqual({ studies: new Set() });
  });

  it("addToTrustList writes a sorted list once per study and leaves no temporary file", async () => {
    await addToTrustList(root, "b.couplet.json");
    await addToTrustList(root, "a/x.couplet.json");
    await addToTrustList(root, "b.couplet.json");
    const written = JSON.parse(readFileSync(join(root, TRUST_FILE), "utf8"));
    expect(written.format).toBe("couplet-trust");
    expect(written.studies).toEqual(["a/x.couplet.json", "b.couplet.json"]);
    expect([...(await readTrustList(root)).studies]).toEqual(["a/x.couplet.json", "b.couplet.json"]);
    expect(readdirSync(root)).toEqual([TRUST_FILE]);
  });

  it("a .couplet-trust of another shape trusts nothing, and addToTrustList refuses to overwrite it", async () => {
    writeFileSync(join(root, TRUST_FILE), '["a.couplet.json"]');
    const list = await readTrustList(root);
    expect(list.studies.size).toBe(0);
    expect(list.problem).toContain("not a trust list");
    await expect(addToTrustList(root, "a.couplet.json")).rejects.toMatchObject({ status: 409, code: "trust-file-unusable" });
    expect(readFileSync(join(root, TRUST_FILE), "utf8")).toBe('["a.couplet.json"]');
  });
});
