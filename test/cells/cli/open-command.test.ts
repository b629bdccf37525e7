import { mkdtempSync, readFileSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { openCommand } from "../../../cells/cli/open-command";
import { UsageError } from "../../../cells/cli/usage-error";
import type { RunningServer } from "../../../cells/server/start-server";

const depotText = readFileSync(new URL("../../fixtures/studies/depot-supply.couplet.json", import.meta.url), "utf8");

let dir: string;
beforeEach(() => {
  dir = realpathSync(mkdtempSync(join(tmpdir(), "couplet-open-")));
  writeFileSync(join(dir, "depots.couplet.json"), depotText);
  writeFileSync(join(dir, "notes.txt"), "");
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { stdout: (t: string) => out.push(t), stderr: (t: string) => err.push(t), cwd: dir }, out, err };
}

/** Runs `couplet open ARGS`, calls `visit` with the listening server, then stops it the way Ctrl-C would. */
async function openAndStop(argv: string[], visit: (server: RunningServer) => Promise<void>) {
  const { io, out, err } = capture();
  const stop = new AbortController();
  let seen: RunningServer | undefined;
  let visited: Promise<void> = Promise.resolve();
  const code = await openCommand(argv, io, {
    stop: stop.signal,
    onListening: (server) => {
      seen = server;
      visited = visit(server).finally(() => stop.abort());
    },
  });
  await visited;
  return { code, out: out.join(""), err: err.join(""), server: seen as RunningServer };
}

describe("openCommand", () => {
  it("openCommand STUDY prints one 'Couplet editor: URL' line, serves the study's folder and returns 0 when stopped", async () => {
    const { code, out, server } = await openAndStop(["depots.couplet.json", "--no-browser"], async (running) => {
      const session = await fetch(`http://127.0.0.1:${running.port}/api/session`, { headers: { "x-couplet-token": running.token } });
      expect(session.status).toBe(200);
      expect(await session.json()).toMatchObject({ studyPath: "depots.couplet.json", trusted: false });
    });
    expect(code).toBe(0);
    const lines = out.split("\n");
    expect(lines[0]).toMatch(/^Couplet editor: http:\/\/127\.0\.0\.1:\d+\/\?token=[A-Za-z0-9_-]{43}$/);
    expect(lines[0]).toBe(`Couplet editor: ${server.url}`);
    expect(out).toContain("Press Ctrl-C to stop.");
    expect(server.server.listening).toBe(false);
  });

  it("openCommand FOLDER opens the folder with no study", async () => {
    const { code } = await openAndStop(["."], async (running) => {
      const session = await (await fetch(`http://127.0.0.1:${running.port}/api/session`, { headers: { "x-couplet-token": running.token } })).json();
      expect(session.studyPath).toBeNull();
      expect(running.root).toBe(dir);
    });
    expect(code).toBe(0);
  });

  it("openCommand --port N listens on that port", async () => {
    // Find a free port by letting the system pick one, then ask for it.
    let free = 0;
    await openAndStop([], async (running) => {
      free = running.port;
    });
    const { code } = await openAndStop(["--port", String(free)], async (running) => {
      expect(running.port).toBe(free);
    });
    expect(code).toBe(0);
  });

  it("openCommand refuses a missing path, a file that is not a study, two paths and a bad port with a UsageError", async () => {
    const { io } = capture();
    await expect(openCommand(["missing.couplet.json"], io)).rejects.toThrow(new UsageError("missing.couplet.json: no such file or folder"));
    await expect(openCommand(["notes.txt"], io)).rejects.toThrow(/not a study/);
    await expect(openCommand(["a", "b"], io)).rejects.toThrow(/one study or folder/);
    await expect(openCommand(["--port", "70000"], io)).rejects.toThrow(/--port: must be a whole number from 1 to 65535/);
    await expect(openCommand(["--browser"], io)).rejects.toThrow(UsageError);
  });

  it("openCommand --port of a port in use is a UsageError naming the port", async () => {
    await openAndStop([], async (running) => {
      const { io } = capture();
      await expect(openCommand(["--port", String(running.port)], io)).rejects.toThrow(`--port ${running.port}: already in use`);
    });
  });

  it("openCommand --help prints the usage and returns 0", async () => {
    const { io, out } = capture();
    expect(await openCommand(["--help"], io)).toBe(0);
    expect(out.join("")).toContain("Usage: couplet open [STUDY | FOLDER] [options]");
  });
});
