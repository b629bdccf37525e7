import type { CostSpec, EpsilonSpec, ScaleReference } from "../../core/cost";
import { TransportInputError } from "../../core/errors";
import { type PointMeasure, normalizeMeasure, totalMass } from "../../core/measure";
import type { SolveOptions, TransportMethod, TransportResult } from "../../core/result";
import { solveTransport } from "../../core/solve";
import { readMeasureFile } from "../data/read-measure-file";
import { type OptionSpec, formatOptions, numberOption, parseCommandLine } from "./parse-options";
import { UsageError } from "./usage-error";

const METHODS: readonly TransportMethod[] = ["exact", "entropic", "unbalanced", "debiased"];

export const SOLVE_OPTIONS: readonly OptionSpec[] = [
  { name: "method", type: "string", value: "M", help: "exact (default) | entropic | unbalanced | debiased" },
  { name: "cost", type: "string", value: "C", help: "sqeuclidean (default, |x-y|^2 with no 1/2) | euclidean (|x-y|) | pow:P (|x-y|^P, P > 0)" },
  { name: "epsilon", type: "string", value: "E", help: "entropic regularisation, absolute (same units as the cost)" },
  { name: "epsilon-rel", type: "string", value: "R", help: "entropic regularisation as R x a cost-scale statistic (see --epsilon-of)" },
  { name: "epsilon-of", type: "string", value: "S", help: "statistic --epsilon-rel multiplies: max (default) | median | mean of the cost matrix" },
  { name: "mass-penalty", type: "string", value: "RHO", help: "unbalanced/debiased: KL penalty on both marginals, or RHO_SOURCE,RHO_TARGET;\n'inf' makes a side balanced. Required for --method unbalanced" },
  { name: "tolerance", type: "string", value: "T", help: "iterative methods: stop when the relative L1 marginal error <= T (default 1e-6)" },
  { name: "max-iterations", type: "string", value: "N", help: "iterative methods: iteration cap (default 10000); hitting it exits with code 1" },
  { name: "schedule", type: "boolean", help: "iterative methods: start at a large epsilon and shrink it geometrically to the target" },
  { name: "normalize", type: "boolean", help: "rescale both measures to total mass 1 before solving" },
  { name: "json", type: "boolean", help: "print one JSON object instead of the readable summary" },
];

export const SOLVE_HELP = `Usage: couplet solve SOURCE TARGET [options]

Solves one optimal transport problem between two point clouds and reports the
values, the convergence status and any caution about the result.

SOURCE and TARGET are CSV or TSV files (by extension; .json and .npy also work)
with a header row. Every column is a coordinate except an optional column named
"mass", which gives each point's mass (default: uniform 1/n).

Options:
${formatOptions([...SOLVE_OPTIONS, { name: "help", type: "boolean", help: "show this text" }])}

Exit codes: 0 solved, 1 not converged or cancelled, 2 bad input or usage (reason on stderr).

Caution: an entropic or unbalanced value is a regularised cost, not a distance;
compare measures with --method debiased, and check the status line before
trusting any iterative value.
`;

function parseCost(text: string): CostSpec {
  if (text === "sqeuclidean") return { kind: "sqeuclidean" };
  if (text === "euclidean") return { kind: "euclidean" };
  const match = /^pow:(.+)$/.exec(text);
  if (match) return { kind: "power", p: numberOption("cost", match[1], (p) => (p > 0 ? undefined : "the power P must be > 0")) };
  throw new UsageError(`--cost: unknown cost ${JSON.stringify(text)}; use sqeuclidean, euclidean or pow:P`);
}

function parsePenalty(text: string): { source: number; target: number } {
  const parts = text.split(",");
  if (parts.length > 2) throw new UsageError(`--mass-penalty: give one value or two separated by a comma, got ${JSON.stringify(text)}`);
  const values = parts.map((part) => {
    if (/^(inf|infinity)$/i.test(part.trim())) return Infinity;
    return numberOption("mass-penalty", part, (v) => (v > 0 ? undefined : "must be > 0"));
  });
  return { source: values[0], target: values[values.length - 1] };
}

