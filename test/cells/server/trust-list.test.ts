import { createHash } from "node:crypto";
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { addToTrustList, readTrustList, trustFilePath } from "../../../cells/server/trust-list";

let dir: string;
let root: string;
beforeEach(() => {
  dir = realpathSync(mkdtempSync(join(tmpdir(), "couplet-trust-")));
  root = join(dir, "root");
  mkdirSync(join(root, "a"), { recursive: true });
  writeFileSync(join(root, "b.couplet.json"), "{}\n");
  writeFileSync(join(root, "a", "x.couplet.json"), "[]\n");
  process.env.COUPLET_TRUST_FILE = join(dir, "user", "trusted-studies.json");
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const sha256 = (path: string) => createHash("sha256").update(readFileSync(path)).digest("hex");

describe("readTrustList and addToTrustList", () => {
  it("trustFilePath() is per user: $COUPLET_TRUST_FILE, else under the user's config folder, never in an opened folder", () => {
    expect(trustFilePath()).toBe(join(dir, "user", "trusted-studies.json"));
    const saved = process.env.COUPLET_TRUST_FILE;
    delete process.env.COUPLET_TRUST_FILE;
    try {
      expect(trustFilePath()).toMatch(/couplet[\\/]trusted-studies\.json$/);
    } finally {
      process.env.COUPLET_TRUST_FILE = saved;
    }
  });

  it("readTrustList(root) without a trust file trusts nothing", async () => {
    expect(await readTrustList(root)).toEqual({ studies: new Set() });
  });

  it("addToTrustList records each study once with the SHA-256 of its bytes, and leaves no temporary file", async () => {
    await addToTrustList(root, "b.couplet.json");
    await addToTrustList(root, "a/x.couplet.json");
    await addToTrustList(root, "b.couplet.json");
    const written = JSON.parse(readFileSync(trustFilePath(), "utf8"));
    expect(written.format).toBe("couplet-trust");
    // FIPS 180-4 SHA-256 via node:crypto.
    expect(written.studies).toEqual([
      { path: join(root, "a", "x.couplet.json"), sha256: sha256(join(root, "a", "x.couplet.json")) },
      { path: join(root, "b.couplet.json"), sha256: sha256(join(root, "b.couplet.json")) },
    ]);
    expect([...(await readTrustList(root)).studies].sort()).toEqual(["a/x.couplet.json", "b.couplet.json"]);
    expect(readdirSync(join(dir, "user"))).toEqual(["trusted-studies.json"]);
  });

  it("readTrustList drops a study whose bytes changed since it was trusted", async () => {
    await addToTrustList(root, "b.couplet.json");
    writeFileSync(join(root, "b.couplet.json"), '{"changed": true}\n');
    expect((await readTrustList(root)).studies.size).toBe(0);
    await addToTrustList(root, "b.couplet.json");
    expect([...(await readTrustList(root)).studies]).toEqual(["b.couplet.json"]);
    expect(JSON.parse(readFileSync(trustFilePath(), "utf8")).studies).toHaveLength(1);
  });

  it("a trust file of another shape trusts nothing, and addToTrustList refuses to overwrite it", async () => {
    mkdirSync(join(dir, "user"));
    writeFileSync(trustFilePath(), '["b.couplet.json"]');
    const list = await readTrustList(root);
    expect(list.studies.size).toBe(0);
    expect(list.problem).toContain("not a trust list");
    await expect(addToTrustList(root, "b.couplet.json")).rejects.toMatchObject({ status: 409, code: "trust-file-unusable" });
    expect(readFileSync(trustFilePath(), "utf8")).toBe('["b.couplet.json"]');
  });
});
