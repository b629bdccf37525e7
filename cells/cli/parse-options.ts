import { parseArgs } from "node:util";
import { UsageError } from "./usage-error";

/** One option of a command, with the text `--help` prints for it. */
export interface OptionSpec {
  readonly name: string;
  readonly type: "string" | "boolean";
  readonly value?: string;
  readonly help: string;
  readonly multiple?: boolean;
}

export interface ParsedCommandLine {
  readonly values: Record<string, string | boolean | string[] | undefined>;
  readonly positionals: string[];
}

/** Parses argv strictly against `specs`; unknown options become a UsageError naming them. */
export function parseCommandLine(argv: string[], specs: readonly OptionSpec[]): ParsedCommandLine {
  const options: Record<string, { type: "string" | "boolean"; multiple?: boolean }> = { help: { type: "boolean" } };
  for (const spec of specs) options[spec.name] = spec.multiple ? { type: spec.type, multiple: true } : { type: spec.type };
  try {
    const { values, positionals } = parseArgs({ args: argv, options, allowPositionals: true, strict: true });
    return { values: values as ParsedCommandLine["values"], positionals };
  } catch (error) {
    throw new UsageError((error as Error).message.replace(/^TypeError \[[A-Z_]+\]: /, ""));
  }
}

/** The option list as `--help` shows it: one aligned line per option. */
export function formatOptions(specs: readonly OptionSpec[]): string {
  const heads = specs.map((s) => `  --${s.name}${s.value ? ` ${s.value}` : ""}`);
  const width = Math.max(...heads.map((h) => h.length)) + 2;
  return specs
    .map((s, k) => {
      const lines = s.help.split("\n");
      return heads[k].padEnd(width) + lines[0] + lines.slice(1).map((l) => `\n${" ".repeat(width)}${l}`).join("");
    })
    .join("\n");
}

/** A strictly parsed finite number option, or a UsageError naming the option. */
export function numberOption(name: string, text: string, check?: (v: number) => string | undefined): number {
  const value = Number(text);
  if (text.trim() === "" || !Number.isFinite(value)) throw new UsageError(`--${name}: not a number: ${JSON.stringify(text)}`);
  const problem = check?.(value);
  if (problem) throw new UsageError(`--${name}: ${problem}, got ${text}`);
  return value;
}
