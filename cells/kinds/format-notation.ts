import type { NumberNotation } from "../document/number-format";

/**
 * A number written in one of the document's notations (docs/format.md, "table"
 * and prose live values), with plain ASCII digits, point and minus as JavaScript
 * writes them:
 * - `auto` without digits: the shortest text that reads back as the same number
 *   (`String(x)`: 0.05, 1e-7, 1e+21); with digits: `significant` for
 *   0.001 ≤ |x| < 10⁶ (and 0), else scientific with the same number of significant digits;
 * - `fixed`: `digits` digits after the point (0.05, 3 → "0.050");
 * - `significant`: `digits` significant digits (0.05, 3 → "0.0500"), in plain notation
 *   up to 10²¹ (123456, 3 → "123000"), exponent notation below 10⁻⁶ as JavaScript writes it;
 * - `scientific`: `digits` digits after the mantissa's point (0.05, 3 → "5.000e-2").
 * Non-finite numbers are written "NaN", "Infinity", "-Infinity". `digits` must suit
 * the notation (0–20; 1–20 for significant and auto), as the document checks.
 */
export function formatNotation(value: number, notation: NumberNotation = "auto", digits?: number): string {
  if (!Number.isFinite(value)) return String(value);
  switch (notation) {
    case "fixed":
      return value.toFixed(digits ?? 0);
    case "scientific":
      return value.toExponential(digits ?? 0);
    case "significant":
      return significant(value, digits ?? 1);
    default: {
      if (digits === undefined) return String(value);
      const abs = Math.abs(value);
      return value === 0 || (abs >= 1e-3 && abs < 1e6) ? significant(value, digits) : value.toExponential(digits - 1);
    }
  }
}

function significant(value: number, digits: number): string {
  const text = value.toPrecision(digits);
  // toPrecision writes 123456 at 3 digits as "1.23e+5": write it out in full instead.
  const e = text.indexOf("e+");
  if (e >= 0 && Math.abs(value) < 1e21) return Number(text).toFixed(0);
  return text;
}

/**
 * A number as shown when no format is given (prose `@{name}`): integers in full,
 * others rounded to 6 significant digits with trailing zeros dropped (1.2841,
 * 0.123457, 1.5e-7), so long binary fractions do not spill into the text.
 */
export function defaultNumberText(value: number): string {
  if (!Number.isFinite(value) || Number.isInteger(value)) return String(value);
  return String(Number(value.toPrecision(6)));
}
