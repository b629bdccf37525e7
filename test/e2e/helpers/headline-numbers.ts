// Reading numbers back from what the page shows: the editor writes them with a
// Unicode minus and exponents as "9.8e−8" (cells/views/figures/format-number.ts).

/**
 * The number right after the first `label` in `text`, or NaN when there is none:
 * in "UOT_ε = 2.615 (unbalanced, ε = 0.148, mass 0.7145, converged, 212 it)",
 * `", ε = "` gives 0.148 and `"UOT_ε = "` gives 2.615.
 */
export function numberAfter(text: string, label: string): number {
  const at = text.indexOf(label);
  if (at < 0) return Number.NaN;
  const match = /^[−-]?\d+(\.\d+)?(e[−+-]?\d+)?/.exec(text.slice(at + label.length));
  return match ? Number(match[0].replace(/−/g, "-")) : Number.NaN;
}

/** |a − b| ≤ rel·|b|: equal to the digits a page shows (`rel` 5e-4 for 4 significant digits). */
export function closeTo(a: number, b: number, rel: number): boolean {
  return Math.abs(a - b) <= rel * Math.abs(b);
}
