import { describe, expect, it } from "vitest";
import { FrameBatcher } from "../../../cells/editor/run/frame-batcher";

describe("FrameBatcher", () => {
  it("push() hands only the newest update of each id to one flush per frame", () => {
    const frames: (() => void)[] = [];
    const flushed: [string, number][][] = [];
    const batcher = new FrameBatcher<number>((u) => flushed.push([...u]), (run) => frames.push(run));
    batcher.push("a", 1);
    batcher.push("a", 2);
    batcher.push("b", 3);
    expect(frames).toHaveLength(1);
    frames[0]();
    expect(flushed).toEqual([[["a", 2], ["b", 3]]]);
  });

  it("flushNow() delivers pending updates at once", () => {
    const flushed: number[] = [];
    const batcher = new FrameBatcher<number>((u) => flushed.push(...u.values()), () => {});
    batcher.push("a", 7);
    batcher.flushNow();
    expect(flushed).toEqual([7]);
  });
});
