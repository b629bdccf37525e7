import { mkdirSync, mkdtempSync, realpathSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { listFiles } from "../../../cells/server/list-files";
import { SERVER_LIMITS } from "../../../cells/server/server-limits";

let dir: string;
let root: string;
beforeEach(() => {
  dir = realpathSync(mkdtempSync(join(tmpdir(), "couplet-list-")));
  root = join(dir, "root");
  mkdirSync(join(root, "a", "b"), { recursive: true });
  mkdirSync(join(root, ".hidden"));
  mkdirSync(join(root, "node_modules"));
  mkdirSync(join(dir, "out"));
  writeFileSync(join(root, "one.couplet.json"), "{}");
  writeFileSync(join(root, "one.couplet.json.previous"), "{}");
  writeFileSync(join(root, "a", "points.CSV"), "x\n1\n");
  writeFileSync(join(root, "a", "b", "grid.npy"), "");
  writeFileSync(join(root, "a", "readme.md"), "");
  writeFileSync(join(root, ".hidden", "h.csv"), "");
  writeFileSync(join(root, "node_modules", "m.csv"), "");
  writeFileSync(join(dir, "out", "far.csv"), "");
  symlinkSync(join(dir, "out", "far.csv"), join(root, "far.csv"));
  symlinkSync(join(dir, "out"), join(root, "out-dir"));
  symlinkSync(join(root, "a", "points.CSV"), join(root, "near.csv"));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

describe("listFiles", () => {
  it("listFiles finds studies and data files, skipping hidden folders, node_modules and links that lead out", async () => {
    expect(await listFiles(root)).toEqual({
      studies: ["one.couplet.json"],
      data: [
        { path: "a/b/grid.npy", format: "npy", bytes: 0 },
        { path: "a/points.CSV", format: "csv", bytes: 4 },
        { path: "near.csv", format: "csv", bytes: 4 },
      ],
      truncated: false,
    });
  });

  it("listFiles stops at the depth limit and says so", async () => {
    let deep = root;
    for (let k = 0; k <= SERVER_LIMITS.listDepth + 1; k++) {
      deep = join(deep, `d${k}`);
      mkdirSync(deep);
    }
    writeFileSync(join(deep, "deep.csv"), "");
    const list = await listFiles(root);
    expect(list.truncated).toBe(true);
    expect(list.data.map((d) => d.path)).not.toContain(expect.stringContaining("deep.csv"));
  });
});
