/**
 * Drafts kept in the browser when a study cannot be written to disk (server
 * gone, disk full, permission refused): the editor's text and the revision it
 * was based on, so that nothing typed is lost and the next visit can offer it.
 */

/** One kept draft. */
export interface Draft {
  /** The study text (canonical JSON, as serializeStudy writes it). */
  readonly text: string;
  /** The revision on disk the draft started from ("" when unknown). */
  readonly baseRevision: string;
  /** When it was kept, ms since the Unix epoch. */
  readonly keptAt: number;
}

/** The part of the Web Storage API the store uses (localStorage in the page). */
export interface KeyValueStorage {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
  removeItem(key: string): void;
}

const PREFIX = "couplet.draft:";

/** The storage key of the draft of `studyPath`. */
export function draftKey(studyPath: string): string {
  return `${PREFIX}${studyPath}`;
}

/**
 * Keeps `draft` for `studyPath`. Returns false when the storage refused it (quota,
 * private mode): the caller then tells the user that the draft is not kept either.
 */
export function keepDraft(storage: KeyValueStorage, studyPath: string, draft: Draft): boolean {
  try {
    storage.setItem(draftKey(studyPath), JSON.stringify(draft));
    return true;
  } catch {
    return false;
  }
}

/** The draft kept for `studyPath`, or undefined (none, or unreadable). */
export function readDraft(storage: KeyValueStorage, studyPath: string): Draft | undefined {
  let raw: string | null;
  try {
    raw = storage.getItem(draftKey(studyPath));
  } catch {
    return undefined;
  }
  if (raw === null) return undefined;
  try {
    const value = JSON.parse(raw) as Partial<Draft>;
    if (typeof value.text !== "string") return undefined;
    return { text: value.text, baseRevision: typeof value.baseRevision === "string" ? value.baseRevision : "", keptAt: typeof value.keptAt === "number" ? value.keptAt : 0 };
  } catch {
    return undefined;
  }
}

/** Forgets the draft of `studyPath` (after it reached the disk). */
export function dropDraft(storage: KeyValueStorage, studyPath: string): void {
  try {
    storage.removeItem(draftKey(studyPath));
  } catch {
    // Nothing to do: a storage that cannot remove cannot have kept much either.
  }
}
