/**
 * A caller's mistake: the input named by `field` has an unusable value.
 * Thrown at the boundary of the core; numerical outcomes (not converged,
 * mass lost) are never thrown but reported in a result's diagnostics.
 */
export class TransportInputError extends Error {
  /** Dotted path of the offending input, e.g. "source.mass[3]" or "epsilon". */
  readonly field: string;
  /** The offending value (as given, may be NaN or undefined). */
  readonly value: unknown;

  constructor(field: string, message: string, value?: unknown) {
    super(`${field}: ${message}`);
    this.name = "TransportInputError";
    this.field = field;
    this.value = value;
  }
}

/** Formats a value for an error message: NaN and ±Infinity stay readable. */
export function describeValue(value: unknown): string {
  if (typeof value === "number") return Number.isNaN(value) ? "NaN" : String(value);
  if (typeof value === "string") return JSON.stringify(value);
  if (value === undefined) return "undefined";
  try {
    const text = JSON.stringify(value);
    return text.length > 60 ? `${text.slice(0, 57)}...` : text;
  } catch {
    return String(value);
  }
}
