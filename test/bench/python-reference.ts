import { spawnSync } from "node:child_process";
import { existsSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

/** What reference.py --describe reports about the Python side. */
export interface ReferenceEnvironment {
  readonly python: string;
  readonly numpy: string;
  readonly scipy: string;
  readonly threads: Record<string, string | null>;
  readonly openblasCoretype: string | null;
  /** BLAS pools from threadpoolctl (kernel = the OpenBLAS core type it runs), or why not known. */
  readonly blas: readonly { api: string; kernel: string | null; version: string | null; threads: number }[] | string | null;
}

/** One case as reference.py reads it from the manifest. Files are names inside the manifest's folder. */
export interface ReferenceCase {
  readonly id: string;
  readonly kind: "assignment" | "transport-lp" | "sinkhorn-iterations" | "sinkhorn-tolerance";
  readonly files: Record<string, string>;
  readonly repetitions: number;
  readonly budgetSeconds: number;
  readonly longSeconds: number;
  readonly [setting: string]: unknown;
}

/** What reference.py returns for one case (seconds, as Python measures). */
export interface ReferenceOutcome {
  readonly id: string;
  readonly seconds?: number;
  readonly samples?: number[];
  readonly cpuSeconds?: number;
  readonly singleRun?: boolean;
  readonly value?: number;
  readonly iterations?: number;
  readonly marginalError?: number;
  readonly status?: number;
  readonly message?: string;
  readonly totalSeconds?: number;
  readonly error?: string;
}

/** Variables removed from the child's environment, and why: see docs/benchmarks.md. */
const UNSET = ["OPENBLAS_CORETYPE", "OPENBLAS_L2_SIZE"] as const;

/**
 * The environment reference.py runs in: single-threaded BLAS (the Couplet side uses
 * one core), and OPENBLAS_CORETYPE / OPENBLAS_L2_SIZE removed together so that a
 * current OpenBLAS picks its own kernel for this CPU (some machines here pin an older,
 * slower one for the sake of old builds). Only this child process is affected.
 */
export function referenceEnv(): { env: NodeJS.ProcessEnv; unset: string[] } {
  const env: NodeJS.ProcessEnv = { ...process.env, OMP_NUM_THREADS: "1", OPENBLAS_NUM_THREADS: "1", MKL_NUM_THREADS: "1" };
  const unset: string[] = [];
  for (const name of UNSET) {
    if (name in env) {
      unset.push(`${name}=${env[name]}`);
      delete env[name];
    }
  }
  return { env, unset };
}

/** Path of reference.py: beside this file in the source tree, found from dist/bench.mjs or the working directory. */
export function referenceScript(): string | undefined {
  const candidates = [fileURLToPath(new URL("../test/bench/reference.py", import.meta.url)), join(process.cwd(), "test/bench/reference.py")];
  return candidates.find((p) => existsSync(p));
}

/** The Python side, once detected: how to run it and what it is. */
export interface PythonReference {
  readonly python: string;
  readonly script: string;
  readonly env: NodeJS.ProcessEnv;
  readonly unset: readonly string[];
  readonly environment: ReferenceEnvironment;
}

/**
 * Finds python3 with numpy and scipy by running `reference.py --describe`.
 * Returns the reference, or the reason it is not available.
 */
export function detectReference(python = process.env.COUPLET_BENCH_PYTHON ?? "python3"): PythonReference | { unavailable: string } {
  const script = referenceScript();
  if (!script) return { unavailable: "test/bench/reference.py not found (run from the repository root)" };
  const { env, unset } = referenceEnv();
  const probe = spawnSync(python, [script, "--describe"], { env, encoding: "utf8", timeout: 60_000 });
  if (probe.error) return { unavailable: `${python} could not be started (${probe.error.message})` };
  if (probe.status !== 0) {
    const last = probe.stderr.trim().split("\n").pop() ?? "";
    return { unavailable: `${python} with numpy and scipy is not available (${last || `exit ${probe.status}`})` };
  }
  return { python, script, env, unset, environment: JSON.parse(probe.stdout) as ReferenceEnvironment };
}

/**
 * Runs reference.py on one manifest of cases in `folder` and returns its outcomes.
 * A crash or time-out becomes an `error` on every case, never an exception.
 */
export function runReference(reference: PythonReference, folder: string, cases: readonly ReferenceCase[], timeoutSeconds: number): ReferenceOutcome[] {
  const manifest = join(folder, "manifest.json");
  const out = join(folder, "reference-out.json");
  writeFileSync(manifest, JSON.stringify({ cases }, null, 1));
  rmSync(out, { force: true });
  const child = spawnSync(reference.python, [reference.script, manifest, out], {
    env: reference.env,
    encoding: "utf8",
    timeout: timeoutSeconds * 1000,
    maxBuffer: 16 * 2 ** 20,
  });
  const failure = child.error ? child.error.message : child.status !== 0 ? `exit ${child.status}: ${child.stderr.trim().split("\n").slice(-3).join(" | ")}` : undefined;
  if (failure || !existsSync(out)) return cases.map((c) => ({ id: c.id, error: `reference.py failed: ${failure ?? "no output file"}` }));
  const parsed = JSON.parse(readFileSync(out, "utf8")) as { results: ReferenceOutcome[] };
  return parsed.results;
}
