import type { CostSpec } from "../../core/cost";
import { TransportInputError } from "../../core/errors";
import type { Measure } from "../../core/measure";
import type { SolveOptions, SolveProgress, TransportResult } from "../../core/result";

/*
 * The messages between a page or process and a solve worker. They are plain
 * structured-clone data (typed arrays, numbers, strings, plain objects), so the
 * same worker code serves a Node worker_threads Worker and a browser Web Worker.
 *
 *   caller → worker   {type: "solve", id, request}        one per worker in practice
 *   worker → caller   {type: "progress", id, progress}    0..n, while solving
 *                     {type: "result", id, result}        exactly one of these two
 *                     {type: "failure", id, error}
 *
 * Cancelling is not a message: a solve is synchronous inside the worker, so the
 * worker could not read one until it had finished. The caller terminates the worker.
 */

/** Solve options that can cross a thread boundary (no signal, no callback). */
export type PortableSolveOptions = Omit<SolveOptions, "signal" | "onProgress">;

/** One transport problem, as `solveTransport(source, target, cost, options)` takes it. */
export interface SolveRequest {
  readonly source: Measure;
  readonly target: Measure;
  readonly cost: CostSpec;
  readonly options: PortableSolveOptions;
}

/** Caller → worker. */
export interface SolveMessage {
  readonly type: "solve";
  readonly id: number;
  readonly request: SolveRequest;
}

/** An error as it crosses the boundary; `field` and `value` for a TransportInputError. */
export interface PortableError {
  readonly name: string;
  readonly message: string;
  readonly stack?: string;
  readonly field?: string;
  readonly value?: unknown;
}

/** Worker → caller. */
export type WorkerReply =
  | { readonly type: "progress"; readonly id: number; readonly progress: SolveProgress }
  | { readonly type: "result"; readonly id: number; readonly result: TransportResult }
  | { readonly type: "failure"; readonly id: number; readonly error: PortableError };

/**
 * A copy of `value` ready to post with a transfer list: every typed array is copied
 * into a compact buffer of its own (a view into a larger buffer would otherwise
 * drag the whole buffer along) and that buffer is listed for transfer, so the
 * caller's arrays stay intact and usable. Views on a SharedArrayBuffer stay shared.
 * Throws a TypeError naming the path of anything that cannot cross (a function).
 */
export function portableCopy<T>(value: T, path = "request"): { value: T; transfer: ArrayBuffer[] } {
  const transfer: ArrayBuffer[] = [];
  const copy = (item: unknown, at: string): unknown => {
    if (item === null || typeof item !== "object") {
      if (typeof item === "function" || typeof item === "symbol") throw new TypeError(`${at}: a ${typeof item} cannot be sent to a solve worker`);
      return item;
    }
    if (ArrayBuffer.isView(item)) {
      if (item.buffer instanceof ArrayBuffer === false) return item; // shared memory stays shared
      if (item instanceof DataView) {
        const bytes = item.buffer.slice(item.byteOffset, item.byteOffset + item.byteLength);
        transfer.push(bytes);
        return new DataView(bytes);
      }
      const fresh = (item as unknown as Float64Array).slice();
      transfer.push(fresh.buffer);
      return fresh;
    }
    if (Array.isArray(item)) return item.map((element, k) => copy(element, `${at}[${k}]`));
    if (Object.getPrototypeOf(item) !== Object.prototype && Object.getPrototypeOf(item) !== null) {
      if (item instanceof AbortSignal) throw new TypeError(`${at}: an AbortSignal cannot be sent to a solve worker; pass it as control.signal`);
      return item; // Map, Set, Date, … : left to structured clone
    }
    const out: Record<string, unknown> = {};
    for (const [key, element] of Object.entries(item)) out[key] = copy(element, `${at}.${key}`);
    return out;
  };
  return { value: copy(value, path) as T, transfer };
}

/**
 * The distinct, transferable buffers under `value` (typed arrays in plain objects
 * and arrays), for posting a result the sender will not touch again. A buffer
 * shared by several views is listed once; shared memory is never listed.
 */
export function transferList(value: unknown): ArrayBuffer[] {
  const buffers = new Set<ArrayBuffer>();
  const seen = new Set<object>();
  const visit = (item: unknown) => {
    if (item === null || typeof item !== "object" || seen.has(item)) return;
    seen.add(item);
    if (ArrayBuffer.isView(item)) {
      if (item.buffer instanceof ArrayBuffer) buffers.add(item.buffer);
      return;
    }
    for (const element of Array.isArray(item) ? item : Object.values(item)) visit(element);
  };
  visit(value);
  return [...buffers];
}

/** An error in a form that survives structured cloning. */
export function portableError(error: unknown): PortableError {
  if (error instanceof TransportInputError) {
    // The message is "field: reason"; keep the reason alone so the receiver can rebuild it.
    const reason = error.message.startsWith(`${error.field}: `) ? error.message.slice(error.field.length + 2) : error.message;
    return { name: error.name, message: reason, stack: error.stack, field: error.field, value: cloneable(error.value) };
  }
  if (error instanceof Error) return { name: error.name, message: error.message, stack: error.stack };
  return { name: "Error", message: String(error) };
}

/** Rebuilds an error sent by {@link portableError}: a TransportInputError stays one. */
export function errorFromPortable(error: PortableError): Error {
  if (error.name === "TransportInputError" && error.field !== undefined) {
    const rebuilt = new TransportInputError(error.field, error.message, error.value);
    if (error.stack) rebuilt.stack = error.stack;
    return rebuilt;
  }
  const rebuilt = new Error(error.message);
  rebuilt.name = error.name;
  if (error.stack) rebuilt.stack = error.stack;
  return rebuilt;
}

function cloneable(value: unknown): unknown {
  try {
    return structuredClone(value);
  } catch {
    return String(value);
  }
}

/**
 * What a caller does with one worker reply to request `id` (replies to other ids are
 * ignored): progress goes to `onProgress` (a throwing callback ends the request),
 * the result resolves it and the solver's error rejects it. `finish(reusable, outcome)`
 * settles exactly once; the worker stays reusable after a result or a solver error.
 * Shared by the Node client (solve-off-thread.ts) and the browser's (cells/editor).
 */
export function routeWorkerReply(
  reply: WorkerReply | undefined,
  id: number,
  onProgress: ((progress: SolveProgress) => void) | undefined,
  finish: (reusable: boolean, outcome: () => void) => void,
  resolve: (result: TransportResult) => void,
  reject: (error: unknown) => void,
): void {
  if (!reply || reply.id !== id) return;
  if (reply.type === "progress") {
    try {
      onProgress?.(reply.progress);
    } catch (error) {
      finish(false, () => reject(error));
    }
  } else if (reply.type === "result") finish(true, () => resolve(reply.result));
  else if (reply.type === "failure") finish(true, () => reject(errorFromPortable(reply.error)));
}
