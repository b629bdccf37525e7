import { describeValue } from "../../../core/errors";
import { type NameMapper } from "../../document/references";
import { MAX_SEED } from "../../document/seed";
import { type StudyIssue, childPath } from "../../document/study-issue";
import { type JsonObject, checkArray, checkBoolean, checkNumber, checkObject, checkOneOf, checkPresent, checkString, jsonTypeName } from "../../document/value-checks";

/** The controls a parameter cell can show. */
export type ParameterControl = "number" | "log-range" | "integer" | "choice" | "toggle" | "text" | "seed";

/** All controls, in the order the docs list them. */
export const PARAMETER_CONTROLS: readonly ParameterControl[] = ["number", "log-range", "integer", "choice", "toggle", "text", "seed"];

/** Fields every control accepts. */
interface ParameterCommon {
  /** Text shown beside the control. Default: the cell's name. */
  readonly label?: string;
  /** Unit shown after the value, e.g. "km". */
  readonly unit?: string;
  readonly [extra: string]: unknown;
}

/** A slider on [min, max] with an optional step (> 0; default: continuous). */
export interface NumberParameter extends ParameterCommon {
  readonly control: "number";
  readonly value: number;
  readonly min: number;
  readonly max: number;
  readonly step?: number;
}

/** A slider on [min, max], 0 < min < max, moving evenly in log(value): for epsilon, penalties, tolerances. */
export interface LogRangeParameter extends ParameterCommon {
  readonly control: "log-range";
  readonly value: number;
  readonly min: number;
  readonly max: number;
}

/** A whole number, optionally bounded, moving by `step` (a positive integer, default 1). */
export interface IntegerParameter extends ParameterCommon {
  readonly control: "integer";
  readonly value: number;
  readonly min?: number;
  readonly max?: number;
  readonly step?: number;
}

/** One of a fixed list of strings or numbers (no repeats); `value` must be one of them. */
export interface ChoiceParameter extends ParameterCommon {
  readonly control: "choice";
  readonly value: string | number;
  readonly options: readonly (string | number)[];
}

/** On or off. */
export interface ToggleParameter extends ParameterCommon {
  readonly control: "toggle";
  readonly value: boolean;
}

/** Free text; `multiline` shows a text area (default false). */
export interface TextParameter extends ParameterCommon {
  readonly control: "text";
  readonly value: string;
  readonly multiline?: boolean;
}

/** A random seed: an integer in [0, 4294967295], with a button to draw a new one. */
export interface SeedParameter extends ParameterCommon {
  readonly control: "seed";
  readonly value: number;
}

/** Settings of a parameter cell: its control, current value and bounds. Its value is the cell's value. */
export type ParameterSettings = NumberParameter | LogRangeParameter | IntegerParameter | ChoiceParameter | ToggleParameter | TextParameter | SeedParameter;

function checkWithin(value: number, min: number | undefined, max: number | undefined, path: string, issues: StudyIssue[]): void {
  if ((min !== undefined && value < min) || (max !== undefined && value > max)) {
    const range = `[${min ?? "-∞"}, ${max ?? "∞"}]`;
    issues.push({ path, message: `must be within ${range}, got ${describeValue(value)}` });
  }
}

/** min and max present, numbers, min < max (and min > 0 when `positive`); returns them when usable. */
function checkRange(s: JsonObject, path: string, issues: StudyIssue[], positive: boolean): [number, number] | undefined {
  const hasMin = checkPresent(s, "min", path, issues) && checkNumber(s.min, childPath(path, "min"), issues, positive ? { above: 0 } : {});
  const hasMax = checkPresent(s, "max", path, issues) && checkNumber(s.max, childPath(path, "max"), issues);
  if (!hasMin || !hasMax) return undefined;
  const min = s.min as number;
  const max = s.max as number;
  if (!(max > min)) {
    issues.push({ path: childPath(path, "max"), message: `must be > min (${min}), got ${describeValue(max)}` });
    return undefined;
  }
  return [min, max];
}

