import type { Cell, StudyChange, StudyDocument } from "../../document";
import { el, replaceChildren, uniqueId } from "../dom/element";
import { type IconName, icon } from "../dom/icons";
import { type TextEditor, createTextEditor } from "../dom/text-editor";
import { dataForm } from "../forms/data-form";
import { figureForm } from "../forms/figure-form";
import type { CellFormContext } from "../forms/form-context";
import { parameterForm } from "../forms/parameter-form";
import { settingsJson } from "../forms/settings-json";
import { sweepForm } from "../forms/sweep-form";
import { tableForm } from "../forms/table-form";
import { transportForm } from "../forms/transport-form";
import { defineProseCell } from "../../kinds/prose/define";
import type { DefineContext } from "../../kinds/define-context";
import { cellOutput } from "../output/cell-output";
import { type EditorCellState, statusWords } from "../run/status-words";

/** What a cell card asks of the page around it. */
export interface CellCardHost {
  study(): StudyDocument;
  /** Applies changes as one undo step; returns the problem in words when refused. */
  apply(changes: readonly StudyChange[], label: string, mergeKey?: string): string | undefined;
  valueOf(name: string): unknown;
  /** Width available for figures, CSS pixels. */
  width(): number;
  move(id: string, delta: -1 | 1): void;
  duplicate(id: string): void;
  remove(id: string): void;
  focusSibling(id: string, delta: -1 | 1): void;
  /** Opens the insert menu for a new cell right after `id`. */
  insertAfter(id: string): void;
  /** Moves focus to this parameter's control at the control desk. */
  tuneAtDesk(id: string): void;
  /** Whether a transport cell's latest solve was warm-started by the editor (not by its own setting). */
  warmStarted(id: string, runs: number): boolean;
  /** Remembers editor text typed but not yet run (saved by autosave), or forgets it (undefined). */
  pendingText(id: string, text: string | undefined): void;
  save(): void;
}

const KIND_WORDS: Record<string, string> = {
  prose: "text",
  parameter: "parameter",
  data: "data",
  transport: "transport",
  sweep: "sweep",
  figure: "figure",
  code: "code",
  table: "table",
};

/** Kinds whose settings are edited in a form. */
const FORM_KINDS = new Set(["parameter", "data", "transport", "sweep", "figure", "table"]);

/**
 * One cell of the study column: a header (kind, name, state in words, tools), the
 * cell's editing surface (prose and code in CodeMirror, typed settings in forms)
 * and its output. The card never writes the study: every edit goes through the
 * host's `apply`, and the card is updated from the new study.
 */
export class CellCard {
  readonly root: HTMLElement;
  private cell: Cell;
  private readonly host: CellCardHost;
  private readonly headingId = uniqueId("cell");
  private readonly nameBox: HTMLElement;
  private readonly stateLine: HTMLElement;
  private readonly upButton: HTMLButtonElement;
  private readonly downButton: HTMLButtonElement;
  private readonly body: HTMLElement;
  private readonly editorSlot: HTMLElement;
  private readonly settingsSlot: HTMLElement;
  private readonly outputSlot: HTMLElement;
  private readonly problemLine: HTMLElement;
  private readonly settingsButton: HTMLButtonElement;
  private readonly settingsPanelId: string;
  private editor: TextEditor | null = null;
  private editing = false;
  private settingsOpen: boolean;
  private proseTimer: ReturnType<typeof setTimeout> | null = null;
  private lastState: EditorCellState = { status: "waiting" };
  private shownValue: unknown = undefined;
  private shownCell: Cell | undefined;

