/*
 * Small readers for figure specs in tests: find a mark by the description our figure
 * functions give it, and read its data. Plot marks keep `ariaDescription` and `data`
 * as plain properties (Plot 0.6.17 source, src/style.js and src/mark.js).
 */
import type { FigureSpec } from "../../../../cells/views/figures/figure-spec";
import { afterEach, beforeEach, expect, vi } from "vitest";

export interface MarkView {
  readonly ariaDescription?: string;
  readonly data?: ArrayLike<unknown> & Iterable<unknown>;
}

export function marksOf(spec: FigureSpec<object>): MarkView[] {
  return (spec.options.marks ?? []).flat(Infinity as 1) as unknown as MarkView[];
}

export function markNamed(spec: FigureSpec<object>, description: string): MarkView {
  const mark = marksOf(spec).find((m) => m.ariaDescription === description);
  if (!mark) throw new Error(`no mark described as ${JSON.stringify(description)}; have ${marksOf(spec).map((m) => m.ariaDescription).join(", ")}`);
  return mark;
}

export function dataOf<T = Record<string, unknown>>(mark: MarkView): T[] {
  return Array.from((mark.data ?? []) as Iterable<T>);
}

/** Rounds every decimal number in a string to `digits` decimals (Plot's snapshot tests do the same before comparing). */
export function roundNumbers(text: string, digits = 1): string {
  return text.replace(/-?\d+\.\d+/g, (n) => String(Number(Number(n).toFixed(digits))));
}

/**
 * Registers hooks that fail the test when Plot warns: Plot reports problems through
 * console.warn, and no figure test expects one (STYLE.md: tests that expect no
 * warning assert none).
 */
export function failOnPlotWarnings(): void {
  let warn: ReturnType<typeof vi.spyOn>;
  beforeEach(() => {
    warn = vi.spyOn(console, "warn").mockImplementation(() => {});
  });
  afterEach(() => {
    expect(warn).not.toHaveBeenCalled();
    warn.mockRestore();
  });
}
