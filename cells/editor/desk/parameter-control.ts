import type { CellOf } from "../../document";
import type { ParameterSettings } from "../../kinds/parameter/settings";
import { drawSeed } from "../controls/draw-seed";
import { LOG_SLIDER_STEPS, linearValue, logPosition, logValue } from "../controls/log-scale";
import { el, uniqueId } from "../dom/element";
import { parseTyped } from "../forms/fields";

/** What a control does with a new value: write it (one undo step per drag) and answer with a problem, if any. */
export type SetParameter = (value: unknown, options: { merge: boolean }) => string | undefined;

/** A control at the desk: its element and a way to show a value changed elsewhere (undo, reload). */
export interface ParameterControl {
  readonly root: HTMLElement;
  /** Shows the cell's new settings without rebuilding while the user is using the control. */
  update(cell: CellOf<"parameter">): boolean;
  focus(): void;
}

const SLIDER_STEPS = 1000;
/** Least time between two writes while dragging, ms: the newest position always lands. */
const DRAG_INTERVAL = 90;

function shown(value: unknown): string {
  return typeof value === "number" ? String(value) : String(value ?? "");
}

/** Calls `run` at most once per `interval` ms while called repeatedly, always ending with the last call. */
function throttle<T>(run: (value: T) => void, interval: number): (value: T) => void {
  let last = 0;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let pending: T;
  return (value) => {
    pending = value;
    const wait = last + interval - performance.now();
    if (wait <= 0 && timer === null) {
      last = performance.now();
      run(value);
      return;
    }
    if (timer !== null) return;
    timer = setTimeout(() => {
      timer = null;
      last = performance.now();
      run(pending);
    }, Math.max(0, wait));
  };
}

/**
 * The control of one parameter cell at the control desk:
 * - number: a slider and an entry box; log-range: a slider that moves evenly in
 *   log(value) (1000 steps, values rounded to 3 significant digits) and an entry
 *   box for any exact value within the range;
 * - integer: an entry with − and + (and a slider when bounded);
 * - choice: buttons for up to five options, else a drop-down;
 * - toggle: a switch; text: a box; seed: an entry and a "new draw" button.
 * Dragging writes the value as it moves (throttled), as one undo step.
 */
