import { formatCount, formatNumber, formatPercent } from "../figures/format-number";
import type { ColumnFormat, TableValue } from "./report-model";

/** Writes a table value as text by its column format (see {@link ColumnFormat}); null → "—". */
export function formatTableValue(value: TableValue, format: ColumnFormat | undefined): string {
  if (value === null || value === undefined) return "—";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "string") return value;
  if (format === "text") return String(value);
  if (format === "integer") return formatCount(value);
  if (format === "percent") return formatPercent(value);
  if (format === "scientific") {
    if (!Number.isFinite(value) || value === 0) return formatNumber(value);
    const [m, e] = value.toExponential(2).split("e");
    return `${m.replace("-", "\u2212")}e${e.replace("+", "").replace("-", "\u2212")}`;
  }
  if (format && typeof format === "object" && "fixed" in format) {
    return Number.isFinite(value) ? value.toFixed(Math.min(20, Math.max(0, Math.round(format.fixed)))).replace("-", "\u2212") : formatNumber(value);
  }
  const significant = format && typeof format === "object" && "significant" in format ? format.significant : 4;
  return formatNumber(value, significant);
}

/** A parameter value as run: numbers in their shortest exact form, so a reader can type them back in. */
export function formatParameterValue(value: number | string | boolean): string {
  if (typeof value === "boolean") return value ? "on" : "off";
  return String(value);
}

/** A duration: "0.8 ms", "230 ms", "2.41 s", "3 min 05 s". Not finite or negative → "—". */
export function formatSeconds(seconds: number): string {
  if (!(seconds >= 0) || !Number.isFinite(seconds)) return "—";
  if (seconds < 0.01) return `${formatNumber(seconds * 1000, 2)} ms`;
  if (seconds < 1) return `${Math.round(seconds * 1000)} ms`;
  if (seconds < 59.995) return `${seconds.toFixed(2)} s`;
  const total = Math.round(seconds);
  return `${Math.floor(total / 60)} min ${String(total % 60).padStart(2, "0")} s`;
}
