import { describeValue } from "../../../core/errors";
import { checkCellName } from "../../document/cell-name";
import { type NameMapper, collectReferences, mapField, mapItems } from "../../document/references";
import { type StudyIssue, childPath } from "../../document/study-issue";
import { type JsonObject, checkArray, checkBoolean, checkNumber, checkObject, checkOneOf, checkPresent, checkString } from "../../document/value-checks";
import { SWEEP_OUTPUTS, type SweepOutput } from "../sweep/settings";

/** The ready views, and "code" for a figure drawn by JavaScript. */
export type FigureView = "coupling-lines" | "plan-matrix" | "convergence" | "potentials" | "sweep-curve" | "code";

/** Values of `view`, in the order the docs list them. */
export const FIGURE_VIEWS: readonly FigureView[] = ["coupling-lines", "plan-matrix", "convergence", "potentials", "sweep-curve", "code"];

/** Options every ready view accepts. */
export interface CommonFigureSettings {
  /** Heading above the figure. */
  readonly title?: string;
  /** Outer width in CSS pixels, > 0. Default: the page's figure width. */
  readonly width?: number;
  readonly [extra: string]: unknown;
}

/** Lines from source to target points, thickness ∝ mass moved. */
export interface CouplingLinesOptions extends CommonFigureSettings {
  /** Draw at most this many plan entries, the heaviest first (positive integer). */
  readonly maxLines?: number;
}

/** Marginal error per iteration, log scale by default. */
export interface ConvergenceOptions extends CommonFigureSettings {
  /** Default true. */
  readonly logScale?: boolean;
}

/** The dual potentials over the points. */
export interface PotentialsOptions extends CommonFigureSettings {
  /** Default "both". */
  readonly side?: "source" | "target" | "both";
}

/** One recorded output against the varied setting, replicates as a band. */
export interface SweepCurveOptions extends CommonFigureSettings {
  /** Default: the sweep's first recorded output. */
  readonly output?: SweepOutput;
  /** Log x axis. Default: true when the sweep's range is log-spaced. */
  readonly logX?: boolean;
  /** Log y axis. Default false. */
  readonly logY?: boolean;
}

/**
 * Settings of a figure cell: a ready view of other cells (`of` names them:
 * exactly one transport for coupling-lines, plan-matrix and potentials; one or
 * more transports for convergence; one or more sweeps for sweep-curve), or
 * `view: "code"` with JavaScript that returns a plot.
 */
export type FigureSettings =
  | { readonly view: "coupling-lines"; readonly of: readonly [string]; readonly options?: CouplingLinesOptions; readonly [extra: string]: unknown }
  | { readonly view: "plan-matrix"; readonly of: readonly [string]; readonly options?: CommonFigureSettings; readonly [extra: string]: unknown }
  | { readonly view: "potentials"; readonly of: readonly [string]; readonly options?: PotentialsOptions; readonly [extra: string]: unknown }
  | { readonly view: "convergence"; readonly of: readonly string[]; readonly options?: ConvergenceOptions; readonly [extra: string]: unknown }
  | { readonly view: "sweep-curve"; readonly of: readonly string[]; readonly options?: SweepCurveOptions; readonly [extra: string]: unknown }
  | { readonly view: "code"; readonly code: string; readonly [extra: string]: unknown };

const SINGLE: readonly FigureView[] = ["coupling-lines", "plan-matrix", "potentials"];

function checkOptions(view: FigureView, options: JsonObject, path: string, issues: StudyIssue[]): void {
  const at = (key: string) => childPath(path, key);
  if (options.title !== undefined) checkString(options.title, at("title"), issues);
  if (options.width !== undefined) checkNumber(options.width, at("width"), issues, { above: 0 });
  if (view === "coupling-lines" && options.maxLines !== undefined) checkNumber(options.maxLines, at("maxLines"), issues, { integer: true, atLeast: 1 });
  if (view === "convergence" && options.logScale !== undefined) checkBoolean(options.logScale, at("logScale"), issues);
  if (view === "potentials" && options.side !== undefined) checkOneOf(options.side, ["source", "target", "both"], at("side"), issues);
  if (view === "sweep-curve") {
    if (options.output !== undefined) checkOneOf(options.output, SWEEP_OUTPUTS, at("output"), issues);
    for (const key of ["logX", "logY"]) if (options[key] !== undefined) checkBoolean(options[key], at(key), issues);
  }
}

/**
 * Validates figure settings at `path`: the view, the cells it draws (`of`, a
 * list of names of the right length, no repeats), its options (known options
 * are type-checked; others are kept for the views), or the code of a code figure.
 */
export function validateFigureSettings(settings: unknown, path: string): StudyIssue[] {
  const issues: StudyIssue[] = [];
  if (!checkObject(settings, path, issues)) return issues;
  const s = settings;
  const at = (key: string) => childPath(path, key);
  if (!checkPresent(s, "view", path, issues) || !checkOneOf(s.view, FIGURE_VIEWS, at("view"), issues)) return issues;
  const view = s.view;
  if (view === "code") {
    if (checkPresent(s, "code", path, issues, 'when view is "code"')) checkString(s.code, at("code"), issues);
    return issues;
  }
  if (checkPresent(s, "of", path, issues, `when view is "${view}"`) && checkArray(s.of, at("of"), issues, 1)) {
    if (SINGLE.includes(view) && s.of.length !== 1) {
      issues.push({ path: at("of"), message: `a ${view} figure draws exactly one transport cell, got ${s.of.length} names` });
    }
    const seen = new Map<unknown, number>();
    s.of.forEach((name, i) => {
      const ip = childPath(at("of"), i);
      if (!checkCellName(name, ip, issues)) return;
      if (seen.has(name)) issues.push({ path: ip, message: `repeats of[${seen.get(name)}] (${describeValue(name)})` });
      else seen.set(name, i);
    });
  }
  if (s.options !== undefined && checkObject(s.options, at("options"), issues)) checkOptions(view, s.options, at("options"), issues);
  return issues;
}

/** Renames the cells a figure draws (`of`); code figures are left to the runtime. */
export function mapFigureReferences(settings: FigureSettings, rename: NameMapper): FigureSettings {
  return mapField(settings, "of", (of) => (Array.isArray(of) ? mapItems(of, (n: unknown) => (typeof n === "string" ? rename(n) : n)) : of)) as FigureSettings;
}

/**
 * Names of the cells a ready view draws (its `of` list). A code figure's
 * names are found by the runtime from its code, so it returns `[]`.
 */
export function figureDependencies(settings: FigureSettings): string[] {
  return collectReferences(settings, mapFigureReferences);
}
