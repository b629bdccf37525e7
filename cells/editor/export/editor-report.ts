import type { CellOf, StudyDocument } from "../../document";
import { studySeed } from "../../document";
import { describeCell } from "../../kinds/registry";
import type { CellOutcome } from "../../study/cell-outcome";
import { causeInWords } from "../../study/cause-in-words";
import { describeControl } from "../../study/parameter-overrides";
import { RECEIPT_KINDS, createReceipt } from "../../study/receipts";
import { type ReportableRun, studyReportModel } from "../../study/report-model";
import { renderReport } from "../../views/report/render-report";
import { WARM_START_NOTE } from "../run/warm-start-note";
import type { EditorCellState } from "../run/status-words";

/**
 * The page's run as the headless run describes one (cells/study/run-study.ts): one
 * outcome per cell from its state in the editor — done cells with their value,
 * headline, cautions and a fresh receipt (data, transport, sweep); failed cells
 * with message and cause; held cells (code not run, or waiting on such a cell) as
 * held; cells still computing as held with that reason — and the parameter values
 * as set at the desk. Transports the editor warm-started while tuning carry a
 * caution saying so (their iteration counts are not cold counts).
 */
export function editorRun(
  study: StudyDocument,
  stateOf: (id: string) => EditorCellState,
  options: { recordedAt: string; seconds?: number; warmStarted?: (id: string) => boolean },
): ReportableRun {
  const valuesByName = new Map<string, unknown>();
  for (const cell of study.cells) {
    const state = stateOf(cell.id);
    if (cell.name !== undefined && state.status === "done") valuesByName.set(cell.name, state.value);
  }
  const outcomes: CellOutcome[] = study.cells.map((cell) => {
    const base = { cellId: cell.id, kind: cell.kind, ...(cell.name === undefined ? {} : { name: cell.name }) };
    const state = stateOf(cell.id);
    switch (state.status) {
      case "waiting":
      case "running":
        return { ...base, status: "held", error: { message: "still computing when the report was written", cause: "not finished" }, seconds: 0, cautions: [] };
      case "held":
        return { ...base, status: "held", error: { message: state.reason, cause: "code held" }, seconds: 0, cautions: [] };
      case "failed":
        return { ...base, status: "failed", error: { message: state.message, cause: causeInWords(state.cause, study) }, seconds: 0, cautions: [] };
      case "done": {
        let headline: string | undefined;
        let cautions: readonly string[] = [];
        try {
          ({ headline, cautions } = describeCell(cell, state.value));
        } catch {
          // A description is a courtesy: the value still counts as done.
        }
        if (options.warmStarted?.(cell.id)) cautions = [...cautions, WARM_START_NOTE];
        const receipt = RECEIPT_KINDS.includes(cell.kind)
          ? createReceipt(cell, state.value, { valuesByName, studySeed: studySeed(study), seconds: state.seconds, recordedAt: options.recordedAt })
          : undefined;
        return { ...base, status: "done", value: state.value, seconds: state.seconds, ...(headline === undefined ? {} : { headline }), cautions: [...cautions], ...(receipt ? { receipt } : {}) };
      }
    }
  });
  const parameters = study.cells
    .filter((c): c is CellOf<"parameter"> => c.kind === "parameter")
    .map((c) => ({ name: c.name ?? c.id, value: c.settings.value, control: describeControl(c.settings) }));
  return { study, outcomes, seconds: options.seconds ?? 0, parameters };
}

/**
 * The same self-contained HTML report as `couplet run --report` (one file, no
 * scripts, no requests), drawn from the page's current results.
 */
export function editorReportHtml(study: StudyDocument, stateOf: (id: string) => EditorCellState, generatedAt: string, warmStarted?: (id: string) => boolean): string {
  const run = editorRun(study, stateOf, { recordedAt: generatedAt, ...(warmStarted ? { warmStarted } : {}) });
  return renderReport(studyReportModel(run, { generatedAt }));
}
