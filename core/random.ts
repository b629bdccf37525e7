import { TransportInputError, describeValue } from "./errors";

/**
 * A seeded source of uniform numbers in [0, 1). Every random choice in the core
 * goes through one of these, passed in by the caller: same seed, same bits.
 */
export type RandomSource = () => number;

/**
 * Park–Miller "minimal standard" generator (Park & Miller 1988, CACM 31):
 * x ← 16807·x mod (2³¹−1). Exact in doubles. Returns values in (0, 1).
 * Kept because its published check value makes test instances reproducible.
 * The seed is reduced to an integer in [1, 2³¹−2] (|seed| floored, mod 2³¹−1, 0 → 1);
 * a non-finite seed throws a {@link TransportInputError} naming "seed".
 */
export function parkMiller(seed: number): RandomSource {
  // Without this check a NaN seed silently produced a generator of NaNs.
  if (typeof seed !== "number" || !Number.isFinite(seed)) throw new TransportInputError("seed", `must be a finite number, got ${describeValue(seed)}`, seed);
  let x = Math.floor(Math.abs(seed)) % 2147483647;
  if (x === 0) x = 1;
  return () => {
    x = (16807 * x) % 2147483647;
    return x / 2147483647;
  };
}

/**
 * The default generator: a 32-bit counter-based mix ("splitmix32"-style),
 * fast, with good equidistribution for simulation. Seed is any finite number;
 * it is reduced to 32 bits. A non-finite seed throws a {@link TransportInputError}
 * naming "seed".
 */
export function seededRandom(seed: number): RandomSource {
  if (typeof seed !== "number" || !Number.isFinite(seed)) throw new TransportInputError("seed", `must be a finite number, got ${describeValue(seed)}`, seed);
  let state = (Math.trunc(seed) ^ 0x9e3779b9) >>> 0;
  return () => {
    state = (state + 0x9e3779b9) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    z = (z ^ (z >>> 16)) >>> 0;
    return z / 4294967296;
  };
}

/**
 * A generator from either a generator or a seed: a number becomes
 * {@link seededRandom}(number); a function is returned as is (and so keeps its
 * state shared with the caller). Anything else throws a
 * {@link TransportInputError} naming `field` (default "random").
 */
export function randomSource(random: RandomSource | number, field = "random"): RandomSource {
  if (typeof random === "function") return random;
  if (typeof random === "number" && Number.isFinite(random)) return seededRandom(random);
  throw new TransportInputError(field, `must be a seeded random source (a function) or a finite seed, got ${describeValue(random)}`, random);
}

/** A standard normal draw from two uniforms (Box–Muller); uses `random` twice. */
export function normalDraw(random: RandomSource): number {
  let u = random();
  while (u <= 0) u = random();
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}
