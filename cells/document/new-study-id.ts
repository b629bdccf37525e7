import type { RandomSource } from "../../core/random";

const LETTERS = "abcdefghijklmnopqrstuvwxyz";
const ALPHABET = `${LETTERS}0123456789`;

/**
 * A new cell id not in `taken`.
 * - With a {@link RandomSource}: six characters, a lowercase letter then five
 *   letters or digits (26·36⁵ ≈ 1.6·10⁹ ids), drawn again while taken; seven
 *   and more characters after 100 collisions. Same source state, same id.
 * - With a counter n (a non-negative integer): `c<n in base 36>`, or the first
 *   `c<k>` with k > n that is free — predictable ids for tests and scripts.
 */
export function newStudyId(source: RandomSource | number, taken: ReadonlySet<string> | readonly string[] = []): string {
  const used = taken instanceof Set ? taken : new Set(taken as readonly string[]);
  if (typeof source === "number") {
    if (!Number.isSafeInteger(source) || source < 0) throw new RangeError(`counter must be a non-negative integer, got ${source}`);
    for (let k = source; ; k++) {
      const id = `c${k.toString(36)}`;
      if (!used.has(id)) return id;
    }
  }
  for (let attempt = 0; ; attempt++) {
    const length = 6 + Math.floor(attempt / 100);
    let id = LETTERS[Math.floor(source() * LETTERS.length)];
    while (id.length < length) id += ALPHABET[Math.floor(source() * ALPHABET.length)];
    if (!used.has(id)) return id;
  }
}
