import { describe, expect, it } from "vitest";
import { DataImportError } from "../../../cells/data/import-error";
import { parseNpy } from "../../../cells/data/parse-npy";
import { expected, fixtureBytes, thrown } from "./fixtures";

// Reference: the numpy .npy format specification (numpy.lib.format module documentation,
// numpy 2.4.6; first proposed in NEP 1). Every fixture was written by numpy itself
// (numpy.lib.format.write_array / write_array_header_1_0) and expected.json holds what
// numpy.load reads back, cast to float64 in C order — the outside reference below.

/** A little .npy file with a header dict we write by hand, padded as the specification says. */
function npyBytes(header: string, payload: Uint8Array, version: [number, number] = [1, 0]): Uint8Array {
  const lengthBytes = version[0] === 1 ? 2 : 4;
  let text = header;
  while ((10 + (lengthBytes - 2) + text.length + 1) % 64 !== 0) text += " ";
  text += "\n";
  const head = new Uint8Array(8 + lengthBytes + text.length);
  head.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, version[0], version[1]]);
  const view = new DataView(head.buffer);
  if (lengthBytes === 2) view.setUint16(8, text.length, true);
  else view.setUint32(8, text.length, true);
  for (let k = 0; k < text.length; k++) head[8 + lengthBytes + k] = text.charCodeAt(k);
  const out = new Uint8Array(head.length + payload.length);
  out.set(head);
  out.set(payload, head.length);
  return out;
}

function f8(values: number[]): Uint8Array {
  return new Uint8Array(Float64Array.from(values).buffer);
}

describe("parseNpy on numpy-written fixtures", () => {
  for (const [name, want] of Object.entries(expected.npy)) {
    it(`parseNpy(${name}) returns numpy's shape and values (${want.descr}, version ${want.version}${want.fortran_order ? ", Fortran order" : ""})`, () => {
      const array = parseNpy(fixtureBytes(name), { name });
      // numpy.load(name).astype(float64) in C order, recorded by make_fixtures.py (numpy .npy format, numpy.lib.format / NEP 1).
      expect(array.shape).toEqual(want.shape);
      expect(array.dtype).toBe(want.descr);
      expect(Array.from(array.data)).toEqual(want.values);
    });
  }

  it("parseNpy covers every dtype and header version the brief lists", () => {
    // Guards the fixture set itself: each listed case must be among the numpy-written files.
    const seen = new Set(Object.values(expected.npy).map((e) => e.descr));
    for (const descr of ["<f8", "<f4", ">f8", "<i4", "<i8", "<u1", "|u1", "|b1"]) expect(seen).toContain(descr);
    const versions = new Set(Object.values(expected.npy).map((e) => e.version));
    expect([...versions].sort()).toEqual(["1.0", "2.0", "3.0"]);
    expect(Object.values(expected.npy).some((e) => e.fortran_order && e.shape.length === 2)).toBe(true);
  });

  it("parseNpy reads a Fortran-order file as the transpose of its storage order", () => {
    // numpy.lib.format: with fortran_order True the data is column-major; row-major (i, k) = storage[k*rows + i].
    const bytes = fixtureBytes("points_fortran_f8.npy");
    const array = parseNpy(bytes);
    const [rows, cols] = array.shape;
    const stored = new Float64Array(bytes.slice(bytes.length - rows * cols * 8).buffer);
    for (let i = 0; i < rows; i++) for (let k = 0; k < cols; k++) expect(array.data[i * cols + k]).toBe(stored[k * rows + i]);
  });

  for (const [name, want] of Object.entries(expected.npy_refused)) {
    it(`parseNpy(${name}) throws a DataImportError mentioning "${want.reason_contains}"`, () => {
      const error = thrown(() => parseNpy(fixtureBytes(name), { name }));
      expect(error).toBeInstanceOf(DataImportError);
      expect(error.file).toBe(name);
      expect(String(error.reason)).toContain(want.reason_contains);
    });
  }
});

