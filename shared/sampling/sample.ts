// Reproducible random sample of a lot. The seed is stored with the lot, so anyone can draw the
// same sample again; the algorithm below must therefore never change for stored seeds:
//   1. seed text (a number is taken as its decimal text) → UTF-8 bytes → FNV-1a 32-bit hash;
//   2. the hash seeds mulberry32, a small 32-bit generator (good enough for choosing pieces,
//      not for cryptography);
//   3. a partial Fisher–Yates shuffle of the positions 0…N-1 picks n of them, each draw an
//      unbiased integer by rejection sampling;
//   4. the chosen serials are returned in their original order.

const FNV_OFFSET_BASIS = 0x811c9dc5;
const FNV_PRIME = 0x01000193;
const TWO_TO_32 = 2 ** 32;

/** FNV-1a, 32-bit, over the UTF-8 bytes of the seed's text. */
export function hashSeed(seed: string | number): number {
  let hash = FNV_OFFSET_BASIS;
  for (const byte of new TextEncoder().encode(String(seed))) {
    hash = Math.imul(hash ^ byte, FNV_PRIME) >>> 0;
  }
  return hash >>> 0;
}

/** mulberry32: returns a function giving the next unsigned 32-bit integer. */
function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = Math.imul(state ^ (state >>> 15), state | 1);
    t = (t + Math.imul(t ^ (t >>> 7), t | 61)) ^ t;
    return (t ^ (t >>> 14)) >>> 0;
  };
}

/** Uniform integer in [0, bound), dropping the top values that would favour small results. */
function uniformBelow(next: () => number, bound: number): number {
  const limit = TWO_TO_32 - (TWO_TO_32 % bound);
  for (;;) {
    const value = next();
    if (value < limit) return value % bound;
  }
}

export function drawSample(serials: readonly string[], n: number, seed: string | number): string[] {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`sample size must be a whole number, got ${n}`);
  if (n > serials.length) throw new RangeError(`cannot draw ${n} pieces from a lot of ${serials.length}`);
  if (new Set(serials).size !== serials.length) throw new Error('serial numbers of a lot must be distinct');
  if (typeof seed === 'string' ? seed.length === 0 : !Number.isFinite(seed)) throw new Error('a sample needs a seed');
  const next = mulberry32(hashSeed(seed));
  const positions = Array.from(serials, (_, index) => index);
  for (let i = 0; i < n; i++) {
    const j = i + uniformBelow(next, positions.length - i);
    [positions[i], positions[j]] = [positions[j], positions[i]];
  }
  return positions
    .slice(0, n)
    .sort((a, b) => a - b)
    .map((index) => serials[index]);
}

/** A fresh seed to store with a lot: 64 random bits from the platform's secure generator, as hex. */
export function newSampleSeed(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(8));
  return Array.from(bytes, (byte) => byte.toString(16).padStart(2, '0')).join('');
}
