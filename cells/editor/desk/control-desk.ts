import type { CellOf, StudyChange, StudyDocument } from "../../document";
import { drawSeed } from "../controls/draw-seed";
import { el, replaceChildren, uniqueId } from "../dom/element";
import { parseTyped } from "../forms/fields";
import type { EditorCellState } from "../run/status-words";
import { type ParameterControl, parameterControl } from "./parameter-control";

/** What the desk asks of the page. */
export interface ControlDeskHost {
  apply(changes: readonly StudyChange[], label: string, mergeKey?: string): string | undefined;
  /** Whether transport solves start from the last potentials while tuning. */
  warmWhileTuning(): boolean;
  setWarmWhileTuning(on: boolean): void;
  /** Moves focus to a cell of the study column. */
  focusCell(id: string): void;
}

/** Counts of cell states, for the desk's summary line. */
export interface RunSummary {
  readonly ready: number;
  readonly busy: number;
  readonly failed: number;
  readonly held: number;
  /** Cells with cautions: id, name and the cautions. */
  readonly cautions: readonly { readonly id: string; readonly name: string; readonly cautions: readonly string[] }[];
}

/**
 * The control desk: a side panel gathering every parameter of the study, so a
 * user can tune epsilon, penalties, sample sizes or seeds while watching the
 * results in the column; plus the study seed, the warm-start choice for tuning,
 * and a summary of where the run stands with the cautions it raised.
 */
export class ControlDesk {
  readonly root: HTMLElement;
  private readonly host: ControlDeskHost;
  private readonly list: HTMLElement;
  private readonly seedBox: HTMLInputElement;
  private readonly seedProblem: HTMLElement;
  private readonly summary: HTMLElement;
  private readonly cautionList: HTMLElement;
  private readonly controls = new Map<string, ParameterControl>();
  private cautionKey = "";
  /** The seed box holds typed text not yet sent (a change from elsewhere must not overwrite it). */
  private seedTyping = false;

  constructor(host: ControlDeskHost) {
    this.host = host;
    this.list = el("div", { class: "cp-desk-list", "data-testid": "desk-parameters" });
    const seedId = uniqueId("seed");
    this.seedBox = el("input", { id: seedId, type: "text", inputmode: "numeric", class: "cp-input cp-param-entry", autocomplete: "off", "data-testid": "study-seed" });
    this.seedProblem = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
    const setSeed = (seed: number) => {
      const problem = host.apply([{ type: "set-seed", seed }], "study seed");
      this.seedProblem.hidden = problem === undefined;
      this.seedProblem.textContent = problem ?? "";
    };
    this.seedBox.addEventListener("input", () => (this.seedTyping = true));
    this.seedBox.addEventListener("change", () => {
      this.seedTyping = false;
      const v = parseTyped(this.seedBox.value);
      if (typeof v !== "number") {
        this.seedProblem.hidden = false;
        this.seedProblem.textContent = "the seed is a whole number from 0 to 4294967295";
        return;
      }
      setSeed(v);
    });
    const warmId = uniqueId("warm");
    const warm = el("input", { id: warmId, type: "checkbox", class: "cp-check", "data-testid": "warm-while-tuning" });
    warm.checked = host.warmWhileTuning();
    warm.addEventListener("change", () => host.setWarmWhileTuning(warm.checked));
    this.summary = el("p", { class: "cp-run-summary", "data-testid": "run-summary", role: "status", "aria-live": "polite" });
    this.cautionList = el("div", { class: "cp-desk-cautions" });
    this.root = el(
      "aside",
      { class: "cp-desk", "aria-labelledby": "cp-desk-title", "data-testid": "control-desk", tabindex: -1 },
      el("h2", { id: "cp-desk-title", class: "cp-desk-title", text: "Control desk" }),
      el("p", { class: "cp-desk-lede", text: "Every parameter of the study in one place. A change re-runs only the cells that depend on it." }),
      this.list,
      el(
        "section",
        { class: "cp-desk-section", "aria-label": "Study seed" },
        el("h3", { text: "Study seed" }),
        el(
          "div",
          { class: "cp-param-row" },
          el("label", { for: seedId, class: "cp-visually-hidden", text: "Study seed" }),
          this.seedBox,
          el("button", { type: "button", class: "cp-small-button", text: "New draw", "aria-label": "Draw a new study seed", "data-testid": "reroll-study-seed", on: { click: () => setSeed(drawSeed()) } }),
        ),
        el("p", { class: "cp-field-hint", text: "Cells whose seed is “from the study” draw again when it changes." }),
        this.seedProblem,
      ),
      el(
        "section",
        { class: "cp-desk-section", "aria-label": "Tuning" },
        el("h3", { text: "While tuning" }),
        el("div", { class: "cp-field cp-field-check" }, el("div", { class: "cp-field-control" }, warm, el("label", { for: warmId, text: "Start each transport from its last potentials" }))),
        el("p", { class: "cp-field-hint", text: "Re-solving after a change of ε or ρ starts where the cell's last solve ended: far fewer iterations, the same answer within the tolerance. The file is not changed; sweeps always start cold." }),
      ),
      el("section", { class: "cp-desk-section", "aria-label": "Run" }, el("h3", { text: "Run" }), this.summary, this.cautionList),
    );
  }

