import { cpSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import type { StudyCommandIO } from "../../../cells/cli/run-command";

/** A command's io that records what it writes; `out()` and `err()` give the text so far. */
export function captureIO(cwd: string, extra: Partial<StudyCommandIO> = {}) {
  const out: string[] = [];
  const err: string[] = [];
  const io: StudyCommandIO = { stdout: (t) => void out.push(t), stderr: (t) => void err.push(t), cwd, now: () => new Date("2026-12-01T09:30:00Z"), ...extra };
  return { io, out: () => out.join(""), err: () => err.join("") };
}

/** The study fixtures folder. */
export const STUDIES = fileURLToPath(new URL("../../fixtures/studies/", import.meta.url));

/** A fresh temporary folder holding a copy of the named study fixtures. */
export function scratchWith(...fixtures: string[]): string {
  const dir = mkdtempSync(join(tmpdir(), "couplet-cli-"));
  for (const name of fixtures) cpSync(join(STUDIES, name), join(dir, name));
  return dir;
}
