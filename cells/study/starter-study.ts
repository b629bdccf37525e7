import { type Cell, type StudyDocument, createStudy, updateStudy } from "../document";

/** Options of {@link starterStudy}. */
export interface StarterStudyOptions {
  /** Title of the study. Default "Morning and evening pickups". */
  readonly title?: string;
}

/** The default title of a new study. */
export const STARTER_TITLE = "Morning and evening pickups";

/**
 * The cells of the starter study, in order. An invented scenario: where riders of a
 * small bike-share scheme pick up bikes in the morning (two housing estates) and in
 * the evening (a business park and a station). Small on purpose (60 × 80 points),
 * so the first run takes well under a second.
 */
function starterCells(): Cell[] {
  return [
    {
      id: "intro",
      kind: "prose",
      settings: {
        text:
          "A starter study. Morning pickups cluster around two housing estates; evening pickups " +
          "around a business park and a station. How far does the demand move during the day, and how much does the " +
          "answer depend on epsilon?\n\n" +
          "Run it with `couplet run FILE --report report.html`, try another epsilon with `--set eps=0.2`, " +
          "and make it its own regression test with `--save-receipts` and `couplet check FILE`.",
      },
    },
    {
      id: "eps",
      kind: "parameter",
      name: "eps",
      settings: { control: "log-range", value: 0.05, min: 0.005, max: 1, label: "epsilon (× median cost)" },
    },
    {
      id: "morning",
      kind: "data",
      name: "morning",
      settings: {
        from: "generator",
        generator: "gaussian-mixture",
        n: 60,
        components: [
          { weight: 2, mean: [0, 0], scale: 0.5 },
          { weight: 1, mean: [2.5, 0.5], scale: [0.3, 0.6] },
        ],
      },
    },
    {
      id: "evening",
      kind: "data",
      name: "evening",
      settings: {
        from: "generator",
        generator: "gaussian-mixture",
        n: 80,
        components: [
          { weight: 1, mean: [1, 3], scale: 0.4 },
          { weight: 1, mean: [3.5, 2.5], scale: [0.6, 0.3] },
        ],
      },
    },
    {
      id: "exact",
      kind: "transport",
      name: "moved",
      settings: { source: "morning", target: "evening", cost: { kind: "sqeuclidean" }, method: "exact" },
    },
    {
      id: "debiased",
      kind: "transport",
      name: "gap",
      settings: {
        source: "morning",
        target: "evening",
        cost: { kind: "sqeuclidean" },
        method: "debiased",
        epsilon: { relative: { param: "eps" }, reference: "median" },
        tolerance: 1e-6,
        maxIterations: 5000,
      },
    },
    {
      id: "lines",
      kind: "figure",
      settings: { view: "coupling-lines", of: ["moved"], options: { title: "Which morning pickup feeds which evening pickup", maxLines: 200 } },
    },
    {
      id: "converge",
      kind: "figure",
      settings: { view: "convergence", of: ["gap"], options: { title: "How the debiased solve converged" } },
    },
    {
      id: "findings",
      kind: "prose",
      settings: {
        text:
          "## What the numbers say\n\n" +
          "The exact plan moves the morning demand a mean squared distance of @{moved.values.cost:4}. " +
          "With epsilon = @{eps:3f} × the median cost, the debiased divergence is @{gap.values.divergence:4}: " +
          "unlike the entropic value itself, it is zero when the two clouds are the same.",
      },
    },
  ] as Cell[];
}

/**
 * A new study that runs as it is: two small generated measures, an epsilon
 * parameter relative to the median cost, an exact and a debiased transport, a
 * coupling-lines figure, a convergence figure, and prose quoting live values.
 * Study seed 1, so every new study starts from the same numbers.
 */
export function starterStudy(options: StarterStudyOptions = {}): StudyDocument {
  const title = options.title ?? STARTER_TITLE;
  const study = createStudy({
    title,
    about: "Started with couplet new. Edit the cells, or replace the generated clouds with your own data: a data cell can read CSV, TSV, JSON and .npy files.",
    seed: 1,
  });
  return updateStudy(
    study,
    starterCells().map((cell) => ({ type: "insert-cell" as const, cell })),
  ).study;
}
