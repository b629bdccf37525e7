import { describe, expect, it } from "vitest";
import { npyElementType } from "../../../cells/data/npy-dtype";

function readOne(descr: string, bytes: number[]): number {
  const result = npyElementType(descr);
  if (!result.ok) throw new Error(result.reason);
  return result.type.read(new DataView(new Uint8Array(bytes).buffer), 0);
}

function reason(descr: string): string {
  const result = npyElementType(descr);
  return result.ok ? "" : result.reason;
}

describe("npyElementType", () => {
  it("npyElementType reads IEEE 754 doubles in both byte orders", () => {
    // IEEE 754-2008 binary64: 1.0 is 0x3FF0000000000000.
    expect(readOne("<f8", [0, 0, 0, 0, 0, 0, 0xf0, 0x3f])).toBe(1);
    expect(readOne(">f8", [0x3f, 0xf0, 0, 0, 0, 0, 0, 0])).toBe(1);
  });

  it("npyElementType decodes half floats exactly, including subnormals, infinity and NaN", () => {
    // IEEE 754-2008 binary16: 0x3C00 = 1, 0x7BFF = 65504 (largest), 0x0001 = 2^-24 (smallest subnormal),
    // 0xC000 = -2, 0x7C00 = +inf, 0x7E00 = NaN.
    expect(readOne("<f2", [0x00, 0x3c])).toBe(1);
    expect(readOne("<f2", [0xff, 0x7b])).toBe(65504);
    expect(readOne("<f2", [0x01, 0x00])).toBe(2 ** -24);
    expect(readOne(">f2", [0xc0, 0x00])).toBe(-2);
    expect(readOne("<f2", [0x00, 0x7c])).toBe(Infinity);
    expect(readOne("<f2", [0x00, 0x7e])).toBeNaN();
  });

  it("npyElementType reads two's-complement integers of every size", () => {
    expect(readOne("|i1", [0x80])).toBe(-128);
    expect(readOne(">i2", [0xff, 0xfe])).toBe(-2);
    expect(readOne("<i4", [0xff, 0xff, 0xff, 0x7f])).toBe(2 ** 31 - 1);
    expect(readOne("<i8", [0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff])).toBe(-1);
    expect(readOne(">u8", [0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff])).toBe(2 ** 64);
  });

  it("npyElementType accepts < and > for one-byte types and reads any non-zero bool byte as 1", () => {
    expect(readOne("<u1", [200])).toBe(200);
    expect(readOne(">u1", [200])).toBe(200);
    expect(readOne("|b1", [0])).toBe(0);
    expect(readOne("|b1", [7])).toBe(1);
  });

  it("npyElementType refuses object, complex, text, void and native-order types with a reason", () => {
    expect(reason("|O")).toMatch(/object arrays/);
    expect(reason("<c16")).toMatch(/complex/);
    expect(reason("<U5")).toMatch(/text/);
    expect(reason("|S3")).toMatch(/byte-string/);
    expect(reason("|V8")).toMatch(/void/);
    expect(reason("=f8")).toMatch(/native byte order/);
    expect(reason("|f8")).toMatch(/needs byte order/);
    expect(reason("<b2")).toMatch(/sizes 1 only/);
    expect(reason("<i3")).toMatch(/sizes 1, 2, 4, 8 only/);
    expect(reason("float64")).toMatch(/^malformed dtype/);
    expect(reason("<f")).toMatch(/no size/);
  });
});
