import { sha256 } from "@noble/hashes/sha2.js";
import { bytesToHex } from "@noble/hashes/utils.js";

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
const encoder = new TextEncoder();

/**
 * A fingerprint of a value: "sha256:" and the SHA-256 (FIPS 180-4, via
 * @noble/hashes) of a canonical byte encoding, so equal values give equal
 * fingerprints on every machine and any change of a number's bits changes it.
 * Encoding: a one-letter tag per value — numbers as their 8 IEEE-754 bytes
 * (little-endian; 0.1 and 0.1000000000000001 differ), strings as UTF-8 with their
 * length, typed arrays as their type name, length and element bytes, arrays item
 * by item, plain objects key by key in sorted key order (so key order does not
 * matter), `undefined` fields left out. Functions and symbols are refused
 * (TypeError): they have no stable bytes.
 */
export function fingerprint(value: unknown): string {
  const hash = sha256.create();
  const number = new DataView(new ArrayBuffer(8));
  const tag = (t: string): void => {
    hash.update(encoder.encode(t));
  };
  const length = (n: number) => {
    number.setFloat64(0, n, true);
    hash.update(new Uint8Array(number.buffer.slice(0)));
  };
  const visit = (item: unknown, path: string): void => {
    if (item === null) return tag("n");
    switch (typeof item) {
      case "undefined":
        return tag("u");
      case "boolean":
        return tag(item ? "t" : "f");
      case "number":
        tag("d");
        number.setFloat64(0, item, true);
        hash.update(new Uint8Array(number.buffer.slice(0)));
        return;
      case "bigint":
      case "string": {
        const bytes = encoder.encode(String(item));
        tag(typeof item === "string" ? "s" : "b");
        length(bytes.length);
        hash.update(bytes);
        return;
      }
      case "function":
      case "symbol":
        throw new TypeError(`fingerprint: ${path} is a ${typeof item}, which has no stable bytes`);
    }
    if (ArrayBuffer.isView(item)) {
      const name = item.constructor.name;
      tag("A");
      length(name.length);
      tag(name);
      length(item.byteLength);
      hash.update(littleEndianBytes(item));
      return;
    }
    if (Array.isArray(item)) {
      tag("[");
      length(item.length);
      item.forEach((element, k) => visit(element, `${path}[${k}]`));
      return;
    }
    const keys = Object.keys(item as object)
      .filter((key) => (item as Record<string, unknown>)[key] !== undefined)
      .sort();
    tag("{");
    length(keys.length);
    for (const key of keys) {
      visit(key, path);
      visit((item as Record<string, unknown>)[key], `${path}.${key}`);
    }
  };
  visit(value, "value");
  return `sha256:${bytesToHex(hash.digest())}`;
}

/** The bytes of a typed array in little-endian order (a copy only on big-endian machines). */
function littleEndianBytes(view: ArrayBufferView): Uint8Array {
  const bytes = new Uint8Array(view.buffer, view.byteOffset, view.byteLength);
  const size = (view as unknown as { BYTES_PER_ELEMENT?: number }).BYTES_PER_ELEMENT ?? 1;
  if (LITTLE_ENDIAN || size === 1) return bytes;
  const out = new Uint8Array(bytes.length);
  for (let k = 0; k < bytes.length; k += size) for (let b = 0; b < size; b++) out[k + b] = bytes[k + size - 1 - b];
  return out;
}
