/**
 * Small numerics on sampled signals, shared by the fit and the goodness-of-fit report. Pure.
 */

/**
 * Noise σ of a densely sampled smooth signal: the median absolute deviation of its second differences,
 * scaled to a standard deviation. Second differences of white noise have variance 6σ², and for a normal
 * distribution σ = MAD / 0.6745 (robust scale estimate, e.g. Hampel 1974). Second rather than first
 * differences because the slope of a fast current pulse inflates first differences; the median ignores the
 * few samples at a switching edge. Assumes white (sample-to-sample independent) noise: a scope's bandwidth
 * limit correlates neighbouring samples and makes this an underestimate.
 */
export function estimateNoise(y: ArrayLike<number>, from = 0, to = y.length): number {
  if (to - from < 3) return NaN;
  const second = new Float64Array(to - from - 2);
  for (let i = from + 1; i + 1 < to; i++) second[i - from - 1] = y[i + 1]! - 2 * y[i]! + y[i - 1]!;
  const centre = median(second);
  for (let k = 0; k < second.length; k++) second[k] = Math.abs(second[k]! - centre);
  return median(second) / 0.6744897501960817 / Math.sqrt(6);
}

/** Median of a list (not modified); linear time on a typed copy (Hoare's selection, iterative). */
export function median(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return NaN;
  const work = Float64Array.from(values as ArrayLike<number>);
  const upper = select(work, n >> 1);
  if (n % 2) return upper;
  // the lower middle is the largest value left of the upper one after selection
  let lower = -Infinity;
  for (let i = 0; i < n >> 1; i++) if (work[i]! > lower) lower = work[i]!;
  return (lower + upper) / 2;
}

/** The k-th smallest value (0-based); rearranges `work` so that smaller values lie left of k. */
function select(work: Float64Array, k: number): number {
  let left = 0;
  let right = work.length - 1;
  while (right > left) {
    const pivot = work[(left + right) >> 1]!;
    let i = left;
    let j = right;
    while (i <= j) {
      while (work[i]! < pivot) i++;
      while (work[j]! > pivot) j--;
      if (i <= j) {
        const swap = work[i]!;
        work[i] = work[j]!;
        work[j] = swap;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return work[k]!;
}

/** Median spacing of increasing sample times: the record's sample interval, robust to a gap or an inserted sample. */
export function medianInterval(t: ArrayLike<number>): number {
  if (t.length < 2) return NaN;
  const steps = new Float64Array(t.length - 1);
  for (let i = 1; i < t.length; i++) steps[i - 1] = t[i]! - t[i - 1]!;
  return median(steps);
}

/** Largest |value| of a series (no argument spreading: records hold millions of samples). */
export function largestMagnitude(values: ArrayLike<number>, from = 0, to = values.length): number {
  let largest = 0;
  for (let i = from; i < to; i++) {
    const magnitude = Math.abs(values[i]!);
    if (magnitude > largest) largest = magnitude;
  }
  return largest;
}

export interface Peak {
  value: number;
  time: number;
}

/**
 * The maximum of a sampled signal, refined by a least-squares cubic through the contiguous samples within
 * 3 % of the largest sample (at least three each side). A cubic rather than a parabola because a current
 * pulse rises faster than it falls: a parabola's vertex leans towards the slow side (6 % of a sample
 * interval on a series RLC pulse), the cubic's maximum does not. Falls back to the largest sample when the
 * fit has no maximum inside the window. `kinks` are times where the signal's slope may jump (the model's
 * switching instants, e.g. a crowbar onset just after the peak): the window stops short of them, since no
 * cubic follows a kink (across one the maximum came out 0.3 µs early on a densely sampled crowbarred pulse).
 */
export function locatePeak(t: ArrayLike<number>, y: ArrayLike<number>, kinks: readonly number[] = []): Peak {
  let best = 0;
  for (let i = 1; i < y.length; i++) if (y[i]! > y[best]!) best = i;
  const top = y[best]!;
  const floor = top - 0.03 * Math.abs(top);
  let before = -Infinity;
  let after = Infinity;
  for (const kink of kinks) {
    if (kink < t[best]! && kink > before) before = kink;
    if (kink > t[best]! && kink < after) after = kink;
  }
  let from = best;
  let to = best;
  while (from > 0 && y[from - 1]! >= floor && t[from - 1]! > before) from--;
  while (to + 1 < y.length && y[to + 1]! >= floor && t[to + 1]! < after) to++;
  from = Math.max(0, Math.min(from, best - 3));
  to = Math.min(y.length - 1, Math.max(to, best + 3));
  const sample = { value: top, time: t[best]! };
  if (to - from < 4) return sample;
  // centred, scaled abscissa keeps the 4×4 normal equations well conditioned
  const centre = t[best]!;
  const width = Math.max(t[to]! - centre, centre - t[from]!);
  const normal = Array.from({ length: 4 }, () => new Array<number>(4).fill(0));
  const rhs = new Array<number>(4).fill(0);
  for (let i = from; i <= to; i++) {
    const u = (t[i]! - centre) / width;
    for (let r = 0; r < 4; r++) {
      rhs[r]! += y[i]! * u ** r;
      for (let c = 0; c < 4; c++) normal[r]![c]! += u ** (r + c);
    }
  }
  const [a, b, c, d] = solveSmall(normal, rhs) as [number, number, number, number];
  const lo = (t[from]! - centre) / width;
  const hi = (t[to]! - centre) / width;
  // maximum: a root of b + 2cu + 3du² with negative second derivative 2c + 6du
  const roots = d === 0 ? [-b / (2 * c)] : quadraticRoots(3 * d, 2 * c, b);
  const value = (u: number): number => a + u * (b + u * (c + u * d));
  const candidates = roots.filter((u) => u >= lo && u <= hi && 2 * c + 6 * d * u < 0);
  if (candidates.length === 0) return sample;
  const u = candidates.reduce((p, q) => (value(q) > value(p) ? q : p));
  return { value: value(u), time: centre + u * width };
}

function quadraticRoots(a: number, b: number, c: number): number[] {
  const disc = b * b - 4 * a * c;
  if (disc < 0) return [];
  const q = -0.5 * (b + Math.sign(b || 1) * Math.sqrt(disc)); // stable form (Numerical Recipes §5.6)
  return [q / a, q !== 0 ? c / q : 0];
}

/** Gaussian elimination with partial pivoting for the small normal equations above. */
function solveSmall(matrix: number[][], rhs: number[]): number[] {
  const n = rhs.length;
  const m = matrix.map((row, i) => [...row, rhs[i]!]);
  for (let k = 0; k < n; k++) {
    let pivot = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(m[i]![k]!) > Math.abs(m[pivot]![k]!)) pivot = i;
    [m[k], m[pivot]] = [m[pivot]!, m[k]!];
    for (let i = k + 1; i < n; i++) {
      const f = m[i]![k]! / m[k]![k]!;
      for (let j = k; j <= n; j++) m[i]![j]! -= f * m[k]![j]!;
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let sum = m[i]![n]!;
    for (let j = i + 1; j < n; j++) sum -= m[i]![j]! * x[j]!;
    x[i] = sum / m[i]![i]!;
  }
  return x;
}
