import type { CellState, FailureCause } from "../../runtime";
import { formatNumber } from "../../views/figures/format-number";

/**
 * How a cell stands, as the editor shows it: the engine's state, plus `held` for
 * code the user has not yet agreed to run (a study that is not trusted).
 */
export type EditorCellState = CellState | { readonly status: "held"; readonly reason: string };

/** A short tone for styling: quiet (queued/held), busy, good, bad. */
export type StatusTone = "quiet" | "busy" | "good" | "bad";

/** What the state line of a cell says. */
export interface StatusWords {
  /** One line, e.g. "solving — iteration 240, marginal error 3.1e-5". */
  readonly text: string;
  readonly tone: StatusTone;
}

/** What a running cell is doing, by kind: the verb before any progress. */
const BUSY_VERB: Readonly<Record<string, string>> = {
  transport: "solving",
  sweep: "sweeping",
  data: "preparing points",
  figure: "drawing",
  prose: "writing",
  code: "running",
  table: "gathering rows",
  parameter: "reading",
};

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null;
}

/** Small numbers as "3.1e-5", others with 3 significant digits. */
function shortNumber(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (x !== 0 && (Math.abs(x) < 1e-3 || Math.abs(x) >= 1e6)) return x.toExponential(1).replace("e-", "e-").replace("e+", "e");
  return formatNumber(x, 3);
}

/**
 * Progress reports in words. Understands the core's SolveProgress
 * (`iteration`, `marginalError`, `epsilon`), a sweep's (`run`/`done` and
 * `of`/`total`), a fraction (`fraction` in [0, 1]) and a free `message`.
 */
export function progressWords(progress: unknown): string {
  if (!isRecord(progress)) return "";
  const parts: string[] = [];
  const done = typeof progress.run === "number" ? progress.run : typeof progress.done === "number" ? progress.done : undefined;
  const total = typeof progress.of === "number" ? progress.of : typeof progress.total === "number" ? progress.total : undefined;
  if (done !== undefined && total !== undefined) parts.push(`run ${done} of ${total}`);
  if (typeof progress.iteration === "number") parts.push(`iteration ${progress.iteration}`);
  if (typeof progress.marginalError === "number") parts.push(`marginal error ${shortNumber(progress.marginalError)}`);
  if (typeof progress.epsilon === "number") parts.push(`ε ${shortNumber(progress.epsilon)}`);
  if (typeof progress.fraction === "number" && parts.length === 0) parts.push(`${Math.round(progress.fraction * 100)} %`);
  if (typeof progress.message === "string" && progress.message) parts.push(progress.message);
  return parts.join(", ");
}

/** Why a cell failed, in a few words (the part in parentheses). */
export function causeWords(cause: FailureCause): string {
  switch (cause.kind) {
    case "own-error":
      return "error in this cell";
    case "upstream":
      return `because ${cause.name ?? cause.cellId ?? "an input"} failed`;
    case "cycle":
      return "the cells refer to each other in a circle";
    case "unknown-name":
      return `no cell is named ${cause.name ?? "that"}`;
    case "duplicate-name":
      return `two cells share the name ${cause.name ?? ""}`.trim();
  }
}

/** Durations on the state line: "12 ms", "0.41 s", "3.2 s", "2 min 05 s". */
export function durationWords(seconds: number): string {
  if (!(seconds >= 0) || !Number.isFinite(seconds)) return "";
  if (seconds < 0.1) return `${Math.max(1, Math.round(seconds * 1000))} ms`;
  if (seconds < 10) return `${seconds.toFixed(2)} s`;
  if (seconds < 60) return `${seconds.toFixed(1)} s`;
  const total = Math.round(seconds);
  return `${Math.floor(total / 60)} min ${String(total % 60).padStart(2, "0")} s`;
}

/**
 * The state line of a cell of `kind`:
 * queued · solving — iteration 240, marginal error 3.1e-5 · ready · 0.41 s ·
 * failed: message (cause) · held: reason.
 */
export function statusWords(kind: string, state: EditorCellState): StatusWords {
  switch (state.status) {
    case "waiting":
      return { text: "queued", tone: "quiet" };
    case "running": {
      const verb = BUSY_VERB[kind] ?? "working";
      const detail = progressWords(state.progress);
      return { text: detail ? `${verb} — ${detail}` : `${verb}…`, tone: "busy" };
    }
    case "done": {
      const time = durationWords(state.seconds);
      return { text: time && kind !== "parameter" && kind !== "prose" ? `ready · ${time}` : "ready", tone: "good" };
    }
    case "failed": {
      const message = state.message.split("\n")[0];
      const cause = causeWords(state.cause);
      return { text: `failed: ${message}${message.includes(cause) ? "" : ` (${cause})`}`, tone: "bad" };
    }
    case "held":
      return { text: `held: ${state.reason}`, tone: "quiet" };
  }
}