  constructor(cell: Cell, host: CellCardHost, options: { fresh?: boolean } = {}) {
    this.cell = cell;
    this.host = host;
    this.settingsOpen = options.fresh === true;
    this.editing = options.fresh === true && cell.kind === "prose";
    this.nameBox = el("span", { class: "cp-cell-name" });
    this.stateLine = el("p", { class: "cp-state", "data-testid": "cell-state", role: "status", "aria-live": "polite", "aria-atomic": "true" });
    const tool = (label: string, glyph: IconName, testid: string, run: () => void) =>
      el("button", { type: "button", class: "cp-tool", "aria-label": label, title: label, "data-testid": testid, on: { click: run } }, icon(glyph));
    this.upButton = tool("Move cell up (Alt+↑)", "up", "cell-move-up", () => host.move(this.cell.id, -1));
    this.downButton = tool("Move cell down (Alt+↓)", "down", "cell-move-down", () => host.move(this.cell.id, 1));
    this.settingsPanelId = uniqueId("settings");
    this.settingsButton = el("button", {
      type: "button",
      class: "cp-settings-toggle",
      "data-testid": "cell-settings-toggle",
      "aria-expanded": "false",
      "aria-controls": this.settingsPanelId,
      text: "Settings",
      on: { click: () => this.toggleSettings() },
    });
    const tools = el(
      "div",
      { class: "cp-cell-tools", role: "toolbar", "aria-label": "Cell actions" },
      this.upButton,
      this.downButton,
      tool("Duplicate cell (Alt+Shift+↓)", "duplicate", "cell-duplicate", () => host.duplicate(this.cell.id)),
      tool("Insert a cell below (Alt+N)", "plus", "cell-insert-below", () => host.insertAfter(this.cell.id)),
      tool("Delete cell (Alt+Delete; undo brings it back)", "cross", "cell-delete", () => host.remove(this.cell.id)),
    );
    const header = el(
      "header",
      { class: "cp-cell-head" },
      el("h3", { class: "cp-cell-title", id: this.headingId }, el("span", { class: "cp-kind", text: KIND_WORDS[cell.kind] ?? cell.kind }), this.nameBox),
      this.stateLine,
      this.settingsButton,
      tools,
    );
    this.problemLine = el("p", { class: "cp-field-problem", role: "alert", hidden: true });
    this.editorSlot = el("div", { class: "cp-editor-slot" });
    this.settingsSlot = el("div", { class: "cp-settings-slot", id: this.settingsPanelId });
    this.outputSlot = el("div", { class: "cp-output-slot", "aria-live": "off" });
    this.body = el("div", { class: "cp-cell-body" }, this.problemLine, this.editorSlot, this.settingsSlot, this.outputSlot);
    this.root = el(
      "article",
      {
        class: `cp-cell cp-kind-${cell.kind}`,
        tabindex: 0,
        "data-testid": "cell",
        "data-cell-id": cell.id,
        "data-kind": cell.kind,
        "aria-labelledby": this.headingId,
      },
      header,
      this.body,
    );
    this.root.addEventListener("keydown", (event) => this.onKey(event));
    this.renderAll();
  }

  /** The cell this card shows. */
  get id(): string {
    return this.cell.id;
  }

  /** Shows `cell` (a new version of the same id) and where it stands in the column. */
  update(cell: Cell, index: number, count: number): void {
    this.upButton.disabled = index === 0;
    this.downButton.disabled = index === count - 1;
    if (cell === this.cell) return;
    const previous = this.cell;
    this.cell = cell;
    this.renderName();
    if (cell.settings !== previous.settings) {
      this.renderSettings();
      this.syncEditorText();
    }
  }

  /** Redraws the settings form (lists of other cells, linked values); nothing when it is closed. */
  refreshForms(): void {
    if (this.settingsOpen) this.renderSettings();
  }

  private toggleSettings(): void {
    this.settingsOpen = !this.settingsOpen;
    this.renderSettings();
    if (this.settingsOpen) (this.settingsSlot.querySelector("input, select, textarea") as HTMLElement | null)?.focus({ preventScroll: true });
  }

