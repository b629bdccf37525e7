import { describe, expect, it } from "vitest";
import { DataFileCache, DataFileLoadingError } from "../../../cells/editor/run/data-file-cache";

describe("DataFileCache", () => {
  it("reader() fails while a file is on its way, then reads it once it has arrived", async () => {
    let release!: (bytes: Uint8Array) => void;
    const loaded: string[] = [];
    const cache = new DataFileCache(() => new Promise((r) => (release = r)), (path) => loaded.push(path));
    const read = cache.reader(() => "studies/s.couplet.json");
    expect(() => read("data/p.csv", {})).toThrow(DataFileLoadingError);
    expect(cache.generation("studies/data/p.csv")).toBe(0);
    release(new TextEncoder().encode("x\n1\n2\n"));
    await Promise.resolve();
    expect(loaded).toEqual(["studies/data/p.csv"]);
    expect(cache.generation("studies/data/p.csv")).toBe(1);
    expect(read("data/p.csv", {})).toMatchObject({ kind: "points", n: 2 });
  });

  it("reader() rethrows the server's error for a file that could not be fetched", async () => {
    const cache = new DataFileCache(async () => {
      throw new Error("reading p.csv: the server answered 404");
    }, () => {});
    cache.ensure("p.csv");
    await new Promise((r) => setTimeout(r, 0));
    expect(() => cache.reader(() => "s.couplet.json")("p.csv", {})).toThrow(/404/);
  });
});
