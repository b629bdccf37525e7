import { describe, expect, it } from "vitest";
import { measureFromBytes, servedDataPath } from "../../../cells/editor/run/measure-from-bytes";

const bytes = (text: string) => new TextEncoder().encode(text);

describe("data files in the browser", () => {
  it("measureFromBytes reads CSV coordinates and a mass column like the Node reader", () => {
    const m = measureFromBytes(bytes("x,y,mass,label\n0,1,2,a\n3,4,6,b\n"), "data/p.csv", { columns: ["x", "y"], mass: "mass" });
    expect(m.n).toBe(2);
    expect(Array.from(m.points)).toEqual([0, 1, 3, 4]);
    expect(Array.from(m.mass)).toEqual([2, 6]);
  });

  it("measureFromBytes uses a column named mass by default and equal masses without one", () => {
    expect(Array.from(measureFromBytes(bytes("x,mass\n1,3\n2,1\n"), "p.csv", {}).mass)).toEqual([3, 1]);
    expect(Array.from(measureFromBytes(bytes("x\n1\n2\n"), "p.csv", {}).mass)).toEqual([0.5, 0.5]);
  });

  it("measureFromBytes throws naming the file when the format cannot be told", () => {
    expect(() => measureFromBytes(bytes("1"), "points.txt", {})).toThrow(/points\.txt/);
  });

  it("servedDataPath joins a data path to the study's folder and resolves ..", () => {
    expect(servedDataPath("studies/a.couplet.json", "data/p.csv")).toBe("studies/data/p.csv");
    expect(servedDataPath("studies/a.couplet.json", "../shared/p.csv")).toBe("shared/p.csv");
    expect(servedDataPath("a.couplet.json", "./p.csv")).toBe("p.csv");
  });

  it("servedDataPath returns undefined for a path that leaves the served folder", () => {
    expect(servedDataPath("a.couplet.json", "../p.csv")).toBeUndefined();
  });
});
