// The generated 50-cell study of the study benchmark (study-bench.ts): built with
// createStudy/updateStudy, the way the editor builds one, so it is a valid study by
// construction. Invented scenario (a parcel network: depots, lockers, kiosks, vans);
// the numbers mean nothing beyond exercising every kind.
import { type Cell, type StudyDocument, createStudy, updateStudy } from "../../cells/document";

/** Cell counts by kind of {@link benchStudy} (50 in all). */
export const BENCH_STUDY_KINDS = { prose: 9, parameter: 6, data: 8, transport: 12, figure: 10, sweep: 1, code: 2, table: 2 } as const;

/** The parameters the re-evaluation rows change, each with a second value to switch to. */
export const BENCH_PARAMETER_CHANGES: readonly { readonly id: string; readonly values: readonly [unknown, unknown]; readonly what: string }[] = [
  { id: "eps", values: [0.05, 0.06], what: "epsilon of 5 transports (entropic, unbalanced, debiased)" },
  { id: "rho", values: [0.5, 0.7], what: "mass penalty of 2 unbalanced transports" },
  { id: "pts", values: [180, 160], what: "size of 2 data sets (everything downstream)" },
  { id: "note", values: ["first run", "second run"], what: "a text shown by prose only (no solve)" },
];

const mixture = (n: number | { param: string }, means: number[][], scale: number) => ({
  from: "generator",
  generator: "gaussian-mixture",
  n,
  components: means.map((mean) => ({ mean, scale })),
});

/**
 * The study: 9 prose, 6 parameters, 8 data sets (mixtures, ring, two moons, box;
 * 150–240 points in 2-D), 12 transports (exact by assignment and network simplex,
 * entropic with and without schedule and warm start, unbalanced one- and two-sided,
 * debiased balanced and unbalanced; squared Euclidean, Euclidean and power costs),
 * 10 figures (coupling lines, plan matrices, convergence, potentials, a sweep curve),
 * one sweep of 4 runs, 2 code cells and 2 tables. Parameters are referenced from
 * typed settings and from prose, so changing one re-runs a known set of cells.
 */
