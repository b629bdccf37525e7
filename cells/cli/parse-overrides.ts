import type { CellOf, StudyDocument } from "../document";
import { MAX_SEED } from "../document/seed";
import type { ParameterSettings } from "../kinds/parameter/settings";
import { UsageError } from "./usage-error";

/** A plain decimal or scientific number: no hex, no "Infinity", no surrounding text. */
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

const TRUE_WORDS = ["true", "yes", "on", "1"];
const FALSE_WORDS = ["false", "no", "off", "0"];

/** The parameter cells of a study that have a name, in study order. */
export function namedParameters(study: StudyDocument): Array<CellOf<"parameter"> & { readonly name: string }> {
  return study.cells.filter((c): c is CellOf<"parameter"> & { name: string } => c.kind === "parameter" && typeof c.name === "string");
}

function strictNumber(text: string): number | undefined {
  const trimmed = text.trim();
  if (!DECIMAL.test(trimmed)) return undefined;
  const value = Number(trimmed);
  return Number.isFinite(value) ? value : undefined;
}

function rangeText(min: number | undefined, max: number | undefined): string {
  return `[${min ?? "-∞"}, ${max ?? "∞"}]`;
}

/**
 * Reads the text of `--set NAME=TEXT` as a value of the parameter's control, strictly:
 * - `number`, `log-range`: a decimal or scientific number within [min, max];
 * - `integer`: a whole number within the bounds given;
 * - `toggle`: true/false, yes/no, on/off or 1/0 (any letter case);
 * - `choice`: one of the options (for number options the text is read as a number, so `0.10` picks `0.1`);
 * - `text`: the text as it is (may be empty);
 * - `seed`: a whole number in [0, 4294967295].
 * Returns a problem (one phrase, no option name) instead of throwing, so the
 * caller can name the option.
 */
export function parseParameterText(settings: ParameterSettings, text: string): { value: unknown } | { problem: string } {
  switch (settings.control) {
    case "number":
    case "log-range": {
      const value = strictNumber(text);
      if (value === undefined) return { problem: `not a number: ${JSON.stringify(text)}` };
      if (value < settings.min || value > settings.max) return { problem: `${value} is outside the parameter's range ${rangeText(settings.min, settings.max)}` };
      return { value };
    }
    case "integer": {
      const value = strictNumber(text);
      if (value === undefined || !Number.isInteger(value)) return { problem: `not a whole number: ${JSON.stringify(text)}` };
      if ((settings.min !== undefined && value < settings.min) || (settings.max !== undefined && value > settings.max)) {
        return { problem: `${value} is outside the parameter's range ${rangeText(settings.min, settings.max)}` };
      }
      return { value };
    }
    case "seed": {
      const value = strictNumber(text);
      if (value === undefined || !Number.isInteger(value) || value < 0 || value > MAX_SEED) {
        return { problem: `a seed is a whole number in [0, ${MAX_SEED}], got ${JSON.stringify(text)}` };
      }
      return { value };
    }
    case "toggle": {
      const word = text.trim().toLowerCase();
      if (TRUE_WORDS.includes(word)) return { value: true };
      if (FALSE_WORDS.includes(word)) return { value: false };
      return { problem: `an on/off parameter takes true/false, yes/no, on/off or 1/0, got ${JSON.stringify(text)}` };
    }
    case "choice": {
      const options = settings.options;
      if (options.includes(text)) return { value: text };
      const number = strictNumber(text);
      if (number !== undefined && options.includes(number)) return { value: number };
      return { problem: `${JSON.stringify(text)} is not one of the options: ${options.map((o) => (typeof o === "string" ? o : String(o))).join(", ")}` };
    }
    case "text":
      return { value: text };
    default:
      return { problem: `unknown control ${JSON.stringify((settings as { control: unknown }).control)}` };
  }
}

/**
 * Turns the texts of repeated `--set NAME=VALUE` options into parameter values by
 * name, typed by each parameter's control (see {@link parseParameterText}).
 * Throws a UsageError naming the option and the problem: a text without "=",
 * a name that is not a parameter of the study (the message lists the parameters),
 * the same name twice, or a value the control does not accept.
 */
export function parseOverrides(study: StudyDocument, texts: readonly string[]): Record<string, unknown> {
  const parameters = new Map(namedParameters(study).map((c) => [c.name, c]));
  const known = parameters.size === 0 ? "this study has no parameters" : `its parameters are ${[...parameters.keys()].join(", ")}`;
  const overrides: Record<string, unknown> = {};
  for (const text of texts) {
    const at = text.indexOf("=");
    if (at <= 0) throw new UsageError(`--set ${text}: write NAME=VALUE, e.g. --set ${[...parameters.keys()][0] ?? "eps"}=0.1`);
    const name = text.slice(0, at).trim();
    const valueText = text.slice(at + 1);
    const cell = parameters.get(name);
    if (!cell) {
      const other = study.cells.find((c) => c.name === name);
      const what = other ? `"${name}" is a ${other.kind} cell, not a parameter` : `the study has no parameter "${name}"`;
      throw new UsageError(`--set ${text}: ${what}; ${known}`);
    }
    if (Object.hasOwn(overrides, name)) throw new UsageError(`--set ${text}: parameter "${name}" is set twice; give it once`);
    const parsed = parseParameterText(cell.settings, valueText);
    if ("problem" in parsed) throw new UsageError(`--set ${text}: parameter "${name}" (${cell.settings.control}): ${parsed.problem}`);
    overrides[name] = parsed.value;
  }
  return overrides;
}
