import type { StudyDocument } from "../../document";
import type { Draft } from "../save/draft-store";
import type { SaveStatus } from "../save/save-controller";
import type { Notice } from "./notices";

/** What the save notices' buttons do. */
export interface SaveNoticeActions {
  retry(): void;
  download(): void;
  reload(): void;
  keepBoth(): void;
  overwrite(): void;
}

/**
 * The notice for a save status that needs the user: a write that failed (with
 * whether a draft is kept) or a file changed or deleted on disk (with the three
 * ways out). Undefined for the statuses the masthead alone reports.
 */
export function saveNotice(status: SaveStatus, act: SaveNoticeActions): Notice | undefined {
  if (status.kind === "unwritten") {
    return {
      key: "unwritten",
      tone: "failure",
      title: status.draftKept ? "Not saved to disk — your work is kept in this browser." : "Not saved — and this browser could not keep a copy either.",
      text: `${status.reason}. ${status.draftKept ? "The draft stays here until a save succeeds; it is offered again if you reopen the study." : "Keep this page open, or download the study file."}`,
      actions: [
        { label: "Try again", primary: true, testid: "retry-save", run: act.retry },
        { label: "Download the study file", run: act.download },
      ],
    };
  }
  if (status.kind === "conflict") {
    const deleted = status.diskText === null;
    return {
      key: "conflict",
      tone: "failure",
      title: deleted ? "The study file was deleted from the disk since you opened it." : "The study file changed on disk since you opened it (another program or window wrote it).",
      text: `${status.problem ? `${status.problem}. ` : ""}Autosave is paused until you choose. Your version is kept in this browser meanwhile.`,
      actions: [
        ...(deleted ? [] : [{ label: "Reload from disk (drop my changes)", testid: "conflict-reload", run: act.reload }]),
        { label: "Keep both (save mine as a copy)", primary: true, testid: "conflict-keep-both", run: act.keepBoth },
        { label: deleted ? "Write mine there again" : "Replace the file with mine", testid: "conflict-overwrite", run: act.overwrite },
      ],
    };
  }
  return undefined;
}

/** Code cells and figures drawn by code: what a study that is not trusted holds. */
export function codeCellsOf(study: StudyDocument): StudyDocument["cells"] {
  return study.cells.filter((c) => c.kind === "code" || (c.kind === "figure" && (c.settings as { view?: string }).view === "code"));
}

/**
 * The notice of held code: which cells, why they did not run, and the two
 * choices (run it in this page, or always for this study). Undefined when the
 * study has no code.
 */
export function trustNotice(study: StudyDocument, act: { runOnce(): void; always(): void }): Notice | undefined {
  const codeCells = codeCellsOf(study);
  if (codeCells.length === 0) return undefined;
  const names = codeCells.map((c) => c.name ?? c.id).slice(0, 4).join(", ");
  return {
    key: "trust",
    tone: "caution",
    title: `${codeCells.length === 1 ? "One code cell is" : `${codeCells.length} code cells are`} held, not run.`,
    text:
      `This study is not on your trust list, so its JavaScript (${names}${codeCells.length > 4 ? ", …" : ""}) has not run: ` +
      "code from a study you did not write runs with this page's access to your study files. Read the code in the cells below first. " +
      "Everything else (data, transport, sweeps, ready figures) runs as usual.",
    actions: [
      { label: "Run the code this time", testid: "run-code-once", run: act.runOnce },
      { label: "Always run this study's code", primary: true, testid: "trust-study", run: act.always },
    ],
  };
}

/** The offer of a draft this browser kept from an earlier visit. */
export function draftNotice(draft: Draft, revisionOnDisk: string, act: { restore(): void; discard(): void }): Notice {
  const when = draft.keptAt ? new Date(draft.keptAt).toLocaleString() : "an earlier visit";
  return {
    key: "draft",
    tone: "caution",
    title: `This browser kept unsaved work on this study (${when}).`,
    text:
      draft.baseRevision === revisionOnDisk
        ? "It was not written to disk. Restore it to continue from there."
        : "The file on disk has changed since, so restoring replaces what is on disk at the next save.",
    actions: [
      { label: "Restore the draft", primary: true, testid: "restore-draft", run: act.restore },
      { label: "Discard it", testid: "discard-draft", run: act.discard },
    ],
  };
}