describe("parseNpy on damaged input", () => {
  const good = fixtureBytes("points_f8.npy");

  it("parseNpy of a file cut inside the data throws 'truncated data' with the byte counts", () => {
    const cut = good.slice(0, good.length - 3);
    const error = thrown(() => parseNpy(cut, { name: "cut.npy" }));
    expect(error).toBeInstanceOf(DataImportError);
    expect(error.message).toBe("cut.npy: truncated data: shape (5, 2) of <f8 needs 80 bytes, the file has 77 after the header");
  });

  it("parseNpy of a file cut inside the header throws 'truncated header'", () => {
    const error = thrown(() => parseNpy(good.slice(0, 40)));
    expect(error.reason).toMatch(/^truncated header: the header length says 118 bytes, the file has 30/);
  });

  it("parseNpy of a file cut inside the length field or magic string says truncated", () => {
    expect(thrown(() => parseNpy(good.slice(0, 9))).reason).toMatch(/^truncated: .*header length/);
    expect(thrown(() => parseNpy(good.slice(0, 4))).reason).toMatch(/^truncated: .*magic string/);
    expect(thrown(() => parseNpy(good.slice(0, 7))).reason).toMatch(/^truncated: .*version/);
  });

  it("parseNpy of an empty byte array throws 'not a .npy file'", () => {
    expect(thrown(() => parseNpy(new Uint8Array(0))).reason).toMatch(/^not a \.npy file: .*an empty file/);
  });

  it("parseNpy with a corrupt magic string throws 'not a .npy file' showing the bytes found", () => {
    const bad = good.slice();
    bad[1] = 0x4d; // "\x93MUMPY"
    const error = thrown(() => parseNpy(bad, { name: "bad.npy" }));
    expect(error).toBeInstanceOf(DataImportError);
    expect(error.reason).toBe("not a .npy file: it must start with the magic string \\x93NUMPY (bytes 93 4e 55 4d 50 59), found 93 4d 55 4d 50 59 01 00");
  });

  it("parseNpy of a zip archive (.npz) says so", () => {
    const zip = new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0, 8, 0]);
    expect(thrown(() => parseNpy(zip)).reason).toMatch(/zip archive \(\.npz/);
  });

  it("parseNpy with version 4.0 throws naming the version", () => {
    const bad = good.slice();
    bad[6] = 4;
    expect(thrown(() => parseNpy(bad)).reason).toBe("unsupported .npy format version 4.0; readable versions are 1.0, 2.0 and 3.0");
  });

  it("parseNpy with a header that is not a Python literal throws 'malformed header'", () => {
    const bad = good.slice();
    bad[10] = 0x5b; // "{" → "[" : the dict never closes as a list
    expect(thrown(() => parseNpy(bad)).reason).toMatch(/^malformed header: /);
  });

  it("parseNpy with a header missing 'shape' throws naming the keys found", () => {
    const bytes = npyBytes("{'descr': '<f8', 'fortran_order': False, }", f8([1]));
    expect(thrown(() => parseNpy(bytes)).reason).toBe("malformed header: the keys must be exactly 'descr', 'fortran_order', 'shape'; found 'descr', 'fortran_order'");
  });

  it("parseNpy with an extra header key throws, as numpy's reader does", () => {
    const bytes = npyBytes("{'descr': '<f8', 'fortran_order': False, 'shape': (1,), 'extra': 1}", f8([1]));
    expect(thrown(() => parseNpy(bytes)).reason).toMatch(/found 'descr', 'extra', 'fortran_order', 'shape'/);
  });

  it("parseNpy with a list shape or a non-bool fortran_order throws 'malformed header'", () => {
    expect(thrown(() => parseNpy(npyBytes("{'descr': '<f8', 'fortran_order': False, 'shape': [1]}", f8([1])))).reason).toMatch(/'shape' must be a tuple/);
    expect(thrown(() => parseNpy(npyBytes("{'descr': '<f8', 'fortran_order': 0, 'shape': (1,)}", f8([1])))).reason).toMatch(/'fortran_order' must be True or False/);
    expect(thrown(() => parseNpy(npyBytes("{'descr': '<f8', 'fortran_order': False, 'shape': (-1,)}", f8([1])))).reason).toMatch(/non-negative/);
  });

  it("parseNpy with a header that is not a dict throws 'malformed header'", () => {
    expect(thrown(() => parseNpy(npyBytes("('<f8', False, (1,))", f8([1])))).reason).toMatch(/^malformed header: expected a dict/);
  });

  it("parseNpy with an unsupported dtype names it", () => {
    expect(thrown(() => parseNpy(npyBytes("{'descr': '<c8', 'fortran_order': False, 'shape': (1,)}", f8([1])))).reason).toMatch(/^unsupported dtype "<c8": complex/);
    expect(thrown(() => parseNpy(npyBytes("{'descr': '<f16', 'fortran_order': False, 'shape': (1,)}", new Uint8Array(16)))).reason).toMatch(/extended-precision/);
    expect(thrown(() => parseNpy(npyBytes("{'descr': '<M8[ns]', 'fortran_order': False, 'shape': (1,)}", f8([1])))).reason).toMatch(/datetime/);
  });

  it("parseNpy with bytes after the data throws naming how many", () => {
    const extra = new Uint8Array(good.length + 5);
    extra.set(good);
    expect(thrown(() => parseNpy(extra)).reason).toMatch(/^5 unexpected bytes after the data of shape \(5, 2\)/);
  });

  it("parseNpy reads a header written with Python 2 long integers (3L), as numpy's reader accepts", () => {
    // numpy.lib.format._filter_header strips the L suffix of Python 2 headers.
    const array = parseNpy(npyBytes("{'descr': '<f8', 'fortran_order': False, 'shape': (2L, 1L), }", f8([1.5, -2])));
    expect(array.shape).toEqual([2, 1]);
    expect(Array.from(array.data)).toEqual([1.5, -2]);
  });

  it("parseNpy reads a version 2.0 header built by hand the same as version 1.0", () => {
    const header = "{'descr': '>i4', 'fortran_order': True, 'shape': (2, 2), }";
    const payload = new Uint8Array([0, 0, 0, 1, 0, 0, 0, 2, 0, 0, 0, 3, 0xff, 0xff, 0xff, 0xff]); // column-major 1, 2 | 3, -1
    expect(Array.from(parseNpy(npyBytes(header, payload, [2, 0])).data)).toEqual([1, 3, 2, -1]);
    expect(Array.from(parseNpy(npyBytes(header, payload, [1, 0])).data)).toEqual([1, 3, 2, -1]);
  });

  it("parseNpy does not modify the bytes it reads", () => {
    const copy = good.slice();
    parseNpy(copy);
    expect(copy).toEqual(good);
  });

  it("parseNpy reads from a Uint8Array that is a window on a larger buffer", () => {
    const big = new Uint8Array(good.length + 13);
    big.set(good, 13);
    expect(Array.from(parseNpy(big.subarray(13)).data)).toEqual(expected.npy["points_f8.npy"].values);
  });
});
