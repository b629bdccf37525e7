import { type StudyIssue } from "./study-issue";
import { checkNumber } from "./value-checks";

/**
 * How a number is written in a table column or a live value in prose:
 * - `fixed`: `digits` digits after the decimal point (0.0500 for digits 4);
 * - `significant`: `digits` significant digits (0.05000 for digits 4);
 * - `scientific`: one digit, point, `digits` digits, exponent (5.000e-2 for digits 3);
 * - `auto`: the shortest text that reads back as the same number, or, when
 *   `digits` is given, `significant` for |x| in [1e-3, 1e6) and `scientific` outside.
 */
export type NumberNotation = "auto" | "fixed" | "significant" | "scientific";

/** All notations, in the order the docs list them. */
export const NUMBER_NOTATIONS: readonly NumberNotation[] = ["auto", "fixed", "significant", "scientific"];

/** Largest `digits` accepted: what every JavaScript engine's toFixed/toPrecision/toExponential supports. */
export const MAX_DIGITS = 20;

/**
 * Checks `digits` for a notation: an integer in [0, 20], and at least 1 for
 * `significant` (and `auto`, which may write significant digits).
 */
export function checkDigits(value: unknown, notation: NumberNotation, path: string, issues: StudyIssue[]): boolean {
  const least = notation === "fixed" || notation === "scientific" ? 0 : 1;
  return checkNumber(value, path, issues, { integer: true, atLeast: least, atMost: MAX_DIGITS });
}
