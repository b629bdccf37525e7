import { type NumberOrParam, isParamRef } from "../../document";
import { el, uniqueId } from "../dom/element";

/**
 * Writes a setting; returns the problem in words when the study refuses the value
 * (the field then shows it and keeps what the user typed), else undefined.
 */
export type Commit = (value: unknown) => string | undefined;

/** A labelled field: its row element and a way to show a problem under it. */
export interface Field {
  readonly row: HTMLElement;
  showProblem(message: string | undefined): void;
}

/** Common options of every field. */
export interface FieldOptions {
  readonly label: string;
  /** Key kept across re-renders so focus returns to the same field (data-field). */
  readonly key: string;
  /** A short explanation under the field. */
  readonly hint?: string;
}

function fieldRow(options: FieldOptions, control: HTMLElement, id: string, extra: HTMLElement[] = []): Field {
  const problem = el("p", { class: "cp-field-problem", id: `${id}-problem`, role: "alert", hidden: true });
  const hint = options.hint ? el("p", { class: "cp-field-hint", id: `${id}-hint`, text: options.hint }) : null;
  const described = [hint ? `${id}-hint` : "", `${id}-problem`].filter(Boolean).join(" ");
  control.setAttribute("aria-describedby", described);
  const row = el(
    "div",
    { class: "cp-field", "data-field": options.key },
    el("label", { class: "cp-field-label", for: id, text: options.label }),
    el("div", { class: "cp-field-control" }, control, ...extra),
    hint,
    problem,
  );
  return {
    row,
    showProblem(message) {
      problem.hidden = message === undefined;
      problem.textContent = message ?? "";
      control.setAttribute("aria-invalid", message === undefined ? "false" : "true");
      row.classList.toggle("cp-field-bad", message !== undefined);
    },
  };
}

/** Parses what a user typed as a number: accepts "1e-3", "0,5" is refused; "" is undefined. */
export function parseTyped(text: string): number | undefined | "bad" {
  const t = text.trim();
  if (t === "") return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : "bad";
}

/**
 * A number typed in a text box (not a spinner: epsilon and tolerances are written
 * as 1e-6). Commits on Enter and on leaving the field. With `optional`, an empty
 * box removes the setting (its default then applies, shown as placeholder).
 */
export function numberField(options: FieldOptions & { value: number | undefined; commit: Commit; optional?: boolean; placeholder?: string; integer?: boolean }): Field {
  const id = uniqueId("num");
  const input = el("input", { id, type: "text", inputmode: options.integer ? "numeric" : "decimal", class: "cp-input cp-input-number", autocomplete: "off", spellcheck: "false", placeholder: options.placeholder ?? "" });
  input.value = options.value === undefined ? "" : String(options.value);
  const field = fieldRow(options, input, id);
  let last = input.value;
  const send = () => {
    if (input.value === last) return field.showProblem(undefined);
    const parsed = parseTyped(input.value);
    if (parsed === "bad") return field.showProblem(`"${input.value.trim()}" is not a number (write 0.05 or 5e-2)`);
    if (parsed === undefined && !options.optional) return field.showProblem("a value is needed here");
    const problem = options.commit(parsed);
    field.showProblem(problem);
    if (problem === undefined) last = input.value;
  };
  input.addEventListener("change", send);
  input.addEventListener("keydown", (event) => {
    if (event.key === "Enter") {
      event.preventDefault();
      send();
    }
  });
  return field;
}

/** One option of a select. */
export interface Choice {
  readonly value: string;
  readonly label: string;
}

/** A drop-down; commits on change. A value missing from `choices` is shown as it is, marked "(not found)". */
export function selectField(options: FieldOptions & { value: string | undefined; choices: readonly Choice[]; commit: Commit }): Field {
  const id = uniqueId("sel");
  const select = el("select", { id, class: "cp-input cp-select" });
  const all = [...options.choices];
  if (options.value !== undefined && !all.some((c) => c.value === options.value)) all.push({ value: options.value, label: `${options.value} (not found)` });
  if (options.value === undefined) select.append(el("option", { value: "", text: "— choose —", disabled: true, selected: true }));
  for (const choice of all) select.append(el("option", { value: choice.value, text: choice.label, selected: choice.value === options.value }));
  const field = fieldRow(options, select, id);
  select.addEventListener("change", () => field.showProblem(options.commit(select.value)));
  return field;
}

/** A checkbox with its label to the right; commits on change. */
export function checkField(options: FieldOptions & { checked: boolean; commit: Commit }): Field {
  const id = uniqueId("chk");
  const input = el("input", { id, type: "checkbox", class: "cp-check" });
  input.checked = options.checked;
  const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
  const row = el(
    "div",
    { class: "cp-field cp-field-check", "data-field": options.key },
    el("div", { class: "cp-field-control" }, input, el("label", { for: id, text: options.label })),
    options.hint ? el("p", { class: "cp-field-hint", text: options.hint }) : null,
    problem,
  );
  input.addEventListener("change", () => {
    const message = options.commit(input.checked);
    problem.hidden = message === undefined;
    problem.textContent = message ?? "";
    if (message !== undefined) input.checked = !input.checked;
  });
  return {
    row,
    showProblem(message) {
      problem.hidden = message === undefined;
      problem.textContent = message ?? "";
    },
  };
}

