import type { Cell, CellKindName, StudyChange, StudyDocument } from "../../document";
import { newStudyId, parseStudy, serializeStudy, updateStudy } from "../../document";
import type { TransportSolver } from "../../kinds/define-context";
import { FIGURE_WIDTH } from "../../views/theme";
import { ControlDesk, countStates } from "../desk/control-desk";
import { el, replaceChildren } from "../dom/element";
import { downloadText } from "../export/download-file";
import { editorReportHtml } from "../export/editor-report";
import { duplicateCell, newCell } from "../model/new-cell";
import { redoLabel, undoLabel } from "../model/study-history";
import { DataFileCache } from "../run/data-file-cache";
import { FrameBatcher } from "../run/frame-batcher";
import { servedDataPath } from "../run/measure-from-bytes";
import type { EditorCellState } from "../run/status-words";
import { StudySession, problemText } from "../run/study-session";
import { type KeyValueStorage, dropDraft, keepDraft, readDraft } from "../save/draft-store";
import { SaveController, type SaveStatus } from "../save/save-controller";
import type { StudyServer } from "../save/server-api";
import { CellCard, type CellCardHost } from "../sheet/cell-card";
import { openInsertMenu } from "../sheet/insert-menu";
import { seamElement } from "../sheet/seam";
import { Masthead } from "./masthead";
import { NoticeBand } from "./notices";
import { draftNotice, saveNotice, trustNotice } from "./page-notices";
import { shortcutsDialog } from "./shortcuts";

/** Everything the editor needs to open one study. */
export interface EditorAppOptions {
  /** Where the page is drawn. */
  readonly mount: HTMLElement;
  readonly server: StudyServer;
  /** Path of the study on the server. */
  readonly path: string;
  /** The study's text as read, and its revision. */
  readonly text: string;
  readonly revision: string;
  /** Whether the folder trusts this study's code. */
  readonly trusted: boolean;
  /** Solves transport problems (Web Workers in the page). */
  readonly solve: TransportSolver;
  /** Browser storage for drafts and preferences. */
  readonly storage?: KeyValueStorage;
}

const WARM_KEY = "couplet.warmWhileTuning";

/** A random source for new cell ids (the id only has to be unlikely to repeat). */
function idSource(): () => number {
  return () => crypto.getRandomValues(new Uint32Array(1))[0] / 4294967296;
}

/**
 * The browser editor of one study: the study column of cells (prose rendered,
 * results inline), the control desk of parameters, the masthead and notices.
 * It owns the session (history + engine), the save controller and the cards, and
 * routes every edit through the session so that undo, autosave and re-running
 * follow from one place.
 */
export class EditorApp {
  private readonly options: EditorAppOptions;
  private readonly session: StudySession;
  private readonly saver: SaveController;
  private readonly files: DataFileCache;
  private readonly masthead: Masthead;
  private readonly notices = new NoticeBand();
  private readonly desk: ControlDesk;
  private readonly sheet: HTMLElement;
  private readonly about: HTMLTextAreaElement;
  private readonly cards = new Map<string, CellCard>();
  private readonly pending = new Map<string, string>();
  private readonly batcher: FrameBatcher<EditorCellState>;
  private readonly fresh = new Set<string>();
  private path: string;
  private warm: boolean;
  /** Width for figures, kept up to date by a ResizeObserver (reading it would force a layout per figure). */
  private figureWidth = FIGURE_WIDTH;
  private aboutTyping = false;

