/**
 * The points a fit compares for one measured signal: the samples inside the window, less those the
 * switching rule leaves out (./switching.ts), and, for a long record, block means. Pure.
 *
 * Decimation of a long record (more usable samples than `maxPoints`): block means of k = ⌈n / maxPoints⌉
 * consecutive samples, compared with the model at the block's mean time. For a smooth stretch the mean of
 * f over the block and f at the mean time differ by about f''·D²/24 (D the block's duration), far below the
 * noise of a block for the few thousand blocks over a shot. A block never spans a switching instant: the
 * record is cut at every instant, and the k samples next to each instant (on both sides, less those the
 * rule leaves out) stay single samples, so the model's timing of the event keeps all the samples that see it.
 * The noise of a block is estimated from the blocks themselves (the same robust estimator on their series),
 * which also covers noise correlated from sample to sample by the scope's bandwidth; a noise given by the
 * user (per sample) is divided by √(samples in the block), which assumes white noise.
 */
import type { SampleArray } from './csv.js';
import { lowerBound, rangeCursor, samplesNearInstants, upperBound, type IndexRanges } from './switching.js';
import { estimateNoise } from './waveform.js';

export interface SignalPoints {
  /** comparison times (s): a sample's time or a block's mean time */
  time: Float64Array;
  /** measured value (SI) at that time: a sample or a block mean */
  value: Float64Array;
  /** one standard deviation of `value` (SI) */
  noise: Float64Array;
  /** index of the first sample of each point and the number of samples in it (1 for a single sample) */
  first: Uint32Array;
  count: Uint32Array;
}

export interface PointPlan {
  /** sample index range of the window [from, to) */
  from: number;
  to: number;
  /** samples left out by the switching rule (index ranges within the window) */
  excluded: IndexRanges;
  /** samples per block (1: no decimation) */
  blockSize: number;
  /** where the record is cut: the index of the first sample at or after each switching instant */
  cuts: number[];
}

export interface WindowSpan {
  start: number;
  end: number;
}

/** Which samples a fit uses at the current model: window, exclusions and blocks. */
export function planPoints(t: SampleArray, window: WindowSpan, instants: readonly number[], interval: number, maxPoints: number): PointPlan {
  // a relative slack so that a sample written as 500 µs is not lost to rounding against a model ending at 5e-4 s
  const slack = 1e-9 * Math.max(Math.abs(window.start), Number.isFinite(window.end) ? Math.abs(window.end) : 0);
  const from = lowerBound(t, window.start - slack);
  const to = upperBound(t, window.end + slack);
  const excluded = samplesNearInstants(t, instants, interval, from, to);
  let excludedCount = 0;
  for (const [a, b] of excluded) excludedCount += b - a;
  const usable = to - from - excludedCount;
  const blockSize = usable > maxPoints ? Math.ceil(usable / maxPoints) : 1;
  const cuts: number[] = [];
  for (const instant of instants) {
    if (instant < window.start - interval || instant > window.end + interval) continue;
    const cut = lowerBound(t, instant, from, to);
    // an instant at the window's start or end also counts: the samples next to it stay single
    if (cut >= from && cut <= to && cuts[cuts.length - 1] !== cut) cuts.push(cut);
  }
  return { from, to, excluded, blockSize, cuts };
}

/** Number of usable samples (in the window, not left out). */
export function usableSamples(plan: PointPlan): number {
  let excluded = 0;
  for (const [a, b] of plan.excluded) excluded += b - a;
  return plan.to - plan.from - excluded;
}

/** Same samples, same blocks: the fit's residual function would not change. */
export function samePlan(a: PointPlan, b: PointPlan): boolean {
  const sameList = <T>(x: readonly T[], y: readonly T[], same: (p: T, q: T) => boolean): boolean => x.length === y.length && x.every((v, i) => same(v, y[i]!));
  return (
    a.from === b.from &&
    a.to === b.to &&
    a.blockSize === b.blockSize &&
    sameList(a.excluded, b.excluded, (p, q) => p[0] === q[0] && p[1] === q[1]) &&
    (a.blockSize === 1 || sameList(a.cuts, b.cuts, (p, q) => p === q))
  );
}

/** The points of one signal under a plan; `sampleNoise` is σ of one sample, `given` when the user stated it. */
export function signalPoints(t: SampleArray, y: SampleArray, plan: PointPlan, sampleNoise: number, given: boolean): SignalPoints {
  const left = rangeCursor(plan.excluded);
  const k = plan.blockSize;
  const points = { time: [] as number[], value: [] as number[], count: [] as number[], first: [] as number[], block: [] as boolean[] };
  const single = (i: number): void => {
    if (left(i)) return;
    points.time.push(t[i]!);
    points.value.push(y[i]!);
    points.first.push(i);
    points.count.push(1);
    points.block.push(false);
  };
  const bounds = [plan.from, ...plan.cuts, plan.to];
  for (let s = 0; s + 1 < bounds.length; s++) {
    const a = bounds[s]!;
    const b = bounds[s + 1]!;
    if (k === 1) {
      for (let i = a; i < b; i++) single(i);
      continue;
    }
    // single samples next to each cut (an instant), blocks in between
    const headEnd = s > 0 ? Math.min(b, a + k) : a;
    const tailStart = s + 2 < bounds.length ? Math.max(headEnd, b - k) : b;
    for (let i = a; i < headEnd; i++) single(i);
    for (let i = headEnd; i < tailStart; ) {
      let sumT = 0;
      let sumY = 0;
      let n = 0;
      const start = i;
      for (; i < tailStart && i - start < k; i++) {
        if (left(i)) continue;
        sumT += t[i]!;
        sumY += y[i]!;
        n++;
      }
      if (n === 0) continue;
      points.time.push(sumT / n);
      points.value.push(sumY / n);
      points.first.push(start);
      points.count.push(n);
      points.block.push(true);
    }
    for (let i = tailStart; i < b; i++) single(i);
  }
  const count = points.time.length;
  const noise = new Float64Array(count);
  const blockNoise = k > 1 && !given ? blockSeriesNoise(points.value, points.count, points.block, k) : NaN;
  for (let p = 0; p < count; p++) {
    const n = points.count[p]!;
    noise[p] = !points.block[p] ? sampleNoise : Number.isFinite(blockNoise) ? blockNoise * Math.sqrt(k / n) : sampleNoise / Math.sqrt(n);
  }
  return {
    time: Float64Array.from(points.time),
    value: Float64Array.from(points.value),
    noise,
    first: Uint32Array.from(points.first),
    count: Uint32Array.from(points.count),
  };
}

/** σ of a full block, from the series of full-block means (the estimator of ./waveform.ts on that series). */
function blockSeriesNoise(values: number[], counts: number[], block: boolean[], k: number): number {
  const full: number[] = [];
  for (let p = 0; p < values.length; p++) if (block[p] && counts[p] === k) full.push(values[p]!);
  return full.length >= 8 ? estimateNoise(full) : NaN;
}
