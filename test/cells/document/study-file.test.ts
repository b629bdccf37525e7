import * as fsp from "node:fs/promises";
import { chmodSync, existsSync, mkdtempSync, readFileSync, readdirSync, realpathSync, rmSync, statSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { parseStudy } from "../../../cells/document/parse-study";
import { serializeStudy } from "../../../cells/document/serialize-study";
import { type StudyFileHandle, type StudyFileSystem, backupPathFor, loadStudyFile, saveStudyFile } from "../../../cells/document/study-file";
import { StudyFormatError } from "../../../cells/document/study-issue";
import type { StudyDocument } from "../../../cells/document/study-types";
import { updateStudy } from "../../../cells/document/update-study";

const fixtureText = readFileSync(new URL("../../fixtures/studies/depot-supply.couplet.json", import.meta.url), "utf8");
const original = parseStudy(fixtureText);
const edited = updateStudy(original, [{ type: "set-title", title: "Depot supply, second look" }]).study;

let dir: string;
beforeEach(() => {
  // realpath: the temporary folder may itself sit behind a symbolic link (macOS), and saving resolves links.
  dir = realpathSync(mkdtempSync(join(tmpdir(), "couplet-save-")));
});
afterEach(() => {
  rmSync(dir, { recursive: true, force: true });
});

const realFs = fsp as unknown as StudyFileSystem;

type Fault = { open?: boolean; write?: "throw" | "partial"; sync?: boolean; rename?: boolean };

/**
 * The real file system, except that the operations named in `fail` throw while
 * writing the study itself (`during: "study"`) or its backup (`during: "backup"`).
 */
function failingFs(fail: Fault, during: "study" | "backup" = "study"): StudyFileSystem {
  const targeted = (path: string) => path.includes(".saving-") && path.includes(".previous.saving-") === (during === "backup");
  const boom = (what: string) => Object.assign(new Error(`injected ${what} failure`), { code: "EIO" });
  return {
    ...realFs,
    readFile: (p) => fsp.readFile(p),
    stat: (p) => fsp.stat(p),
    realpath: (p) => fsp.realpath(p),
    unlink: (p) => fsp.unlink(p),
    open: async (path, flags, mode) => {
      const hit = flags === "wx" && targeted(path);
      if (fail.open && hit) throw boom("open");
      const handle = await fsp.open(path, flags, mode);
      const wrapped: StudyFileHandle = {
        writeFile: async (data) => {
          if (fail.write === "partial" && hit) {
            // A disk that fills up mid-write: half the bytes land, then an error.
            await handle.writeFile(typeof data === "string" ? data.slice(0, data.length / 2) : data.subarray(0, data.length / 2));
            throw Object.assign(new Error("injected: no space left on device"), { code: "ENOSPC" });
          }
          if (fail.write === "throw" && hit) throw boom("write");
          await handle.writeFile(data);
        },
        sync: async () => {
          if (fail.sync && hit) throw boom("fsync");
          await handle.sync();
        },
        close: () => handle.close(),
      };
      return wrapped;
    },
    rename: async (from, to) => {
      if (fail.rename && targeted(from)) throw boom("rename");
      await fsp.rename(from, to);
    },
  };
}

const leftovers = () => readdirSync(dir).filter((f) => f.includes(".saving-"));

describe("saveStudyFile", () => {
  it("saveStudyFile writes the canonical text and loadStudyFile reads it back equal", async () => {
    const path = join(dir, "depots.couplet.json");
    const report = await saveStudyFile(path, original);
    expect(report).toEqual({ path, written: true, backupPath: null });
    expect(readFileSync(path, "utf8")).toBe(fixtureText);
    expect(await loadStudyFile(path)).toEqual(original);
    expect(leftovers()).toEqual([]);
  });

  it("saveStudyFile keeps the previous file as <name>.previous after a successful save", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    const report = await saveStudyFile(path, edited);
    expect(report.backupPath).toBe(backupPathFor(path));
    expect(readFileSync(`${path}.previous`, "utf8")).toBe(fixtureText);
    expect(readFileSync(path, "utf8")).toBe(serializeStudy(edited));
    expect(leftovers()).toEqual([]);
  });

  it("saveStudyFile does not touch the file or the backup when the text is unchanged", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    writeFileSync(`${path}.previous`, "older");
    expect(await saveStudyFile(path, original)).toEqual({ path, written: false, backupPath: null });
    expect(readFileSync(`${path}.previous`, "utf8")).toBe("older");
  });

  it("saveStudyFile leaves the old file intact and no temporary file when the write fails midway", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    await expect(saveStudyFile(path, edited, { fs: failingFs({ write: "partial" }) })).rejects.toMatchObject({ code: "ENOSPC" });
    expect(readFileSync(path, "utf8")).toBe(fixtureText);
    // The backup was complete before the study's own write began.
    expect(readFileSync(`${path}.previous`, "utf8")).toBe(fixtureText);
    expect(leftovers()).toEqual([]);
  });

  it("saveStudyFile leaves the old file intact when fsync, rename or creating the temporary file fails", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    const faults: Fault[] = [{ sync: true }, { rename: true }, { open: true }, { write: "throw" }, { write: "partial" }];
    for (const during of ["study", "backup"] as const) {
      for (const fault of faults) {
        await expect(saveStudyFile(path, edited, { fs: failingFs(fault, during) }), `${JSON.stringify(fault)} during ${during}`).rejects.toThrow(/injected/);
        expect(readFileSync(path, "utf8")).toBe(fixtureText);
        expect(leftovers()).toEqual([]);
      }
    }
  });

  it("saveStudyFile leaves an earlier backup intact when writing the new backup fails", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    writeFileSync(`${path}.previous`, "older");
    await expect(saveStudyFile(path, edited, { fs: failingFs({ write: "partial" }, "backup") })).rejects.toThrow(/injected/);
    expect(readFileSync(`${path}.previous`, "utf8")).toBe("older");
    expect(readFileSync(path, "utf8")).toBe(fixtureText);
  });

  // Root ignores permission bits, so this runs for ordinary users only.
  it.skipIf(process.getuid?.() === 0)("saveStudyFile fails without changing anything in a folder it may not write", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    chmodSync(dir, 0o555);
    try {
      await expect(saveStudyFile(path, edited)).rejects.toMatchObject({ code: "EACCES" });
      expect(readFileSync(path, "utf8")).toBe(fixtureText);
    } finally {
      chmodSync(dir, 0o755);
    }
  });

  it("saveStudyFile refuses an invalid study before touching the disk", async () => {
    const path = join(dir, "bad.couplet.json");
    const bad = { ...original, title: 5 } as unknown as StudyDocument;
    await expect(saveStudyFile(path, bad)).rejects.toThrow(StudyFormatError);
    expect(existsSync(path)).toBe(false);
  });

  it("saveStudyFile keeps the file's permission bits", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    chmodSync(path, 0o600);
    await saveStudyFile(path, edited);
    expect(statSync(path).mode & 0o777).toBe(0o600);
  });

  it("saveStudyFile follows a symbolic link and replaces its target", async () => {
    const real = join(dir, "real.couplet.json");
    const link = join(dir, "link.couplet.json");
    writeFileSync(real, fixtureText);
    symlinkSync(real, link);
    const report = await saveStudyFile(link, edited);
    expect(report.path).toBe(real);
    expect(readFileSync(real, "utf8")).toBe(serializeStudy(edited));
    expect(existsSync(`${real}.previous`)).toBe(true);
  });

  it("saveStudyFile with backup off writes no backup", async () => {
    const path = join(dir, "depots.couplet.json");
    writeFileSync(path, fixtureText);
    await saveStudyFile(path, edited, { backup: false });
    expect(existsSync(`${path}.previous`)).toBe(false);
  });
});

describe("loadStudyFile", () => {
  it("loadStudyFile names the file in a format error", async () => {
    const path = join(dir, "broken.couplet.json");
    writeFileSync(path, '{"format": "couplet-study", "formatVersion": 2, "title": "t", "cells": [{"id": "a", "kind": "chart", "settings": {}}]}');
    await expect(loadStudyFile(path)).rejects.toThrow(`${path}: 1 problem\n  cells[0].kind: unknown cell kind "chart"`);
  });

  it("loadStudyFile passes on the file system's error for a missing file", async () => {
    await expect(loadStudyFile(join(dir, "none.json"))).rejects.toMatchObject({ code: "ENOENT" });
  });
});
