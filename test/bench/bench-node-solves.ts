// The Node side of the editor benchmark's references: a study run headless on a
// StudyEngine whose transport solves go to a warm pool of Node worker_threads
// workers (the built dist/solve-worker.mjs, the same solver code the browser's
// worker bundles), with every solve timed from the request to the answer.
import { type StudyDocument, updateStudy } from "../../cells/document";
import { type TransportSolver, createStudyMemory } from "../../cells/kinds/define-context";
import { createSolveWorkerPool } from "../../cells/runtime/solve-off-thread";
import { StudyEngine } from "../../cells/runtime/study-engine";
import { compileStudy, studyGlobals } from "../../cells/study/compile-study";

/** One solve as the engine saw it: wall time from request to answer (ms), and what the solver reports. */
export interface TimedSolve {
  readonly ms: number;
  readonly iterations: number;
  readonly algorithm: string;
  /** The solver's own time, inside the worker (s). */
  readonly solverSeconds: number;
}

/**
 * A study run on a StudyEngine in this process with solves in Node workers. `set`
 * changes one parameter's value the way the editor's desk does (an updateStudy
 * transaction, then a recompile with the same warm-start memory) and returns the
 * solves that change caused.
 */
export class NodeStudyRun {
  private study: StudyDocument;
  private readonly engine = new StudyEngine({ globals: studyGlobals() });
  private readonly memory = createStudyMemory();
  private readonly pool = createSolveWorkerPool();
  private readonly solves: TimedSolve[] = [];
  private readonly solve: TransportSolver = async (request, control) => {
    const started = performance.now();
    const result = await this.pool.solve(request, control);
    this.solves.push({ ms: performance.now() - started, iterations: result.diagnostics.iterations, algorithm: result.algorithm, solverSeconds: result.diagnostics.seconds });
    return result;
  };

  private constructor(study: StudyDocument) {
    this.study = study;
  }

  /** Opens `study` and waits for its first evaluation; returns the run and that evaluation's solves. */
  static async open(study: StudyDocument): Promise<{ run: NodeStudyRun; solves: TimedSolve[] }> {
    const run = new NodeStudyRun(study);
    const solves = await run.evaluate();
    return { run, solves };
  }

  /** Sets parameter cell `id` to `value` and waits for the study to settle; the solves it caused. */
  async set(id: string, value: unknown): Promise<TimedSolve[]> {
    this.study = updateStudy(this.study, [{ type: "set-setting", id, path: "value", value }]).study;
    return this.evaluate();
  }

  /** Stops the engine and the workers. */
  async close(): Promise<void> {
    this.engine.dispose();
    await this.pool.close();
  }

  private async evaluate(): Promise<TimedSolve[]> {
    this.solves.length = 0;
    this.engine.update(compileStudy(this.study, { solve: this.solve, memory: this.memory }));
    await this.engine.settled();
    const failed = [...this.engine.states()].filter(([, s]) => s.status === "failed");
    if (failed.length > 0) throw new Error(`the Node run failed: ${failed.map(([id, s]) => `${id}: ${s.status === "failed" ? s.message : ""}`).join("; ")}`);
    return [...this.solves];
  }
}

/** The study with every iterative transport warm-starting, as the editor runs it while tuning (cells/editor/run/study-session.ts withWarmStarts). */
export function warmStarting(study: StudyDocument): StudyDocument {
  const changes = study.cells
    .filter((c) => c.kind === "transport" && c.settings.method !== "exact" && c.settings.warmStart !== true)
    .map((c) => ({ type: "set-setting" as const, id: c.id, path: "warmStart", value: true }));
  return changes.length === 0 ? study : updateStudy(study, changes).study;
}
