import { type Draft, type KeyValueStorage, dropDraft, keepDraft } from "./draft-store";
import { type StudyServer, ServerUnreachableError } from "./server-api";

/**
 * Where the study stands with respect to the disk, as the masthead shows it.
 * - `saved`: the file holds what the editor shows;
 * - `pending`: edited; an autosave is scheduled;
 * - `saving`: a write is under way;
 * - `conflict`: the file changed on disk since it was opened or last saved;
 *   `diskText` is what it holds now (null: the file was deleted). Autosave stops
 *   until the user chooses;
 *   `problem` says why the last attempt to resolve it failed;
 * - `unwritten`: the write failed (`reason`); `draftKept` says whether the text
 *   is safe in this browser's storage. Autosave retries on the next edit.
 */
export type SaveStatus =
  | { readonly kind: "saved"; readonly at?: number }
  | { readonly kind: "pending" }
  | { readonly kind: "saving" }
  | { readonly kind: "conflict"; readonly diskText: string | null; readonly diskRevision: string | null; readonly problem?: string }
  | { readonly kind: "unwritten"; readonly reason: string; readonly draftKept: boolean };

/** Options of a {@link SaveController}. */
export interface SaveControllerOptions {
  readonly server: StudyServer;
  /** Browser storage for drafts (localStorage); undefined when there is none. */
  readonly storage?: KeyValueStorage;
  /** The study's path on the server. */
  readonly path: string;
  /** The revision the editor's text was read at. */
  readonly revision: string;
  /** The text as read (to tell whether anything changed). */
  readonly savedText: string;
  /** The editor's current study text; called when a save starts. */
  readonly currentText: () => string;
  /** Called on each status change. */
  readonly onStatus?: (status: SaveStatus) => void;
  /** Quiet time after the last edit before an autosave, ms. Default 1500. */
  readonly delay?: number;
  /** Clock, ms. Default Date.now. */
  readonly now?: () => number;
  /** Timers (injectable for tests). Default setTimeout / clearTimeout. */
  readonly setTimer?: (run: () => void, ms: number) => unknown;
  readonly clearTimer?: (handle: unknown) => void;
}

/**
 * Saves a study so that work is never lost: explicit saves, debounced autosaves,
 * a conflict stop when the file changed on disk (see {@link SaveStatus}), and a
 * draft in browser storage whenever a write fails. One write at a time; edits made
 * during a write are saved by the next one.
 */
export class SaveController {
  private readonly options: SaveControllerOptions;
  private readonly delay: number;
  private readonly now: () => number;
  private readonly setTimer: (run: () => void, ms: number) => unknown;
  private readonly clearTimer: (handle: unknown) => void;
  private path: string;
  private revision: string;
  private savedText: string;
  private current: SaveStatus = { kind: "saved" };
  private timer: unknown = null;
  private writing: Promise<void> | null = null;
  private again = false;
  private canonical: string | undefined;

  constructor(options: SaveControllerOptions) {
    this.options = options;
    this.delay = options.delay ?? 1500;
    this.now = options.now ?? Date.now;
    this.setTimer = options.setTimer ?? ((run, ms) => setTimeout(run, ms));
    this.clearTimer = options.clearTimer ?? ((handle) => clearTimeout(handle as ReturnType<typeof setTimeout>));
    this.path = options.path;
    this.revision = options.revision;
    this.savedText = options.savedText;
  }

  /** The current status. */
  get status(): SaveStatus {
    return this.current;
  }

  /** The study path writes go to (changes after "keep both"). */
  get studyPath(): string {
    return this.path;
  }

  /** The revision of the file as last read or written. */
  get baseRevision(): string {
    return this.revision;
  }

  /**
   * The canonical text the server stored on the last save, when it differed from
   * the text sent (the editor then adopts it); taken once.
   */
  takeCanonicalText(): string | undefined {
    const text = this.canonical;
    this.canonical = undefined;
    return text;
  }

  /** Whether the editor's text differs from what was last written. */
  hasUnsavedChanges(): boolean {
    return this.options.currentText() !== this.savedText;
  }

  /** Call after every edit: schedules an autosave (not while a conflict waits for the user). */
  edited(): void {
    if (this.current.kind === "conflict") return;
    if (!this.hasUnsavedChanges()) {
      this.cancelTimer();
      if (this.current.kind === "pending") this.set({ kind: "saved" });
      return;
    }
    this.cancelTimer();
    if (this.current.kind !== "saving" && this.current.kind !== "unwritten") this.set({ kind: "pending" });
    this.timer = this.setTimer(() => {
      this.timer = null;
      void this.save();
    }, this.delay);
  }

  /**
   * Writes now (Ctrl+S, the Save button, retry). Resolves when the write has
   * finished, whatever its outcome (see {@link status}); never rejects.
   */
  async save(): Promise<void> {
    this.cancelTimer();
    if (this.current.kind === "conflict") return;
    if (this.writing) {
      this.again = true;
      return this.writing;
    }
    this.writing = this.write().finally(() => {
      this.writing = null;
    });
    await this.writing;
    if (this.again) {
      this.again = false;
      // `status`, not `current`: the write above may have changed it (TypeScript keeps the narrowing).
      if (this.hasUnsavedChanges() && this.status.kind !== "conflict") await this.save();
    }
  }

