// Bundles Couplet with esbuild. Node entries go to dist/ as ES modules with
// dependencies left external (they are in node_modules); worker entries are
// built on their own because esbuild does not follow `new Worker(new URL(...))`.
import { build } from "esbuild";
import { copyFile, mkdir } from "node:fs/promises";

const node = {
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  packages: "external",
  sourcemap: true,
  logLevel: "warning",
};

// The CLI is split into chunks (in dist/ itself, so files found beside a module
// stay beside it): each command loads only what it uses, and `couplet solve`
// starts without the plotting library, the DOM shim and the runtime.
const cli = build({
  ...node,
  entryPoints: { "couplet-cli": "cells/cli/main.ts" },
  outdir: "dist",
  outExtension: { ".js": ".mjs" },
  splitting: true,
  chunkNames: "[name]-[hash]",
});

// Other entries: [source, output file under dist/].
const nodeEntries = [
  ["cells/runtime/solve-worker.ts", "solve-worker.mjs"],
  ["test/bench/core-bench.ts", "bench.mjs"],
  ["test/bench/study-bench.ts", "bench-studies.mjs"],
  ["test/bench/editor-bench.ts", "bench-editor.mjs"],
];

await mkdir("dist", { recursive: true });
await Promise.all([cli, ...nodeEntries.map(([entry, out]) => build({ ...node, entryPoints: [entry], outfile: `dist/${out}` }))]);

// Browser entries: the editor page and its solve worker, bundled with their
// dependencies for the browser into dist/editor/ (served by `couplet open`).
// `linkedom` (the views' headless DOM for static SVG and report sanitising) is
// replaced by an inert DOMParser document; the worker's Node channel
// (`node:worker_threads`) is never loaded in a Web Worker, so it stays external.
const browser = {
  bundle: true,
  platform: "browser",
  format: "esm",
  target: ["chrome111", "firefox115", "safari16.4"],
  minify: true,
  sourcemap: true,
  legalComments: "linked",
  logLevel: "warning",
  alias: { linkedom: "./cells/editor/browser/linkedom-shim.ts" },
  external: ["node:*"],
};

const browserEntries = [
  ["cells/editor/main.ts", "editor/editor.js"],
  ["cells/runtime/solve-worker.ts", "editor/solve-worker.js"],
];

await mkdir("dist/editor", { recursive: true });
await Promise.all([
  ...browserEntries.map(([entry, out]) => build({ ...browser, entryPoints: [entry], outfile: `dist/${out}` })),
  build({ ...browser, entryPoints: ["cells/editor/editor.css"], outfile: "dist/editor/editor.css", sourcemap: false }),
  copyFile("cells/editor/index.html", "dist/editor/index.html"),
]);