  /** Shows the cell's state: the line in the header and, when computed, its output. */
  setState(state: EditorCellState): void {
    this.lastState = state;
    const words = statusWords(this.cell.kind, state);
    // Running cells report many times a second: touch the DOM only where something changed.
    if (this.stateLine.textContent !== words.text) {
      this.stateLine.textContent = words.text;
      this.stateLine.title = words.text;
    }
    if (this.stateLine.dataset.tone !== words.tone) this.stateLine.dataset.tone = words.tone;
    if (this.root.dataset.state !== state.status) this.root.dataset.state = state.status;
    if (state.status === "done") this.showValue(state.value, false, this.host.warmStarted(this.cell.id, state.runs));
    else if (state.status === "running" && state.value !== undefined) this.showValue(state.value, true);
    else if ((state.status === "waiting" || state.status === "running") && !this.outputSlot.classList.contains("cp-stale")) this.outputSlot.classList.add("cp-stale");
    else if (this.cell.kind === "prose" && (state.status === "held" || (state.status === "failed" && state.cause.kind === "upstream"))) this.showProseAnyway(state);
    else if (state.status === "failed") this.showProblem("failed", state.message);
    else if (state.status === "held") this.showProblem("held", state.reason);
    if (this.cell.kind === "parameter") this.renderName();
  }

  /** Prose drawn without some of its values redraws when other cells finish (see showProseAnyway). */
  refreshPartialProse(): void {
    const state = this.lastState;
    if (this.cell.kind === "prose" && (state.status === "held" || (state.status === "failed" && state.cause.kind === "upstream"))) this.showProseAnyway(state);
  }

  /** Moves focus to the card itself. */
  focus(): void {
    this.root.focus();
  }

  /** Opens the cell for editing: prose text, code, or the first settings field. */
  open(): void {
    if (this.cell.kind === "prose") {
      this.editing = true;
      this.renderEditor();
      this.editor?.focus();
      return;
    }
    if (this.editor) {
      this.editor.focus();
      return;
    }
    if (FORM_KINDS.has(this.cell.kind)) {
      if (!this.settingsOpen) this.toggleSettings();
      (this.settingsSlot.querySelector("input, select, textarea") as HTMLElement | null)?.focus();
    }
  }

  /** Commits text typed in the cell's editor and not yet run (before a save). */
  commitPending(): void {
    if (!this.editor) return;
    const text = this.editor.text();
    const path = this.cell.kind === "prose" ? "text" : "code";
    if ((this.cell.settings as Record<string, unknown>)[path] !== text) this.commitText(text);
  }

  destroy(): void {
    this.editor?.destroy();
    if (this.proseTimer) clearTimeout(this.proseTimer);
    this.host.pendingText(this.cell.id, undefined);
  }

  // ---- drawing ----------------------------------------------------------------

  private renderAll(): void {
    this.renderName();
    this.renderEditor();
    this.renderSettings();
    this.setState(this.lastState);
  }

  private renderName(): void {
    const { cell } = this;
    const named = typeof cell.name === "string";
    const label = named ? cell.name! : "unnamed";
    const button = el("button", {
      type: "button",
      class: `cp-name-button${named ? "" : " cp-unnamed"}`,
      "data-testid": "cell-name",
      "aria-label": named ? `Rename ${label}` : "Give this cell a name",
      title: "Rename",
      text: label,
      on: { click: () => this.startRename() },
    });
    const parts: (HTMLElement | string)[] = [button];
    if (cell.kind === "parameter") {
      const value = this.lastState.status === "done" ? this.lastState.value : (cell.settings as { value: unknown }).value;
      const unit = (cell.settings as { unit?: string }).unit;
      parts.push(el("span", { class: "cp-param-value", "data-testid": "parameter-value", text: `= ${typeof value === "string" ? JSON.stringify(value) : String(value)}${unit ? ` ${unit}` : ""}` }));
      parts.push(el("button", { type: "button", class: "cp-link-button", text: "tune at the desk", on: { click: () => this.host.tuneAtDesk(cell.id) } }));
    }
    replaceChildren(this.nameBox, ...parts);
  }

