import { TransportInputError } from "../../core/errors";
import type { StudyCommandIO } from "./run-command";
import { UsageError } from "./usage-error";

type Command = (argv: string[], io: StudyCommandIO) => Promise<number>;

// Commands are loaded when chosen, so that `couplet solve` does not load the study
// runtime and the plotting library (with esbuild's code splitting, not even from disk).
const COMMANDS: Record<string, { load: () => Promise<Command>; summary: string }> = {
  run: { load: async () => (await import("./run-command")).runCommand, summary: "run a study file headlessly; optionally write an HTML report and receipts" },
  check: { load: async () => (await import("./check-command")).checkCommand, summary: "run a study again and compare it with the receipts saved in it" },
  new: { load: async () => (await import("./new-command")).newCommand, summary: "write a starter study that runs as it is" },
  open: { load: async () => (await import("./open-command")).openCommand, summary: "open a study (or a folder of studies) in the browser editor on this machine" },
  solve: { load: async () => (await import("./solve-command")).solveCommand, summary: "solve one transport problem between two point files" },
};

function overview(): string {
  const width = Math.max(...Object.keys(COMMANDS).map((k) => k.length)) + 2;
  return `Usage: couplet COMMAND [options]\n\nCommands:\n${Object.entries(COMMANDS)
    .map(([name, c]) => `  ${name.padEnd(width)}${c.summary}`)
    .join("\n")}\n\nRun couplet COMMAND --help for the options of a command.\n`;
}

/** Known failures of the user's input (exit 2) as opposed to bugs (rethrown). */
function isInputProblem(error: unknown): error is Error {
  return error instanceof UsageError || error instanceof TransportInputError || (error instanceof Error && error.name === "DataImportError") || (error instanceof Error && (error.name === "StudyFormatError" || error.name === "StudyRunError"));
}

/** Entry of the `couplet` command: runs it and returns the exit code. */
export async function main(argv: string[], io: StudyCommandIO = defaultIO()): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    (name === undefined ? io.stderr : io.stdout)(overview());
    return name === undefined ? 2 : 0;
  }
  const command = COMMANDS[name];
  if (!command) {
    io.stderr(`couplet: unknown command ${JSON.stringify(name)}\n\n${overview()}`);
    return 2;
  }
  try {
    return await (await command.load())(rest, io);
  } catch (error) {
    if (isInputProblem(error)) {
      io.stderr(`couplet ${name}: ${error.message}\n`);
      return 2;
    }
    throw error;
  }
}

function defaultIO(): StudyCommandIO {
  return {
    stdout: (text) => process.stdout.write(text),
    stderr: (text) => process.stderr.write(text),
    cwd: process.cwd(),
    stderrIsTTY: process.stderr.isTTY === true,
    columns: process.stderr.columns,
  };
}
