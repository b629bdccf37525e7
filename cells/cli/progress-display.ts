import type { CellState } from "../runtime/cell-definition";

/** One state change of a cell during a headless run, as the study run reports it. */
export interface ProgressEvent {
  readonly cellId: string;
  readonly name?: string;
  readonly state: CellState;
}

/** Options of {@link createProgressDisplay}. */
export interface ProgressDisplayOptions {
  /** Where the display writes (the command's stderr). */
  readonly write: (text: string) => void;
  /**
   * true: one status line redrawn in place with a carriage return (a terminal);
   * false: one plain line per finished cell and no control characters (logs, CI).
   */
  readonly live: boolean;
  /** The cells of the study, for labels ("plan (transport)") and the count of cells. */
  readonly cells: ReadonlyArray<{ readonly id: string; readonly kind: string; readonly name?: string }>;
  /** Width of the terminal in characters; the live line is cut to fit. Default (and below 20) 80. */
  readonly columns?: number;
  /** Clock in milliseconds. Default Date.now. */
  readonly now?: () => number;
  /** Least time between two redraws of the live line, in ms. Default 100 (at most ~10 redraws a second). */
  readonly interval?: number;
}

/** A progress display fed with state changes; `close` before printing anything else. */
export interface ProgressDisplay {
  update(event: ProgressEvent): void;
  /** Stops redrawing and clears the live line. Safe to call twice. */
  close(): void;
}

interface Running {
  readonly label: string;
  progress?: unknown;
  /** The latest progressive value (a sweep's table so far). */
  value?: unknown;
  since: number;
  touched: number;
}

/** "plan (transport)", or the id for an unnamed cell: "f1 (figure)". */
export function cellLabel(cell: { readonly id: string; readonly kind: string; readonly name?: string }): string {
  return `${cell.name ?? cell.id} (${cell.kind})`;
}

/** A short number for a status line: 4 significant digits, scientific when small or large. */
function short(value: number): string {
  if (value === 0 || !Number.isFinite(value)) return String(value);
  const abs = Math.abs(value);
  return abs >= 1e-3 && abs < 1e5 ? String(Number(value.toPrecision(4))) : value.toExponential(2);
}

/**
 * Words for a running cell's latest progress report. Solves report
 * `{iteration, marginalError, epsilon}`, sweeps `{run, of}`; other computations
 * may report `{done, total}`. Anything else shows nothing.
 */
export function describeProgress(progress: unknown): string[] {
  if (typeof progress !== "object" || progress === null) return [];
  const p = progress as Record<string, unknown>;
  const words: string[] = [];
  if (typeof p.done === "number" && typeof p.total === "number") words.push(`${p.done} of ${p.total}`);
  if (typeof p.run === "number" && typeof p.of === "number") words.push(`run ${p.run} of ${p.of}`);
  if (typeof p.iteration === "number") words.push(`iteration ${p.iteration}`);
  if (typeof p.marginalError === "number") words.push(`marginal error ${short(p.marginalError)}`);
  if (typeof p.epsilon === "number") words.push(`epsilon ${short(p.epsilon)}`);
  return words;
}

/** Text on one line with no control characters (a log must not get escape codes from a message). */
export function oneLine(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u001f\u007f-\u009f]+/g, " ").replace(/ {2,}/g, " ").trim();
}

/** Words for a progressive value: a sweep's table so far (`rows` of `planned` runs). */
function describePartialValue(value: unknown): string[] {
  if (typeof value !== "object" || value === null) return [];
  const v = value as { rows?: unknown; planned?: unknown };
  return Array.isArray(v.rows) && typeof v.planned === "number" ? [`run ${v.rows.length} of ${v.planned}`] : [];
}

function seconds(ms: number): string {
  return `${(Math.max(0, ms) / 1000).toFixed(2)} s`;
}

/**
 * Shows how a headless study run is going, on stderr.
 *
 * Live (a terminal): one line, `[3/9] running plan (transport) · iteration 340 ·
 * marginal error 2.1e-5 · 1.20 s` (cells finished / cells), redrawn in place with "\r" and
 * erase-to-end-of-line, at most once per `interval` (the latest state wins; a
 * timer draws the last change of a burst). Cut to the terminal width so it never wraps.
 *
 * Plain (a log): one line per cell when it finishes, `[3/9] plan (transport) done in
 * 0.18 s` or `[4/9] f1 (figure) failed: …`, with no carriage returns or escape codes.
 */
export function createProgressDisplay(options: ProgressDisplayOptions): ProgressDisplay {
  const { write, live, cells, now = Date.now, interval = 100 } = options;
  // A terminal that reports no usable width (0, as some pseudo-terminals do) gets the classic 80.
  const columns = options.columns !== undefined && options.columns >= 20 ? options.columns : 80;
  const labels = new Map(cells.map((c) => [c.id, cellLabel(c)]));
  const total = cells.length;
  const finished = new Set<string>();
  const running = new Map<string, Running>();
  let lastDraw = -Infinity;
  let drawn = false;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let closed = false;

  const labelOf = (event: ProgressEvent) => labels.get(event.cellId) ?? (event.name ? `${event.name}` : event.cellId);

  function line(): string {
    const count = `[${finished.size}/${total}]`;
    let current: Running | undefined;
    for (const r of running.values()) if (!current || r.touched >= current.touched) current = r;
    if (!current) return `${count} finished`;
    const more = running.size > 1 ? [`+${running.size - 1} more running`] : [];
    const words = describeProgress(current.progress);
    if (words.length === 0) words.push(...describePartialValue(current.value));
    const text = `${count} ${[`running ${current.label}`, ...words, seconds(now() - current.since), ...more].join(" · ")}`;
    const width = columns - 1;
    return text.length > width ? `${text.slice(0, width - 1)}…` : text;
  }

  function draw(): void {
    if (closed) return;
    timer = null;
    lastDraw = now();
    drawn = true;
    write(`\r${line()}\x1b[K`);
  }

  function schedule(): void {
    const wait = lastDraw + interval - now();
    if (wait <= 0) {
      if (timer !== null) clearTimeout(timer);
      draw();
    } else if (timer === null) {
      timer = setTimeout(draw, wait);
      // A pending redraw must not keep the process alive once the run is over.
      (timer as { unref?: () => void }).unref?.();
    }
  }

  return {
    update(event) {
      if (closed) return;
      const { state } = event;
      const label = labelOf(event);
      if (state.status === "running") {
        const r = running.get(event.cellId);
        const t = now();
        if (r) {
          r.progress = state.progress ?? r.progress;
          r.value = state.value ?? r.value;
          r.touched = t;
        } else {
          running.set(event.cellId, { label, progress: state.progress, value: state.value, since: t, touched: t });
        }
        finished.delete(event.cellId);
      } else if (state.status === "waiting") {
        running.delete(event.cellId);
        finished.delete(event.cellId);
      } else {
        running.delete(event.cellId);
        // A cell reported finished twice (a late duplicate) is counted and printed once.
        if (finished.has(event.cellId)) return;
        finished.add(event.cellId);
        if (!live) {
          const head = `[${finished.size}/${total}] ${label}`;
          if (state.status === "done") write(`${head} done in ${seconds(state.seconds * 1000)}\n`);
          else write(`${head} failed: ${oneLine(state.message)}\n`);
          return;
        }
      }
      if (live) schedule();
    },
    close() {
      if (closed) return;
      closed = true;
      if (timer !== null) clearTimeout(timer);
      timer = null;
      if (live && drawn) write("\r\x1b[K");
    },
  };
}
