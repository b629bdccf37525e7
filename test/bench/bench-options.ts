/** Command-line options of the benchmark harness (`npm run bench -- …`). */
export interface BenchOptions {
  /** Tiny sizes and few iterations: a smoke check that everything runs (seconds, not minutes). */
  readonly quick: boolean;
  /** Where to write the results as JSON: a file path, "-" for stdout, or undefined for none. */
  readonly json: string | undefined;
  /** Row names to keep (see {@link ROW_NAMES}); undefined keeps all. */
  readonly only: readonly RowName[] | undefined;
  /** Skip the numpy/scipy reference even when python3 has them. */
  readonly noReference: boolean;
  readonly help: boolean;
}

/** The benchmark rows, in the order they run and print. */
export const ROW_NAMES = ["assignment", "network-simplex", "sinkhorn-kernel", "sinkhorn-log", "sinkhorn-tolerance"] as const;
export type RowName = (typeof ROW_NAMES)[number];

/** Short names accepted by `--only` besides the row names themselves. */
const ROW_ALIASES: Record<string, readonly RowName[]> = {
  sinkhorn: ["sinkhorn-kernel", "sinkhorn-log", "sinkhorn-tolerance"],
  simplex: ["network-simplex"],
  kernel: ["sinkhorn-kernel"],
  log: ["sinkhorn-log"],
  tolerance: ["sinkhorn-tolerance"],
};

export const USAGE = `Usage: npm run bench -- [--quick] [--json [FILE]] [--only ROWS] [--no-reference]

  --quick           tiny sizes, a smoke check that every row runs
  --json [FILE]     write the results table as JSON to FILE (stdout when FILE is
                    omitted or "-"; the readable table then goes to stderr)
  --only ROWS       comma-separated rows to run: ${ROW_NAMES.join(", ")}
                    (also: sinkhorn = the three Sinkhorn rows, simplex, kernel, log, tolerance)
  --no-reference    do not run the numpy/scipy reference
  --help            this text`;

/** Thrown for an unknown flag or a bad value; the entry prints it with the usage. */
export class BenchUsageError extends Error {}

/** Parses argv (without the node and script paths). */
export function parseBenchOptions(argv: readonly string[]): BenchOptions {
  let quick = false;
  let json: string | undefined;
  let only: RowName[] | undefined;
  let noReference = false;
  let help = false;
  for (let k = 0; k < argv.length; k++) {
    const arg = argv[k];
    const [flag, inline] = arg.startsWith("--") && arg.includes("=") ? [arg.slice(0, arg.indexOf("=")), arg.slice(arg.indexOf("=") + 1)] : [arg, undefined];
    switch (flag) {
      case "--quick":
        quick = true;
        break;
      case "--no-reference":
        noReference = true;
        break;
      case "--help":
      case "-h":
        help = true;
        break;
      case "--json": {
        if (inline !== undefined) json = inline;
        else if (k + 1 < argv.length && !argv[k + 1].startsWith("--")) json = argv[++k];
        else json = "-";
        break;
      }
      case "--only": {
        const list = inline ?? argv[++k];
        if (list === undefined || list.startsWith("--")) throw new BenchUsageError("--only needs a comma-separated list of rows");
        only = parseRows(list);
        break;
      }
      default:
        throw new BenchUsageError(`unknown option ${JSON.stringify(arg)}`);
    }
  }
  return { quick, json, only, noReference, help };
}

function parseRows(list: string): RowName[] {
  const rows = new Set<RowName>();
  for (const word of list.split(",").map((w) => w.trim()).filter((w) => w.length > 0)) {
    if ((ROW_NAMES as readonly string[]).includes(word)) rows.add(word as RowName);
    else if (word in ROW_ALIASES) ROW_ALIASES[word].forEach((r) => rows.add(r));
    else throw new BenchUsageError(`--only: unknown row ${JSON.stringify(word)}; known: ${ROW_NAMES.join(", ")}, ${Object.keys(ROW_ALIASES).join(", ")}`);
  }
  if (rows.size === 0) throw new BenchUsageError("--only needs at least one row");
  return ROW_NAMES.filter((r) => rows.has(r));
}