  constructor(options: EditorAppOptions) {
    this.options = options;
    this.path = options.path;
    const study = parseStudy(options.text, { path: options.path });
    this.warm = options.storage?.getItem(WARM_KEY) !== "off";
    this.files = new DataFileCache(
      (served) => options.server.readData(served),
      () => this.session.recompile(),
    );
    this.batcher = new FrameBatcher((updates) => this.showStates(updates));
    this.session = new StudySession({
      study,
      solve: options.solve,
      warmWhileTuning: () => this.warm,
      runCode: options.trusted,
      readMeasureFile: this.files.reader(() => this.path),
      fileGeneration: (path) => this.files.generation(servedDataPath(this.path, path) ?? path),
      onState: (id, state) => this.batcher.push(id, state),
      onStudy: (next, how) => this.studyChanged(next, how),
    });
    this.saver = new SaveController({
      server: options.server,
      ...(options.storage ? { storage: options.storage } : {}),
      path: options.path,
      revision: options.revision,
      savedText: options.text,
      currentText: () => this.currentText(),
      onStatus: (status) => this.saveChanged(status),
    });
    this.masthead = new Masthead({
      setTitle: (title) => this.apply([{ type: "set-title", title }], "title"),
      undo: () => this.undo(),
      redo: () => this.redo(),
      save: () => void this.save(),
      exportReport: () => void this.exportReport(),
      exportStudy: () => this.downloadStudy(),
      showKeys: () => this.showKeys(),
      showDesk: () => {
        this.desk.root.scrollIntoView({ block: "start" });
        this.desk.root.focus();
      },
    });
    this.desk = new ControlDesk({
      apply: (changes, label, mergeKey) => this.apply(changes, label, mergeKey),
      warmWhileTuning: () => this.warm,
      setWarmWhileTuning: (on) => {
        this.warm = on;
        options.storage?.setItem(WARM_KEY, on ? "on" : "off");
        this.session.recompile();
      },
      focusCell: (id) => this.focusCell(id),
    });
    this.about = el("textarea", { class: "cp-about", rows: 2, "aria-label": "What this study is about", placeholder: "What is this study about? (plain text)", "data-testid": "study-about" });
    this.about.addEventListener("input", () => {
      this.aboutTyping = true;
      this.fitAbout();
    });
    this.about.addEventListener("change", () => {
      this.aboutTyping = false;
      const value = this.about.value;
      this.apply([{ type: "set-about", about: value.trim() === "" ? undefined : value }], "about");
    });
    this.sheet = el("main", { class: "cp-sheet", "aria-label": "Study cells", "data-region": "sheet", "data-testid": "sheet", tabindex: -1 });
    const skip = el("a", { class: "cp-skip", href: "#cp-desk-title", text: "Skip to the control desk" });
    skip.addEventListener("click", (e) => {
      e.preventDefault();
      this.desk.root.focus();
    });
    replaceChildren(
      options.mount,
      skip,
      this.masthead.root,
      this.notices.root,
      el("div", { class: "cp-workspace" }, el("div", { class: "cp-sheet-wrap" }, this.about, this.sheet), this.desk.root),
    );
    this.desk.root.dataset.region = "desk";
    new ResizeObserver(([entry]) => {
      this.figureWidth = Math.max(280, Math.min(FIGURE_WIDTH, Math.round(entry.contentRect.width) - 40));
    }).observe(this.sheet);
    document.addEventListener("keydown", (event) => this.onKey(event));
    window.addEventListener("beforeunload", (event) => this.beforeUnload(event));
    this.studyChanged(study, "replace");
    this.saveChanged(this.saver.status);
    if (!options.trusted) this.showTrustNotice();
    this.offerDraft();
  }

  // ---- the study ---------------------------------------------------------------

  /** Applies changes as one undo step; the problem in words when refused. */
  apply(changes: readonly StudyChange[], label: string, mergeKey?: string): string | undefined {
    return this.session.apply(changes, label, mergeKey);
  }

  private undo(): void {
    if (!this.session.undo()) this.flash("Nothing to undo.");
  }

  private redo(): void {
    if (!this.session.redo()) this.flash("Nothing to redo.");
  }

  /** The study as saved: the present study plus code typed but not yet run. */
  private currentText(): string {
    let study = this.session.study;
    if (this.pending.size > 0) {
      const changes: StudyChange[] = [];
      for (const [id, text] of this.pending) {
        const cell = study.cells.find((c) => c.id === id);
        if (cell) changes.push({ type: "set-setting", id, path: cell.kind === "prose" ? "text" : "code", value: text });
      }
      try {
        study = updateStudy(study, changes).study;
      } catch {
        // Unsavable typing (cannot happen for text): save what ran.
      }
    }
    return serializeStudy(study);
  }

