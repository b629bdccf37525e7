import { DataImportError } from "./import-error";
import { npyElementType } from "./npy-dtype";
import { type PythonValue, PythonLiteralError, parsePythonLiteral } from "./python-literal";

/**
 * A numeric array read from a .npy file: `shape` is [n] or [n, d]; `data`
 * holds the n or n·d values as doubles, row-major (element (i, k) at
 * `i*d + k`) whatever the file's order; `dtype` is the file's type string.
 */
export interface NpyArray {
  readonly shape: number[];
  readonly data: Float64Array;
  readonly dtype: string;
}

/** Options of {@link parseNpy}. */
export interface ParseNpyOptions {
  /** File name for messages. Default "npy data". */
  name?: string;
}

const MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59]; // "\x93NUMPY"

/** Per version: bytes of the little-endian header-length field and the header's text encoding. */
const VERSIONS: Record<string, { lengthBytes: 2 | 4; encoding: "latin1" | "utf-8" }> = {
  "1.0": { lengthBytes: 2, encoding: "latin1" },
  "2.0": { lengthBytes: 4, encoding: "latin1" },
  "3.0": { lengthBytes: 4, encoding: "utf-8" },
};

/**
 * Reads a numpy .npy file (format versions 1.0, 2.0 and 3.0 as described in the
 * numpy.lib.format documentation, first proposed in NEP 1): the magic string
 * `\x93NUMPY`, a version, a little-endian header length (2 bytes in 1.0, 4 in
 * 2.0 and 3.0), a Python-literal dict with exactly the keys 'descr',
 * 'fortran_order' and 'shape', then the raw data. Fortran-ordered 2-D data is
 * transposed to row-major. Element types: see {@link npyElementType}.
 *
 * Throws a {@link DataImportError} for: a wrong magic string (with a hint
 * when the bytes are a .npz zip archive), an unsupported version, a
 * malformed header, an unsupported dtype, 0-D or 3-D-and-higher shapes,
 * fewer data bytes than the shape needs, and bytes left over after the data
 * (numpy itself ignores those; here they mean a damaged file or several
 * arrays appended to one file, which should not pass unnoticed).
 */
