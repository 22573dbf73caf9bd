/** Seeded normal generators for repeatable noise draws (mulberry32 + Box–Muller). */

function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function seededNormal(seed: number): () => number {
  const uniform = mulberry32(seed);
  return () => {
    const u = 1 - uniform();
    const v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

/** The same, using both Box–Muller values of each pair: half the work for records of millions of samples. */
export function seededNormalPairs(seed: number): () => number {
  const uniform = mulberry32(seed);
  let spare = NaN;
  return () => {
    if (!Number.isNaN(spare)) {
      const value = spare;
      spare = NaN;
      return value;
    }
    const radius = Math.sqrt(-2 * Math.log(1 - uniform()));
    const angle = 2 * Math.PI * uniform();
    spare = radius * Math.sin(angle);
    return radius * Math.cos(angle);
  };
}

export function mean(values: number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

export function standardDeviation(values: number[]): number {
  const mu = mean(values);
  return Math.sqrt(values.reduce((a, b) => a + (b - mu) ** 2, 0) / (values.length - 1));
}
