import { readFile, stat, writeFile } from "node:fs/promises";
import { dirname, resolve } from "node:path";
import { type StudyDocument, parseStudy, updateStudy } from "../document";
import { saveStudyFile } from "../document/study-file";
import type { CellOutcome } from "../study/cell-outcome";
import type { RunStudyOptions, StudyRun } from "../study/run-study";
import { studyReportModel } from "../study/report-model";
import { formatSeconds } from "../views/report/format-value";
import { renderReport } from "../views/report/render-report";
import { type OptionSpec, formatOptions, parseCommandLine } from "./parse-options";
import { namedParameters, parseOverrides } from "./parse-overrides";
import { cellLabel, createProgressDisplay, oneLine } from "./progress-display";
import type { CommandIO } from "./solve-command";
import { UsageError } from "./usage-error";

/**
 * What the study commands use of their surroundings, beyond {@link CommandIO}.
 * Every field is optional: without them output is plain and the clock is the real one.
 */
export interface StudyCommandIO extends CommandIO {
  /** stderr is a terminal: show a live progress line instead of one line per finished cell. */
  readonly stderrIsTTY?: boolean;
  /** Width of the terminal in characters (for the live line). Default 80. */
  readonly columns?: number;
  /** The clock: run times in receipts and the report. Default: the real time. */
  readonly now?: () => Date;
}

/** The study run the commands call; tests pass a stand-in. */
export type StudyRunner = (study: StudyDocument, options?: RunStudyOptions) => Promise<StudyRun>;

export const RUN_OPTIONS: readonly OptionSpec[] = [
  { name: "set", type: "string", value: "NAME=VALUE", multiple: true, help: "run with parameter NAME at VALUE instead of the value in the file (repeatable);\nVALUE is read by the parameter's control: a number, a whole number,\ntrue/false (also yes/no, on/off, 1/0), one of the options, text or a seed" },
  { name: "report", type: "string", value: "FILE.html", help: "write a self-contained HTML report of the run (no scripts, no network)" },
  { name: "receipts", type: "string", value: "FILE.json", help: "write this run's receipts, by cell id, as JSON" },
  { name: "save-receipts", type: "boolean", help: "store this run's receipts in the study file itself (the old file is kept\nas FILE.previous), so that `couplet check` can compare later runs with it" },
  { name: "hold-code", type: "boolean", help: "do not run the study's code cells (they and the cells using them are held)" },
  { name: "require-converged", type: "boolean", help: "exit with code 1 when any solve (of a transport cell or in a sweep) did not converge" },
];

export const RUN_HELP = `Usage: couplet run STUDY [options]

Runs every cell of a study file headlessly, prints one line per cell and a
closing line, and on request writes an HTML report and the run's receipts.

Code cells in the file run by default: you chose to run this file. Use
--hold-code for a study you have not read.

Options:
${formatOptions([...RUN_OPTIONS, { name: "help", type: "boolean", help: "show this text" }])}

Progress goes to stderr: a live status line on a terminal, one line per
finished cell otherwise. The per-cell summary goes to stdout.

A solve that did not converge is not a failure (its cell is done, with a
caution, and the closing line counts it); --require-converged makes it one.

Exit codes: 0 every cell done or held, 1 a cell failed (or, with
--require-converged, a solve did not converge), 2 bad usage or a bad study file
(every problem is listed with its place in the file).
`;

/** Reads and checks a study file named on the command line; a missing or unreadable file is a UsageError. */
export async function readStudyArgument(file: string, io: CommandIO): Promise<{ study: StudyDocument; path: string }> {
  const path = resolve(io.cwd, file);
  let bytes: Uint8Array;
  try {
    bytes = await readFile(path);
  } catch (error) {
    throw new UsageError(`cannot read the study ${JSON.stringify(file)}: ${fileProblem(error)}`);
  }
  return { study: parseStudy(new TextDecoder().decode(bytes), { path: file }), path };
}

/** A file system error in words: "no such file", "it is a folder", … */
export function fileProblem(error: unknown): string {
  const code = (error as { code?: string } | null)?.code;
  switch (code) {
    case "ENOENT":
      return "no such file or folder";
    case "EISDIR":
      return "it is a folder, not a file";
    case "EACCES":
    case "EPERM":
      return "permission denied";
    case "ENOTDIR":
      return "a part of the path is not a folder";
    default:
      return (error as Error)?.message ?? String(error);
  }
}