/** Turns the parsed command line into solver options (no file access). */
export function solveOptionsFrom(values: Record<string, unknown>): SolveOptions {
  const method = (values.method as string | undefined) ?? "exact";
  if (!METHODS.includes(method as TransportMethod)) throw new UsageError(`--method: unknown method ${JSON.stringify(method)}; use ${METHODS.join(", ")}`);
  const iterative = method !== "exact";
  const abs = values.epsilon as string | undefined;
  const rel = values["epsilon-rel"] as string | undefined;
  const of = values["epsilon-of"] as string | undefined;
  if (abs !== undefined && rel !== undefined) throw new UsageError("give either --epsilon or --epsilon-rel, not both");
  if (of !== undefined && !["max", "median", "mean"].includes(of)) throw new UsageError(`--epsilon-of: use max, median or mean, got ${JSON.stringify(of)}`);
  let epsilon: EpsilonSpec | undefined;
  if (abs !== undefined) epsilon = { absolute: numberOption("epsilon", abs, (v) => (v > 0 ? undefined : "must be > 0")) };
  if (rel !== undefined) {
    epsilon = { relative: numberOption("epsilon-rel", rel, (v) => (v > 0 ? undefined : "must be > 0")), reference: (of ?? "max") as ScaleReference };
  }
  if (!iterative && (epsilon !== undefined || values["mass-penalty"] !== undefined)) {
    throw new UsageError("--method exact takes no --epsilon, --epsilon-rel or --mass-penalty; choose --method entropic, unbalanced or debiased");
  }
  if (iterative && epsilon === undefined) throw new UsageError(`--method ${method} needs --epsilon E or --epsilon-rel R (e.g. --epsilon-rel 0.05)`);
  const penaltyText = values["mass-penalty"] as string | undefined;
  if (method === "unbalanced" && penaltyText === undefined) throw new UsageError("--method unbalanced needs --mass-penalty RHO (the KL penalty on each marginal)");
  const options: { -readonly [K in keyof SolveOptions]: SolveOptions[K] } = { method: method as TransportMethod, epsilon };
  if (penaltyText !== undefined) options.massPenalty = parsePenalty(penaltyText);
  if (values.tolerance !== undefined) options.tolerance = numberOption("tolerance", values.tolerance as string, (v) => (v > 0 ? undefined : "must be > 0"));
  if (values["max-iterations"] !== undefined) {
    options.maxIterations = numberOption("max-iterations", values["max-iterations"] as string, (v) => (Number.isInteger(v) && v > 0 ? undefined : "must be a positive integer"));
  }
  if (values.schedule) options.schedule = true;
  return options;
}

/** The --json object: stable field names documented in docs/cli.md. */
export function solveSummary(result: TransportResult): Record<string, unknown> {
  const { values, diagnostics } = result;
  return {
    method: result.method,
    algorithm: result.algorithm,
    cost: values.cost,
    objective: values.objective,
    divergence: values.divergence ?? null,
    dual: values.dual ?? null,
    mass: values.mass,
    penalties: values.penalties ?? null,
    selfTerms: values.selfTerms ?? null,
    status: diagnostics.status,
    iterations: diagnostics.iterations,
    marginalError: diagnostics.marginalError,
    seconds: diagnostics.seconds,
    epsilon: result.epsilon?.absolute ?? null,
    epsilonRelative: result.epsilon ? { value: result.epsilon.relative, of: result.epsilon.reference } : null,
    massPenalty: result.massPenalty ? { source: jsonNumber(result.massPenalty.source), target: jsonNumber(result.massPenalty.target) } : null,
    costScale: result.costScale,
    warnings: diagnostics.warnings,
  };
}

/** JSON has no Infinity: an infinite penalty (a balanced side) is written as the string "inf". */
function jsonNumber(value: number): number | string {
  return Number.isFinite(value) ? value : "inf";
}