/** A line of text (or several, with `multiline`); commits on change. */
export function textField(options: FieldOptions & { value: string | undefined; commit: Commit; multiline?: boolean; placeholder?: string; optional?: boolean; mono?: boolean }): Field {
  const id = uniqueId("txt");
  const input = options.multiline
    ? el("textarea", { id, class: `cp-input cp-textarea${options.mono ? " cp-mono" : ""}`, rows: 4, spellcheck: options.mono ? "false" : "true", placeholder: options.placeholder ?? "" })
    : el("input", { id, type: "text", class: `cp-input${options.mono ? " cp-mono" : ""}`, autocomplete: "off", placeholder: options.placeholder ?? "" });
  input.value = options.value ?? "";
  const field = fieldRow(options, input, id);
  input.addEventListener("change", () => {
    const text = input.value;
    field.showProblem(options.commit(text === "" && options.optional ? undefined : text));
  });
  return field;
}

/**
 * Numbers written in one line, separated by commas or spaces ("0, 1.5"), for
 * points such as a mean or a box corner. Commits the list.
 */
export function numberListField(options: FieldOptions & { value: readonly number[] | undefined; commit: Commit; optional?: boolean; placeholder?: string }): Field {
  const id = uniqueId("list");
  const input = el("input", { id, type: "text", class: "cp-input cp-mono", autocomplete: "off", spellcheck: "false", placeholder: options.placeholder ?? "" });
  input.value = options.value ? options.value.join(", ") : "";
  const field = fieldRow(options, input, id);
  input.addEventListener("change", () => {
    const text = input.value.trim();
    if (text === "") {
      field.showProblem(options.optional ? options.commit(undefined) : "at least one number is needed");
      return;
    }
    const parts = text.split(/[\s,;]+/).filter(Boolean);
    const numbers = parts.map(Number);
    const bad = parts.find((_, k) => !Number.isFinite(numbers[k]));
    if (bad !== undefined) return field.showProblem(`"${bad}" is not a number`);
    field.showProblem(options.commit(numbers));
  });
  return field;
}

/**
 * A number, or a link to another cell that supplies it (`{"param": name}`): a text
 * box and, beside it, a drop-down "typed here" / "from <name>". When linked, the
 * box shows the linked cell's current value, read-only.
 */
export function numberOrLinkField(
  options: FieldOptions & {
    value: NumberOrParam | undefined;
    /** Names a link may point to (parameter cells first). */
    linkable: readonly string[];
    /** Current value of a cell, for showing a linked value. */
    valueOf: (name: string) => unknown;
    commit: Commit;
    optional?: boolean;
    placeholder?: string;
    integer?: boolean;
  },
): Field {
  const id = uniqueId("ref");
  const linked = isParamRef(options.value) ? String(options.value.param) : undefined;
  const input = el("input", { id, type: "text", inputmode: "decimal", class: "cp-input cp-input-number", autocomplete: "off", spellcheck: "false", placeholder: options.placeholder ?? "" });
  const source = el("select", { class: "cp-input cp-select cp-link-select", "aria-label": `${options.label}: where the value comes from` });
  source.append(el("option", { value: "", text: "typed here", selected: linked === undefined }));
  const names = [...options.linkable];
  if (linked !== undefined && !names.includes(linked)) names.push(linked);
  for (const name of names) source.append(el("option", { value: name, text: `from ${name}`, selected: name === linked }));
  const showLinked = (name: string) => {
    const v = options.valueOf(name);
    input.value = typeof v === "number" ? String(v) : v === undefined ? "" : "…";
    input.readOnly = true;
    input.classList.add("cp-linked");
  };
  if (linked !== undefined) showLinked(linked);
  else input.value = typeof options.value === "number" ? String(options.value) : "";
  const field = fieldRow(options, input, id, [source]);
  let last = input.value;
  const sendTyped = () => {
    if (input.readOnly) return;
    if (input.value === last) return field.showProblem(undefined);
    const parsed = parseTyped(input.value);
    if (parsed === "bad") return field.showProblem(`"${input.value.trim()}" is not a number`);
    if (parsed === undefined && !options.optional) return field.showProblem("a value is needed here");
    const problem = options.commit(parsed);
    field.showProblem(problem);
    if (problem === undefined) last = input.value;
  };
  input.addEventListener("change", sendTyped);
  input.addEventListener("keydown", (event) => {
    if (event.key === "Enter") {
      event.preventDefault();
      sendTyped();
    }
  });
  source.addEventListener("change", () => {
    if (source.value === "") {
      // Back to a typed number: start from the linked value when it is one.
      input.readOnly = false;
      input.classList.remove("cp-linked");
      const parsed = parseTyped(input.value);
      const value = typeof parsed === "number" ? parsed : undefined;
      if (value === undefined) {
        if (options.optional) field.showProblem(options.commit(undefined));
        else {
          input.value = "";
          input.focus();
          field.showProblem("type a number");
        }
        return;
      }
      field.showProblem(options.commit(value));
      last = input.value;
      return;
    }
    showLinked(source.value);
    field.showProblem(options.commit({ param: source.value }));
  });
  return field;
}

/** A group of fields under a small heading (a fieldset with a legend). */
export function fieldGroup(legend: string, ...fields: (Field | HTMLElement | null | undefined | false)[]): HTMLFieldSetElement {
  const set = el("fieldset", { class: "cp-group" }, el("legend", { text: legend }));
  for (const f of fields) if (f) set.append(f instanceof HTMLElement ? f : f.row);
  return set;
}
