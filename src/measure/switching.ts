/**
 * Measured samples at switching instants, and the robust loss. Pure.
 *
 * At a trigger, a switch turn-on or turn-off, a crowbar onset, the muzzle exit or any other located event
 * of the model (a new kind included), dI/dt and the breech voltage jump: the model's waveform holds both
 * one-sided values at the instant, while a digitiser's sample there holds whichever side its aperture
 * caught (a delay generator and a scope sharing a time base put the triggers exactly on the sampling grid,
 * so this is the normal case). The rule:
 *
 *  1. A sample closer than one sample interval Δt (the record's median spacing) to a switching instant of
 *     the model is left out: |t_j − t_event| < Δt. A sample exactly Δt away is kept: the model's waveform
 *     holds both sides of every event, so its interpolation never straddles one.
 *  2. Every residual goes through Huber's loss (P. J. Huber, "Robust estimation of a location parameter",
 *     Ann. Math. Statist. 35, 1964) with threshold c = HUBER_THRESHOLD noise units: quadratic inside,
 *     linear beyond, so a sample that the rule missed (a glitch, a probe that rang) pulls like one at c σ
 *     rather than at its full distance. For least squares the residual r becomes
 *     sign(r)·√(2c|r| − c²) beyond c, whose square is the Huber loss (times 2) and which is continuous with
 *     its first derivative, so Levenberg–Marquardt minimises the Huber objective directly.
 *
 * The armature's start and stop are not switching instants for the measured signals: the velocity, and so
 * the current and both voltages, are continuous there. The model's end at a stall or at the end of a
 * ring-down is one: the model stops where its currents cross the floor (a hair before a switch opens, or at
 * the switch opening, as the step falls), and is zero after it.
 */
import type { Shot } from '../solve/types.js';
import type { SampleArray } from './csv.js';

/**
 * Huber threshold in noise units. A Gaussian sample lies beyond 3σ with probability 0.27 %, so on clean
 * data the estimate is least squares in all but name (asymptotic efficiency above 99.9 %, Huber 1964),
 * while a sample tens of σ off cannot steer the fit.
 */
export const HUBER_THRESHOLD = 3;

const CONTINUOUS_EVENTS = new Set<string>(['start', 'stop', 'timeout']);

/** Times of the model's switching instants, increasing, each once. */
export function switchingInstants(shot: Shot): number[] {
  const times: number[] = [];
  for (const event of shot.events) if (!CONTINUOUS_EVENTS.has(event.kind)) times.push(event.t);
  times.sort((a, b) => a - b);
  const unique: number[] = [];
  for (const t of times) if (unique.length === 0 || t !== unique[unique.length - 1]) unique.push(t);
  return unique;
}

/** First index with t[i] ≥ value (t increasing). */
export function lowerBound(t: SampleArray, value: number, from = 0, to = t.length): number {
  let lo = from;
  let hi = to;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid]! < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index with t[i] > value (t increasing). */
export function upperBound(t: SampleArray, value: number, from = 0, to = t.length): number {
  let lo = from;
  let hi = to;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid]! <= value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Index ranges [from, to) of samples, in order and not overlapping. */
export type IndexRanges = [number, number][];

/**
 * The samples in [from, to) closer than `interval` to an instant (rule 1), as merged index ranges. The
 * interval is shrunk by one part in a million so that a grid sample exactly one interval away, computed
 * with rounding, is kept on both sides alike.
 */
export function samplesNearInstants(t: SampleArray, instants: readonly number[], interval: number, from = 0, to = t.length): IndexRanges {
  const reach = interval * (1 - 1e-6);
  const ranges: IndexRanges = [];
  for (const instant of instants) {
    const first = upperBound(t, instant - reach, from, to);
    const end = lowerBound(t, instant + reach, from, to);
    if (end <= first) continue;
    const last = ranges[ranges.length - 1];
    if (last && first <= last[1]) last[1] = Math.max(last[1], end);
    else ranges.push([first, end]);
  }
  return ranges;
}

/** Number of indices covered by the ranges. */
export function rangesSize(ranges: IndexRanges): number {
  let size = 0;
  for (const [from, to] of ranges) size += to - from;
  return size;
}

/** A membership test for increasing queries (one pass over the ranges). */
export function rangeCursor(ranges: IndexRanges): (index: number) => boolean {
  let k = 0;
  return (index) => {
    while (k < ranges.length && ranges[k]![1] <= index) k++;
    return k < ranges.length && ranges[k]![0] <= index;
  };
}

/** A residual in noise units through the Huber loss (rule 2): unchanged inside ±c, √(2c|r| − c²) beyond. */
export function huberResidual(r: number, threshold = HUBER_THRESHOLD): number {
  const magnitude = Math.abs(r);
  if (!(magnitude > threshold)) return r;
  return Math.sign(r) * Math.sqrt(2 * threshold * magnitude - threshold * threshold);
}

/** The weight Huber's loss gives a residual (1 inside the threshold, c/|r| beyond): how much it still counts. */
export function huberWeight(r: number, threshold = HUBER_THRESHOLD): number {
  const magnitude = Math.abs(r);
  return magnitude > threshold ? threshold / magnitude : 1;
}