export function parameterControl(cell: CellOf<"parameter">, set: SetParameter): ParameterControl {
  let settings = cell.settings as ParameterSettings;
  const name = cell.name ?? cell.id;
  const id = uniqueId("param");
  const labelText = settings.label ?? name;
  const problem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
  const say = (message: string | undefined) => {
    problem.hidden = message === undefined;
    problem.textContent = message ?? "";
  };
  const root = el("div", { class: `cp-param cp-param-${settings.control}`, "data-testid": "desk-parameter", "data-param": name, "data-cell-id": cell.id });
  const head = el("div", { class: "cp-param-head" }, el("label", { for: id, class: "cp-param-label", text: labelText }), el("code", { class: "cp-param-name", text: name }));
  root.append(head);
  let refresh: (s: ParameterSettings) => void = () => {};
  let focusTarget: HTMLElement | null = null;
  const unit = () => (settings.unit ? el("span", { class: "cp-unit", text: settings.unit }) : null);
  // Boxes holding typed text not yet sent: a value changed elsewhere (undo) must not overwrite it.
  const typing = new Set<HTMLElement>();
  const idle = (box: HTMLElement) => !typing.has(box);

  const entry = (integer: boolean) => {
    const box = el("input", { type: "text", class: "cp-input cp-param-entry", inputmode: integer ? "numeric" : "decimal", autocomplete: "off", spellcheck: "false", "aria-label": `${labelText}: exact value` });
    box.value = shown(settings.value);
    const send = () => {
      const v = parseTyped(box.value);
      if (v === "bad" || v === undefined) return say(`"${box.value.trim()}" is not a number`);
      typing.delete(box);
      say(set(v, { merge: false }));
    };
    box.addEventListener("input", () => typing.add(box));
    box.addEventListener("change", send);
    box.addEventListener("keydown", (e) => {
      if (e.key === "Enter") {
        e.preventDefault();
        send();
      }
    });
    return box;
  };

  switch (settings.control) {
    case "number":
    case "log-range": {
      const log = settings.control === "log-range";
      const slider = el("input", { type: "range", id, class: "cp-slider", min: 0, max: log ? LOG_SLIDER_STEPS : SLIDER_STEPS, step: 1 });
      const box = entry(false);
      const position = (s: ParameterSettings & { min: number; max: number; value: number }) =>
        log ? logPosition(s.value, s.min, s.max) : Math.round(((s.value - s.min) / (s.max - s.min)) * SLIDER_STEPS);
      const write = throttle((v: number) => say(set(v, { merge: true })), DRAG_INTERVAL);
      slider.addEventListener("input", () => {
        const s = settings as ParameterSettings & { min: number; max: number };
        const pos = Number(slider.value);
        const v = log ? logValue(pos, s.min, s.max) : linearValue(pos, s.min, s.max, SLIDER_STEPS, (s as { step?: number }).step);
        box.value = String(v);
        slider.setAttribute("aria-valuetext", `${v}${settings.unit ? ` ${settings.unit}` : ""}`);
        write(v);
      });
      const ends = el("div", { class: "cp-slider-ends", "aria-hidden": "true" });
      refresh = (s) => {
        const r = s as ParameterSettings & { min: number; max: number; value: number };
        slider.value = String(position(r));
        slider.setAttribute("aria-valuetext", `${r.value}${s.unit ? ` ${s.unit}` : ""}`);
        if (idle(box)) box.value = shown(r.value);
        ends.replaceChildren(el("span", { text: String(r.min) }), el("span", { text: log ? "log scale" : "" }), el("span", { text: String(r.max) }));
      };
      root.append(el("div", { class: "cp-param-row" }, slider, box, unit()), ends);
      focusTarget = slider;
      break;
    }
    case "integer": {
      const box = entry(true);
      box.id = id;
      const step = () => (settings as { step?: number }).step ?? 1;
      const nudge = (sign: number) => () => {
        const s = settings as { value: number; min?: number; max?: number };
        let v = s.value + sign * step();
        if (s.min !== undefined) v = Math.max(s.min, v);
        if (s.max !== undefined) v = Math.min(s.max, v);
        say(set(v, { merge: true }));
      };
      const row = el(
        "div",
        { class: "cp-param-row" },
        el("button", { type: "button", class: "cp-step", text: "−", "aria-label": `${labelText}: less`, on: { click: nudge(-1) } }),
        box,
        el("button", { type: "button", class: "cp-step", text: "+", "aria-label": `${labelText}: more`, on: { click: nudge(1) } }),
        unit(),
      );
      root.append(row);
      const s0 = settings as { min?: number; max?: number };
      let slider: HTMLInputElement | null = null;
      if (s0.min !== undefined && s0.max !== undefined) {
        slider = el("input", { type: "range", class: "cp-slider", min: s0.min, max: s0.max, step: step(), "aria-label": `${labelText}: slider` });
        const write = throttle((v: number) => say(set(v, { merge: true })), DRAG_INTERVAL);
        slider.addEventListener("input", () => {
          box.value = slider!.value;
          write(Number(slider!.value));
        });
        root.append(slider);
      }
      refresh = (s) => {
        if (idle(box)) box.value = shown(s.value);
        if (slider) slider.value = shown(s.value);
      };
      focusTarget = box;
      break;
    }
    case "choice": {
      const options = settings.options;
      if (options.length <= 5) {
        const group = el("div", { class: "cp-choice", role: "radiogroup", "aria-label": labelText, id });
        const buttons = options.map((option) =>
          el("button", {
            type: "button",
            role: "radio",
            class: "cp-choice-button",
            text: String(option),
            on: { click: () => say(set(option, { merge: false })) },
          }),
        );
        // Arrow keys move between options, as in a radio group.
        group.addEventListener("keydown", (e) => {
          const k = buttons.indexOf(document.activeElement as HTMLButtonElement);
          if (k < 0) return;
          const delta = e.key === "ArrowRight" || e.key === "ArrowDown" ? 1 : e.key === "ArrowLeft" || e.key === "ArrowUp" ? -1 : 0;
          if (delta === 0) return;
          e.preventDefault();
          const next = buttons[(k + delta + buttons.length) % buttons.length];
          next.focus();
          next.click();
        });
        group.append(...buttons);
        root.append(group);
        refresh = (s) =>
          buttons.forEach((b, k) => {
            const on = (s as { value: unknown }).value === options[k];
            b.setAttribute("aria-checked", String(on));
            b.tabIndex = on ? 0 : -1;
          });
        focusTarget = group;
      } else {
        const select = el("select", { id, class: "cp-input cp-select" }, ...options.map((o, k) => el("option", { value: String(k), text: String(o) })));
        select.addEventListener("change", () => say(set(options[Number(select.value)], { merge: false })));
        root.append(select);
        refresh = (s) => (select.value = String(options.indexOf((s as { value: string | number }).value)));
        focusTarget = select;
      }
      break;
    }
    case "toggle": {
      const box = el("input", { type: "checkbox", id, role: "switch", class: "cp-switch" });
      box.addEventListener("change", () => say(set(box.checked, { merge: false })));
      root.append(el("div", { class: "cp-param-row" }, box, el("span", { class: "cp-switch-words", "aria-hidden": "true" })));
      refresh = (s) => {
        box.checked = s.value === true;
        (root.querySelector(".cp-switch-words") as HTMLElement).textContent = s.value === true ? "on" : "off";
      };
      focusTarget = box;
      break;
    }
    case "text": {
      const multiline = settings.multiline === true;
      const box = multiline ? el("textarea", { id, class: "cp-input cp-textarea", rows: 3 }) : el("input", { id, type: "text", class: "cp-input", autocomplete: "off" });
      box.addEventListener("input", () => typing.add(box));
      box.addEventListener("change", () => {
        typing.delete(box);
        say(set(box.value, { merge: false }));
      });
      root.append(box);
      refresh = (s) => {
        if (idle(box)) box.value = String(s.value);
      };
      focusTarget = box;
      break;
    }
    case "seed": {
      const box = entry(true);
      box.id = id;
      root.append(
        el(
          "div",
          { class: "cp-param-row" },
          box,
          el("button", { type: "button", class: "cp-small-button", "data-testid": "reroll-seed", text: "New draw", "aria-label": `${labelText}: draw a new seed`, on: { click: () => say(set(drawSeed(), { merge: false })) } }),
        ),
      );
      refresh = (s) => {
        if (idle(box)) box.value = shown(s.value);
      };
      focusTarget = box;
      break;
    }
  }
  root.append(problem);
  refresh(settings);
  return {
    root,
    update(next) {
      const s = next.settings as ParameterSettings;
      // A different control, label or range needs a new element; a new value does not.
      const { value: _a, ...restA } = settings as unknown as Record<string, unknown>;
      const { value: _b, ...restB } = s as unknown as Record<string, unknown>;
      if (JSON.stringify(restA) !== JSON.stringify(restB) || (next.name ?? next.id) !== name) return false;
      settings = s;
      refresh(s);
      return true;
    },
    focus: () => focusTarget?.focus(),
  };
}