  private startRename(): void {
    const input = el("input", { type: "text", class: "cp-input cp-rename", "aria-label": "New name (Enter to keep, Escape to cancel)", spellcheck: "false", autocomplete: "off" });
    input.value = this.cell.name ?? "";
    let done = false;
    const finish = (keep: boolean) => {
      if (done) return;
      done = true;
      if (keep) {
        const name = input.value.trim();
        const problem = this.host.apply([{ type: "rename", id: this.cell.id, name: name === "" ? undefined : name }], `rename to ${name || "(none)"}`);
        this.showEditProblem(problem);
      }
      this.renderName();
      (this.nameBox.querySelector("button") as HTMLElement | null)?.focus();
    };
    input.addEventListener("keydown", (event) => {
      if (event.key === "Enter") {
        event.preventDefault();
        finish(true);
      } else if (event.key === "Escape") {
        event.preventDefault();
        event.stopPropagation();
        finish(false);
      }
    });
    input.addEventListener("blur", () => finish(true));
    replaceChildren(this.nameBox, input);
    input.focus();
    input.select();
  }

  private textOf(): string | undefined {
    const s = this.cell.settings as Record<string, unknown>;
    if (this.cell.kind === "prose") return String(s.text ?? "");
    if (this.cell.kind === "code") return String(s.code ?? "");
    if (this.cell.kind === "figure" && s.view === "code") return String(s.code ?? "");
    return undefined;
  }

  private renderEditor(): void {
    const text = this.textOf();
    const wanted = text !== undefined && (this.cell.kind !== "prose" || this.editing);
    if (!wanted) {
      this.editor?.destroy();
      this.editor = null;
      const parts: HTMLElement[] = [];
      if (this.cell.kind === "prose") {
        parts.push(el("button", { type: "button", class: "cp-link-button cp-edit-text", "data-testid": "edit-text", text: "Edit text", on: { click: () => this.open() } }));
      }
      replaceChildren(this.editorSlot, ...parts);
      return;
    }
    if (this.editor) return;
    const isProse = this.cell.kind === "prose";
    this.editor = createTextEditor({
      language: isProse ? "markdown" : "javascript",
      text: text!,
      label: isProse ? `Text of this cell (Markdown; @{name} shows a value)` : `Code of ${this.cell.name ?? "this cell"} (JavaScript; Ctrl+Enter runs)`,
      placeholder: isProse ? "Write in Markdown. @{name} shows another cell's value." : "Other cells are in scope by name; the last expression is the value.",
      onCommit: (t) => this.commitText(t),
      onInput: (t) => this.onType(t),
      onLeave: () => {
        if (isProse) this.closeProse();
        this.root.focus();
      },
    });
    const hint = isProse
      ? el(
          "div",
          { class: "cp-editor-foot" },
          el("span", { class: "cp-field-hint", text: "Shown below as you type. Escape or Done to close." }),
          el("button", { type: "button", class: "cp-small-button", text: "Done", "data-testid": "done-text", on: { click: () => this.closeProse() } }),
        )
      : el("div", { class: "cp-editor-foot" }, el("span", { class: "cp-field-hint cp-code-hint", text: "Ctrl+Enter (or leaving the editor) runs the code." }));
    replaceChildren(this.editorSlot, this.editor.dom, hint);
  }

  private closeProse(): void {
    this.commitPending();
    this.editing = false;
    this.renderEditor();
    this.root.focus();
  }

  private syncEditorText(): void {
    const text = this.textOf();
    if (this.editor && text !== undefined && this.editor.text() !== text) this.editor.setText(text);
    if (text === undefined && this.editor) this.renderEditor();
    if (text !== undefined && !this.editor) this.renderEditor();
  }

  private onType(text: string): void {
    if (this.cell.kind === "prose") {
      // Prose re-renders as the user types: commit after a short pause, one undo step per burst.
      if (this.proseTimer) clearTimeout(this.proseTimer);
      this.proseTimer = setTimeout(() => {
        this.proseTimer = null;
        this.commitText(text, true);
      }, 350);
      return;
    }
    const committed = this.textOf();
    this.host.pendingText(this.cell.id, text === committed ? undefined : text);
    this.root.classList.toggle("cp-unrun", text !== committed);
  }

