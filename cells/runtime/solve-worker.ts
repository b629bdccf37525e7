// Entry of the solve worker: built on its own by build.mjs to dist/solve-worker.mjs
// (esbuild does not follow `new Worker(new URL(...))`, and Node 20 cannot start a
// .ts worker). Runs as a Node worker_threads Worker; the same file can run as a
// browser module Web Worker when bundled with `node:worker_threads` external.
import { solveTransport } from "../../core/solve";
import { serveSolves } from "./serve-solves";
import { workerChannel } from "./worker-scope";

serveSolves(await workerChannel(), solveTransport);
