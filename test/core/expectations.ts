// The small assertion helpers shared by the core's tests (STYLE.md: numbers within
// tolerances through one small helper).
import { expect } from "vitest";
import { TransportInputError } from "../../core/errors";

/** Runs `fn` and returns the TransportInputError it throws (fails the test otherwise). */
export function inputError(fn: () => unknown): TransportInputError {
  try {
    fn();
  } catch (error) {
    expect(error).toBeInstanceOf(TransportInputError);
    return error as TransportInputError;
  }
  throw new Error("expected a TransportInputError, nothing was thrown");
}

/** |actual − expected| ≤ rel·max(|expected|, floor), with both numbers in the failure message. */
export function expectClose(actual: number, expected: number, rel: number, floor = 0): void {
  const bound = rel * Math.max(Math.abs(expected), floor);
  if (!(Math.abs(actual - expected) <= bound)) throw new Error(`expected ${actual} within ${bound} of ${expected}`);
}
