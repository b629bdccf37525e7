/** A growable log of (iteration, marginal error) pairs, read out as the typed arrays of Diagnostics. */
export interface IterationHistory {
  push(iteration: number, error: number): void;
  /** Copies of the entries so far: errors and their iteration numbers. */
  read(): { history: Float64Array; historyIterations: Int32Array };
}

/** An empty {@link IterationHistory} (doubling buffers, amortised O(1) per push). */
export function iterationHistory(): IterationHistory {
  let errors = new Float64Array(64);
  let at = new Int32Array(64);
  let length = 0;
  return {
    push(iteration, error) {
      if (length === errors.length) {
        const e = new Float64Array(2 * length);
        e.set(errors);
        errors = e;
        const t = new Int32Array(2 * length);
        t.set(at);
        at = t;
      }
      errors[length] = error;
      at[length] = iteration;
      length++;
    },
    read: () => ({ history: errors.slice(0, length), historyIterations: at.slice(0, length) }),
  };
}
