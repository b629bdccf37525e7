import type { Measure } from "../../../core/measure";
import type { MeasureFileReader, MeasureFileRequest } from "../../kinds/define-context";
import { measureFromBytes, servedDataPath } from "./measure-from-bytes";

type Entry = { state: "loading" } | { state: "ready"; bytes: Uint8Array } | { state: "failed"; error: Error };

/** Thrown by the reader while a file is still on its way from the server. */
export class DataFileLoadingError extends Error {
  constructor(path: string) {
    super(`loading ${path} from the Couplet server…`);
    this.name = "DataFileLoadingError";
  }
}

/**
 * Data files of the open study, fetched once from the server and kept as bytes.
 * The cell kinds read files synchronously (a MeasureFileReader returns a Measure),
 * which a browser cannot do over the network; so the editor fetches every file a
 * study names before its data cells run, and {@link reader} answers from here.
 * A cell that asks before its file has arrived fails with DataFileLoadingError;
 * `onLoaded` then tells the editor to run it again ({@link generation} changes).
 */
export class DataFileCache {
  private readonly entries = new Map<string, Entry>();
  private readonly generations = new Map<string, number>();
  private readonly fetchBytes: (servedPath: string) => Promise<Uint8Array>;
  private readonly onLoaded: (servedPath: string) => void;

  constructor(fetchBytes: (servedPath: string) => Promise<Uint8Array>, onLoaded: (servedPath: string) => void) {
    this.fetchBytes = fetchBytes;
    this.onLoaded = onLoaded;
  }

  /** Starts fetching `servedPath` unless it is here or on its way. */
  ensure(servedPath: string): void {
    if (this.entries.has(servedPath)) return;
    this.entries.set(servedPath, { state: "loading" });
    this.fetchBytes(servedPath).then(
      (bytes) => this.settle(servedPath, { state: "ready", bytes }),
      (error) => this.settle(servedPath, { state: "failed", error: error instanceof Error ? error : new Error(String(error)) }),
    );
  }

  /** Forgets `servedPath` (or every file) so the next read fetches it again. */
  forget(servedPath?: string): void {
    if (servedPath === undefined) this.entries.clear();
    else this.entries.delete(servedPath);
  }

  /** Changes each time `servedPath` finishes loading; part of a data cell's version key. */
  generation(servedPath: string): number {
    return this.generations.get(servedPath) ?? 0;
  }

  /**
   * A synchronous reader for the cell kinds. `studyPath()` gives the study's path on
   * the server at the time of the read (paths in the study are relative to its folder).
   */
  reader(studyPath: () => string): MeasureFileReader {
    return (path: string, request: MeasureFileRequest): Measure => {
      const served = servedDataPath(studyPath(), path);
      if (served === undefined) throw new Error(`${path}: leaves the folder the Couplet server serves`);
      const entry = this.entries.get(served);
      if (!entry) {
        this.ensure(served);
        throw new DataFileLoadingError(path);
      }
      if (entry.state === "loading") throw new DataFileLoadingError(path);
      if (entry.state === "failed") throw entry.error;
      return measureFromBytes(entry.bytes, path, request);
    };
  }

  private settle(servedPath: string, entry: Entry): void {
    if (!this.entries.has(servedPath)) return; // forgotten meanwhile
    this.entries.set(servedPath, entry);
    this.generations.set(servedPath, this.generation(servedPath) + 1);
    this.onLoaded(servedPath);
  }
}
