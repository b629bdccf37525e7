/**
 * Couplet's look: one restrained palette and system font stacks, shared by the
 * figures (through Plot options) and the static report (through its CSS).
 *
 * Why system fonts only: the report must open offline and make no requests, so no
 * web font is loaded; each stack falls back to what every platform ships.
 * Why hand-picked ramps instead of a library scheme: quantized colour scales need a
 * short list of discrete colours anyway, and a fixed list keeps output identical
 * across library versions.
 */

/** Body text colour (near-black with a slight cool cast). */
export const INK = "#1f2429";
/** Secondary text: axis labels, captions, metadata. */
export const MUTED = "#5c6670";
/** Page background: warm off-white, prints as white. */
export const PAPER = "#fbfaf7";
/** Hairlines and table rules. */
export const RULE = "#dedad0";

/** Colour of the source measure in every figure (deep lake blue). */
export const SOURCE_COLOR = "#2b6a8c";
/** Colour of the target measure in every figure (terracotta). */
export const TARGET_COLOR = "#bf5a2e";
/** Colour of coupling segments (graphite; strength is carried by opacity and width). */
export const LINK_COLOR = "#3d4248";

/**
 * Categorical colours for series (convergence curves, sweep series), in order.
 * Chosen to stay distinct in greyscale print by alternating dark and mid tones.
 */
export const SERIES_COLORS: readonly string[] = ["#2b6a8c", "#bf5a2e", "#5a8a3c", "#7b4f8e", "#a8841c", "#3f7d78", "#8c3b4a", "#55606b"];

/**
 * Sequential ramp for non-negative quantities (plan mass): pale sand to deep lake,
 * 7 steps, light to dark. Used with a quantize scale (continuous legends draw on a
 * canvas and fail headless).
 */
export const MASS_RAMP: readonly string[] = ["#f1ebdd", "#d6dccf", "#b0c6c4", "#83a9b5", "#5a88a2", "#366785", "#1c4562"];

/**
 * Ramp for potentials (which have no natural zero): terracotta through sand to lake,
 * 7 steps, low to high.
 */
export const POTENTIAL_RAMP: readonly string[] = ["#9e4423", "#c9794f", "#e4b592", "#efe6d6", "#a9c4d1", "#5f93b0", "#26597a"];

/** Caution colours: amber rule and text on a pale wash. */
export const CAUTION = { wash: "#fbf1d8", rule: "#b3761c", ink: "#6a4610" } as const;
/** Failure colours: brick rule and text on a pale wash. */
export const FAILURE = { wash: "#f8e5df", rule: "#a8402a", ink: "#6e2616" } as const;

/** Prose face: book serifs that ship with common systems. */
export const FONT_PROSE = `"Charter", "Bitstream Charter", "Sitka Text", "Cambria", "Georgia", serif`;
/** Interface face for headings, labels and figures. */
export const FONT_SANS = `"Segoe UI", "Helvetica Neue", "Noto Sans", "Liberation Sans", "Arial", sans-serif`;
/** Figures and numbers in code: a monospace stack. */
export const FONT_MONO = `"SFMono-Regular", "Menlo", "Consolas", "DejaVu Sans Mono", "Liberation Mono", monospace`;

/**
 * Inline style for every Plot SVG: our sans face at 11 px, ink colour, transparent
 * background (the page supplies the paper). An object, because Plot assigns a string
 * style through a property that linkedom's SVG elements do not let it set.
 */
export const PLOT_STYLE: Readonly<Record<string, string>> = { fontFamily: FONT_SANS, fontSize: "11px", color: INK, background: "transparent", overflow: "visible" };

/** Default outer width of a figure in CSS pixels (fits the report's text column). */
export const FIGURE_WIDTH = 680;