  /**
   * After a conflict: the editor takes the disk's text (returned) and drops its
   * own. The draft is kept in browser storage first, in case this was a mistake.
   */
  reloadFromDisk(): { text: string; revision: string } | undefined {
    if (this.current.kind !== "conflict") return undefined;
    const { diskText, diskRevision } = this.current;
    if (diskText === null || diskRevision === null) return undefined;
    this.stash(this.options.currentText());
    this.revision = diskRevision;
    this.savedText = diskText;
    this.set({ kind: "saved", at: this.now() });
    return { text: diskText, revision: diskRevision };
  }

  /**
   * After a conflict: writes the editor's text as a new file beside the study (the
   * server picks the name) and continues editing that copy; the changed file is
   * left as it is. Returns the copy's path, or undefined when the copy failed (the
   * status then says why and the conflict stays).
   */
  async keepBoth(): Promise<string | undefined> {
    if (this.current.kind !== "conflict") return undefined;
    const conflict = this.current;
    const text = this.options.currentText();
    try {
      const copy = await this.options.server.copyStudy(this.path, text);
      const stored = copy.revision === undefined ? await this.options.server.readStudy(copy.path) : { revision: copy.revision, text };
      dropDraft(this.storage(), this.path);
      this.path = copy.path;
      this.revision = stored.revision;
      this.savedText = text;
      this.set({ kind: "saved", at: this.now() });
      return copy.path;
    } catch (error) {
      const kept = this.stash(text);
      // The disk still differs: the choice stays open, with what went wrong.
      this.set({ ...conflict, problem: `could not save a copy: ${messageOf(error)}${kept ? "; your version is kept in this browser" : ""}` });
      return undefined;
    }
  }

  /**
   * After a conflict: writes the editor's text over the file anyway (or again, when
   * it was deleted). The server keeps the replaced file as NAME.couplet.json.previous.
   */
  async overwrite(): Promise<void> {
    if (this.current.kind !== "conflict") return;
    const conflict = this.current;
    const text = this.options.currentText();
    try {
      const outcome = await this.options.server.writeStudy(this.path, text, conflict.diskRevision);
      if (outcome.kind === "saved") {
        this.revision = outcome.revision;
        this.savedText = outcome.text ?? text;
        this.canonical = outcome.text;
        dropDraft(this.storage(), this.path);
        this.set({ kind: "saved", at: this.now() });
      } else if (outcome.kind === "conflict") {
        this.set({ kind: "conflict", diskText: outcome.currentText, diskRevision: outcome.currentRevision, problem: "the file changed again meanwhile" });
      } else {
        this.set({ ...conflict, problem: `the server refused the study (${outcome.issues[0]?.message ?? "no reason given"})` });
      }
    } catch (error) {
      this.set({ ...conflict, problem: `could not write: ${messageOf(error)}` });
    }
  }

  /** Stops any scheduled autosave (when the page closes or the study is replaced). */
  dispose(): void {
    this.cancelTimer();
  }

  private async write(): Promise<void> {
    const text = this.options.currentText();
    if (text === this.savedText) {
      this.set({ kind: "saved", at: this.now() });
      return;
    }
    this.set({ kind: "saving" });
    let outcome;
    try {
      outcome = await this.options.server.writeStudy(this.path, text, this.revision);
    } catch (error) {
      const kept = this.stash(text);
      this.set({ kind: "unwritten", reason: messageOf(error), draftKept: kept });
      return;
    }
    switch (outcome.kind) {
      case "saved":
        this.revision = outcome.revision;
        this.savedText = outcome.text ?? text;
        this.canonical = outcome.text;
        dropDraft(this.storage(), this.path);
        // Edited again while writing: the next autosave picks that up.
        if (this.options.currentText() !== text) {
          this.set({ kind: "pending" });
          this.edited();
        } else this.set({ kind: "saved", at: this.now() });
        return;
      case "conflict":
        this.stash(text);
        this.set({ kind: "conflict", diskText: outcome.currentText, diskRevision: outcome.currentRevision });
        return;
      case "invalid": {
        const kept = this.stash(text);
        const first = outcome.issues[0];
        this.set({ kind: "unwritten", reason: `the server refused the study${first ? ` (${first.path}: ${first.message})` : ""}`, draftKept: kept });
        return;
      }
    }
  }

  private storage(): KeyValueStorage {
    return this.options.storage ?? NO_STORAGE;
  }

  /** Keeps the text as a draft; false when there is no storage or it refused. */
  private stash(text: string): boolean {
    if (!this.options.storage) return false;
    const draft: Draft = { text, baseRevision: this.revision, keptAt: this.now() };
    return keepDraft(this.options.storage, this.path, draft);
  }

  private cancelTimer(): void {
    if (this.timer !== null) this.clearTimer(this.timer);
    this.timer = null;
  }

  private set(status: SaveStatus): void {
    this.current = status;
    this.options.onStatus?.(status);
  }
}

const NO_STORAGE: KeyValueStorage = { getItem: () => null, setItem: () => {}, removeItem: () => {} };

function messageOf(error: unknown): string {
  if (error instanceof ServerUnreachableError) return error.message;
  return error instanceof Error ? error.message : String(error);
}