/**
 * Validates parameter settings at `path`. Checks the control name, the value's
 * type, bounds (min < max; log-range min > 0), the value within them
 * (`cells[0].settings.value: must be within [0.001, 1], got 3`), choice options
 * (non-empty, no repeats, value among them) and seeds in [0, 4294967295].
 */
export function validateParameterSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  const s = settings;
  for (const key of ["label", "unit"]) if (s[key] !== undefined) checkString(s[key], childPath(path, key), issues);
  if (!checkPresent(s, "control", path, issues) || !checkOneOf(s.control, PARAMETER_CONTROLS, childPath(path, "control"), issues)) return issues;
  const valuePath = childPath(path, "value");
  const hasValue = checkPresent(s, "value", path, issues);
  switch (s.control) {
    case "number":
    case "log-range": {
      const range = checkRange(s, path, issues, s.control === "log-range");
      if (s.control === "number" && s.step !== undefined) checkNumber(s.step, childPath(path, "step"), issues, { above: 0 });
      if (hasValue && checkNumber(s.value, valuePath, issues) && range) checkWithin(s.value, range[0], range[1], valuePath, issues);
      break;
    }
    case "integer": {
      const min = s.min === undefined ? undefined : checkNumber(s.min, childPath(path, "min"), issues, { integer: true }) ? s.min : null;
      const max = s.max === undefined ? undefined : checkNumber(s.max, childPath(path, "max"), issues, { integer: true }) ? s.max : null;
      if (typeof min === "number" && typeof max === "number" && !(max > min)) {
        issues.push({ path: childPath(path, "max"), message: `must be > min (${min}), got ${max}` });
      }
      if (s.step !== undefined) checkNumber(s.step, childPath(path, "step"), issues, { integer: true, atLeast: 1 });
      if (hasValue && checkNumber(s.value, valuePath, issues, { integer: true }) && min !== null && max !== null) {
        if (min === undefined || max === undefined || max > min) checkWithin(s.value, min, max, valuePath, issues);
      }
      break;
    }
    case "choice": {
      const optionsPath = childPath(path, "options");
      let options: readonly unknown[] | undefined;
      if (checkPresent(s, "options", path, issues) && checkArray(s.options, optionsPath, issues, 1)) {
        options = s.options;
        const seen = new Map<unknown, number>();
        s.options.forEach((option, i) => {
          const itemPath = childPath(optionsPath, i);
          if (typeof option !== "string" && !(typeof option === "number" && Number.isFinite(option))) {
            issues.push({ path: itemPath, message: `must be a string or a number, got ${jsonTypeName(option)}` });
            options = undefined;
          } else if (seen.has(option)) {
            issues.push({ path: itemPath, message: `repeats options[${seen.get(option)}] (${describeValue(option)})` });
          } else seen.set(option, i);
        });
      }
      if (hasValue) {
        if (typeof s.value !== "string" && typeof s.value !== "number") issues.push({ path: valuePath, message: `must be a string or a number, got ${jsonTypeName(s.value)}` });
        else if (options && !options.includes(s.value)) {
          issues.push({ path: valuePath, message: `must be one of the options (${options.map((o) => describeValue(o)).join(", ")}), got ${describeValue(s.value)}` });
        }
      }
      break;
    }
    case "toggle":
      if (hasValue) checkBoolean(s.value, valuePath, issues);
      break;
    case "text":
      if (hasValue) checkString(s.value, valuePath, issues);
      if (s.multiline !== undefined) checkBoolean(s.multiline, childPath(path, "multiline"), issues);
      break;
    case "seed":
      if (hasValue) checkNumber(s.value, valuePath, issues, { integer: true, atLeast: 0, atMost: MAX_SEED });
      break;
  }
  return issues;
}

/** A parameter refers to no other cell: returns the settings unchanged. */
export function mapParameterReferences(settings: ParameterSettings, _rename: NameMapper): ParameterSettings {
  return settings;
}

/** A parameter depends on nothing: always `[]`. */
export function parameterDependencies(_settings: ParameterSettings): string[] {
  return [];
}
