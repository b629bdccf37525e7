/**
 * Deterministic number formatting for captions and report tables (no locale
 * lookups beyond the fixed "en-US" grouping, so output is identical on every machine).
 */

/** Unicode minus for negative numbers and exponents (typographic practice, no source). */
const MINUS = "\u2212";

/**
 * `value` to `significant` significant digits (default 4, range 1–17): plain
 * notation for 1e−3 ≤ |value| < 1e6, else `m×10ⁿ` written as `me−n`, trailing zeros
 * dropped. NaN → "NaN", ±Infinity → "∞" / "−∞", zero → "0".
 */
export function formatNumber(value: number, significant = 4): string {
  if (Number.isNaN(value)) return "NaN";
  if (value === Infinity) return "∞";
  if (value === -Infinity) return `${MINUS}∞`;
  if (value === 0) return "0";
  const digits = Math.min(17, Math.max(1, Math.round(significant)));
  const abs = Math.abs(value);
  let text: string;
  if (abs >= 1e-3 && abs < 1e6) {
    // String() of the rounded value drops trailing zeros and, in this range, never uses
    // an exponent (toPrecision alone writes 10 as "1e+1" at one digit).
    const rounded = Number(abs.toPrecision(digits));
    text = rounded < 1e6 ? String(rounded) : expForm(abs, digits);
  } else {
    text = expForm(abs, digits);
  }
  return value < 0 ? MINUS + text : text;
}

function expForm(abs: number, digits: number): string {
  const [mantissa, exponent] = abs.toExponential(digits - 1).split("e");
  const e = Number(exponent);
  return `${trimZeros(mantissa)}e${e < 0 ? MINUS : ""}${Math.abs(e)}`;
}

function trimZeros(text: string): string {
  if (!text.includes(".")) return text;
  return text.replace(/0+$/, "").replace(/\.$/, "");
}

/** An integer count with thousands separators: 12345 → "12,345". */
export function formatCount(value: number): string {
  if (!Number.isFinite(value)) return formatNumber(value);
  return Math.round(value).toLocaleString("en-US");
}

/** A share in [0, 1] as a percentage with `decimals` decimals (default 1): 0.8734 → "87.3 %". */
export function formatPercent(share: number, decimals = 1): string {
  if (!Number.isFinite(share)) return formatNumber(share);
  return `${(share * 100).toFixed(decimals)} %`;
}
