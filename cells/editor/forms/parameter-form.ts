import { PARAMETER_CONTROLS, type ParameterSettings } from "../../kinds/parameter/settings";
import { el } from "../dom/element";
import { checkField, fieldGroup, numberField, selectField, textField } from "./fields";
import type { CellFormContext } from "./form-context";

const CONTROL_WORDS: Record<string, string> = {
  number: "number on a slider",
  "log-range": "number on a log slider (ε, ρ, tolerances)",
  integer: "whole number",
  choice: "one of a list",
  toggle: "on / off",
  text: "text",
  seed: "random seed",
};

/** Settings for a control chosen afresh, keeping the label and unit (and the value when it still fits). */
export function controlTemplate(control: string, from: ParameterSettings): Record<string, unknown> {
  const keep: Record<string, unknown> = {};
  if (from.label !== undefined) keep.label = from.label;
  if (from.unit !== undefined) keep.unit = from.unit;
  const v = from.value;
  const num = typeof v === "number" && Number.isFinite(v) ? v : undefined;
  switch (control) {
    case "number":
      return { control, value: num ?? 0.5, min: Math.min(0, num ?? 0), max: Math.max(1, num ?? 1), ...keep };
    case "log-range":
      return num !== undefined && num > 0 ? { control, value: num, min: num / 100, max: num * 100, ...keep } : { control, value: 0.05, min: 0.001, max: 1, ...keep };
    case "integer":
      return { control, value: num !== undefined ? Math.round(num) : 10, min: 1, max: Math.max(100, Math.round(num ?? 0)), ...keep };
    case "choice":
      return { control, value: typeof v === "string" || typeof v === "number" ? v : "first", options: typeof v === "string" || typeof v === "number" ? [v, "other"] : ["first", "second"], ...keep };
    case "toggle":
      return { control, value: v === true, ...keep };
    case "text":
      return { control, value: typeof v === "string" ? v : "", ...keep };
    default:
      return { control: "seed", value: num !== undefined && Number.isInteger(num) && num >= 0 && num <= 4294967295 ? num : 1, ...keep };
  }
}

/**
 * The definition form of a parameter cell (its value is tuned at the control desk):
 * which control, label and unit, bounds and step, the options of a choice, and
 * whether text spans several lines.
 */
export function parameterForm(context: CellFormContext): HTMLElement {
  const s = context.cell.settings as ParameterSettings;
  const form = el("div", { class: "cp-form cp-form-parameter" });
  const head = fieldGroup(
    "Control",
    selectField({
      label: "Kind of control",
      key: "control",
      value: s.control,
      choices: PARAMETER_CONTROLS.map((c) => ({ value: c, label: CONTROL_WORDS[c] })),
      commit: (v) => context.replace(controlTemplate(String(v), s), `control ${v}`),
    }),
    textField({ label: "Label", key: "label", value: s.label, optional: true, placeholder: context.cell.name ?? "", commit: (v) => context.set("label", v, "label") }),
    textField({ label: "Unit", key: "unit", value: s.unit, optional: true, placeholder: "none", commit: (v) => context.set("unit", v, "unit") }),
  );
  form.append(head);
  if (s.control === "number" || s.control === "log-range" || s.control === "integer") {
    const bounds = fieldGroup(
      "Range",
      numberField({ label: "Least", key: "min", value: s.min, optional: s.control === "integer", integer: s.control === "integer", commit: (v) => context.set("min", v, "least value") }),
      numberField({ label: "Greatest", key: "max", value: s.max, optional: s.control === "integer", integer: s.control === "integer", commit: (v) => context.set("max", v, "greatest value") }),
      s.control !== "log-range"
        ? numberField({
            label: "Step",
            key: "step",
            value: s.step,
            optional: true,
            integer: s.control === "integer",
            placeholder: s.control === "integer" ? "1" : "continuous",
            commit: (v) => context.set("step", v, "step"),
          })
        : null,
    );
    form.append(bounds);
  }
  if (s.control === "choice") {
    form.append(
      fieldGroup(
        "Options",
        textField({
          label: "Options, one per line (numbers stay numbers)",
          key: "options",
          value: s.options.map(String).join("\n"),
          multiline: true,
          commit: (v) => {
            const options = String(v)
              .split("\n")
              .map((line) => line.trim())
              .filter(Boolean)
              .map((line) => (/^-?\d+(\.\d+)?(e-?\d+)?$/i.test(line) ? Number(line) : line));
            const value = options.includes(s.value) ? s.value : options[0];
            return context.replace({ ...s, options, value }, "choice options");
          },
        }),
      ),
    );
  }
  if (s.control === "text") {
    form.append(checkField({ label: "several lines", key: "multiline", checked: s.multiline === true, commit: (v) => context.set("multiline", v ? true : undefined, "text lines") }).row);
  }
  return form;
}
