import { mkdirSync, mkdtempSync, realpathSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { HttpError } from "../../../cells/server/http-error";
import { isInsideRoot, pathSegments, relativeToRoot, resolveInRoot } from "../../../cells/server/root-path";

function statusOf(run: () => unknown): number | undefined {
  try {
    run();
  } catch (error) {
    return error instanceof HttpError ? error.status : -1;
  }
  return undefined;
}

describe("pathSegments", () => {
  it("pathSegments splits a plain relative path at /", () => {
    expect(pathSegments("data/points.csv")).toEqual(["data", "points.csv"]);
    expect(pathSegments("a b/ε.couplet.json")).toEqual(["a b", "ε.couplet.json"]);
  });

  it("pathSegments refuses .. anywhere and absolute paths with 403", () => {
    for (const path of ["..", "../x", "a/../b", "a/..", "/etc/passwd", "//server/share", "C:/x", "c:x"]) expect(statusOf(() => pathSegments(path)), path).toBe(403);
  });

  it("pathSegments refuses backslashes, NUL and other control characters, empty and . segments with 400", () => {
    for (const path of ["a\\b", "..\\x", "a\u0000b", "a\nb", "", "a//b", "./a", "a/", "a/./b"]) expect(statusOf(() => pathSegments(path)), JSON.stringify(path)).toBe(400);
  });

  it("pathSegments refuses a non-string and a path over 1024 characters with 400", () => {
    expect(statusOf(() => pathSegments(undefined))).toBe(400);
    expect(statusOf(() => pathSegments(42))).toBe(400);
    expect(statusOf(() => pathSegments("a".repeat(1025)))).toBe(400);
  });

  it("pathSegments sees %2e%2e as a name, not as .. (decoding is the caller's job, done once)", () => {
    expect(pathSegments("%2e%2e")).toEqual(["%2e%2e"]);
  });
});

describe("resolveInRoot", () => {
  let dir: string;
  let root: string;
  beforeEach(() => {
    dir = realpathSync(mkdtempSync(join(tmpdir(), "couplet-root-path-")));
    root = join(dir, "root");
    mkdirSync(join(root, "sub"), { recursive: true });
    mkdirSync(join(dir, "out"));
    writeFileSync(join(root, "sub", "a.csv"), "a\n");
    writeFileSync(join(dir, "out", "b.csv"), "b\n");
    symlinkSync(join(root, "sub", "a.csv"), join(root, "in-link.csv"));
    symlinkSync(join(dir, "out", "b.csv"), join(root, "out-link.csv"));
    symlinkSync(join(dir, "out"), join(root, "out-dir"));
    symlinkSync(join(dir, "out", "missing.csv"), join(root, "dangling.csv"));
    // A sibling whose name starts with the root's name must not count as inside.
    mkdirSync(join(dir, "root-evil"));
    symlinkSync(join(dir, "root-evil"), join(root, "evil-sibling"));
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  const codeOf = async (promise: Promise<unknown>) => promise.then(() => 0, (error) => (error instanceof HttpError ? error.status : -1));

  it("resolveInRoot follows a link that stays inside the root", async () => {
    expect(await resolveInRoot(root, "in-link.csv")).toEqual({ absolute: join(root, "sub", "a.csv"), exists: true });
  });

  it("resolveInRoot refuses links that lead out (file, folder, prefix-named sibling) with 403", async () => {
    for (const path of ["out-link.csv", "out-dir/b.csv", "evil-sibling"]) expect(await codeOf(resolveInRoot(root, path)), path).toBe(403);
  });

  it("resolveInRoot answers 404 for a missing file unless allowMissing", async () => {
    expect(await codeOf(resolveInRoot(root, "sub/none.csv"))).toBe(404);
    expect(await resolveInRoot(root, "sub/none.csv", { allowMissing: true })).toEqual({ absolute: join(root, "sub", "none.csv"), exists: false });
    expect(await codeOf(resolveInRoot(root, "nofolder/none.csv", { allowMissing: true }))).toBe(404);
  });

  it("resolveInRoot with allowMissing refuses a new name in a folder linked from outside, and a dangling link", async () => {
    expect(await codeOf(resolveInRoot(root, "out-dir/new.csv", { allowMissing: true }))).toBe(403);
    expect(await codeOf(resolveInRoot(root, "dangling.csv", { allowMissing: true }))).toBe(403);
  });

  it("isInsideRoot and relativeToRoot agree on what is below the root", () => {
    expect(isInsideRoot("/a/b", "/a/b/c")).toBe(true);
    expect(isInsideRoot("/a/b", "/a/b")).toBe(true);
    expect(isInsideRoot("/a/b", "/a/bc")).toBe(false);
    expect(relativeToRoot("/a/b", "/a/b/c/d.csv")).toBe("c/d.csv");
  });
});
