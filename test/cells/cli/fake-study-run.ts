/*
 * A stand-in for the headless study run (cells/study/run-study.ts) for the command
 * tests that need failures and receipts on demand: every cell "computes" instantly
 * from its settings. Transports solve a fixed three-point problem whose exact value
 * is known (W1([0, 1, 3], [5, 6, 8]) = 5, the scipy.stats.wasserstein_distance
 * docstring example). A cell named `broken` fails; code cells are held when
 * `runCode` is false.
 */
import { pointMeasure } from "../../../core/measure";
import { solveTransport } from "../../../core/solve";
import type { StudyDocument } from "../../../cells/document";
import { fnv1a32 } from "../../../cells/document/seed";
import type { StudyRunner } from "../../../cells/cli/run-command";
import type { ReportableOutcome } from "../../../cells/study/report-model";
import { couplingLinesFigure } from "../../../cells/views/figures/coupling-lines";

const source = pointMeasure([[0], [1], [3]]);
const target = pointMeasure([[5], [6], [8]]);

/** Options of {@link fakeStudyRunner}. */
export interface FakeRunOptions {
  /** Added to every transport's cost, to simulate a drifting solver. Default 0. */
  readonly drift?: number;
}

export function fakeStudyRunner(fake: FakeRunOptions = {}): StudyRunner & { calls: Array<{ study: StudyDocument; options: unknown }> } {
  const calls: Array<{ study: StudyDocument; options: unknown }> = [];
  const runner = async (study: StudyDocument, options: Parameters<StudyRunner>[1] = {}) => {
    calls.push({ study, options });
    const overrides = options.overrides ?? {};
    const when = (options.now ?? (() => new Date("2026-12-01T09:30:00Z")))().toISOString();
    const outcomes: ReportableOutcome[] = [];
    const parameters: Array<{ name: string; value: unknown; control: string }> = [];
    const failed = new Set<string>();
    for (const cell of study.cells) {
      const base = { cellId: cell.id, kind: cell.kind, ...(cell.name ? { name: cell.name } : {}), seconds: 0.001, cautions: [] as string[] };
      options.onProgress?.({ cellId: cell.id, name: cell.name, state: { status: "running", since: 0, progress: { iteration: 1, marginalError: 0.5 } } });
      const receiptOf = (summary: Record<string, unknown>) => ({
        fingerprint: `fake:${fnv1a32(JSON.stringify({ settings: cell.settings, overrides }))}`,
        settings: cell.settings as Record<string, unknown>,
        coreVersion: "0.1.0",
        summary,
        seconds: 0.001,
        recordedAt: when,
      });
      if (cell.name === "broken") {
        failed.add(cell.name);
        outcomes.push({ ...base, status: "failed", error: { message: "broken on purpose", cause: "own-error" } });
        options.onProgress?.({ cellId: cell.id, name: cell.name, state: { status: "failed", error: new Error("broken on purpose"), message: "broken on purpose", cause: { kind: "own-error" } } });
        continue;
      }
      switch (cell.kind) {
        case "parameter": {
          const value = cell.name !== undefined && Object.hasOwn(overrides, cell.name) ? overrides[cell.name] : cell.settings.value;
          parameters.push({ name: cell.name!, value, control: cell.settings.control });
          outcomes.push({ ...base, status: "done", value });
          break;
        }
        case "prose":
          outcomes.push({ ...base, status: "done", value: { html: `<p>prose of ${cell.id}</p>` } });
          break;
        case "data":
          outcomes.push({ ...base, status: "done", value: source, headline: "3 points in 1-D", receipt: receiptOf({ n: 3 }) });
          break;
        case "transport": {
          const result = solveTransport(source, target, { kind: "euclidean" }, { method: "exact" });
          const cost = result.values.cost + (fake.drift ?? 0);
          outcomes.push({ ...base, status: "done", value: { result, source, target }, headline: `cost ${cost}`, receipt: receiptOf({ cost, status: "converged" }) });
          break;
        }
        case "figure": {
          const result = solveTransport(source, target, { kind: "euclidean" }, { method: "exact" });
          outcomes.push({ ...base, status: "done", value: couplingLinesFigure({ source, target, plan: result.plan!, title: "fake lines" }) });
          break;
        }
        case "code":
          if (options.runCode === false) outcomes.push({ ...base, status: "held", seconds: 0, error: { message: "code cells are held", cause: "held" } });
          else outcomes.push({ ...base, status: "done", value: 42 });
          break;
        default:
          outcomes.push({ ...base, status: "done", value: { columns: ["x"], rows: [{ x: 1 }] } });
      }
      const last = outcomes[outcomes.length - 1];
      if (last.status === "done") options.onProgress?.({ cellId: cell.id, name: cell.name, state: { status: "done", value: last.value, seconds: 0.001, runs: 1 } });
    }
    return { study, outcomes, seconds: 0.01, parameters } as unknown as Awaited<ReturnType<StudyRunner>>;
  };
  return Object.assign(runner, { calls });
}
