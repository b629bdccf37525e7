import type { CellOf, StudyDocument } from "../document/study-types";
import type { ParameterSettings } from "../kinds/parameter/settings";
import { validateParameterSettings } from "../kinds/parameter/settings";
import { StudyRunError } from "./study-run-error";

/**
 * Checks a run's parameter overrides (parameter name → value, already parsed to
 * the parameter's type) against the study: each name must be a parameter cell's,
 * and each value must pass the same checks as a written value (type, bounds,
 * integer, one of the choices, seed range). Returns them as a map; throws a
 * {@link StudyRunError} naming the first bad parameter.
 */
export function checkOverrides(study: StudyDocument, overrides: Readonly<Record<string, unknown>> = {}): Map<string, unknown> {
  const checked = new Map<string, unknown>();
  const parameters = study.cells.filter((c): c is CellOf<"parameter"> => c.kind === "parameter");
  for (const [name, value] of Object.entries(overrides)) {
    const cell = study.cells.find((c) => c.name === name);
    if (!cell) {
      const known = parameters.map((p) => p.name).join(", ");
      throw new StudyRunError(`unknown parameter "${name}"; ${known ? `the parameters are ${known}` : "the study has no parameters"}`, name);
    }
    if (cell.kind !== "parameter") throw new StudyRunError(`"${name}" is a ${cell.kind} cell, not a parameter`, name);
    const issues = validateParameterSettings({ ...cell.settings, value }, name);
    if (issues.length > 0) throw new StudyRunError(`${issues[0].path.replace(/\.value$/, "")}: ${issues[0].message}`, name);
    checked.set(name, value);
  }
  return checked;
}

/** A parameter's control in words, as reports show it: "log range 0.001 – 1", "integer 10 – 2000 (step 10)", "choice of a, b". */
export function describeControl(settings: ParameterSettings): string {
  const span = (min?: number, max?: number) => (min === undefined && max === undefined ? "" : ` ${min ?? "−∞"} – ${max ?? "∞"}`);
  switch (settings.control) {
    case "number":
      return `number${span(settings.min, settings.max)}${settings.step === undefined ? "" : ` (step ${settings.step})`}`;
    case "log-range":
      return `log range${span(settings.min, settings.max)}`;
    case "integer":
      return `integer${span(settings.min, settings.max)}${settings.step === undefined || settings.step === 1 ? "" : ` (step ${settings.step})`}`;
    case "choice":
      return `choice of ${settings.options.join(", ")}`;
    case "text":
      return settings.multiline ? "text (several lines)" : "text";
    default:
      return settings.control;
  }
}
