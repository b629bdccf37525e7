import type { CostSpec } from "../../core/cost";
import type { Measure } from "../../core/measure";
import type { SolveOptions, TransportResult } from "../../core/result";
import { type SolveMessage, type WorkerReply, portableError, transferList } from "./solve-protocol";
import type { WorkerChannel } from "./worker-scope";

/** The solver a worker serves; `solveTransport` from core/solve.ts in production. */
export type TransportSolver = (source: Measure, target: Measure, cost: CostSpec, options: SolveOptions) => TransportResult;

/**
 * Answers solve messages on `channel` (see solve-protocol.ts): runs `solve` with a
 * progress callback that posts each report, then posts the result with its typed
 * arrays transferred, or the error the solver threw. Other messages are ignored.
 */
export function serveSolves(channel: WorkerChannel, solve: TransportSolver): void {
  const reply = (message: WorkerReply, transfer?: ArrayBuffer[]) => channel.post(message, transfer);
  channel.listen((message) => {
    const { type, id, request } = (message ?? {}) as Partial<SolveMessage>;
    if (type !== "solve" || typeof id !== "number" || !request) return;
    let result: TransportResult;
    try {
      result = solve(request.source, request.target, request.cost, {
        ...request.options,
        onProgress: (progress) => reply({ type: "progress", id, progress: { ...progress } }),
      });
    } catch (error) {
      reply({ type: "failure", id, error: portableError(error) });
      return;
    }
    reply({ type: "result", id, result }, transferList(result));
  });
}