function fmt(value: number): string {
  if (value === 0) return "0";
  const abs = Math.abs(value);
  return abs >= 1e-3 && abs < 1e6 ? Number(value.toPrecision(8)).toString() : value.toExponential(6);
}

/** The readable summary printed without --json. */
export function formatSolveReport(result: TransportResult, sizes: { n: number; m: number }): string {
  const { values, diagnostics: d } = result;
  const lines: [string, string][] = [];
  lines.push(["method", `${result.method} (${result.algorithm}), ${sizes.n} source x ${sizes.m} target points`]);
  if (values.divergence !== undefined) lines.push(["divergence", `${fmt(values.divergence)}   debiased S_eps = OT_eps(a,b) - (OT_eps(a,a) + OT_eps(b,b))/2`]);
  lines.push(["cost", `${fmt(values.cost)}   <C,P>, transport cost of the plan`]);
  if (result.method !== "exact") lines.push(["objective", `${fmt(values.objective)}   the ${result.method === "debiased" ? "cross term OT_eps(a,b)" : "regularised objective"}`]);
  if (values.penalties) lines.push(["penalties", `${fmt(values.penalties.source)} (source), ${fmt(values.penalties.target)} (target)`]);
  lines.push(["mass", `${fmt(values.mass)} transported`]);
  if (result.epsilon) {
    const e = result.epsilon;
    lines.push(["epsilon", `${fmt(e.absolute)} = ${fmt(e.relative)} x ${e.reference} cost (${fmt(result.costScale[e.reference])})`]);
  }
  const status = d.status === "converged" ? "converged" : d.status === "cancelled" ? "CANCELLED" : "NOT CONVERGED";
  lines.push(["status", `${status} after ${d.iterations} iteration${d.iterations === 1 ? "" : "s"}, marginal error ${fmt(d.marginalError)}`]);
  lines.push(["time", `${d.seconds.toFixed(3)} s`]);
  const width = Math.max(...lines.map(([k]) => k.length)) + 2;
  const body = lines.map(([k, v]) => k.padEnd(width) + v);
  for (const w of d.warnings) body.push(`caution (${w.code}): ${w.message}`);
  return `${body.join("\n")}\n`;
}

export interface CommandIO {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  readonly cwd: string;
}

/** `couplet solve`: returns the exit code (0 solved, 1 not converged/cancelled, 2 bad input). */
export async function solveCommand(argv: string[], io: CommandIO): Promise<number> {
  const { values, positionals } = parseCommandLine(argv, SOLVE_OPTIONS);
  if (values.help) {
    io.stdout(SOLVE_HELP);
    return 0;
  }
  if (positionals.length !== 2) throw new UsageError(`solve needs two files, SOURCE and TARGET; got ${positionals.length} (see couplet solve --help)`);
  const options = solveOptionsFrom(values);
  let [source, target] = positionals.map((file, k) =>
    readMeasureFile(file, { relativeTo: io.cwd, name: k === 0 ? "source" : "target" }),
  ) as [PointMeasure, PointMeasure];
  if (values.normalize) {
    source = normalizeMeasure(source);
    target = normalizeMeasure(target);
  }
  const balanced = options.method === "exact" || options.method === "entropic" || (options.method === "debiased" && options.massPenalty === undefined);
  const ms = totalMass(source);
  const mt = totalMass(target);
  if (balanced && Math.abs(ms - mt) > 1e-9 * Math.max(ms, mt)) {
    throw new TransportInputError(
      "target.mass",
      `total masses differ (source ${ms}, target ${mt}) and --method ${options.method} moves all mass; add --normalize to compare shapes only, or use --method unbalanced --mass-penalty RHO to let mass be created or destroyed`,
      mt,
    );
  }
  const result = solveTransport(source, target, costOf(values.cost as string | undefined), options);
  io.stdout(values.json ? `${JSON.stringify(solveSummary(result))}\n` : formatSolveReport(result, { n: source.n, m: target.n }));
  return result.diagnostics.status === "converged" ? 0 : 1;
}

function costOf(text: string | undefined): CostSpec {
  return parseCost(text ?? "sqeuclidean");
}
