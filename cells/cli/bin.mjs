#!/usr/bin/env node
// The `couplet` command. The CLI is TypeScript bundled by build.mjs (run by
// `npm ci` through the prepare script); this launcher only loads the bundle.
import { existsSync } from "node:fs";
import { fileURLToPath, pathToFileURL } from "node:url";

const bundle = fileURLToPath(new URL("../../dist/couplet-cli.mjs", import.meta.url));
if (!existsSync(bundle)) {
  process.stderr.write("couplet: the CLI is not built yet; run `npm run build` in the project folder first\n");
  process.exit(2);
}
const { main } = await import(pathToFileURL(bundle).href);
process.exitCode = await main(process.argv.slice(2));
