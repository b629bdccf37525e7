import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

/** Folder of the data-import fixtures written by test/fixtures/data/make_fixtures.py. */
export const FIXTURES = fileURLToPath(new URL("../../fixtures/data/", import.meta.url));

/** Bytes of one fixture file. */
export function fixtureBytes(name: string): Uint8Array {
  return new Uint8Array(readFileSync(FIXTURES + name));
}

/** Text of one fixture file, byte-order mark kept. */
export function fixtureText(name: string): string {
  return new TextDecoder("utf-8", { ignoreBOM: true }).decode(fixtureBytes(name));
}

interface ExpectedNpy {
  version: string;
  descr: string;
  fortran_order: boolean;
  shape: number[];
  values: number[];
}

/**
 * What numpy (and Python's csv/json modules) read back from each fixture, as
 * recorded by make_fixtures.py: the outside reference of the data-import tests.
 */
export interface Expected {
  npy: Record<string, ExpectedNpy>;
  npy_refused: Record<string, { descr: unknown; reason_contains: string }>;
  text: Record<string, { columns: string[]; rows: number[][] }>;
}

export const expected: Expected = JSON.parse(readFileSync(FIXTURES + "expected.json", "utf-8"));

/** Catches the error a call throws, failing when it does not throw. */
export function thrown(call: () => unknown): Error & Record<string, unknown> {
  try {
    call();
  } catch (error) {
    return error as Error & Record<string, unknown>;
  }
  throw new Error("expected the call to throw");
}