export function benchStudy(): StudyDocument {
  const cells: Cell[] = [];
  const add = (id: string, kind: Cell["kind"], name: string | undefined, settings: Record<string, unknown>) =>
    cells.push({ id, kind, ...(name === undefined ? {} : { name }), settings } as unknown as Cell);

  add("intro", "prose", undefined, { text: "# Parcel network, benchmark study\n\nRun: @{note}. Epsilon @{eps:3} × max cost; lockers → kiosks exact cost **@{lockerExact.values.cost:4}**, entropic **@{lockerSmooth.values.objective:4}**." });
  add("eps", "parameter", "eps", { control: "log-range", value: 0.05, min: 0.001, max: 1, label: "epsilon, relative to the max cost" });
  add("epsFine", "parameter", "epsFine", { control: "log-range", value: 0.02, min: 0.001, max: 1 });
  add("rho", "parameter", "rho", { control: "log-range", value: 0.5, min: 0.01, max: 100, label: "mass penalty" });
  add("tol", "parameter", "tol", { control: "log-range", value: 1e-6, min: 1e-9, max: 1e-2, label: "tolerance" });
  add("pts", "parameter", "pts", { control: "integer", value: 180, min: 20, max: 400, step: 10, label: "vans per fleet" });
  add("note", "parameter", "note", { control: "text", value: "first run" });

  add("pData", "prose", undefined, { text: "## Data\n\nEight invented point sets; the two van fleets have @{pts} points each." });
  add("lockers", "data", "lockers", mixture(200, [[0, 0], [3, 1]], 0.7));
  add("kiosks", "data", "kiosks", mixture(200, [[1, 2], [4, -1]], 0.8));
  add("depots", "data", "depots", { from: "generator", generator: "ring", n: 150, center: [0, 0], radius: 2.5, noise: 0.15 });
  add("shops", "data", "shops", { from: "generator", generator: "two-moons", n: 180, noise: 0.1 });
  add("vansA", "data", "vansA", mixture({ param: "pts" }, [[-1, -1]], 1));
  add("vansB", "data", "vansB", { from: "generator", generator: "uniform-box", n: { param: "pts" }, lower: [-2, -2], upper: [2, 2] });
  add("yardN", "data", "yardN", mixture(240, [[0, 5], [2, 6], [-2, 6]], 0.5));
  add("yardS", "data", "yardS", mixture(220, [[0, -5], [3, -4]], 0.9));

  add("pExact", "prose", undefined, { text: "## Exact\n\nAssignment of lockers to kiosks: **@{lockerExact.values.cost:5}**; depots to shops by network simplex: **@{depotExact.values.cost:5}**." });
  add("lockerExact", "transport", "lockerExact", { source: "lockers", target: "kiosks", method: "exact" });
  add("depotExact", "transport", "depotExact", { source: "depots", target: "shops", method: "exact" });
  add("yardExact", "transport", "yardExact", { source: "yardN", target: "yardS", method: "exact", cost: { kind: "euclidean" } });
  add("vanExact", "transport", "vanExact", { source: "vansA", target: "vansB", method: "exact" });

  add("pEntropic", "prose", undefined, { text: "## Entropic\n\nAt epsilon @{eps:3}: lockers @{lockerSmooth.values.objective:4} after @{lockerSmooth.diagnostics.iterations} iterations; depots (with a schedule) @{depotSmooth.values.objective:4}." });
  add("lockerSmooth", "transport", "lockerSmooth", { source: "lockers", target: "kiosks", method: "entropic", epsilon: { relative: { param: "eps" }, reference: "max" }, tolerance: { param: "tol" } });
  add("depotSmooth", "transport", "depotSmooth", { source: "depots", target: "shops", method: "entropic", epsilon: { relative: { param: "eps" }, reference: "max" }, schedule: true });
  add("vanSmooth", "transport", "vanSmooth", { source: "vansA", target: "vansB", method: "entropic", epsilon: { relative: { param: "epsFine" }, reference: "max" }, warmStart: true });
  add("yardPower", "transport", "yardPower", { source: "yardN", target: "yardS", method: "entropic", cost: { kind: "power", p: 1.5 }, epsilon: { relative: 0.05, reference: "median" } });

  add("pUnbalanced", "prose", undefined, { text: "## Unbalanced\n\nWith a mass penalty of @{rho:3}, @{lockerLoose.values.mass:4} of the lockers' mass moves." });
  add("lockerLoose", "transport", "lockerLoose", { source: "lockers", target: "kiosks", method: "unbalanced", epsilon: { relative: { param: "eps" }, reference: "max" }, massPenalty: { param: "rho" } });
  add("vanLoose", "transport", "vanLoose", { source: "vansA", target: "vansB", method: "unbalanced", epsilon: { relative: 0.05, reference: "max" }, massPenalty: { source: { param: "rho" }, target: "balanced" } });

  add("pDebiased", "prose", undefined, { text: "## Debiased\n\nS_ε(depots, shops) = **@{depotGap.values.divergence:4}**; yards, unbalanced: **@{yardGap.values.divergence:4}**." });
  add("depotGap", "transport", "depotGap", { source: "depots", target: "shops", method: "debiased", epsilon: { relative: { param: "eps" }, reference: "max" } });
  add("yardGap", "transport", "yardGap", { source: "yardN", target: "yardS", method: "debiased", epsilon: { relative: { param: "eps" }, reference: "max" }, massPenalty: 2 });

  add("fLockerLines", "figure", undefined, { view: "coupling-lines", of: ["lockerExact"], options: { title: "Lockers to kiosks, exact" } });
  add("fSmoothLines", "figure", undefined, { view: "coupling-lines", of: ["lockerSmooth"], options: { title: "Lockers to kiosks, entropic", maxLines: 400 } });
  add("fDepotLines", "figure", undefined, { view: "coupling-lines", of: ["depotExact"], options: { title: "Depots to shops, exact" } });
  add("fSmoothMatrix", "figure", undefined, { view: "plan-matrix", of: ["lockerSmooth"], options: { title: "Entropic plan as a matrix" } });
  add("fLooseMatrix", "figure", undefined, { view: "plan-matrix", of: ["lockerLoose"], options: { title: "Unbalanced plan as a matrix" } });
  add("fConvergence", "figure", undefined, { view: "convergence", of: ["lockerSmooth", "depotSmooth", "lockerLoose"], options: { title: "Marginal error per iteration" } });
  add("fVanConvergence", "figure", undefined, { view: "convergence", of: ["vanSmooth", "vanLoose"], options: { title: "Van fleets: convergence" } });
  add("fPotentials", "figure", undefined, { view: "potentials", of: ["lockerSmooth"], options: { title: "Potentials, lockers and kiosks" } });
  add("fYardPotentials", "figure", undefined, { view: "potentials", of: ["yardPower"], options: { side: "source" } });

  add("pSweep", "prose", undefined, { text: "## Sweep\n\nThe yard problem at four epsilons; see the table and the curve." });
  add("yardSweep", "sweep", "yardSweep", { transport: "yardPower", vary: "epsilon", values: [0.03, 0.06, 0.12, 0.24], record: ["cost", "objective", "iterations"] });
  add("fSweep", "figure", undefined, { view: "sweep-curve", of: ["yardSweep"], options: { output: "objective", logX: true } });

  add("summary", "code", "summary", {
    code: "return [lockerExact, lockerSmooth, lockerLoose, depotExact, depotSmooth, depotGap, yardExact, yardPower, yardGap, vanExact, vanSmooth, vanLoose].map((t) => ({ method: t.method, cost: t.values.cost, mass: t.values.mass, iterations: t.diagnostics.iterations }));",
  });
  add("energy", "code", "energy", { code: "return core.energyDistance(lockers, kiosks);" });
  add("pTable", "prose", undefined, { text: "## Tables\n\nEnergy distance lockers → kiosks: @{energy:4}." });
  add("summaryTable", "table", undefined, { of: "summary", columns: [{ field: "method" }, { field: "cost", digits: 4 }, { field: "mass", digits: 4, notation: "fixed" }, { field: "iterations" }] });
  add("legend", "table", undefined, { rows: [{ set: "lockers", points: 200 }, { set: "kiosks", points: 200 }, { set: "depots", points: 150 }, { set: "shops", points: 180 }], columns: [{ field: "set", label: "point set" }, { field: "points" }] });
  add("close", "prose", undefined, { text: "That is all: @{note}." });

  let study = createStudy({ title: "Parcel network (benchmark)", seed: 20261205, about: "Generated by test/bench/bench-study-document.ts." });
  study = updateStudy(study, cells.map((cell) => ({ type: "insert-cell" as const, cell }))).study;
  return study;
}