  private commitText(text: string, merge = false): void {
    const path = this.cell.kind === "prose" ? "text" : "code";
    this.host.pendingText(this.cell.id, undefined);
    this.root.classList.remove("cp-unrun");
    const problem = this.host.apply([{ type: "set-setting", id: this.cell.id, path, value: text }], this.cell.kind === "prose" ? "edit text" : "edit code", merge ? `text:${this.cell.id}` : undefined);
    this.showEditProblem(problem);
  }

  private showEditProblem(problem: string | undefined): void {
    this.problemLine.hidden = problem === undefined;
    this.problemLine.textContent = problem ?? "";
  }

  private formContext(): CellFormContext {
    const host = this.host;
    const id = this.cell.id;
    const study = host.study();
    return {
      cell: this.cell,
      study,
      set: (path, value, label) => host.apply([{ type: "set-setting", id, path, value }], label, `setting:${id}:${Array.isArray(path) ? path.join(".") : path}`),
      replace: (settings, label) => host.apply([{ type: "set-settings", id, settings }], label),
      names: (...kinds) => study.cells.filter((c) => kinds.includes(c.kind) && typeof c.name === "string" && c.id !== id).map((c) => c.name as string),
      // A parameter's value is in its settings: no need to wait for the run to show it.
      valueOf: (name) => {
        const source = study.cells.find((c) => c.name === name);
        return source?.kind === "parameter" ? (source.settings as { value: unknown }).value : host.valueOf(name);
      },
    };
  }

  private renderSettings(): void {
    const { cell } = this;
    const wantsForm = FORM_KINDS.has(cell.kind);
    // Remember which field had focus, to give it back after redrawing.
    const active = document.activeElement as HTMLElement | null;
    const inside = active && this.settingsSlot.contains(active) ? active : null;
    const key = inside?.closest("[data-field]")?.getAttribute("data-field") ?? null;
    const position = inside && key ? Array.from(this.settingsSlot.querySelectorAll(`[data-field="${CSS.escape(key)}"] input, [data-field="${CSS.escape(key)}"] select, [data-field="${CSS.escape(key)}"] textarea`)).indexOf(inside) : -1;
    const context = this.formContext();
    this.settingsButton.hidden = !wantsForm;
    this.settingsButton.setAttribute("aria-expanded", String(this.settingsOpen));
    this.settingsButton.classList.toggle("cp-on", this.settingsOpen);
    if (!wantsForm || !this.settingsOpen) {
      replaceChildren(this.settingsSlot);
      this.settingsSlot.hidden = true;
      return;
    }
    let form: HTMLElement | null = null;
    switch (cell.kind) {
      case "transport":
        form = transportForm(context);
        break;
      case "data":
        form = dataForm(context);
        break;
      case "parameter":
        form = parameterForm(context);
        break;
      case "sweep":
        form = sweepForm(context);
        break;
      case "figure":
        form = figureForm(context);
        break;
      case "table":
        form = tableForm(context);
        break;
    }
    this.settingsSlot.hidden = false;
    replaceChildren(this.settingsSlot, el("div", { class: "cp-settings", "data-testid": "cell-settings", role: "group", "aria-label": `Settings of ${cell.name ?? `this ${cell.kind} cell`}` }, form, settingsJson(context)));
    if (key) {
      const again = Array.from(this.settingsSlot.querySelectorAll(`[data-field="${CSS.escape(key)}"] input, [data-field="${CSS.escape(key)}"] select, [data-field="${CSS.escape(key)}"] textarea`)) as HTMLElement[];
      (again[Math.max(0, position)] ?? again[0])?.focus();
    }
  }

