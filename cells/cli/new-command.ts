import { stat } from "node:fs/promises";
import { resolve } from "node:path";
import { saveStudyFile } from "../document/study-file";
import { STARTER_TITLE, starterStudy } from "../study/starter-study";
import { type OptionSpec, formatOptions, parseCommandLine } from "./parse-options";
import { fileProblem } from "./run-command";
import type { CommandIO } from "./solve-command";
import { UsageError } from "./usage-error";

export const NEW_OPTIONS: readonly OptionSpec[] = [
  { name: "title", type: "string", value: "T", help: `title of the study (default "${STARTER_TITLE}")` },
  { name: "force", type: "boolean", help: "replace FILE if it exists (the old file is kept as FILE.previous)" },
];

export const NEW_HELP = `Usage: couplet new FILE [options]

Writes a starter study that runs as it is: two small generated point clouds,
an epsilon parameter relative to the median cost, an exact and a debiased
transport, a coupling-lines figure, a convergence figure, and prose that
quotes live values. Name it NAME.couplet.json by convention.

Options:
${formatOptions([...NEW_OPTIONS, { name: "help", type: "boolean", help: "show this text" }])}

Exit codes: 0 written, 2 bad usage, FILE exists (without --force) or cannot be written.
`;

/** `couplet new FILE [--title T] [--force]`: see {@link NEW_HELP}. Returns the exit code. */
export async function newCommand(argv: string[], io: CommandIO): Promise<number> {
  const { values, positionals } = parseCommandLine(argv, NEW_OPTIONS);
  if (values.help) {
    io.stdout(NEW_HELP);
    return 0;
  }
  if (positionals.length !== 1) throw new UsageError(`new needs one file name; got ${positionals.length} (see couplet new --help)`);
  const [file] = positionals;
  const path = resolve(io.cwd, file);
  let exists = false;
  try {
    const info = await stat(path);
    if (info.isDirectory()) throw new UsageError(`${file} is a folder; name a file, e.g. ${file.replace(/\/+$/, "")}/study.couplet.json`);
    exists = true;
  } catch (error) {
    if (error instanceof UsageError) throw error;
  }
  if (exists && !values.force) throw new UsageError(`${file} exists; choose another name, or add --force to replace it (the old file is kept as ${file}.previous)`);
  const study = starterStudy(typeof values.title === "string" ? { title: values.title } : {});
  let backup: string | null;
  try {
    backup = (await saveStudyFile(path, study)).backupPath;
  } catch (error) {
    if ((error as Error)?.name === "StudyFormatError") throw error;
    throw new UsageError(`cannot write ${file}: ${fileProblem(error)}`);
  }
  io.stdout(`wrote ${file}: a starter study of ${study.cells.length} cells${backup ? ` (previous file kept as ${file}.previous)` : ""}\nrun it:   couplet run ${file} --report ${file.replace(/\.couplet\.json$|\.json$/, "")}.html\n`);
  return 0;
}