  private studyChanged(study: StudyDocument, how: "edit" | "undo" | "redo" | "replace"): void {
    const cells = study.cells;
    const ids = new Set(cells.map((c) => c.id));
    for (const [id, card] of this.cards) {
      if (!ids.has(id)) {
        card.destroy();
        card.root.remove();
        this.cards.delete(id);
      }
    }
    const namesChanged = this.namesKey !== (this.namesKey = cells.map((c) => `${c.kind}:${c.name ?? ""}`).join("|"));
    // Forms show the current value of linked parameters: redraw open ones when a value moved.
    const valuesChanged = this.valuesKey !== (this.valuesKey = JSON.stringify(cells.filter((c) => c.kind === "parameter").map((c) => (c.settings as { value: unknown }).value)));
    const order: HTMLElement[] = [seamElement(0, (anchor, index) => this.insertAt(anchor, index))];
    cells.forEach((cell, index) => {
      let card = this.cards.get(cell.id);
      if (!card) {
        card = new CellCard(cell, this.cardHost, { fresh: this.fresh.has(cell.id) });
        this.fresh.delete(cell.id);
        this.cards.set(cell.id, card);
        card.setState(this.session.state(cell.id));
      } else if (namesChanged || valuesChanged) card.refreshForms();
      card.update(cell, index, cells.length);
      order.push(card.root, seamElement(index + 1, (anchor, at) => this.insertAt(anchor, at)));
    });
    if (cells.length === 0) {
      order.push(el("p", { class: "cp-empty", text: "This study has no cells yet. Insert one with the button above." }));
    }
    // Keep focus where it is: re-append only when the order of cards changed.
    const active = document.activeElement;
    const current = Array.from(this.sheet.children).filter((n) => n.classList.contains("cp-cell"));
    const wanted = order.filter((n) => n.classList.contains("cp-cell"));
    if (current.length !== wanted.length || current.some((n, k) => n !== wanted[k]) || this.sheet.children.length !== order.length) {
      replaceChildren(this.sheet, ...order);
      if (active instanceof HTMLElement && this.sheet.contains(active)) active.focus();
    }
    if (!this.aboutTyping && this.about.value !== (study.about ?? "")) {
      this.about.value = study.about ?? "";
      requestAnimationFrame(() => this.fitAbout());
    }
    this.masthead.show({ title: study.title, path: this.path, undo: undoLabel(this.session.history), redo: redoLabel(this.session.history) });
    document.title = `${study.title.trim() || "Untitled study"} — Couplet`;
    this.desk.render(study);
    for (const cell of cells) {
      if (cell.kind === "data" && cell.settings.from === "file") {
        const served = servedDataPath(this.path, cell.settings.path);
        if (served) this.files.ensure(served);
      }
    }
    if (how !== "replace") this.saver.edited();
    this.updateSummary();
  }

  private namesKey = "";
  private valuesKey = "";

  /** Grows the "about" box to its text (no inner scroll bar for a paragraph). */
  private fitAbout(): void {
    this.about.style.height = "auto";
    this.about.style.height = `${this.about.scrollHeight + 2}px`;
  }

  private readonly cardHost: CellCardHost = {
    study: () => this.session.study,
    apply: (changes, label, mergeKey) => this.apply(changes, label, mergeKey),
    valueOf: (name) => this.session.valueOf(name),
    width: () => this.figureWidth,
    move: (id, delta) => this.move(id, delta),
    duplicate: (id) => this.duplicate(id),
    remove: (id) => this.remove(id),
    focusSibling: (id, delta) => {
      const cells = this.session.study.cells;
      const k = cells.findIndex((c) => c.id === id) + delta;
      if (k >= 0 && k < cells.length) this.focusCell(cells[k].id);
    },
    insertAfter: (id) => {
      const index = this.session.study.cells.findIndex((c) => c.id === id) + 1;
      const anchor = this.cards.get(id)?.root.querySelector<HTMLElement>('[data-testid="cell-insert-below"]');
      if (anchor) this.insertAt(anchor, index);
    },
    tuneAtDesk: (id) => this.desk.focusParameter(id),
    warmStarted: (id, runs) => this.warmStarted(id, runs),
    pendingText: (id, text) => {
      if (text === undefined) this.pending.delete(id);
      else this.pending.set(id, text);
      this.saver.edited();
    },
    save: () => void this.save(),
  };