/** Fails early (before a long run) when an output file's folder does not exist. */
export async function checkOutputFolder(option: string, file: string, io: CommandIO): Promise<string> {
  const path = resolve(io.cwd, file);
  let folder: { isDirectory(): boolean };
  try {
    folder = await stat(dirname(path));
  } catch (error) {
    throw new UsageError(`--${option} ${file}: cannot write there: the folder ${JSON.stringify(dirname(file))}: ${fileProblem(error)}`);
  }
  if (!folder.isDirectory()) throw new UsageError(`--${option} ${file}: cannot write there: ${JSON.stringify(dirname(file))} is not a folder`);
  try {
    if ((await stat(path)).isDirectory()) throw new UsageError(`--${option} ${file}: is a folder; name a file`);
  } catch (error) {
    if (error instanceof UsageError) throw error;
  }
  return path;
}

/** Runs a study with the progress display of this terminal (or log) and returns the run. */
export async function runWithProgress(
  runner: StudyRunner,
  study: StudyDocument,
  io: StudyCommandIO,
  options: Omit<RunStudyOptions, "onProgress">,
): Promise<StudyRun> {
  const display = createProgressDisplay({ write: io.stderr, live: io.stderrIsTTY === true, cells: study.cells, columns: io.columns });
  try {
    return await runner(study, { ...options, onProgress: (event) => display.update(event), ...(io.now ? { now: io.now } : {}) });
  } finally {
    display.close();
  }
}

/** The status word of a cell in the summary: fixed width, capitals only for a failure. */
function statusWord(status: CellOutcome["status"]): string {
  return status === "failed" ? "FAILED" : status;
}

const WORD_WIDTH = 8;
const TIME_WIDTH = 9;

/**
 * The summary of a run: one line per cell — status, time, `name (kind)`, headline —
 * then indented lines for a failure's message and cause, a held cell's reason
 * and each caution; and a closing line with the counts and the total time.
 */
export function formatRunSummary(run: StudyRun): string {
  const lines: string[] = [];
  const indent = " ".repeat(WORD_WIDTH + 1 + TIME_WIDTH + 2);
  const counts = { done: 0, failed: 0, held: 0 };
  for (const o of run.outcomes) {
    counts[o.status]++;
    const time = o.status !== "done" && !(o.seconds > 0) ? "—" : formatSeconds(o.seconds);
    const label = cellLabel({ id: o.cellId, kind: o.kind, ...(o.name !== undefined ? { name: o.name } : {}) });
    const headline = o.status === "done" && o.headline ? `  ${oneLine(o.headline)}` : "";
    lines.push(`${statusWord(o.status).padEnd(WORD_WIDTH)} ${time.padStart(TIME_WIDTH)}  ${label}${headline}`);
    if (o.status === "failed") {
      lines.push(`${indent}${oneLine(o.error?.message ?? "no message was recorded")}`);
      if (o.error?.cause) lines.push(`${indent}cause: ${oneLine(o.error.cause)}`);
    } else if (o.status === "held" && o.error?.message) {
      lines.push(`${indent}${oneLine(o.error.message)}`);
    }
    for (const caution of o.cautions) lines.push(`${indent}caution: ${oneLine(caution)}`);
  }
  const n = run.outcomes.length;
  const unconverged = unconvergedSolves(run);
  const warning = unconverged > 0 ? `; ${unconverged} solve${unconverged === 1 ? "" : "s"} NOT CONVERGED` : "";
  lines.push(`${n} cell${n === 1 ? "" : "s"}: ${counts.done} done, ${counts.failed} failed, ${counts.held} held in ${formatSeconds(run.seconds)}${warning}`);
  return `${lines.join("\n")}\n`;
}

/**
 * Solves of a run that did not converge: one per transport cell whose result's
 * status is not "converged", plus each sweep's unconverged runs.
 */
export function unconvergedSolves(run: StudyRun): number {
  let count = 0;
  for (const o of run.outcomes) {
    if (o.status !== "done" || o.value === null || typeof o.value !== "object") continue;
    const value = o.value as { diagnostics?: { status?: string }; notConverged?: number };
    if (o.kind === "transport" && value.diagnostics?.status !== undefined && value.diagnostics.status !== "converged") count++;
    if (o.kind === "sweep" && typeof value.notConverged === "number") count += value.notConverged;
  }
  return count;
}

/** The fresh receipts of a run, by cell id, in study order. */
export function runReceipts(run: StudyRun): Record<string, CellOutcome["receipt"] & object> {
  const receipts: Record<string, CellOutcome["receipt"] & object> = {};
  for (const o of run.outcomes) if (o.receipt) receipts[o.cellId] = o.receipt;
  return receipts;
}

