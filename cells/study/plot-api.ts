import * as Plot from "@observablehq/plot";

type PlotOptions = Plot.PlotOptions;

/** `Plot.plot` in a study: keeps the options instead of drawing them. */
function keepOptions(options: PlotOptions = {}): PlotOptions {
  return { ...options };
}

/** A mark's (or mark list's) `.plot(options)`, kept as options with the mark appended, as Plot's own does before drawing. */
function deferPlot(out: unknown): unknown {
  if (out instanceof Plot.Mark || (Array.isArray(out) && typeof (out as { plot?: unknown }).plot === "function")) {
    Object.defineProperty(out, "plot", {
      configurable: true,
      writable: true,
      value: ({ marks = [], ...options }: PlotOptions = {}) => ({ ...options, marks: [...(marks as unknown[]), out] }),
    });
  }
  return out;
}

/**
 * `@observablehq/plot` as code cells and code figures see it (the global `Plot`):
 * every export as it is, except that `Plot.plot(options)` and `mark.plot(options)`
 * return the Plot options instead of drawing them. A figure is data until a view
 * draws it — live DOM in the editor, SVG in a report (cells/views/render-svg.ts) —
 * so the same code works headless, where there is no document to draw in.
 * Mark factories (lower-case exports such as `Plot.dot`) are wrapped so their
 * marks get the deferred `.plot`; classes and other values are passed through.
 * A fresh object per call: a study cannot change another study's Plot.
 */
export function studyPlot(): typeof Plot {
  const api: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(Plot)) {
    api[key] =
      typeof value === "function" && /^[a-z]/.test(key)
        ? function (this: unknown, ...args: unknown[]) {
            return deferPlot((value as (...a: unknown[]) => unknown).apply(this, args));
          }
        : value;
  }
  api.plot = keepOptions;
  return Object.freeze(api) as unknown as typeof Plot;
}
