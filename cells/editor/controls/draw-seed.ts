/**
 * A fresh seed in [0, 4294967295] for the "new draw" buttons, from the browser's
 * cryptographic source: the user asked for a new, unpredictable draw, and the
 * number is written into the study, so the run stays reproducible afterwards.
 * `source` (filling a one-element array) is injectable for tests.
 */
export function drawSeed(source: (buffer: Uint32Array<ArrayBuffer>) => void = (buffer) => void crypto.getRandomValues(buffer)): number {
  const buffer = new Uint32Array(1);
  source(buffer);
  return buffer[0];
}
