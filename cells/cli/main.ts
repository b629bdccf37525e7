import { TransportInputError } from "../../core/errors";
import { type CommandIO, solveCommand } from "./solve-command";
import { UsageError } from "./usage-error";

type Command = (argv: string[], io: CommandIO) => Promise<number>;

const COMMANDS: Record<string, { run: Command; summary: string }> = {
  solve: { run: solveCommand, summary: "solve one transport problem between two point files" },
};

function overview(): string {
  const width = Math.max(...Object.keys(COMMANDS).map((k) => k.length)) + 2;
  return `Usage: couplet COMMAND [options]\n\nCommands:\n${Object.entries(COMMANDS)
    .map(([name, c]) => `  ${name.padEnd(width)}${c.summary}`)
    .join("\n")}\n\nRun couplet COMMAND --help for the options of a command.\n`;
}

/** Known failures of the user's input (exit 2) as opposed to bugs (rethrown). */
function isInputProblem(error: unknown): error is Error {
  return error instanceof UsageError || error instanceof TransportInputError || (error instanceof Error && error.name === "DataImportError") || (error instanceof Error && error.name === "StudyFormatError");
}

/** Entry of the `couplet` command: runs it and returns the exit code. */
export async function main(argv: string[], io: CommandIO = defaultIO()): Promise<number> {
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
    return await command.run(rest, io);
  } catch (error) {
    if (isInputProblem(error)) {
      io.stderr(`couplet ${name}: ${error.message}\n`);
      return 2;
    }
    throw error;
  }
}

function defaultIO(): CommandIO {
  return {
    stdout: (text) => process.stdout.write(text),
    stderr: (text) => process.stderr.write(text),
    cwd: process.cwd(),
  };
}
