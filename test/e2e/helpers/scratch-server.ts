// A scratch copy of the demo studies (docs/examples/), served by the real Couplet
// server (cells/server/start-server.ts) on 127.0.0.1 and a port the system picks.
// The demos themselves are never written: every test works on its own copy.
import { existsSync } from "node:fs";
import { cp, mkdtemp, realpath, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { type RunningServer, startServer } from "../../../cells/server/start-server";
import { addToTrustList } from "../../../cells/server/trust-list";

/** The demo studies shipped with Couplet. */
export const EXAMPLES_DIR: string = fileURLToPath(new URL("../../../docs/examples/", import.meta.url));

/** The bundled editor the server serves by default (built by build.mjs; `npm test` builds first). */
export const EDITOR_BUNDLE: string = fileURLToPath(new URL("../../../dist/editor/editor.js", import.meta.url));

/** A served scratch folder. */
export interface ScratchServer {
  /** The folder's real path. */
  readonly root: string;
  /** The user's trust list for this run (outside `root`, like the real one). */
  readonly trustFile: string;
  readonly server: RunningServer;
  /** The address to open, token included. */
  readonly url: string;
  /** The absolute path of a file in the folder, from its path relative to it. */
  file(relative: string): string;
  /** Stops the server and deletes the folder and the trust list. */
  close(): Promise<void>;
}

/** Options of {@link serveExamples}. */
export interface ServeExamplesOptions {
  /** The study the server opens first, relative to the folder. */
  readonly study: string;
  /** Studies already on the user's trust list when the server starts (their code runs at once). */
  readonly trusted?: readonly string[];
  /** Called with the folder after the copy and before the server starts (to add or change files). */
  readonly prepare?: (root: string) => Promise<void>;
}

/**
 * Copies docs/examples/ into a fresh temporary folder and serves it with
 * `startServer({root, study, port: 0, host: "127.0.0.1"})`. The trust list is per
 * user: `COUPLET_TRUST_FILE` is pointed at a fresh file of this scratch run
 * *before* the server starts, then the `trusted` studies are added to it the way
 * the server itself records trust.
 */
export async function serveExamples(options: ServeExamplesOptions): Promise<ScratchServer> {
  // Without the bundle the server answers 503 and every wait would time out: say why at once.
  if (!existsSync(EDITOR_BUNDLE)) throw new Error(`the editor is not built (${EDITOR_BUNDLE} is missing): run \`npm run build\` first (\`npm test\` builds before testing)`);
  const root = await realpath(await mkdtemp(join(tmpdir(), "couplet-e2e-")));
  const userDir = await mkdtemp(join(tmpdir(), "couplet-e2e-user-"));
  const trustFile = join(userDir, "trusted-studies.json");
  try {
    await cp(EXAMPLES_DIR, root, { recursive: true });
    await options.prepare?.(root);
    process.env.COUPLET_TRUST_FILE = trustFile;
    for (const study of options.trusted ?? []) await addToTrustList(root, study);
    const server = await startServer({ root, study: options.study, port: 0, host: "127.0.0.1" });
    return {
      root,
      trustFile,
      server,
      url: server.url,
      file: (relative) => join(root, ...relative.split("/")),
      async close() {
        await server.close();
        await rm(root, { recursive: true, force: true });
        await rm(userDir, { recursive: true, force: true });
      },
    };
  } catch (error) {
    await rm(root, { recursive: true, force: true });
    await rm(userDir, { recursive: true, force: true });
    throw error;
  }
}
