import { el } from "../dom/element";
import type { SaveStatus } from "../save/save-controller";

/** What the masthead's buttons do. */
export interface MastheadActions {
  setTitle(title: string): string | undefined;
  undo(): void;
  redo(): void;
  save(): void;
  exportReport(): void;
  exportStudy(): void;
  showKeys(): void;
  /** Moves to the control desk (shown on narrow screens, where the desk is below the cells). */
  showDesk(): void;
}

/** Save status in words, as the masthead shows it. */
export function saveWords(status: SaveStatus, now: number = Date.now()): { text: string; tone: "good" | "busy" | "bad" | "quiet" } {
  switch (status.kind) {
    case "saved": {
      if (status.at === undefined) return { text: "saved", tone: "quiet" };
      const seconds = Math.max(0, Math.round((now - status.at) / 1000));
      return { text: seconds < 5 ? "saved just now" : `saved at ${new Date(status.at).toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" })}`, tone: "good" };
    }
    case "pending":
      return { text: "unsaved changes — saving shortly", tone: "busy" };
    case "saving":
      return { text: "saving…", tone: "busy" };
    case "conflict":
      return { text: status.diskText === null ? "not saved: the file was deleted" : "not saved: the file changed on disk", tone: "bad" };
    case "unwritten":
      return { text: status.draftKept ? "not saved to disk — kept in this browser" : "not saved — and not kept anywhere", tone: "bad" };
  }
}

/**
 * The band across the top: the Couplet mark, the study's title (edited in
 * place), its file and save status, and the page's commands (undo, redo, save,
 * report, study file, keyboard help).
 */
export class Masthead {
  readonly root: HTMLElement;
  private readonly title: HTMLInputElement;
  private readonly file: HTMLElement;
  private readonly status: HTMLElement;
  private readonly undoButton: HTMLButtonElement;
  private readonly redoButton: HTMLButtonElement;
  private readonly titleProblem: HTMLElement;
  private titleTyping = false;

  constructor(actions: MastheadActions) {
    this.title = el("input", { type: "text", class: "cp-title", "aria-label": "Study title", placeholder: "Untitled study", "data-testid": "study-title", autocomplete: "off" });
    this.titleProblem = el("span", { class: "cp-field-problem", role: "alert", hidden: true });
    this.title.addEventListener("input", () => (this.titleTyping = true));
    this.title.addEventListener("change", () => {
      this.titleTyping = false;
      const problem = actions.setTitle(this.title.value);
      this.titleProblem.hidden = problem === undefined;
      this.titleProblem.textContent = problem ?? "";
    });
    this.title.addEventListener("keydown", (e) => {
      if (e.key === "Enter") this.title.blur();
    });
    this.file = el("span", { class: "cp-file", "data-testid": "study-path" });
    this.status = el("span", { class: "cp-save-status", "data-testid": "save-status", role: "status", "aria-live": "polite" });
    const button = (text: string, label: string, testid: string, run: () => void, extra = "") =>
      el("button", { type: "button", class: `cp-mast-button ${extra}`.trim(), text, "aria-label": label, title: label, "data-testid": testid, on: { click: run } });
    this.undoButton = button("Undo", "Undo (Ctrl+Z)", "undo", actions.undo);
    this.redoButton = button("Redo", "Redo (Ctrl+Shift+Z)", "redo", actions.redo);
    this.root = el(
      "header",
      { class: "cp-masthead", "data-region": "masthead", tabindex: -1 },
      el("div", { class: "cp-mark", "aria-hidden": "true" }, el("span", { class: "cp-mark-a" }), el("span", { class: "cp-mark-b" })),
      el("div", { class: "cp-mast-text" }, this.title, el("div", { class: "cp-mast-meta" }, this.file, this.status, this.titleProblem)),
      el(
        "nav",
        { class: "cp-mast-actions", "aria-label": "Study commands" },
        this.undoButton,
        this.redoButton,
        button("Save", "Save now (Ctrl+S)", "save", actions.save, "cp-mast-strong"),
        button("Report", "Download the HTML report of this run", "export-report", actions.exportReport),
        button("Study file", "Download the study file as it is now", "export-study", actions.exportStudy),
        button("Keys", "Keyboard shortcuts (Ctrl+/)", "show-keys", actions.showKeys),
        button("Desk", "Go to the control desk", "show-desk", actions.showDesk, "cp-mast-desk"),
      ),
    );
  }

  /** Shows the title (unless it is being edited), file and undo/redo availability. */
  show(options: { title: string; path: string; undo?: string; redo?: string }): void {
    if (!this.titleTyping) this.title.value = options.title;
    this.file.textContent = options.path;
    this.undoButton.disabled = options.undo === undefined;
    this.redoButton.disabled = options.redo === undefined;
    this.undoButton.title = options.undo ? `Undo ${options.undo} (Ctrl+Z)` : "Nothing to undo";
    this.redoButton.title = options.redo ? `Redo ${options.redo} (Ctrl+Shift+Z)` : "Nothing to redo";
    this.undoButton.setAttribute("aria-label", this.undoButton.title);
    this.redoButton.setAttribute("aria-label", this.redoButton.title);
  }

  /** Shows the save status in words. */
  showSave(status: SaveStatus): void {
    const words = saveWords(status);
    this.status.textContent = words.text;
    this.status.dataset.tone = words.tone;
  }
}