export function parseNpy(bytes: Uint8Array, options: ParseNpyOptions = {}): NpyArray {
  const { name: file = "npy data" } = options;
  const fail: (reason: string) => never = (reason) => {
    throw new DataImportError({ file, reason });
  };
  checkMagic(bytes, fail);
  if (bytes.length < 8) fail(`truncated: the file ends after ${bytes.length} bytes, inside the version number`);
  const version = `${bytes[6]}.${bytes[7]}`;
  const layout = VERSIONS[version];
  if (layout === undefined) fail(`unsupported .npy format version ${version}; readable versions are 1.0, 2.0 and 3.0`);
  const headerStart = 8 + layout.lengthBytes;
  if (bytes.length < headerStart) fail(`truncated: the file ends after ${bytes.length} bytes, inside the header length`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const headerLength = layout.lengthBytes === 2 ? view.getUint16(8, true) : view.getUint32(8, true);
  const dataStart = headerStart + headerLength;
  if (bytes.length < dataStart) fail(`truncated header: the header length says ${headerLength} bytes, the file has ${bytes.length - headerStart} after the length field`);
  const headerBytes = bytes.subarray(headerStart, dataStart);
  const header = decodeHeader(headerBytes, layout.encoding, fail);
  const { descr, fortranOrder, shape } = readHeaderDict(header, fail);

  const typeResult = npyElementType(descr);
  if (!typeResult.ok) return fail(typeResult.reason);
  const type = typeResult.type;
  if (shape.length === 0) fail("a 0-D (scalar) array holds one number, not a table of points; save an array of shape (n,) or (n, d)");
  if (shape.length > 2) fail(`${shape.length}-D arrays are not supported (shape ${formatShape(shape)}); a point cloud is 1-D (n,) or 2-D (n, d)`);

  const count = shape.reduce((p, s) => p * s, 1);
  const needed = count * type.itemSize;
  const available = bytes.length - dataStart;
  if (available < needed) {
    fail(`truncated data: shape ${formatShape(shape)} of ${descr} needs ${needed} bytes, the file has ${available} after the header`);
  }
  if (available > needed) {
    fail(`${available - needed} unexpected bytes after the data of shape ${formatShape(shape)} (${descr}, ${needed} bytes): a damaged file, or several arrays written into one file`);
  }
  const data = new Float64Array(count);
  const rows = shape[0];
  const cols = shape.length === 2 ? shape[1] : 1;
  for (let idx = 0; idx < count; idx++) {
    // In Fortran order the file stores column by column: element idx is (idx % rows, idx / rows).
    const target = fortranOrder && cols > 1 ? (idx % rows) * cols + Math.floor(idx / rows) : idx;
    data[target] = type.read(view, dataStart + idx * type.itemSize);
  }
  return { shape: [...shape], data, dtype: descr };
}

function checkMagic(bytes: Uint8Array, fail: (reason: string) => never): void {
  const prefix = bytes.subarray(0, MAGIC.length);
  if (prefix.length === MAGIC.length && MAGIC.every((b, k) => prefix[k] === b)) return;
  if (bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04) {
    fail("this is a zip archive (.npz, several arrays), not a .npy file; save the one array with numpy.save");
  }
  const shown = Array.from(bytes.subarray(0, 8), (b) => b.toString(16).padStart(2, "0")).join(" ");
  if (prefix.length > 0 && prefix.length < MAGIC.length && MAGIC.slice(0, prefix.length).every((b, k) => prefix[k] === b)) {
    fail(`truncated: the file ends after ${bytes.length} bytes, inside the magic string`);
  }
  fail(`not a .npy file: it must start with the magic string \\x93NUMPY (bytes 93 4e 55 4d 50 59), found ${shown === "" ? "an empty file" : shown}`);
}

function decodeHeader(headerBytes: Uint8Array, encoding: "latin1" | "utf-8", fail: (reason: string) => never): string {
  if (encoding === "latin1") {
    // Latin-1 maps byte b to code point b (TextDecoder's "latin1" is windows-1252, which does not).
    let text = "";
    for (const b of headerBytes) text += String.fromCharCode(b);
    return text;
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(headerBytes);
  } catch {
    return fail("malformed header: a version 3.0 header must be UTF-8 text");
  }
}

function readHeaderDict(header: string, fail: (reason: string) => never): { descr: string; fortranOrder: boolean; shape: number[] } {
  let dict: PythonValue;
  try {
    dict = parsePythonLiteral(header);
  } catch (error) {
    if (error instanceof PythonLiteralError) return fail(`malformed header: ${error.message} of ${JSON.stringify(header.trim())}`);
    throw error;
  }
  if (!(dict instanceof Map)) return fail(`malformed header: expected a dict {'descr': ..., 'fortran_order': ..., 'shape': ...}, got ${JSON.stringify(header.trim())}`);
  const keys = [...dict.keys()].sort();
  if (keys.join(",") !== "descr,fortran_order,shape") {
    fail(`malformed header: the keys must be exactly 'descr', 'fortran_order', 'shape'; found ${keys.map((k) => `'${k}'`).join(", ") || "none"}`);
  }
  const descr = dict.get("descr");
  const fortranOrder = dict.get("fortran_order");
  const shape = dict.get("shape");
  if (Array.isArray(descr)) fail("unsupported dtype: structured (record) arrays are not read; save a plain numeric array, one column per coordinate");
  if (typeof descr !== "string") return fail(`malformed header: 'descr' must be a type string such as '<f8', got ${JSON.stringify(descr)}`);
  if (typeof fortranOrder !== "boolean") return fail(`malformed header: 'fortran_order' must be True or False, got ${JSON.stringify(fortranOrder)}`);
  const dims = shape !== null && typeof shape === "object" && "tuple" in shape ? shape.tuple : undefined;
  if (dims === undefined || !dims.every((s): s is number => typeof s === "number" && Number.isInteger(s) && s >= 0)) {
    return fail("malformed header: 'shape' must be a tuple of non-negative integers");
  }
  return { descr, fortranOrder, shape: dims };
}

/** Python's way of writing a shape: (5,) or (5, 2). */
function formatShape(shape: readonly number[]): string {
  return shape.length === 1 ? `(${shape[0]},)` : `(${shape.join(", ")})`;
}
