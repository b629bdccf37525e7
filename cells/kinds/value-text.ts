import { isFigureSpec } from "../views/figures/figure-spec";
import { formatNumber } from "../views/figures/format-number";
import { defaultNumberText } from "./format-notation";
import { describeMeasure, isMeasure } from "./measure-input";
import { isSweepValue } from "./sweep/sweep-value";
import { isTransportValue } from "./transport/transport-value";

const MAIN = { exact: "cost", entropic: "OT_ε", unbalanced: "UOT_ε", debiased: "S_ε" } as const;

/**
 * Any cell value as one short line of plain text, for prose live values without a
 * format and for headlines of code cells: numbers by {@link defaultNumberText},
 * text as it is, measures as "300 points in 2-D", a transport result as its main
 * value ("S_ε = 0.0123"), a sweep as "9 runs over epsilon", arrays as "[3 items]",
 * typed arrays as "Float64Array(300)", other objects as short JSON or their keys.
 */
export function valueText(value: unknown): string {
  switch (typeof value) {
    case "number":
      return defaultNumberText(value);
    case "string":
      return value;
    case "boolean":
    case "bigint":
    case "undefined":
      return String(value);
    case "function":
      return "function";
    case "symbol":
      return value.toString();
  }
  if (value === null) return "null";
  if (isMeasure(value)) return describeMeasure(value);
  if (isTransportValue(value)) {
    const main = value.method === "debiased" ? value.values.divergence : value.method === "exact" ? value.values.cost : value.values.objective;
    return `${MAIN[value.method]} = ${formatNumber(main ?? NaN, 4)}`;
  }
  if (isSweepValue(value)) return `${value.rows.length} runs over ${value.vary}`;
  if (isFigureSpec(value)) return `figure: ${(value as { title?: string }).title ?? value.figure}`;
  if (ArrayBuffer.isView(value)) return `${value.constructor.name}(${(value as unknown as ArrayLike<unknown>).length ?? value.byteLength})`;
  if (Array.isArray(value)) return `[${value.length} ${value.length === 1 ? "item" : "items"}]`;
  if (value instanceof Date) return Number.isNaN(value.getTime()) ? "Invalid Date" : value.toISOString();
  try {
    const json = JSON.stringify(value);
    if (json !== undefined && json.length <= 60) return json;
  } catch {
    // Cycles or BigInts: fall through to the keys.
  }
  const keys = Object.keys(value as object);
  return `{${keys.slice(0, 5).join(", ")}${keys.length > 5 ? ", …" : ""}}`;
}
