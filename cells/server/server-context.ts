/** What every API handler knows about the running server. */
export interface ServerContext {
  /** The opened folder, a real path (symbolic links resolved). */
  readonly root: string;
  /** The study `couplet open` was given, relative to the root, or null when a folder was opened. */
  readonly studyPath: string | null;
  /** Version of Couplet (package.json). */
  readonly version: string;
  /**
   * Runs `task` after every earlier task with the same key has settled, so two
   * requests never check-then-write the same file at once. Keys are real paths.
   */
  serialize<T>(key: string, task: () => Promise<T>): Promise<T>;
}

/** A serialiser for {@link ServerContext.serialize}: one promise chain per key, dropped when idle. */
export function keyedSerializer(): ServerContext["serialize"] {
  const tails = new Map<string, Promise<unknown>>();
  return <T>(key: string, task: () => Promise<T>): Promise<T> => {
    const previous = tails.get(key) ?? Promise.resolve();
    const run = previous.then(task, task);
    const tail = run.catch(() => undefined);
    tails.set(key, tail);
    void tail.then(() => {
      if (tails.get(key) === tail) tails.delete(key);
    });
    return run;
  };
}
