import type { Receipt, StudyDocument } from "../document";
import type { compareReceipt } from "../study/receipts";
import type { StudyRun } from "../study/run-study";
import { shortFingerprint } from "../study/report-model";
import { formatSeconds } from "../views/report/format-value";
import { type OptionSpec, formatOptions, parseCommandLine } from "./parse-options";
import { parseOverrides } from "./parse-overrides";
import { cellLabel, oneLine } from "./progress-display";
import { RUN_OPTIONS, type StudyCommandIO, type StudyRunner, readStudyArgument, runStudyLazily, runWithProgress } from "./run-command";
import { UsageError } from "./usage-error";

export const CHECK_OPTIONS: readonly OptionSpec[] = [RUN_OPTIONS.find((o) => o.name === "set")!, RUN_OPTIONS.find((o) => o.name === "hold-code")!];

export const CHECK_HELP = `Usage: couplet check STUDY [options]

Runs a study again and compares every computing cell with the receipt saved in
the study file (by \`couplet run STUDY --save-receipts\`), within each cell's
tolerances. A study with receipts is its own regression test.

For each computing cell it prints one of:
  ok              the fresh numbers agree with the receipt
  DRIFTED         a number moved beyond its tolerance (field, saved, fresh, tolerance)
  inputs changed  the cell's settings or input data are not the ones recorded: not compared
  no receipt      the cell has no saved receipt
  FAILED          the cell failed in this run
  held            the cell was not computed in this run: not compared

Options:
${formatOptions([...CHECK_OPTIONS, { name: "help", type: "boolean", help: "show this text" }])}

Exit codes: 0 nothing drifted, changed or failed; 1 a cell drifted, its inputs
changed or it failed; 2 bad usage, a bad study file, or a study with no receipts at all.
`;

/** Compares a saved receipt with a fresh one within the cell's tolerances (cells/study/receipts.ts). */
export type ReceiptComparer = typeof compareReceipt;

/** How one cell fared in a check. */
export type CheckVerdict = "ok" | "drifted" | "inputs-changed" | "no-receipt" | "failed" | "held";

/** One cell's line in a check. */
export interface CellCheck {
  readonly cellId: string;
  readonly label: string;
  readonly verdict: CheckVerdict;
  /** Fields beyond tolerance (drifted only). */
  readonly drifts: ReadonlyArray<{ readonly field: string; readonly saved: unknown; readonly fresh: unknown; readonly tolerance: number }>;
  /** One line of explanation, when there is one. */
  readonly note?: string;
}

/**
 * Compares a fresh run with the receipts saved in the study, cell by cell in
 * study order. Cells with neither a saved nor a fresh receipt (prose,
 * parameters, …) are left out unless they failed.
 */
export function checkRun(study: StudyDocument, run: StudyRun, compare: ReceiptComparer): CellCheck[] {
  const saved = study.receipts ?? {};
  const outcomes = new Map(run.outcomes.map((o) => [o.cellId, o]));
  const checks: CellCheck[] = [];
  for (const cell of study.cells) {
    const outcome = outcomes.get(cell.id);
    const receipt: Receipt | undefined = saved[cell.id];
    const label = cellLabel(cell);
    const base = { cellId: cell.id, label, drifts: [] };
    if (!outcome) {
      if (receipt) checks.push({ ...base, verdict: "held", note: "not run" });
      continue;
    }
    if (outcome.status === "failed") {
      checks.push({ ...base, verdict: "failed", note: oneLine(outcome.error?.message ?? "no message was recorded") });
      continue;
    }
    if (!receipt && !outcome.receipt) continue;
    if (!receipt) {
      checks.push({ ...base, verdict: "no-receipt" });
      continue;
    }
    if (outcome.status === "held") {
      checks.push({ ...base, verdict: "held", note: `not compared${outcome.error?.message ? ` (${oneLine(outcome.error.message)})` : ""}` });
      continue;
    }
    if (!outcome.receipt) {
      checks.push({ ...base, verdict: "held", note: "this run recorded no receipt for it: not compared" });
      continue;
    }
    const fresh = outcome.receipt;
    const { ok, drifts, coreVersionChanged } = compare(receipt, fresh, cell.settings);
    const core = coreVersionChanged ? `saved by core ${receipt.coreVersion}, now ${fresh.coreVersion}` : undefined;
    if (drifts.some((d) => d.kind === "inputs")) {
      // compareReceipt compares nothing else once the fingerprints differ.
      const note = `fingerprint ${shortFingerprint(receipt.fingerprint)} → ${shortFingerprint(fresh.fingerprint)}: its settings or input data differ from the recorded run`;
      checks.push({ ...base, verdict: "inputs-changed", note: core ? `${note} (${core})` : note });
      continue;
    }
    checks.push({ ...base, verdict: ok ? "ok" : "drifted", drifts: ok ? [] : drifts, ...(core ? { note: core } : {}) });
  }
  return checks;
}

