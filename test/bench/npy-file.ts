import { closeSync, openSync, writeSync } from "node:fs";

/**
 * Writes a float64 array as a NumPy .npy file (format version 1.0: magic, header
 * length, a Python-literal header dict padded to a multiple of 64 bytes, then the raw
 * little-endian data in C order). `shape` must multiply to `data.length`.
 * Assumes a little-endian host (x86-64, ARM64), as the data are written as they lie in memory.
 */
export function writeNpy(path: string, data: Float64Array, shape: readonly number[]): void {
  const size = shape.reduce((p, s) => p * s, 1);
  if (size !== data.length) throw new Error(`writeNpy: shape ${shape.join("×")} does not hold ${data.length} values`);
  const shapeText = shape.length === 1 ? `(${shape[0]},)` : `(${shape.join(", ")})`;
  let header = `{'descr': '<f8', 'fortran_order': False, 'shape': ${shapeText}, }`;
  const preamble = 10; // 6 magic + 2 version + 2 header length
  const padded = Math.ceil((preamble + header.length + 1) / 64) * 64;
  header = header.padEnd(padded - preamble - 1, " ") + "\n";
  const head = Buffer.alloc(preamble);
  head.write("\x93NUMPY", 0, "latin1");
  head[6] = 1;
  head[7] = 0;
  head.writeUInt16LE(header.length, 8);
  // Two writes rather than one concatenated buffer: a 4000×4000 cost matrix is 128 MB.
  const fd = openSync(path, "w");
  try {
    writeAll(fd, Buffer.concat([head, Buffer.from(header, "latin1")]));
    writeAll(fd, new Uint8Array(data.buffer, data.byteOffset, data.byteLength));
  } finally {
    closeSync(fd);
  }
}

/** writeSync may write less than asked; loop until all bytes are out. */
function writeAll(fd: number, bytes: Uint8Array): void {
  let offset = 0;
  while (offset < bytes.length) offset += writeSync(fd, bytes, offset, bytes.length - offset);
}
