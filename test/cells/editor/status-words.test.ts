import { describe, expect, it } from "vitest";
import { durationWords, progressWords, statusWords } from "../../../cells/editor/run/status-words";

describe("status words", () => {
  it("statusWords says what a solving transport is doing with its progress", () => {
    const w = statusWords("transport", { status: "running", since: 0, progress: { iteration: 240, marginalError: 3.1e-5 } });
    expect(w).toEqual({ text: "solving — iteration 240, marginal error 3.1e-5", tone: "busy" });
  });

  it("statusWords says queued for a waiting cell and ready with the time for a done one", () => {
    expect(statusWords("data", { status: "waiting" }).text).toBe("queued");
    expect(statusWords("transport", { status: "done", value: 1, seconds: 0.41, runs: 1 }).text).toBe("ready · 0.41 s");
  });

  it("statusWords gives a failure its message and its cause in parentheses", () => {
    const w = statusWords("figure", { status: "failed", error: new Error("x"), message: "plan failed: bad", cause: { kind: "upstream", name: "plan" } });
    expect(w.text).toBe("failed: plan failed: bad (because plan failed)");
    expect(w.tone).toBe("bad");
  });

  it("statusWords says why a cell is held", () => {
    expect(statusWords("code", { status: "held", reason: "not trusted" }).text).toBe("held: not trusted");
  });

  it("progressWords reads a sweep's runs and a free message", () => {
    expect(progressWords({ run: 3, of: 12 })).toBe("run 3 of 12");
    expect(progressWords({ message: "waiting for a free solver" })).toBe("waiting for a free solver");
  });

  it("durationWords writes short times in ms and long ones in minutes", () => {
    expect(durationWords(0.012)).toBe("12 ms");
    expect(durationWords(125)).toBe("2 min 05 s");
  });
});