const WORDS: Record<CheckVerdict, string> = {
  ok: "ok",
  drifted: "DRIFTED",
  "inputs-changed": "inputs changed",
  "no-receipt": "no receipt",
  failed: "FAILED",
  held: "held",
};

/** A tolerance: 6 significant digits, so 10 × 1e-6 shows as 0.00001, not 0.000009999999999999999. */
function tolerance(value: number): string {
  return String(Number(value.toPrecision(6)));
}

/** A receipt value as typed: numbers in their shortest exact form, the rest as JSON. */
function exact(value: unknown): string {
  if (typeof value === "number") return String(value);
  if (value === undefined) return "(none)";
  const text = JSON.stringify(value) ?? String(value);
  return text.length > 80 ? `${text.slice(0, 77)}...` : text;
}

/** The check's report: one line per cell, drift details indented, and a closing line of counts. */
export function formatCheck(checks: readonly CellCheck[], seconds: number): string {
  const width = Math.max(...Object.values(WORDS).map((w) => w.length)) + 2;
  const lines: string[] = [];
  for (const c of checks) {
    lines.push(`${WORDS[c.verdict].padEnd(width)}${c.label}${c.note ? `: ${c.note}` : ""}`);
    for (const d of c.drifts) {
      lines.push(`${" ".repeat(width + 2)}${d.field}: saved ${exact(d.saved)}, fresh ${exact(d.fresh)}, tolerance ${tolerance(d.tolerance)}`);
    }
  }
  const count = (v: CheckVerdict) => checks.filter((c) => c.verdict === v).length;
  const parts = [`${count("ok")} ok`, `${count("drifted")} drifted`, `${count("inputs-changed")} inputs changed`, `${count("no-receipt")} without receipt`, `${count("failed")} failed`];
  if (count("held") > 0) parts.push(`${count("held")} held`);
  lines.push(`check: ${parts.join(", ")} (${formatSeconds(seconds)})`);
  return `${lines.join("\n")}\n`;
}

/** The real receipt comparison, loaded with the study runtime on first use. */
const compareLazily = async (): Promise<ReceiptComparer> => (await import("../study/receipts")).compareReceipt;

/** `couplet check` with a given study runner and receipt comparison (tests pass stand-ins). */
export function makeCheckCommand(runner: StudyRunner, comparer: () => Promise<ReceiptComparer> = compareLazily): (argv: string[], io: StudyCommandIO) => Promise<number> {
  return async (argv, io) => {
    const { values, positionals } = parseCommandLine(argv, CHECK_OPTIONS);
    if (values.help) {
      io.stdout(CHECK_HELP);
      return 0;
    }
    if (positionals.length !== 1) throw new UsageError(`check needs one study file; got ${positionals.length} (see couplet check --help)`);
    const [file] = positionals;
    const { study, path } = await readStudyArgument(file, io);
    if (!study.receipts || Object.keys(study.receipts).length === 0) {
      throw new UsageError(`${file} has no receipts to check against; record them first with: couplet run ${file} --save-receipts`);
    }
    const overrides = parseOverrides(study, (values.set as string[] | undefined) ?? []);
    const run = await runWithProgress(runner, study, io, { studyPath: path, overrides, runCode: !values["hold-code"] });
    const checks = checkRun(study, run, await comparer());
    io.stdout(formatCheck(checks, run.seconds));
    if (checks.some((c) => c.verdict === "inputs-changed" || c.verdict === "no-receipt")) {
      io.stderr(`to record fresh receipts for the study as it is now: couplet run ${file} --save-receipts\n`);
    }
    // Changed inputs fail too: the study no longer reproduces what it recorded, and a
    // check that compared nothing must not pass as if it had.
    return checks.some((c) => c.verdict === "drifted" || c.verdict === "failed" || c.verdict === "inputs-changed") ? 1 : 0;
  };
}

/** `couplet check STUDY [options]`: see {@link CHECK_HELP}. Returns the exit code. */
export const checkCommand = makeCheckCommand(runStudyLazily);
