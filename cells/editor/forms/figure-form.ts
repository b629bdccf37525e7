import { FIGURE_VIEWS, type FigureSettings } from "../../kinds/figure/settings";
import { SWEEP_OUTPUTS } from "../../kinds/sweep/settings";
import { el, uniqueId } from "../dom/element";
import { checkField, fieldGroup, numberField, selectField, textField } from "./fields";
import type { CellFormContext } from "./form-context";

const VIEW_WORDS: Record<string, string> = {
  "coupling-lines": "coupling lines — who sends mass to whom",
  "plan-matrix": "plan matrix — the coupling as a heat map",
  convergence: "convergence — marginal error per iteration",
  potentials: "potentials — the dual functions over the points",
  "sweep-curve": "sweep curve — an output against the varied setting",
  code: "drawn by code",
};

/** Which cells a view draws, and how many: exactly one, or one or more. */
function drawsWhat(view: string): { kind: "transport" | "sweep"; many: boolean } {
  if (view === "sweep-curve") return { kind: "sweep", many: true };
  return { kind: "transport", many: view === "convergence" };
}

/**
 * The settings form of a figure: the view, the cells it draws (one, or a set of
 * check boxes for views that overlay several), and its options (title, width,
 * lines drawn, log scales, which potentials, which sweep output). A figure drawn
 * by code is edited in its code editor instead.
 */
export function figureForm(context: CellFormContext): HTMLElement {
  const s = context.cell.settings as FigureSettings;
  const form = el("div", { class: "cp-form cp-form-figure" });
  form.append(
    fieldGroup(
      "View",
      selectField({
        label: "Picture",
        key: "view",
        value: s.view,
        choices: FIGURE_VIEWS.map((v) => ({ value: v, label: VIEW_WORDS[v] })),
        commit: (v) => {
          if (v === "code") return context.replace({ view: "code", code: "// Return Plot options: {marks: [...]}\n({marks: []})" }, "figure by code");
          const { kind } = drawsWhat(String(v));
          const names = context.names(kind);
          const previous = s.view !== "code" ? s.of.filter((n) => names.includes(n)) : [];
          const of = previous.length > 0 ? previous.slice(0, v === "convergence" || v === "sweep-curve" ? previous.length : 1) : names.slice(-1);
          return context.replace({ view: v, of: of.length > 0 ? of : [kind === "sweep" ? "sweep" : "plan"], ...(s.view !== "code" && s.options ? { options: { title: s.options.title } } : {}) }, `view ${v}`);
        },
      }),
    ),
  );
  if (s.view === "code") return form;
  const { kind, many } = drawsWhat(s.view);
  const names = context.names(kind);
  if (many) {
    const set = el("fieldset", { class: "cp-group", "data-field": "of" }, el("legend", { text: kind === "sweep" ? "Sweeps drawn" : "Transports drawn" }));
    const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
    const all = [...new Set([...names, ...s.of])];
    for (const name of all) {
      const id = uniqueId("of");
      const box = el("input", { type: "checkbox", id, class: "cp-check", checked: s.of.includes(name) });
      box.addEventListener("change", () => {
        const next = all.filter((n) => (n === name ? box.checked : s.of.includes(n)));
        const message = next.length === 0 ? "draw at least one cell" : context.set("of", next, "cells drawn");
        problem.hidden = message === undefined;
        problem.textContent = message ?? "";
        if (message !== undefined) box.checked = !box.checked;
      });
      set.append(el("span", { class: "cp-check-inline" }, box, el("label", { for: id, text: name })));
    }
    set.append(problem);
    form.append(set);
  } else {
    form.append(
      fieldGroup(
        "Draws",
        selectField({ label: "Transport cell", key: "of.0", value: s.of[0], choices: names.map((n) => ({ value: n, label: n })), commit: (v) => context.set("of", [v], "cell drawn") }),
      ),
    );
  }
  const options = (s.options ?? {}) as Record<string, unknown>;
  const group = fieldGroup(
    "Options",
    textField({ label: "Title", key: "options.title", value: options.title as string | undefined, optional: true, placeholder: "none", commit: (v) => context.set("options.title", v, "figure title") }),
    numberField({ label: "Width (px)", key: "options.width", value: options.width as number | undefined, optional: true, placeholder: "page width", commit: (v) => context.set("options.width", v, "figure width") }),
  );
  if (s.view === "coupling-lines") {
    group.append(numberField({ label: "Lines drawn at most", key: "options.maxLines", value: options.maxLines as number | undefined, optional: true, integer: true, placeholder: "400", commit: (v) => context.set("options.maxLines", v, "lines drawn") }).row);
  }
  if (s.view === "convergence") {
    group.append(checkField({ label: "log scale for the error", key: "options.logScale", checked: options.logScale !== false, commit: (v) => context.set("options.logScale", v ? undefined : false, "log scale") }).row);
  }
  if (s.view === "potentials") {
    group.append(
      selectField({
        label: "Which potentials",
        key: "options.side",
        value: (options.side as string | undefined) ?? "both",
        choices: [
          { value: "both", label: "both" },
          { value: "source", label: "source side (f)" },
          { value: "target", label: "target side (g)" },
        ],
        commit: (v) => context.set("options.side", v === "both" ? undefined : v, "potentials side"),
      }).row,
    );
  }
  if (s.view === "sweep-curve") {
    group.append(
      selectField({
        label: "Output",
        key: "options.output",
        value: (options.output as string | undefined) ?? "",
        choices: [{ value: "", label: "the first recorded" }, ...SWEEP_OUTPUTS.map((o) => ({ value: o, label: o }))],
        commit: (v) => context.set("options.output", v === "" ? undefined : v, "sweep output"),
      }).row,
      checkField({ label: "log scale across", key: "options.logX", checked: options.logX === true, commit: (v) => context.set("options.logX", v ? true : undefined, "log x") }).row,
      checkField({ label: "log scale up", key: "options.logY", checked: options.logY === true, commit: (v) => context.set("options.logY", v ? true : undefined, "log y") }).row,
    );
  }
  form.append(group);
  return form;
}