  /**
   * Whether the editor warm-started this transport cell's latest solve: tuning is on,
   * the cell is iterative and does not ask for warm starts itself, and it ran before
   * (its first run has no previous potentials to start from).
   */
  private warmStarted(id: string, runs: number): boolean {
    const cell = this.session.study.cells.find((c) => c.id === id);
    return this.warm && runs > 1 && cell?.kind === "transport" && cell.settings.method !== "exact" && cell.settings.warmStart !== true;
  }

  private focusCell(id: string): void {
    const card = this.cards.get(id);
    if (!card) return;
    card.root.scrollIntoView({ block: "nearest", behavior: "smooth" });
    card.focus();
  }

  private insertAt(anchor: HTMLElement, index: number): void {
    openInsertMenu(anchor, (kind) => this.insertCell(kind, index));
  }

  private insertCell(kind: CellKindName, index: number): void {
    const study = this.session.study;
    const id = newStudyId(idSource(), study.cells.map((c) => c.id));
    const cell = newCell(kind, id, study);
    this.fresh.add(id);
    const problem = this.apply([{ type: "insert-cell", cell, index }], `insert ${kind}`);
    if (problem) {
      this.fresh.delete(id);
      this.flash(`Could not insert: ${problem}`);
      return;
    }
    const card = this.cards.get(id);
    if (card) {
      card.root.scrollIntoView({ block: "nearest" });
      card.open();
      if (!card.root.contains(document.activeElement)) card.focus();
    }
  }

  private move(id: string, delta: -1 | 1): void {
    const cells = this.session.study.cells;
    const index = cells.findIndex((c) => c.id === id) + delta;
    if (index < 0 || index >= cells.length) return;
    this.apply([{ type: "move-cell", id, index }], delta < 0 ? "move cell up" : "move cell down");
    this.focusCell(id);
  }

  private duplicate(id: string): void {
    const study = this.session.study;
    const index = study.cells.findIndex((c) => c.id === id);
    if (index < 0) return;
    const copyId = newStudyId(idSource(), study.cells.map((c) => c.id));
    const copy: Cell = duplicateCell(study.cells[index], copyId, study);
    const problem = this.apply([{ type: "insert-cell", cell: copy, index: index + 1 }], "duplicate cell");
    if (problem) this.flash(`Could not duplicate: ${problem}`);
    else this.focusCell(copyId);
  }

  private remove(id: string): void {
    const cells = this.session.study.cells;
    const index = cells.findIndex((c) => c.id === id);
    if (index < 0) return;
    const cell = cells[index];
    const problem = this.apply([{ type: "remove-cell", id }], `delete ${cell.name ?? cell.kind}`);
    if (problem) {
      this.flash(`Could not delete: ${problem}`);
      return;
    }
    const next = this.session.study.cells[Math.min(index, this.session.study.cells.length - 1)];
    if (next) this.focusCell(next.id);
    else this.sheet.focus();
    this.notices.show({
      key: "deleted",
      tone: "info",
      title: `Deleted ${cell.name ? `“${cell.name}”` : `a ${cell.kind} cell`}.`,
      actions: [{ label: "Undo", primary: true, testid: "undo-delete", run: () => {
        this.notices.hide("deleted");
        this.undo();
        this.focusCell(id);
      } }],
      dismissible: true,
    });
  }

  // ---- states -----------------------------------------------------------------

  private showStates(updates: ReadonlyMap<string, EditorCellState>): void {
    let held = false;
    let finished = false;
    for (const [id, state] of updates) {
      this.cards.get(id)?.setState(state);
      if (state.status === "held") held = true;
      if (state.status === "done") finished = true;
    }
    if (finished) for (const card of this.cards.values()) if (!updates.has(card.id)) card.refreshPartialProse();
    // Code held in a study the user has not chosen to run: say why, and offer to run it.
    if (held && !this.session.runCode && !this.notices.has("trust")) this.showTrustNotice();
    this.updateSummary();
  }

