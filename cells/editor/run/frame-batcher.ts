/**
 * Collects updates keyed by id and hands the latest of each to `flush` once per
 * animation frame. The engine may report a running solve dozens of times a
 * second; the page redraws at most once a frame, and only the newest state of
 * each cell matters.
 */
export class FrameBatcher<T> {
  private pending = new Map<string, T>();
  private scheduled = false;
  private readonly flush: (updates: ReadonlyMap<string, T>) => void;
  private readonly schedule: (run: () => void) => void;

  /**
   * `schedule` defaults to requestAnimationFrame (a timeout of 16 ms where there
   * is none, e.g. a hidden tab that stopped frames would still flush on its next one).
   */
  constructor(flush: (updates: ReadonlyMap<string, T>) => void, schedule?: (run: () => void) => void) {
    this.flush = flush;
    this.schedule =
      schedule ??
      ((run) => {
        if (typeof requestAnimationFrame === "function") requestAnimationFrame(() => run());
        else setTimeout(run, 16);
      });
  }

  /** Records the newest update of `id`. */
  push(id: string, update: T): void {
    this.pending.set(id, update);
    if (this.scheduled) return;
    this.scheduled = true;
    this.schedule(() => this.run());
  }

  /** Flushes now (e.g. before an export reads the states). */
  flushNow(): void {
    if (this.pending.size > 0) this.run();
  }

  private run(): void {
    this.scheduled = false;
    const updates = this.pending;
    this.pending = new Map();
    if (updates.size > 0) this.flush(updates);
  }
}
