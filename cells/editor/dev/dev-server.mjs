// Starts the real Couplet server (cells/server) on a folder for trying the
// editor by hand or from a browser script: bundles cells/server/start-server.ts
// with esbuild into a temporary module and runs it. Usage:
//   node build.mjs && node cells/editor/dev/dev-server.mjs FOLDER [STUDY]
// Prints the address with its token. Not part of the product.
import { build } from "esbuild";
import { mkdir } from "node:fs/promises";
import { join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const repo = resolve(fileURLToPath(new URL("../../..", import.meta.url)));

/** Starts the server on `root` (opening `study` when given, on `port` when given); resolves to the running server. */
export async function startDevServer(root, study, port) {
  // Inside node_modules so the bundle's external packages resolve.
  const folder = join(repo, "node_modules/.cache/couplet-editor");
  await mkdir(folder, { recursive: true });
  const out = join(folder, "start-server.mjs");
  await build({
    entryPoints: [join(repo, "cells/server/start-server.ts")],
    bundle: true,
    platform: "node",
    format: "esm",
    packages: "external",
    outfile: out,
    logLevel: "warning",
    absWorkingDir: repo,
  });
  const { startServer } = await import(pathToFileURL(out).href);
  return startServer({ root, ...(study ? { study } : {}), ...(port ? { port } : {}), editorDir: join(repo, "dist/editor"), onError: (e) => console.error("server error:", e) });
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const [root = ".", study] = process.argv.slice(2);
  const server = await startDevServer(resolve(root), study);
  console.log(server.url);
}