  private updateSummary(): void {
    const study = this.session.study;
    const states = study.cells.map((c) => this.session.state(c.id));
    const cautions: { id: string; name: string; cautions: readonly string[] }[] = [];
    for (const cell of study.cells) {
      const card = this.cards.get(cell.id);
      const list = card ? Array.from(card.root.querySelectorAll(".cp-output-slot .cp-cautions li, .cp-output-slot .cp-figure-caution")).map((n) => (n.textContent ?? "").replace(/^Caution\s*/, "")) : [];
      if (list.length > 0) cautions.push({ id: cell.id, name: cell.name ?? `${cell.kind} cell`, cautions: list });
    }
    this.desk.showSummary({ ...countStates(states), cautions });
  }

  // ---- trust ------------------------------------------------------------------

  private showTrustNotice(): void {
    const notice = trustNotice(this.session.study, { runOnce: () => void this.allowCode(false), always: () => void this.allowCode(true) });
    if (notice) this.notices.show(notice);
  }

  private async allowCode(remember: boolean): Promise<void> {
    this.notices.hide("trust");
    this.session.setRunCode(true);
    if (!remember) return;
    try {
      await this.options.server.trust(this.path);
    } catch (error) {
      this.notices.show({ key: "trust-failed", tone: "failure", title: "Could not add the study to the trust list.", text: `${(error as Error).message}. The code runs in this page until you close it.`, dismissible: true });
    }
  }

  // ---- saving -----------------------------------------------------------------

  private async save(): Promise<void> {
    await this.saver.save();
  }

  private saveChanged(status: SaveStatus): void {
    this.masthead.showSave(status);
    document.title = `${this.saver?.hasUnsavedChanges() ? "• " : ""}${this.session?.study.title.trim() || "Untitled study"} — Couplet`;
    if (status.kind === "saved") {
      this.notices.hide("unwritten");
      this.notices.hide("conflict");
      const canonical = this.saver.takeCanonicalText();
      if (canonical !== undefined) {
        try {
          this.session.replace(parseStudy(canonical, { path: this.path }), false);
        } catch {
          // The server's canonical text should always parse; keep ours if not.
        }
      }
      return;
    }
    const notice = saveNotice(status, {
      retry: () => void this.save(),
      download: () => this.downloadStudy(),
      reload: () => this.reloadFromDisk(),
      keepBoth: () => void this.keepBoth(),
      overwrite: () => void this.saver.overwrite(),
    });
    if (!notice) return;
    this.notices.show(notice);
    if (notice.key === "conflict") this.notices.firstAction("conflict")?.focus();
  }

  private reloadFromDisk(): void {
    const disk = this.saver.reloadFromDisk();
    if (!disk) return;
    try {
      this.pending.clear();
      this.session.replace(parseStudy(disk.text, { path: this.path }), true);
      this.flash("Reloaded the study from disk. Your version is kept in this browser as a draft.");
    } catch (error) {
      this.flash(`The file on disk is not a valid study: ${problemText(error)}`);
    }
  }

  private async keepBoth(): Promise<void> {
    const copy = await this.saver.keepBoth();
    if (!copy) return;
    const from = this.path;
    this.path = copy;
    this.masthead.show({ title: this.session.study.title, path: this.path, undo: undoLabel(this.session.history), redo: redoLabel(this.session.history) });
    this.notices.show({ key: "kept-both", tone: "info", title: `Your version is saved as ${copy}; you are editing it now.`, text: `${from} was left as the other program wrote it.`, dismissible: true });
  }

