import { describe, expect, it } from "vitest";
import { createStudy, updateStudy } from "../../../cells/document";
import { applyChanges, redo, redoLabel, replacePresent, startHistory, undo, undoLabel } from "../../../cells/editor/model/study-history";

// Undo/redo laws (common practice, no source): undo after apply gives back the very
// same study; redo after undo gives back the very same study; a new change clears redo.

const base = updateStudy(createStudy({ title: "t" }), [
  { type: "insert-cell", cell: { id: "p1", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.05, min: 0.001, max: 1 } } },
]).study;
const setEps = (value: number) => [{ type: "set-setting" as const, id: "p1", path: "value", value }];

describe("study history", () => {
  it("applyChanges then undo gives back the same study object, and redo the changed one", () => {
    const h0 = startHistory(base);
    const { history: h1 } = applyChanges(h0, setEps(0.1), { label: "set eps", now: 0 });
    expect(h1.present).not.toBe(base);
    const { history: h2, step } = undo(h1);
    expect(step?.label).toBe("set eps");
    expect(h2.present).toBe(base);
    const { history: h3 } = redo(h2);
    expect(h3.present).toBe(h1.present);
  });

  it("applyChanges merges steps with the same mergeKey inside the window into one undo step", () => {
    let h = startHistory(base);
    for (const [k, v] of [0.1, 0.2, 0.3].entries()) h = applyChanges(h, setEps(v), { label: "drag", mergeKey: "eps", now: k * 100 }).history;
    expect(h.past).toHaveLength(1);
    expect(undo(h).history.present).toBe(base);
  });

  it("applyChanges starts a new step when the merge window has passed", () => {
    let h = startHistory(base);
    h = applyChanges(h, setEps(0.1), { label: "drag", mergeKey: "eps", now: 0 }).history;
    h = applyChanges(h, setEps(0.2), { label: "drag", mergeKey: "eps", now: 5000 }).history;
    expect(h.past).toHaveLength(2);
  });

  it("applyChanges clears the redo list", () => {
    let h = applyChanges(startHistory(base), setEps(0.1), { label: "a", now: 0 }).history;
    h = undo(h).history;
    expect(redoLabel(h)).toBe("a");
    h = applyChanges(h, setEps(0.3), { label: "b", now: 10 }).history;
    expect(redoLabel(h)).toBeUndefined();
    expect(undoLabel(h)).toBe("b");
  });

  it("applyChanges with a change that changes nothing returns the same history", () => {
    const h = startHistory(base);
    expect(applyChanges(h, setEps(0.05), { label: "same", now: 0 }).history).toBe(h);
  });

  it("applyChanges throws the study's own error and leaves the history as it was", () => {
    const h = startHistory(base);
    expect(() => applyChanges(h, setEps(7), { label: "bad", now: 0 })).toThrow(/must be within \[0\.001, 1\], got 7/);
    expect(h.present).toBe(base);
  });

  it("applyChanges keeps at most `limit` steps, dropping the oldest", () => {
    let h = startHistory(base, 3);
    for (let k = 0; k < 5; k++) h = applyChanges(h, setEps(0.1 + k / 100), { label: `s${k}`, now: k * 10_000 }).history;
    expect(h.past.map((s) => s.label)).toEqual(["s2", "s3", "s4"]);
  });

  it("replacePresent forgets both lists by default", () => {
    const h = applyChanges(startHistory(base), setEps(0.1), { label: "a", now: 0 }).history;
    const r = replacePresent(h, base);
    expect(r.present).toBe(base);
    expect(r.past).toHaveLength(0);
    expect(r.future).toHaveLength(0);
  });
});
