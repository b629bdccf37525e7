import { afterEach, describe, expect, it } from "vitest";
import { createStudy, updateStudy } from "../../../cells/document";
import type { Cell } from "../../../cells/document";
import { solveInThread } from "../../../cells/kinds/define-context";
import type { EditorCellState } from "../../../cells/editor/run/status-words";
import { StudySession, withWarmStarts } from "../../../cells/editor/run/study-session";

const cells: Cell[] = [
  { id: "p", kind: "parameter", name: "eps", settings: { control: "log-range", value: 0.5, min: 0.01, max: 1 } },
  { id: "a", kind: "data", name: "a", settings: { from: "inline", points: [[0], [1]] } },
  { id: "b", kind: "data", name: "b", settings: { from: "inline", points: [[0.5], [2]] } },
  { id: "t", kind: "transport", name: "plan", settings: { source: "a", target: "b", method: "exact" } },
  { id: "c", kind: "code", name: "twice", settings: { code: "plan.values.cost * 2" } },
  { id: "s", kind: "prose", settings: { text: "Twice the cost: @{twice:3f}" } },
];
const study = updateStudy(createStudy({ title: "t" }), cells.map((cell) => ({ type: "insert-cell" as const, cell }))).study;

const sessions: StudySession[] = [];
function open(runCode: boolean) {
  const session = new StudySession({ study, solve: solveInThread, runCode });
  sessions.push(session);
  return session;
}
afterEach(() => sessions.splice(0).forEach((s) => s.dispose()));

const value = (state: EditorCellState) => (state.status === "done" ? state.value : state.status);

describe("StudySession", () => {
  it("runs the study: an exact 1-D cost and code using it", async () => {
    const session = open(true);
    await session.settled();
    // Masses ½: ½(0 − 0.5)² + ½(1 − 2)² = 0.625 (monotone coupling in 1-D; a fact of the trade, no source).
    expect(value(session.state("c"))).toBeCloseTo(1.25, 12);
  });

  it("apply() re-runs the changed cell and undo() brings back the earlier value", async () => {
    const session = open(true);
    await session.settled();
    expect(session.apply([{ type: "set-setting", id: "b", path: "points", value: [[0.5], [3]] }], "move b")).toBeUndefined();
    await session.settled();
    expect(value(session.state("c"))).toBeCloseTo(2 * (0.5 * 0.25 + 0.5 * 4), 12);
    expect(session.undo()).toBe(true);
    await session.settled();
    expect(value(session.state("c"))).toBeCloseTo(1.25, 12);
  });

  it("apply() answers a refused change with the study's message and changes nothing", () => {
    const session = open(true);
    const before = session.study;
    expect(session.apply([{ type: "set-setting", id: "p", path: "value", value: 5 }], "bad")).toMatch(/value: must be within \[0\.01, 1\], got 5/);
    expect(session.study).toBe(before);
  });

  it("a session that does not run code shows code cells, and cells waiting on them, as held", async () => {
    const session = open(false);
    await session.settled();
    expect(session.state("c").status).toBe("held");
    const after = session.state("s");
    expect(after.status).toBe("held");
    expect(after.status === "held" && after.reason).toMatch(/waits on twice/);
    expect(value(session.state("t"))).not.toBe("held");
  });

  it("setRunCode(true) runs the held code", async () => {
    const session = open(false);
    await session.settled();
    session.setRunCode(true);
    await session.settled();
    expect((value(session.state("s")) as { html: string }).html).toContain("1.250");
  });

  it("withWarmStarts turns on warmStart for iterative transports only, and leaves the study alone", () => {
    const entropic = updateStudy(study, [{ type: "set-settings", id: "t", settings: { source: "a", target: "b", method: "entropic", epsilon: { absolute: 0.1 } } }]).study;
    const warm = withWarmStarts(entropic);
    expect(warm.cells.find((c) => c.id === "t")?.settings).toMatchObject({ warmStart: true });
    expect(entropic.cells.find((c) => c.id === "t")?.settings).not.toHaveProperty("warmStart");
    expect(withWarmStarts(study)).toBe(study);
  });
});
