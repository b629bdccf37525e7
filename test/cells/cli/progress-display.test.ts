import { describe, expect, it } from "vitest";
import { createProgressDisplay, describeProgress, oneLine } from "../../../cells/cli/progress-display";

const cells = [
  { id: "d1", kind: "data", name: "depots" },
  { id: "t1", kind: "transport", name: "plan" },
  { id: "f1", kind: "figure" },
];

// Control characters: C0 (which holds \r and ESC, the start of every ANSI sequence) and C1
// (ECMA-48, 5th ed. 1991, sections 5.2–5.3).
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/;

function recorder() {
  const out: string[] = [];
  return { out, write: (text: string) => out.push(text) };
}

describe("createProgressDisplay", () => {
  it("createProgressDisplay({live: false}) writes one plain line per finished cell and no control characters", () => {
    const { out, write } = recorder();
    const display = createProgressDisplay({ write, live: false, cells });
    display.update({ cellId: "d1", name: "depots", state: { status: "running", since: 0 } });
    display.update({ cellId: "d1", name: "depots", state: { status: "done", value: 1, seconds: 0.012, runs: 1 } });
    display.update({ cellId: "t1", name: "plan", state: { status: "running", since: 0, progress: { iteration: 10, marginalError: 0.1 } } });
    display.update({ cellId: "t1", name: "plan", state: { status: "running", since: 0, progress: { iteration: 20, marginalError: 0.01 } } });
    display.update({
      cellId: "f1",
      state: { status: "failed", error: new Error("x"), message: "line one\r\nline \u001b[31mtwo", cause: { kind: "own-error" } },
    });
    display.update({ cellId: "t1", name: "plan", state: { status: "done", value: 2, seconds: 1.5, runs: 1 } });
    display.close();
    expect(out).toEqual([
      "[1/3] depots (data) done in 0.01 s\n",
      "[2/3] f1 (figure) failed: line one line [31mtwo\n",
      "[3/3] plan (transport) done in 1.50 s\n",
    ]);
    for (const line of out) expect(line.slice(0, -1)).not.toMatch(CONTROL);
  });

  it("createProgressDisplay({live: false}) prints a cell reported done twice only once", () => {
    const { out, write } = recorder();
    const display = createProgressDisplay({ write, live: false, cells });
    const done = { status: "done", value: 1, seconds: 0, runs: 1 } as const;
    display.update({ cellId: "d1", state: done });
    display.update({ cellId: "d1", state: done });
    expect(out).toHaveLength(1);
  });

  it("createProgressDisplay({live: true}) redraws one line with \\r and shows the running cell's iteration and marginal error", () => {
    const { out, write } = recorder();
    const display = createProgressDisplay({ write, live: true, cells, now: () => 1000, interval: 100 });
    display.update({ cellId: "t1", name: "plan", state: { status: "running", since: 0, progress: { iteration: 40, marginalError: 0.0021 } } });
    expect(out).toEqual(["\r[0/3] running plan (transport) · iteration 40 · marginal error 0.0021 · 0.00 s\u001b[K"]);
    display.close();
    expect(out.at(-1)).toBe("\r\u001b[K");
  });

  it("createProgressDisplay({live: true}) redraws at most once per interval, then draws the latest state", async () => {
    const { out, write } = recorder();
    let t = 0;
    const display = createProgressDisplay({ write, live: true, cells, now: () => t, interval: 100 });
    for (let k = 1; k <= 50; k++) {
      t = k; // 50 reports within 50 ms
      display.update({ cellId: "t1", name: "plan", state: { status: "running", since: 0, progress: { iteration: k * 10, marginalError: 1 / k } } });
    }
    expect(out).toHaveLength(1);
    t = 200;
    await new Promise((resolve) => setTimeout(resolve, 150));
    expect(out).toHaveLength(2);
    expect(out[1]).toContain("iteration 500");
    display.close();
  });

  it("createProgressDisplay({live: true, columns: 40}) cuts the line to the terminal width", () => {
    const { out, write } = recorder();
    const display = createProgressDisplay({ write, live: true, cells, columns: 40, now: () => 0 });
    display.update({ cellId: "t1", name: "plan", state: { status: "running", since: 0, progress: { iteration: 40, marginalError: 0.0021 } } });
    const visible = out[0].replace("\r", "").replace("\u001b[K", "");
    expect(visible.length).toBeLessThanOrEqual(39);
    display.close();
  });
});

describe("describeProgress", () => {
  it("describeProgress(report) words iterations, marginal error, epsilon and counts", () => {
    expect(describeProgress({ iteration: 12, marginalError: 3.2e-7, epsilon: 0.5 })).toEqual(["iteration 12", "marginal error 3.20e-7", "epsilon 0.5"]);
    expect(describeProgress({ done: 3, total: 9 })).toEqual(["3 of 9"]);
    expect(describeProgress({ run: 4, of: 9 })).toEqual(["run 4 of 9"]);
    expect(describeProgress(undefined)).toEqual([]);
  });
});

describe("oneLine", () => {
  it("oneLine(text) removes line breaks and escape characters", () => {
    expect(oneLine("a\nb\t\u001b[1mc\u009b")).toBe("a b [1mc");
  });
});

describe("createProgressDisplay (sweeps)", () => {
  it("createProgressDisplay({live: true}) counts a sweep's runs from its partial table when it reports no progress", () => {
    const out: string[] = [];
    const display = createProgressDisplay({ write: (t) => out.push(t), live: true, cells: [{ id: "s1", kind: "sweep", name: "epsSweep" }], now: () => 0 });
    display.update({ cellId: "s1", state: { status: "running", since: 0, value: { rows: [{}, {}, {}], planned: 9, complete: false } } });
    expect(out[0]).toBe("\r[0/1] running epsSweep (sweep) · run 3 of 9 · 0.00 s\u001b[K");
    display.close();
  });
});
