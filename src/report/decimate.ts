/**
 * Decimation of long waveforms for display. A plot of 10⁵ samples shows no more than one of a few
 * thousand, but a plain stride would drop the peaks and the events people look for, so this keeps, for
 * every series sharing the time base:
 *   - the first and last sample,
 *   - both samples of every event duplicate (two samples with the same t: the one-sided values),
 *   - the global maximum and minimum of each series,
 *   - the minimum and maximum of each series in each of a number of index buckets.
 * The result is a sorted list of indices, so all series of one plot keep one shared time base.
 */

export interface DecimateOptions {
  /** the number of points aimed at (default 3000) */
  target?: number;
  /** never return more than this, unless the always-kept samples alone exceed it (default 4000) */
  max?: number;
}

/** Indices of samples that are always kept, whatever the bucket count. */
function mandatoryIndices(t: ArrayLike<number>, series: ReadonlyArray<ArrayLike<number>>): Set<number> {
  const n = t.length;
  const keep = new Set<number>([0, n - 1]);
  for (let i = 1; i < n; i++) {
    if (t[i] === t[i - 1]) {
      keep.add(i - 1);
      keep.add(i);
    }
  }
  for (const values of series) {
    let iMax = -1;
    let iMin = -1;
    for (let i = 0; i < n; i++) {
      const value = values[i]!;
      if (!Number.isFinite(value)) continue;
      if (iMax < 0 || value > values[iMax]!) iMax = i;
      if (iMin < 0 || value < values[iMin]!) iMin = i;
    }
    if (iMax >= 0) keep.add(iMax);
    if (iMin >= 0) keep.add(iMin);
  }
  return keep;
}

/** Add the per-bucket minimum and maximum of every series; buckets split the index range evenly. */
function addBucketExtremes(
  keep: Set<number>,
  n: number,
  series: ReadonlyArray<ArrayLike<number>>,
  buckets: number,
): void {
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor((b * n) / buckets);
    const end = Math.floor(((b + 1) * n) / buckets);
    if (end <= start) continue;
    for (const values of series) {
      let iMax = -1;
      let iMin = -1;
      for (let i = start; i < end; i++) {
        const value = values[i]!;
        if (!Number.isFinite(value)) continue;
        if (iMax < 0 || value > values[iMax]!) iMax = i;
        if (iMin < 0 || value < values[iMin]!) iMin = i;
      }
      if (iMax >= 0) keep.add(iMax);
      if (iMin >= 0) keep.add(iMin);
    }
  }
}

function sortedIndices(keep: Set<number>): number[] {
  return [...keep].sort((a, b) => a - b);
}

/**
 * Indices to keep so that every series still shows its peaks and events. `series` must have the
 * length of `t`. With n ≤ max every index is returned.
 */
export function decimateIndices(
  t: ArrayLike<number>,
  series: ReadonlyArray<ArrayLike<number>>,
  options: DecimateOptions = {},
): number[] {
  const n = t.length;
  const target = Math.max(2, options.target ?? 3000);
  const max = Math.max(target, options.max ?? 4000);
  for (const values of series) {
    if (values.length !== n) throw new RangeError(`series length ${values.length} differs from t length ${n}`);
  }
  if (n === 0) return [];
  if (n <= max) return Array.from({ length: n }, (_, i) => i);

  const mandatory = mandatoryIndices(t, series);
  // Each bucket yields at most 2 indices per series; start from the count that would reach the target
  // with no overlap between series, then shrink if the union still exceeds the maximum.
  let buckets = Math.max(1, Math.floor(target / 2));
  for (;;) {
    const keep = new Set(mandatory);
    addBucketExtremes(keep, n, series, buckets);
    if (keep.size <= max || buckets === 1) return sortedIndices(keep);
    buckets = Math.max(1, Math.floor((buckets * target) / keep.size));
  }
}

/** The values of `values` at `indices`. */
export function pick<T>(values: ArrayLike<T>, indices: readonly number[]): T[] {
  return indices.map((i) => values[i]!);
}