  /** Shows the study's parameter cells (kept, updated in place, added or dropped) and its seed. */
  render(study: StudyDocument): void {
    if (!this.seedTyping) this.seedBox.value = String(study.seed ?? 0);
    const cells = study.cells.filter((c): c is CellOf<"parameter"> => c.kind === "parameter");
    const keep = new Set(cells.map((c) => c.id));
    for (const [id, control] of this.controls) {
      if (!keep.has(id)) {
        control.root.remove();
        this.controls.delete(id);
      }
    }
    const order: HTMLElement[] = [];
    for (const cell of cells) {
      let control = this.controls.get(cell.id);
      if (!control || !control.update(cell)) {
        const fresh = parameterControl(cell, (value, { merge }) =>
          this.host.apply([{ type: "set-setting", id: cell.id, path: "value", value }], `set ${cell.name ?? cell.id}`, merge ? `param:${cell.id}` : undefined),
        );
        control?.root.replaceWith(fresh.root);
        control = fresh;
        this.controls.set(cell.id, control);
      }
      order.push(control.root);
    }
    if (cells.length === 0) {
      replaceChildren(this.list, el("p", { class: "cp-desk-empty", text: "No parameters yet. Insert a parameter cell, then link a setting to it (a number field's “from …” choice)." }));
      return;
    }
    // Reorder only when the order changed, so a control in use keeps its focus.
    const current = Array.from(this.list.children);
    if (current.length !== order.length || current.some((node, k) => node !== order[k])) replaceChildren(this.list, ...order);
  }

  /** Shows where the run stands and the cautions it raised, each linked to its cell. */
  showSummary(summary: RunSummary): void {
    const parts = [`${summary.ready} ready`];
    if (summary.busy > 0) parts.push(`${summary.busy} working`);
    if (summary.failed > 0) parts.push(`${summary.failed} failed`);
    if (summary.held > 0) parts.push(`${summary.held} held`);
    const line = parts.join(" · ");
    if (this.summary.textContent !== line) this.summary.textContent = line;
    // Called every frame while cells run: rebuild the list only when it changed.
    const key = JSON.stringify(summary.cautions);
    if (key === this.cautionKey) return;
    this.cautionKey = key;
    if (summary.cautions.length === 0) {
      replaceChildren(this.cautionList);
      return;
    }
    const list = el("ul", { class: "cp-caution-links" });
    for (const item of summary.cautions) {
      list.append(
        el(
          "li",
          {},
          el("button", { type: "button", class: "cp-link-button", text: item.name, on: { click: () => this.host.focusCell(item.id) } }),
          `: ${item.cautions[0]}${item.cautions.length > 1 ? ` (+${item.cautions.length - 1} more)` : ""}`,
        ),
      );
    }
    replaceChildren(this.cautionList, el("p", { class: "cp-cautions-label", text: "Keep in mind" }), list);
  }

  /** Moves focus to the control of parameter cell `id`. */
  focusParameter(id: string): void {
    const control = this.controls.get(id);
    if (!control) return;
    control.root.scrollIntoView({ block: "nearest" });
    control.focus();
  }
}

/** Counts states for {@link ControlDesk.showSummary}. */
export function countStates(states: Iterable<EditorCellState>): { ready: number; busy: number; failed: number; held: number } {
  const out = { ready: 0, busy: 0, failed: 0, held: 0 };
  for (const s of states) {
    if (s.status === "done") out.ready++;
    else if (s.status === "failed") out.failed++;
    else if (s.status === "held") out.held++;
    else out.busy++;
  }
  return out;
}
