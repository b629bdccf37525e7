// Bundles Couplet with esbuild. Node entries go to dist/ as ES modules with
// dependencies left external (they are in node_modules); worker entries are
// built on their own because esbuild does not follow `new Worker(new URL(...))`.
import { build } from "esbuild";
import { mkdir } from "node:fs/promises";

const node = {
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  packages: "external",
  sourcemap: true,
  logLevel: "warning",
};

// Each entry: [source, output file under dist/].
const nodeEntries = [
  ["cells/cli/main.ts", "couplet-cli.mjs"],
  ["cells/runtime/solve-worker.ts", "solve-worker.mjs"],
  ["test/bench/core-bench.ts", "bench.mjs"],
];

await mkdir("dist", { recursive: true });
await Promise.all(
  nodeEntries.map(([entry, out]) => build({ ...node, entryPoints: [entry], outfile: `dist/${out}` })),
);
