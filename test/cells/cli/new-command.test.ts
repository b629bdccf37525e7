import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { main } from "../../../cells/cli/main";
import { parseStudy, serializeStudy } from "../../../cells/document";
import { starterStudy } from "../../../cells/study/starter-study";
import { captureIO, scratchWith } from "./capture-io";

describe("couplet new", () => {
  it("new FILE writes the starter study in canonical form and says how to run it", async () => {
    const dir = scratchWith();
    const { io, out } = captureIO(dir);
    expect(await main(["new", "pickups.couplet.json"], io)).toBe(0);
    const text = readFileSync(join(dir, "pickups.couplet.json"), "utf8");
    expect(text).toBe(serializeStudy(starterStudy()));
    expect(out()).toBe("wrote pickups.couplet.json: a starter study of 9 cells\nrun it:   couplet run pickups.couplet.json --report pickups.html\n");
  });

  it("new FILE --title T uses the title", async () => {
    const dir = scratchWith();
    const { io } = captureIO(dir);
    expect(await main(["new", "s.couplet.json", "--title", "Ferry queues"], io)).toBe(0);
    expect(parseStudy(readFileSync(join(dir, "s.couplet.json"), "utf8")).title).toBe("Ferry queues");
  });

  it("new FILE refuses to replace an existing file and exits 2, leaving it untouched", async () => {
    const dir = scratchWith();
    const file = join(dir, "mine.couplet.json");
    writeFileSync(file, "my notes");
    const { io, err } = captureIO(dir);
    expect(await main(["new", "mine.couplet.json"], io)).toBe(2);
    expect(readFileSync(file, "utf8")).toBe("my notes");
    expect(err()).toContain("couplet new: mine.couplet.json exists; choose another name, or add --force");
  });

  it("new FILE --force replaces it and keeps the old file as FILE.previous", async () => {
    const dir = scratchWith();
    const file = join(dir, "mine.couplet.json");
    writeFileSync(file, "my notes");
    const { io } = captureIO(dir);
    expect(await main(["new", "mine.couplet.json", "--force"], io)).toBe(0);
    expect(readFileSync(`${file}.previous`, "utf8")).toBe("my notes");
    expect(parseStudy(readFileSync(file, "utf8")).cells).toHaveLength(9);
  });

  it("new FOLDER, new in a missing folder and new without a file exit 2", async () => {
    const dir = scratchWith();
    mkdirSync(join(dir, "sub"));
    const { io, err } = captureIO(dir);
    expect(await main(["new", "sub"], io)).toBe(2);
    expect(err()).toContain("sub is a folder; name a file");
    expect(await main(["new", "missing/s.couplet.json"], io)).toBe(2);
    expect(err()).toContain("cannot write missing/s.couplet.json: no such file or folder");
    expect(existsSync(join(dir, "missing"))).toBe(false);
    expect(await main(["new"], io)).toBe(2);
    expect(err()).toContain("new needs one file name; got 0");
  });

  it("new --help prints the options and exits 0", async () => {
    const { io, out } = captureIO(scratchWith());
    expect(await main(["new", "--help"], io)).toBe(0);
    expect(out()).toContain("--title T");
    expect(out()).toContain("--force");
  });
});
