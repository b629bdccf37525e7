import * as Plot from "@observablehq/plot";
import { type FigureSpec, isFigureSpec } from "../../views/figures/figure-spec";
import { shortDescription } from "../resolve-number";

/** What a figure cell drawn by code gives: a FigureSpec it built, or Plot options. */
export type CodeFigureValue = FigureSpec<object> | Plot.PlotOptions;

/**
 * The figure a code figure's return value stands for, never rendered here (the
 * views draw it): a FigureSpec as it is; Plot options (an object with a `marks`
 * array, which is also what `Plot.plot(...)` and `mark.plot(...)` return in a
 * study, see cells/study/plot-api.ts) as they are; one mark or an array of marks
 * as `{marks}`. Anything else throws, saying what came back.
 */
export function codeFigureValue(value: unknown): CodeFigureValue {
  if (isFigureSpec(value)) return value;
  if (value instanceof Plot.Mark) return { marks: [value as Plot.Markish] };
  if (Array.isArray(value) && value.length > 0 && value.every((m) => m instanceof Plot.Mark || Array.isArray(m))) return { marks: value as Plot.Markish[] };
  if (typeof value === "object" && value !== null && Array.isArray((value as Plot.PlotOptions).marks)) return value as Plot.PlotOptions;
  throw new TypeError(`a figure's code must return Plot options ({marks: [...]}), a Plot mark or Plot.plot(...), got ${shortDescription(value)}`);
}