/**
 * The study with this run's receipts: a fresh receipt replaces the saved one of
 * its cell; receipts of cells that did not compute this time (held) are kept.
 */
export function withFreshReceipts(study: StudyDocument, run: StudyRun): StudyDocument {
  const changes = Object.entries(runReceipts(run)).map(([id, receipt]) => ({ type: "set-receipt" as const, id, receipt }));
  return changes.length === 0 ? study : updateStudy(study, changes).study;
}

/** `couplet run` with a given study runner (tests pass a stand-in). */
export function makeRunCommand(runner: StudyRunner): (argv: string[], io: StudyCommandIO) => Promise<number> {
  return async (argv, io) => {
    const { values, positionals } = parseCommandLine(argv, RUN_OPTIONS);
    if (values.help) {
      io.stdout(RUN_HELP);
      return 0;
    }
    if (positionals.length !== 1) throw new UsageError(`run needs one study file; got ${positionals.length} (see couplet run --help)`);
    const [file] = positionals;
    const { study, path } = await readStudyArgument(file, io);
    const setTexts = (values.set as string[] | undefined) ?? [];
    const overrides = parseOverrides(study, setTexts);
    const reportPath = typeof values.report === "string" ? await checkOutputFolder("report", values.report, io) : undefined;
    const receiptsPath = typeof values.receipts === "string" ? await checkOutputFolder("receipts", values.receipts, io) : undefined;
    for (const [option, output] of [["report", reportPath], ["receipts", receiptsPath]] as const) {
      if (output === path) throw new UsageError(`--${option} ${file}: that is the study itself; name another file`);
    }
    if (reportPath !== undefined && reportPath === receiptsPath) throw new UsageError("--report and --receipts name the same file; name two files");

    const run = await runWithProgress(runner, study, io, { studyPath: path, overrides, runCode: !values["hold-code"] });
    io.stdout(formatRunSummary(run));
    const failed = run.outcomes.filter((o) => o.status === "failed").length;

    if (reportPath) {
      const fileValues = new Map(namedParameters(study).map((c) => [c.name, c.settings.value]));
      const overridden = new Map(Object.keys(overrides).map((name) => [name, fileValues.get(name)]));
      const generatedAt = (io.now ? io.now() : new Date()).toISOString();
      const html = renderReport(studyReportModel(run, { generatedAt, overridden }));
      await writeOutput("report", reportPath, values.report as string, html, io);
    }
    if (receiptsPath) await writeOutput("receipts", receiptsPath, values.receipts as string, `${JSON.stringify(runReceipts(run), null, 2)}\n`, io);
    if (values["save-receipts"]) {
      if (failed > 0) {
        io.stderr(`receipts not saved in ${file}: ${failed} cell${failed === 1 ? "" : "s"} failed; fix the study and run again\n`);
      } else {
        const count = Object.keys(runReceipts(run)).length;
        const saved = await saveStudyFile(path, withFreshReceipts(study, run));
        const shownBackup = saved.backupPath === `${path}.previous` ? `${file}.previous` : saved.backupPath;
        const backup = shownBackup ? ` (previous file kept as ${shownBackup})` : "";
        io.stderr(`${saved.written ? "saved" : "unchanged:"} ${count} receipt${count === 1 ? "" : "s"} in ${file}${backup}\n`);
        if (setTexts.length > 0) io.stderr(`note: these receipts were recorded with ${setTexts.map((t) => `--set ${t}`).join(" ")}; check with the same --set\n`);
      }
    }
    if (failed > 0) return 1;
    return values["require-converged"] && unconvergedSolves(run) > 0 ? 1 : 0;
  };
}

async function writeOutput(option: string, path: string, shown: string, text: string, io: CommandIO): Promise<void> {
  try {
    await writeFile(path, text);
  } catch (error) {
    throw new UsageError(`--${option}: cannot write ${shown}: ${fileProblem(error)}`);
  }
  io.stderr(`wrote ${shown}\n`);
}

/**
 * The real headless study run, loaded on first use: `couplet solve` and every
 * `--help` start without loading the study runtime.
 */
export const runStudyLazily: StudyRunner = async (study, options) => {
  const { runStudy } = await import("../study/run-study");
  return runStudy(study, options);
};

/** `couplet run STUDY [options]`: see {@link RUN_HELP}. Returns the exit code. */
export const runCommand = makeRunCommand(runStudyLazily);
