/**
 * The shortest cycle through `start` in a directed graph given by `inputsOf`
 * (edges point from a node to the nodes it depends on), found by breadth-first
 * search. Returns the nodes in dependency order starting with `start`
 * (`[a, b]` means a uses b and b uses a; `[a]` a self-reference), or null if
 * `start` is on no cycle.
 */
export function shortestCycle<T>(start: T, inputsOf: (node: T) => Iterable<T>): T[] | null {
  const parent = new Map<T, T>();
  const queue: T[] = [];
  for (const next of inputsOf(start)) {
    if (next === start) return [start];
    if (!parent.has(next)) {
      parent.set(next, start);
      queue.push(next);
    }
  }
  for (let head = 0; head < queue.length; head++) {
    const node = queue[head];
    for (const next of inputsOf(node)) {
      if (next === start) {
        const path: T[] = [];
        for (let at: T = node; at !== start; at = parent.get(at)!) path.push(at);
        path.push(start);
        return path.reverse();
      }
      if (!parent.has(next)) {
        parent.set(next, node);
        queue.push(next);
      }
    }
  }
  return null;
}
