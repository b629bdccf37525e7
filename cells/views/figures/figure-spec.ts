import type { PlotOptions } from "@observablehq/plot";

/** Names of the ready-made figures. */
export type FigureName = "coupling-lines" | "plan-matrix" | "convergence" | "potentials" | "sweep-curve";

/** One entry of a figure's own key (legend), drawn as HTML beside the caption. */
export interface FigureKeyEntry {
  readonly label: string;
  /** A CSS colour from the theme. */
  readonly color: string;
  /** How the swatch is drawn: a filled dot, a solid line, a dashed line or a faint band. */
  readonly shape: "dot" | "line" | "dash" | "band";
}

/**
 * What a figure-spec function returns: plain Plot options (marks and scales, no
 * document, no caption) plus the words around the picture. Build it with a pure
 * function, draw it with {@link renderSvg} (static) or `Plot.plot` (live).
 *
 * `facts` carries the numbers the caption states (e.g. lines drawn, mass share), so
 * tests and other views can read them without parsing text.
 */
export interface FigureSpec<Facts extends object = Record<string, number | string>> {
  readonly figure: FigureName;
  /** Options for `Plot.plot`; the renderer adds `document`. */
  readonly options: PlotOptions;
  /** Optional heading shown above the picture. */
  readonly title?: string;
  /** Colour key drawn by our renderer (Plot's own swatch legends are not used). */
  readonly key: readonly FigureKeyEntry[];
  /** Caption sentences, plain text, in order. */
  readonly notes: readonly string[];
  /** Cautions, plain text: the caller's first, then any the figure found itself. */
  readonly cautions: readonly string[];
  readonly facts: Facts;
}

/** Options every figure accepts. */
export interface CommonFigureOptions {
  /** Heading shown above the figure. */
  title?: string;
  /**
   * Cautions shown under the figure in the caution style, e.g.
   * "regularised value: not a distance" or "not converged after 5000 iterations".
   */
  cautions?: readonly string[];
  /** Outer width in CSS pixels. Default {@link FIGURE_WIDTH} from the theme. */
  width?: number;
}

/** Type guard: a {@link FigureSpec} rather than bare Plot options. */
export function isFigureSpec(value: unknown): value is FigureSpec<object> {
  return typeof value === "object" && value !== null && "figure" in value && "options" in value && "notes" in value;
}
