/** Interpolation on sampled signals (model waveforms and measured records alike). Pure. */

/**
 * Linear interpolation of (t, y) at increasing query times. The model's waveforms hold two samples at an
 * event instant (left and right limits); a query exactly there takes the right limit, and an interval of
 * zero length is never divided by. Outside the sampled span the end values are held.
 */
export function interpolateSorted(t: ArrayLike<number>, y: ArrayLike<number>, queries: ArrayLike<number>): number[] {
  const out = new Array<number>(queries.length);
  const last = t.length - 1;
  let k = 0;
  for (let q = 0; q < queries.length; q++) {
    const tq = queries[q]!;
    if (last < 0) {
      out[q] = NaN;
      continue;
    }
    if (tq <= t[0]!) {
      out[q] = tq < t[0]! ? y[0]! : y[rightmostAt(t, 0)]!;
      continue;
    }
    if (tq >= t[last]!) {
      out[q] = y[last]!;
      continue;
    }
    if (t[k]! > tq) k = 0; // a query earlier than the previous one: restart the scan
    while (t[k + 1]! <= tq) k++; // ends with t[k] ≤ tq < t[k+1]: k is the last sample at t[k]
    const t0 = t[k]!;
    const t1 = t[k + 1]!;
    out[q] = y[k]! + ((y[k + 1]! - y[k]!) * (tq - t0)) / (t1 - t0);
  }
  return out;
}

function rightmostAt(t: ArrayLike<number>, index: number): number {
  let k = index;
  while (k + 1 < t.length && t[k + 1] === t[index]) k++;
  return k;
}

/**
 * The same interpolation one query at a time, for queries that mostly increase (a scan over a record of
 * millions of samples needs no output array). A query exactly at an event instant takes the right limit.
 */
export function interpolationCursor(t: ArrayLike<number>, y: ArrayLike<number>): (time: number) => number {
  const last = t.length - 1;
  let k = 0;
  return (time) => {
    if (last < 0) return NaN;
    if (time <= t[0]!) {
      if (time < t[0]!) return y[0]!;
      let first = 0;
      while (first < last && t[first + 1] === t[0]) first++;
      return y[first]!;
    }
    if (time >= t[last]!) return y[last]!;
    if (t[k]! > time) k = 0;
    while (t[k + 1]! <= time) k++;
    return y[k]! + ((y[k + 1]! - y[k]!) * (time - t[k]!)) / (t[k + 1]! - t[k]!);
  };
}
