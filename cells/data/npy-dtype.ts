/**
 * How to read one element of a .npy array: its size in bytes and a reader
 * returning the element as a double.
 */
export interface NpyElementType {
  /** The descr string as written in the header, e.g. "<f8". */
  readonly descr: string;
  /** Bytes per element. */
  readonly itemSize: number;
  /** Reads the element starting at byte `offset` of `view`. */
  readonly read: (view: DataView, offset: number) => number;
}

/** The outcome of {@link npyElementType}: a reader, or why the type cannot be read. */
export type NpyElementTypeResult = { readonly ok: true; readonly type: NpyElementType } | { readonly ok: false; readonly reason: string };

/**
 * Decodes a simple (non-structured) numpy type string: byte order
 * (`<` little, `>` big, `|` not applicable — allowed for 1-byte types, where `<`
 * and `>` are also accepted), kind and size (numpy `dtype.str`, see the
 * numpy.lib.format documentation). Readable kinds: float `f2 f4 f8`, signed
 * `i1 i2 i4 i8`, unsigned `u1 u2 u4 u8`, bool `b1` (0 or 1). 64-bit integers
 * beyond ±2^53 round to the nearest double, as numpy's cast to float64 does.
 * Complex, object, text, datetime, raw-bytes and extended-precision types
 * are refused with a reason that names them.
 */
export function npyElementType(descr: string): NpyElementTypeResult {
  // Object arrays are written as "|O" without a size, datetimes as "<M8[ns]".
  const match = /^([<>|=])([a-zA-Z])(\d*)(\[[^\]]*\])?$/.exec(descr);
  if (match === null) return refuse(`malformed dtype: ${JSON.stringify(descr)} is not a numpy type string such as "<f8"`);
  const [, order, kind, sizeText] = match;
  const unsupported = UNSUPPORTED_KINDS[kind];
  if (unsupported !== undefined) return refuse(`unsupported dtype ${JSON.stringify(descr)}: ${unsupported}`);
  if (sizeText === "") return refuse(`malformed dtype: ${JSON.stringify(descr)} gives no size in bytes`);
  const size = Number(sizeText);
  const sizes = READABLE_SIZES[kind];
  if (sizes === undefined) return refuse(`unsupported dtype ${JSON.stringify(descr)}: unknown kind ${JSON.stringify(kind)}`);
  if (!sizes.includes(size)) {
    const why = kind === "f" && (size === 12 || size === 16) ? "extended-precision floats (long double) are not portable" : `kind "${kind}" is readable with sizes ${sizes.join(", ")} only`;
    return refuse(`unsupported dtype ${JSON.stringify(descr)}: ${why}; convert with arr.astype("<f8") before saving`);
  }
  if (order === "=") return refuse(`unsupported dtype ${JSON.stringify(descr)}: native byte order "=" does not say which order the file uses`);
  if (order === "|" && size > 1) return refuse(`unsupported dtype ${JSON.stringify(descr)}: a ${size}-byte type needs byte order "<" or ">"`);
  const little = order !== ">";
  return { ok: true, type: { descr, itemSize: size, read: reader(kind, size, little) } };
}

function refuse(reason: string): NpyElementTypeResult {
  return { ok: false, reason };
}

const READABLE_SIZES: Record<string, readonly number[]> = { f: [2, 4, 8], i: [1, 2, 4, 8], u: [1, 2, 4, 8], b: [1] };

const UNSUPPORTED_KINDS: Record<string, string> = {
  c: "complex numbers are not coordinates; save the real and imaginary parts as two columns",
  O: "object arrays hold pickled Python objects, which are not read (and not safe to read)",
  U: "text arrays are not numbers",
  S: "byte-string arrays are not numbers",
  a: "byte-string arrays are not numbers",
  M: "datetime arrays are not numbers; convert them to a numeric scale first",
  m: "timedelta arrays are not numbers; convert them to a numeric scale first",
  V: "raw-bytes (void) arrays are not numbers",
};

function reader(kind: string, size: number, little: boolean): (view: DataView, offset: number) => number {
  switch (`${kind}${size}`) {
    case "f8":
      return (v, o) => v.getFloat64(o, little);
    case "f4":
      return (v, o) => v.getFloat32(o, little);
    case "f2":
      return (v, o) => halfToNumber(v.getUint16(o, little));
    case "i1":
      return (v, o) => v.getInt8(o);
    case "i2":
      return (v, o) => v.getInt16(o, little);
    case "i4":
      return (v, o) => v.getInt32(o, little);
    case "i8":
      return (v, o) => Number(v.getBigInt64(o, little));
    case "u1":
      return (v, o) => v.getUint8(o);
    case "u2":
      return (v, o) => v.getUint16(o, little);
    case "u4":
      return (v, o) => v.getUint32(o, little);
    case "u8":
      return (v, o) => Number(v.getBigUint64(o, little));
    case "b1":
      // numpy writes 0 or 1; any other byte is still true.
      return (v, o) => (v.getUint8(o) === 0 ? 0 : 1);
    default:
      throw new Error(`unreachable: no reader for ${kind}${size}`);
  }
}

/** IEEE 754 binary16 bits to a double (exact: every half is a double). */
function halfToNumber(bits: number): number {
  const sign = bits & 0x8000 ? -1 : 1;
  const exponent = (bits >> 10) & 0x1f;
  const fraction = bits & 0x3ff;
  if (exponent === 0) return sign * fraction * 2 ** -24;
  if (exponent === 31) return fraction === 0 ? sign * Infinity : NaN;
  return sign * (1 + fraction / 1024) * 2 ** (exponent - 15);
}