  /** A draft kept in this browser from an earlier visit, offered when it differs from the disk. */
  private offerDraft(): void {
    const storage = this.options.storage;
    if (!storage) return;
    const draft = readDraft(storage, this.path);
    if (!draft || draft.text === this.options.text) return;
    this.notices.show(
      draftNotice(draft, this.options.revision, {
        restore: () => {
          try {
            this.session.replace(parseStudy(draft.text, { path: this.path }), false);
            this.saver.edited();
            this.notices.hide("draft");
          } catch (error) {
            this.flash(`The draft is not a valid study: ${problemText(error)}`);
          }
        },
        discard: () => {
          dropDraft(storage, this.path);
          this.notices.hide("draft");
        },
      }),
    );
  }

  private beforeUnload(event: BeforeUnloadEvent): void {
    if (!this.saver.hasUnsavedChanges()) return;
    // Keep what is not on disk, then let the browser ask.
    if (this.options.storage) keepDraft(this.options.storage, this.path, { text: this.currentText(), baseRevision: this.saver.baseRevision, keptAt: Date.now() });
    event.preventDefault();
  }

  // ---- export -----------------------------------------------------------------

  /** Offers the study as it is now (code typed but not run included) as a file. */
  private downloadStudy(): void {
    downloadText(this.path.split("/").pop() ?? "study.couplet.json", this.currentText(), "application/json");
  }

  private async exportReport(): Promise<void> {
    const busy = this.session.study.cells.filter((c) => {
      const s = this.session.state(c.id).status;
      return s === "waiting" || s === "running";
    }).length;
    if (busy > 0) {
      this.flash(`The report waits for ${busy} cell${busy === 1 ? "" : "s"} to finish…`);
      await this.session.settled();
    }
    this.batcher.flushNow();
    const html = editorReportHtml(this.session.study, (id) => this.session.state(id), new Date().toISOString(), (id) => {
      const state = this.session.state(id);
      return state.status === "done" && this.warmStarted(id, state.runs);
    });
    const base = (this.path.split("/").pop() ?? "study").replace(/\.couplet\.json$/, "");
    downloadText(`${base}-report.html`, html, "text/html");
    this.flash("Report downloaded: one self-contained HTML file, the same as `couplet run --report` writes.");
  }

  // ---- keyboard and small things ---------------------------------------------

  private showKeys(): void {
    const dialog = shortcutsDialog();
    document.body.append(dialog);
    dialog.addEventListener("close", () => dialog.remove());
    dialog.showModal();
  }

  private flash(text: string): void {
    this.notices.show({ key: "flash", tone: "info", title: text, dismissible: true });
  }

  private onKey(event: KeyboardEvent): void {
    const mod = event.ctrlKey || event.metaKey;
    const target = event.target as HTMLElement | null;
    const typing = !!target && (target.isContentEditable || target.closest(".cm-editor") !== null || ["INPUT", "TEXTAREA", "SELECT"].includes(target.tagName));
    if (mod && !event.altKey && event.key.toLowerCase() === "s") {
      event.preventDefault();
      void this.save();
      return;
    }
    if (mod && event.key === "/") {
      event.preventDefault();
      this.showKeys();
      return;
    }
    if (event.key === "F6") {
      event.preventDefault();
      this.cycleRegion(event.shiftKey ? -1 : 1);
      return;
    }
    if (typing || !mod || event.altKey) return;
    const key = event.key.toLowerCase();
    if (key === "z" && !event.shiftKey) {
      event.preventDefault();
      this.undo();
    } else if ((key === "z" && event.shiftKey) || key === "y") {
      event.preventDefault();
      this.redo();
    }
  }

  private cycleRegion(delta: 1 | -1): void {
    const regions = [this.masthead.root, this.sheet, this.desk.root];
    const current = regions.findIndex((r) => r.contains(document.activeElement));
    const next = regions[(current + delta + regions.length) % regions.length];
    if (next === this.sheet) {
      const first = this.sheet.querySelector<HTMLElement>(".cp-cell");
      (first ?? this.sheet).focus();
    } else if (next === this.masthead.root) this.masthead.root.querySelector<HTMLElement>("input, button")?.focus();
    else next.focus();
  }

  /** Stops every computation and timer (tests; a page that replaces the study). */
  dispose(): void {
    this.saver.dispose();
    this.session.dispose();
  }
}
