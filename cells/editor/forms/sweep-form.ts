import { SWEEP_OUTPUTS, SWEEP_TARGETS, type SweepRange, type SweepSettings } from "../../kinds/sweep/settings";
import { el, uniqueId } from "../dom/element";
import { fieldGroup, numberField, numberOrLinkField, selectField, textField } from "./fields";
import { type CellFormContext, linkableNames } from "./form-context";

const VARY_WORDS: Record<string, string> = {
  epsilon: "epsilon",
  massPenalty: "mass penalty (both sides)",
  "massPenalty.source": "mass penalty, source side",
  "massPenalty.target": "mass penalty, target side",
  sampleSize: "sample size (both measures)",
  "sampleSize.source": "sample size, source",
  "sampleSize.target": "sample size, target",
  tolerance: "tolerance",
  maxIterations: "iteration cap",
  costExponent: "cost exponent p",
};

/**
 * The settings form of a sweep: which transport, which setting varies, its values
 * (a list, or a range from/to/count spaced evenly or in log), replicates (fresh
 * draws per value) and which outputs each run records.
 */
export function sweepForm(context: CellFormContext): HTMLElement {
  const s = context.cell.settings as SweepSettings;
  const form = el("div", { class: "cp-form cp-form-sweep" });
  const linkable = linkableNames(context);
  const isRange = !Array.isArray(s.values);
  form.append(
    fieldGroup(
      "What varies",
      selectField({ label: "Transport cell", key: "transport", value: s.transport, choices: context.names("transport").map((n) => ({ value: n, label: n })), commit: (v) => context.set("transport", v, "sweep transport") }),
      selectField({ label: "Setting", key: "vary", value: s.vary, choices: SWEEP_TARGETS.map((t) => ({ value: t, label: VARY_WORDS[t] })), commit: (v) => context.set("vary", v, `vary ${v}`) }),
      selectField({
        label: "Values given as",
        key: "values.shape",
        value: isRange ? "range" : "list",
        choices: [
          { value: "range", label: "a range" },
          { value: "list", label: "a list" },
        ],
        commit: (v) => {
          if (v === "range") return context.set("values", { from: 0.01, to: 1, count: 8, spacing: "log" }, "values as range");
          const r = s.values as SweepRange;
          const from = typeof r.from === "number" ? r.from : 0.01;
          const to = typeof r.to === "number" ? r.to : 1;
          return context.set("values", from === to ? [from] : [from, to], "values as list");
        },
      }),
    ),
  );
  if (isRange) {
    const r = s.values as SweepRange;
    form.append(
      fieldGroup(
        "Range",
        numberOrLinkField({ label: "From", key: "values.from", value: r.from, linkable, valueOf: context.valueOf, commit: (v) => context.set("values.from", v, "range start") }),
        numberOrLinkField({ label: "To", key: "values.to", value: r.to, linkable, valueOf: context.valueOf, commit: (v) => context.set("values.to", v, "range end") }),
        numberField({ label: "Count", key: "values.count", value: r.count, integer: true, commit: (v) => context.set("values.count", v, "range count") }),
        selectField({
          label: "Spacing",
          key: "values.spacing",
          value: r.spacing ?? "linear",
          choices: [
            { value: "linear", label: "even" },
            { value: "log", label: "even in log" },
          ],
          commit: (v) => context.set("values.spacing", v === "linear" ? undefined : v, "range spacing"),
        }),
      ),
    );
  } else {
    form.append(
      fieldGroup(
        "Values",
        textField({
          label: "Values, separated by commas (\"balanced\" allowed for penalties)",
          key: "values.list",
          value: (s.values as readonly (number | string)[]).join(", "),
          mono: true,
          commit: (v) => {
            const items = String(v)
              .split(/[\s,;]+/)
              .filter(Boolean)
              .map((t) => (t === "balanced" ? t : Number(t)));
            if (items.some((x) => typeof x === "number" && !Number.isFinite(x))) return "write numbers (or balanced), separated by commas";
            return context.set("values", items, "sweep values");
          },
        }),
      ),
    );
  }
  const record = s.record ?? ["cost", "objective"];
  const outputs = el("fieldset", { class: "cp-group cp-outputs", "data-field": "record" }, el("legend", { text: "Each run records" }));
  const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
  for (const output of SWEEP_OUTPUTS) {
    const id = uniqueId("out");
    const box = el("input", { type: "checkbox", id, class: "cp-check", checked: record.includes(output) });
    box.addEventListener("change", () => {
      const next = SWEEP_OUTPUTS.filter((o) => (o === output ? box.checked : record.includes(o)));
      const message = next.length === 0 ? "record at least one output" : context.set("record", next, "recorded outputs");
      problem.hidden = message === undefined;
      problem.textContent = message ?? "";
      if (message !== undefined) box.checked = !box.checked;
    });
    outputs.append(el("span", { class: "cp-check-inline" }, box, el("label", { for: id, text: output })));
  }
  outputs.append(problem);
  form.append(
    fieldGroup(
      "Repeats",
      numberOrLinkField({
        label: "Replicates per value",
        key: "replicates",
        value: s.replicates,
        optional: true,
        integer: true,
        placeholder: "1",
        linkable,
        valueOf: context.valueOf,
        hint: "each replicate draws the subsamples again with its own seed",
        commit: (v) => context.set("replicates", v, "replicates"),
      }),
    ),
    outputs,
  );
  return form;
}
