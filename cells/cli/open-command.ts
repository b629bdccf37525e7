import { realpath, stat } from "node:fs/promises";
import { basename, dirname, resolve } from "node:path";
import { type RunningServer, startServer } from "../server/start-server";
import { type OptionSpec, formatOptions, numberOption, parseCommandLine } from "./parse-options";
import type { CommandIO } from "./solve-command";
import { UsageError } from "./usage-error";

export const OPEN_OPTIONS: readonly OptionSpec[] = [
  { name: "port", type: "string", value: "N", help: "listen on port N of 127.0.0.1 (default: a free port the system picks)" },
  { name: "no-browser", type: "boolean", help: "only print the link (for now this is always what happens)" },
];

export const OPEN_HELP = `Usage: couplet open [STUDY | FOLDER] [options]

Starts the study editor: a local server on 127.0.0.1 (this computer only) that
serves the editor and reads and writes the files of one folder: the FOLDER
given, or the folder of STUDY (a NAME.couplet.json file), or the current folder.
It prints a link to open in a browser; the link carries a secret for this run,
so only someone holding it can reach your files. Stop it with Ctrl-C.

Options:
${formatOptions([...OPEN_OPTIONS, { name: "help", type: "boolean", help: "show this text" }])}

Exit codes: 0 stopped with Ctrl-C, 2 bad usage, missing file or folder, or the
port cannot be used. See docs/server.md for what the server allows.
`;

/** How a test (or an embedding program) stops `couplet open` instead of Ctrl-C. */
export interface OpenControl {
  /** Aborting it stops the server and makes the command return 0. Default: SIGINT or SIGTERM of this process. */
  readonly stop?: AbortSignal;
  /** Called once the server listens (tests read the URL from here). */
  readonly onListening?: (server: RunningServer) => void;
}

async function whatToOpen(target: string, shown: string): Promise<{ root: string; study?: string }> {
  let info: Awaited<ReturnType<typeof stat>>;
  try {
    info = await stat(target);
  } catch {
    throw new UsageError(`${shown}: no such file or folder`);
  }
  if (info.isDirectory()) return { root: target };
  if (!basename(target).endsWith(".couplet.json")) throw new UsageError(`${shown}: not a study; give a NAME.couplet.json file or a folder`);
  // A study reached through a symbolic link is served from the folder it really lives in.
  const real = await realpath(target);
  return { root: dirname(real), study: basename(real) };
}

function portOption(text: string | undefined): number {
  if (text === undefined) return 0;
  return numberOption("port", text, (v) => (Number.isInteger(v) && v >= 1 && v <= 65535 ? undefined : "must be a whole number from 1 to 65535"));
}

function untilStopped(stop: AbortSignal | undefined): Promise<string> {
  if (stop) return stop.aborted ? Promise.resolve("stop") : new Promise((done) => stop.addEventListener("abort", () => done("stop"), { once: true }));
  return new Promise((done) => {
    const onSignal = (name: string) => {
      process.off("SIGINT", onSignal);
      process.off("SIGTERM", onSignal);
      done(name);
    };
    process.on("SIGINT", onSignal);
    process.on("SIGTERM", onSignal);
  });
}

/**
 * `couplet open [STUDY | FOLDER] [--port N] [--no-browser]`: see {@link OPEN_HELP}.
 * Prints `Couplet editor: http://127.0.0.1:PORT/?token=…` on a line of its own,
 * serves until stopped (Ctrl-C, SIGTERM or `control.stop`), closes the server and
 * returns 0.
 */
export async function openCommand(argv: string[], io: CommandIO, control: OpenControl = {}): Promise<number> {
  const { values, positionals } = parseCommandLine(argv, OPEN_OPTIONS);
  if (values.help) {
    io.stdout(OPEN_HELP);
    return 0;
  }
  if (positionals.length > 1) throw new UsageError(`open takes one study or folder; got ${positionals.length} (see couplet open --help)`);
  const shown = positionals[0] ?? ".";
  const port = portOption(values.port as string | undefined);
  const { root, study } = await whatToOpen(resolve(io.cwd, shown), shown);
  let server: RunningServer;
  try {
    server = await startServer({ root, study, port, host: "127.0.0.1", onError: (error) => io.stderr(`couplet open: unexpected error: ${(error as Error)?.stack ?? String(error)}\n`) });
  } catch (error) {
    const code = (error as { code?: string }).code;
    if (code === "EADDRINUSE") throw new UsageError(`--port ${port}: already in use; choose another port or leave out --port`);
    if (code === "EACCES") throw new UsageError(`--port ${port}: not allowed to listen there; choose a port above 1023`);
    if (error instanceof RangeError) throw new UsageError(`${shown}: ${error.message.replace(/^startServer: /, "")}`);
    throw error;
  }
  io.stdout(`Couplet editor: ${server.url}\n`);
  io.stdout(`Serving ${root}${study ? ` (study ${study})` : ""} on 127.0.0.1 only. The link's token gives access to this folder: keep it to yourself. Press Ctrl-C to stop.\n`);
  control.onListening?.(server);
  await untilStopped(control.stop);
  await server.close();
  io.stdout("Couplet editor stopped.\n");
  return 0;
}
