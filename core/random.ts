/**
 * A seeded source of uniform numbers in [0, 1). Every random choice in the core
 * goes through one of these, passed in by the caller: same seed, same bits.
 */
export type RandomSource = () => number;

/**
 * Park–Miller "minimal standard" generator (Park & Miller 1988, CACM 31):
 * x ← 16807·x mod (2³¹−1). Exact in doubles. Returns values in (0, 1).
 * Kept because its published check value makes test instances reproducible.
 */
export function parkMiller(seed: number): RandomSource {
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
 * it is reduced to 32 bits.
 */
export function seededRandom(seed: number): RandomSource {
  if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number, got ${seed}`);
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

/** A standard normal draw from two uniforms (Box–Muller); uses `random` twice. */
export function normalDraw(random: RandomSource): number {
  let u = random();
  while (u <= 0) u = random();
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}
