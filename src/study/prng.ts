/**
 * Small seeded random numbers for study designs. Deterministic across machines and Node versions (32-bit
 * integer arithmetic only), so a seed names a design for good.
 */

/** mulberry32: a 32-bit state generator, returning uniform numbers in [0, 1). */
export function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 15), z | 1);
    z ^= z + Math.imul(z ^ (z >>> 7), z | 61);
    return ((z ^ (z >>> 14)) >>> 0) / 4294967296;
  };
}

/** A 32-bit integer hash (the murmur3 finaliser) for counter-based draws: value i does not depend on value i − 1. */
export function hash32(value: number): number {
  let h = value >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/** A uniform number in [0, 1) for (seed, index, axis), independent of the order in which points are drawn. */
export function counterUniform(seed: number, index: number, axis: number): number {
  const high = hash32(hash32(hash32(seed) ^ index) + Math.imul(axis + 1, 0x9e3779b9));
  const low = hash32(high ^ 0x5bd1e995 ^ Math.imul(index, 31));
  // 53 bits: 32 from one hash, 21 from the next.
  return (high * 2097152 + (low >>> 11)) / 9007199254740992;
}
