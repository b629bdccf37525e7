import { describe, expect, it } from "vitest";
import { shortestCycle } from "../../../cells/runtime/shortest-cycle";

// Breadth-first search finds shortest paths in unweighted graphs (Moore 1959,
// "The shortest path through a maze"); a shortest cycle through s is a shortest
// path from s's successors back to s.
const graph = (edges: Record<string, string[]>) => (node: string) => edges[node] ?? [];

describe("shortestCycle", () => {
  it("shortestCycle(start, inputsOf) returns null when start is on no cycle", () => {
    expect(shortestCycle("a", graph({ a: ["b"], b: ["c"], c: [] }))).toBeNull();
  });

  it("shortestCycle(start, inputsOf) returns [start] for a self-loop", () => {
    expect(shortestCycle("a", graph({ a: ["b", "a"] }))).toEqual(["a"]);
  });

  it("shortestCycle(start, inputsOf) prefers the shorter of two cycles, in dependency order", () => {
    // a → b → c → d → a and a → e → a: the second is shorter.
    expect(shortestCycle("a", graph({ a: ["b", "e"], b: ["c"], c: ["d"], d: ["a"], e: ["a"] }))).toEqual(["a", "e"]);
    expect(shortestCycle("b", graph({ a: ["b", "e"], b: ["c"], c: ["d"], d: ["a"], e: ["a"] }))).toEqual(["b", "c", "d", "a"]);
  });

  it("shortestCycle(start, inputsOf) ignores cycles that do not pass through start", () => {
    expect(shortestCycle("a", graph({ a: ["b"], b: ["c"], c: ["b"] }))).toBeNull();
  });
});
