/** The worker's side of its channel to the thread that started it. */
export interface WorkerChannel {
  /** Posts a message, transferring (not copying) the listed buffers. */
  post(message: unknown, transfer?: ArrayBuffer[]): void;
  /** Calls `handler` with each message's data. */
  listen(handler: (message: unknown) => void): void;
}

/**
 * The channel of the worker this code runs in: `self` in a browser Web Worker,
 * `parentPort` in a Node worker_threads Worker. The Node module is imported only
 * when there is no worker global scope, so a browser bundle can mark
 * `node:worker_threads` external and never load it.
 */
export async function workerChannel(): Promise<WorkerChannel> {
  const scope = globalThis as unknown as {
    WorkerGlobalScope?: abstract new () => unknown;
    postMessage(message: unknown, transfer: Transferable[]): void;
    addEventListener(type: "message", listener: (event: MessageEvent) => void): void;
  };
  if (typeof scope.WorkerGlobalScope === "function" && scope instanceof scope.WorkerGlobalScope) {
    return {
      post: (message, transfer = []) => scope.postMessage(message, transfer),
      listen: (handler) => scope.addEventListener("message", (event) => handler(event.data)),
    };
  }
  const { parentPort } = await import("node:worker_threads");
  if (!parentPort) throw new Error("workerChannel: not running inside a worker");
  return {
    post: (message, transfer = []) => parentPort.postMessage(message, transfer),
    listen: (handler) => parentPort.on("message", handler),
  };
}
