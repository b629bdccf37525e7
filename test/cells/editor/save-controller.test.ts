import { describe, expect, it } from "vitest";
import { readDraft } from "../../../cells/editor/save/draft-store";
import { SaveController, type SaveStatus } from "../../../cells/editor/save/save-controller";
import { ServerUnreachableError, type StudyServer, type WriteOutcome } from "../../../cells/editor/save/server-api";

// Saving rules of the editor (docs/editor.md, "Saving"): nothing typed is lost
// (a failed write keeps a draft), a file changed on disk stops autosave until the
// user chooses, and one write runs at a time. Common practice, no source.

function memoryStorage() {
  const items = new Map<string, string>();
  return { items, getItem: (k: string) => items.get(k) ?? null, setItem: (k: string, v: string) => void items.set(k, v), removeItem: (k: string) => void items.delete(k) };
}

function fakeServer(answer: (text: string, base: string | null) => WriteOutcome | Error): StudyServer & { writes: { text: string; base: string | null }[] } {
  const writes: { text: string; base: string | null }[] = [];
  return {
    writes,
    session: async () => ({ studyPath: "a.couplet.json", trusted: true }),
    readStudy: async () => ({ text: "", revision: "r0" }),
    writeStudy: async (_path, text, base) => {
      writes.push({ text, base });
      const out = answer(text, base);
      if (out instanceof Error) throw out;
      return out;
    },
    copyStudy: async () => ({ path: "a (draft 2).couplet.json", revision: "c1" }),
    readData: async () => new Uint8Array(),
    trust: async () => {},
    listFiles: async () => ({ studies: [] }),
    createStudy: async (path) => ({ path, text: "", revision: "n1" }),
  };
}

function setup(answer: Parameters<typeof fakeServer>[0]) {
  let text = "v0";
  const timers: (() => void)[] = [];
  const statuses: SaveStatus[] = [];
  const storage = memoryStorage();
  const server = fakeServer(answer);
  const saver = new SaveController({
    server,
    storage,
    path: "a.couplet.json",
    revision: "r0",
    savedText: "v0",
    currentText: () => text,
    onStatus: (s) => statuses.push(s),
    now: () => 1000,
    setTimer: (run) => (timers.push(run), timers.length),
    clearTimer: () => {},
  });
  return { saver, server, storage, statuses, timers, edit: (t: string) => ((text = t), saver.edited()) };
}

describe("SaveController", () => {
  it("edited() schedules one autosave that writes the current text against the base revision", async () => {
    const { saver, server, edit, timers } = setup(() => ({ kind: "saved", revision: "r1" }));
    edit("v1");
    expect(saver.status.kind).toBe("pending");
    timers[timers.length - 1]();
    await new Promise((r) => setTimeout(r, 0));
    expect(server.writes).toEqual([{ text: "v1", base: "r0" }]);
    expect(saver.status.kind).toBe("saved");
    expect(saver.baseRevision).toBe("r1");
  });

  it("save() with an unreachable server keeps a draft in storage and reports it", async () => {
    const { saver, storage, edit } = setup(() => new ServerUnreachableError("The Couplet server did not answer"));
    edit("v1");
    await saver.save();
    expect(saver.status).toMatchObject({ kind: "unwritten", draftKept: true });
    expect(readDraft(storage, "a.couplet.json")).toMatchObject({ text: "v1", baseRevision: "r0" });
  });

  it("save() on a 409 stops autosave until the user chooses", async () => {
    const { saver, server, edit, timers } = setup(() => ({ kind: "conflict", currentRevision: "r9", currentText: "disk" }));
    edit("v1");
    await saver.save();
    expect(saver.status).toMatchObject({ kind: "conflict", diskText: "disk", diskRevision: "r9" });
    const scheduled = timers.length;
    edit("v2");
    expect(timers.length).toBe(scheduled);
    await saver.save();
    expect(server.writes).toHaveLength(1);
  });

  it("reloadFromDisk() after a conflict returns the disk's text and keeps the editor's as a draft", async () => {
    const { saver, storage, edit } = setup(() => ({ kind: "conflict", currentRevision: "r9", currentText: "disk" }));
    edit("mine");
    await saver.save();
    expect(saver.reloadFromDisk()).toEqual({ text: "disk", revision: "r9" });
    expect(readDraft(storage, "a.couplet.json")?.text).toBe("mine");
    expect(saver.status.kind).toBe("saved");
  });

  it("keepBoth() after a conflict writes a copy and continues on the copy's path", async () => {
    const { saver, edit } = setup(() => ({ kind: "conflict", currentRevision: "r9", currentText: "disk" }));
    edit("mine");
    await saver.save();
    expect(await saver.keepBoth()).toBe("a (draft 2).couplet.json");
    expect(saver.studyPath).toBe("a (draft 2).couplet.json");
    expect(saver.baseRevision).toBe("c1");
    expect(saver.status.kind).toBe("saved");
  });

  it("overwrite() after a conflict writes against the disk's revision", async () => {
    let first = true;
    const { saver, server, edit } = setup(() => {
      if (first) return ((first = false), { kind: "conflict", currentRevision: "r9", currentText: "disk" });
      return { kind: "saved", revision: "r10" };
    });
    edit("mine");
    await saver.save();
    await saver.overwrite();
    expect(server.writes[1]).toEqual({ text: "mine", base: "r9" });
    expect(saver.status.kind).toBe("saved");
  });

  it("save() while a write runs saves the newer text right after it", async () => {
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    const server = fakeServer(() => ({ kind: "saved", revision: "rx" }));
    const write = server.writeStudy;
    server.writeStudy = async (...args) => {
      await gate;
      return write(...args);
    };
    let text = "v1";
    const saver = new SaveController({ server, path: "a.couplet.json", revision: "r0", savedText: "v0", currentText: () => text, setTimer: () => 0, clearTimer: () => {} });
    const first = saver.save();
    text = "v2";
    const second = saver.save();
    release();
    await Promise.all([first, second]);
    expect(server.writes.map((w) => w.text)).toEqual(["v1", "v2"]);
  });
});