  private showValue(value: unknown, partial: boolean, warmStarted = false): void {
    if (value === this.shownValue && this.cell === this.shownCell && !this.outputSlot.classList.contains("cp-stale")) return;
    this.shownValue = value;
    this.shownCell = this.cell;
    let output: HTMLElement;
    try {
      output = cellOutput(this.cell, value, { width: this.host.width(), partial, warmStarted });
    } catch (error) {
      output = el("div", { class: "cp-failure", role: "alert", text: `could not show this value: ${(error as Error).message}` });
    }
    this.outputSlot.classList.toggle("cp-stale", partial && this.cell.kind !== "sweep");
    replaceChildren(this.outputSlot, output);
  }

  /**
   * Prose whose live values wait on a held or failed cell is still text worth
   * reading: it is drawn with the values that are there, the others shown as "—",
   * and a line saying why.
   */
  private showProseAnyway(state: EditorCellState): void {
    const cell = this.cell;
    if (cell.kind !== "prose") return;
    let value: unknown;
    try {
      const definition = defineProseCell(cell, {} as DefineContext);
      const inputs: Record<string, unknown> = {};
      for (const name of definition.inputs) inputs[name] = this.host.valueOf(name);
      value = definition.compute(inputs, { signal: new AbortController().signal, progress: () => {} });
    } catch {
      this.showProblem(state.status === "held" ? "held" : "failed", state.status === "held" ? state.reason : state.status === "failed" ? state.message : "");
      return;
    }
    this.shownValue = undefined;
    this.outputSlot.classList.remove("cp-stale");
    const why = state.status === "held" ? state.reason : state.status === "failed" ? state.message : "";
    // The "—" values are explained by the line below, not as missing fields.
    const shown = typeof value === "object" && value !== null ? { ...value, missing: [] } : value;
    replaceChildren(
      this.outputSlot,
      cellOutput(cell, shown, { width: this.host.width() }),
      el("p", { class: "cp-note cp-prose-why", "data-testid": "prose-partial", text: `Values shown as “—” are not available: ${why}.` }),
    );
  }

  private showProblem(kind: "failed" | "held", message: string): void {
    this.shownValue = undefined;
    this.outputSlot.classList.remove("cp-stale");
    const box =
      kind === "failed"
        ? el("div", { class: "cp-failure", "data-testid": "cell-failure" }, el("p", { class: "cp-failure-label", text: "This cell could not be computed" }), el("pre", { text: message }))
        : el("div", { class: "cp-held", "data-testid": "cell-held" }, el("p", { text: `Not run: ${message}. See the notice at the top of the page to run it.` }));
    replaceChildren(this.outputSlot, box);
  }

  // ---- keyboard ---------------------------------------------------------------

  private onKey(event: KeyboardEvent): void {
    const onCard = event.target === this.root;
    const id = this.cell.id;
    if (event.altKey && !event.ctrlKey && !event.metaKey) {
      if (event.key === "ArrowUp" && !event.shiftKey) return this.handled(event, () => this.host.move(id, -1));
      if (event.key === "ArrowDown" && !event.shiftKey) return this.handled(event, () => this.host.move(id, 1));
      if (event.key === "ArrowDown" && event.shiftKey) return this.handled(event, () => this.host.duplicate(id));
      if ((event.key === "Delete" || event.key === "Backspace") && onCard) return this.handled(event, () => this.host.remove(id));
      if (event.code === "KeyN") return this.handled(event, () => this.host.insertAfter(id));
    }
    if (!onCard || event.altKey || event.ctrlKey || event.metaKey) {
      if (event.key === "Escape" && !onCard && this.root.contains(event.target as Node) && !(event.target as HTMLElement).closest(".cm-editor")) {
        this.handled(event, () => this.root.focus());
      }
      return;
    }
    if (event.key === "ArrowUp") return this.handled(event, () => this.host.focusSibling(id, -1));
    if (event.key === "ArrowDown") return this.handled(event, () => this.host.focusSibling(id, 1));
    if (event.key === "Enter") return this.handled(event, () => this.open());
  }

  private handled(event: KeyboardEvent, run: () => void): void {
    event.preventDefault();
    event.stopPropagation();
    run();
  }
}
