/**
 * How well a shot matches a measurement, for the overlay report: RMS error per signal, the peak current and
 * its time, exit time and muzzle velocity when they were measured, probe arrival times. Errors are
 * model − measured, in SI. Pure.
 *
 * The RMS errors follow the fit's rule for switching instants (./switching.ts): samples closer than one
 * sample interval to a switching instant of the model are not compared (they are counted and listed), and
 * neither are samples outside the model's span. One pass over the record, no copies of it: a record of ten
 * million samples costs its own memory only.
 *
 * The measured peak is the signed maximum of I refined by a parabola (./waveform.ts locatePeak); a probe
 * wired with reversed polarity should be read with scale −1. The model peak is the located one from the
 * shot's results.
 */
import type { Shot } from '../solve/types.js';
import { InputError } from '../core/errors.js';
import { interpolationCursor } from '../core/interpolate.js';
import { SIGNAL_NAMES, type Measurement, type PositionPoints, type SampleArray, type SignalName } from './csv.js';
import { lowerBound, rangeCursor, samplesNearInstants, switchingInstants, upperBound, type IndexRanges } from './switching.js';
import { largestMagnitude, locatePeak, medianInterval } from './waveform.js';

export interface Comparison {
  model: number;
  measured: number;
  /** model − measured */
  error: number;
  /** error / |measured| */
  relativeError: number;
}

export interface SignalAgreement {
  /** RMS of model − measured over the measured samples compared (SI) */
  rms: number;
  /** rms divided by the largest |measured| value */
  relativeRms: number;
  /** samples compared: within the model's span, not next to a switching instant */
  points: number;
}

/** Which samples were compared: the switching rule at this model. */
export interface SampleRule {
  /** the record's median sample interval Δt (s) */
  interval: number;
  /** switching instants of the model (s) */
  instants: number[];
  /** times of the samples left out (closer than Δt to an instant) */
  excluded: number[];
  /** samples outside the model's span */
  outside: number;
}

export interface GoodnessOfFit {
  signals: Partial<Record<SignalName, SignalAgreement>>;
  /** absent when nothing was measured on a time base */
  samples?: SampleRule;
  peakCurrent?: Comparison;
  peakCurrentTime?: Comparison;
  exitTime?: Comparison;
  muzzleVelocity?: Comparison;
  /** per probe: arrival-time error (s), null where the model armature never got there */
  arrivalTimeErrors?: (number | null)[];
}

export interface MeasuredFigures {
  muzzleVelocity?: number;
  exitTime?: number;
  positions?: PositionPoints;
}

export function goodnessOfFit(shot: Shot, measurement: Measurement | undefined, figures: MeasuredFigures = {}): GoodnessOfFit {
  const result: GoodnessOfFit = { signals: {} };
  const waveforms = shot.waveforms;
  if (measurement && waveforms && waveforms.t.length > 0 && measurement.t.length > 0) {
    const t = measurement.t;
    const from = lowerBound(t, waveforms.t[0]!);
    const to = upperBound(t, waveforms.t[waveforms.t.length - 1]!);
    const interval = medianInterval(t);
    const instants = switchingInstants(shot);
    const excluded = Number.isFinite(interval) ? samplesNearInstants(t, instants, interval, from, to) : [];
    const excludedTimes: number[] = [];
    for (const [a, b] of excluded) for (let i = a; i < b; i++) excludedTimes.push(t[i]!);
    result.samples = { interval, instants, excluded: excludedTimes, outside: t.length - (to - from) };
    const keys = { I: waveforms.current, V_breech: waveforms.breechVoltage, V_muzzle: waveforms.muzzleVoltage };
    for (const name of SIGNAL_NAMES) {
      const series = measurement.signals[name];
      if (!series) continue;
      const agreement = signalAgreement(t, series, from, to, excluded, waveforms.t, keys[name]);
      if (agreement) result.signals[name] = agreement;
    }
    const current = measurement.signals.I;
    if (current) {
      const peak = locatePeak(t, current, instants);
      result.peakCurrent = compare(shot.results.peakCurrent, peak.value);
      result.peakCurrentTime = compare(shot.results.peakCurrentTime, peak.time);
    }
  }
  if (figures.muzzleVelocity !== undefined) result.muzzleVelocity = compare(shot.results.muzzleVelocity, figures.muzzleVelocity);
  if (figures.exitTime !== undefined && shot.results.exitTime !== null) result.exitTime = compare(shot.results.exitTime, figures.exitTime);
  if (figures.positions && waveforms) result.arrivalTimeErrors = arrivalTimeErrors(shot, figures.positions);
  return result;
}

/** RMS of model − measured over samples [from, to) not in `excluded`, the model interpolated as it goes. */
function signalAgreement(t: SampleArray, series: SampleArray, from: number, to: number, excluded: IndexRanges, modelT: ArrayLike<number>, model: ArrayLike<number>): SignalAgreement | undefined {
  const left = rangeCursor(excluded);
  const at = interpolationCursor(modelT, model);
  let squares = 0;
  let points = 0;
  for (let i = from; i < to; i++) {
    if (left(i)) continue;
    const error = at(t[i]!) - series[i]!;
    squares += error * error;
    points++;
  }
  if (points === 0) return undefined;
  const peak = largestMagnitude(series, from, to);
  const rms = Math.sqrt(squares / points);
  return { rms, relativeRms: peak > 0 ? rms / peak : NaN, points };
}

/** A record none of whose samples could be compared is bad input (a wrong time base, a record of another shot). */
export function requireComparedSamples(goodness: GoodnessOfFit, measurement: Measurement): void {
  if (Object.keys(goodness.signals).length > 0 || Object.keys(measurement.signals).length === 0) return;
  const rule = goodness.samples;
  const detail = rule ? `${rule.outside} of ${measurement.t.length} lie outside the model's span and ${rule.excluded.length} within one sample interval of a switching instant` : 'the model has no waveforms';
  throw new InputError('', `no usable samples: ${detail}; compare a record of the shot itself, or check its time offset (--offset t=…)`, measurement.source);
}

function compare(model: number, measured: number): Comparison {
  const error = model - measured;
  return { model, measured, error, relativeError: measured !== 0 ? error / Math.abs(measured) : NaN };
}

/** Model arrival time at each probe (inverse of x(t), linear between samples, free flight after the end). */
function arrivalTimeErrors(shot: Shot, points: PositionPoints): (number | null)[] {
  const w = shot.waveforms!;
  return points.x.map((x, i) => {
    const k = w.position.findIndex((p) => p >= x);
    let t: number | null;
    if (k === 0) t = w.t[0]!;
    else if (k > 0) {
      const x0 = w.position[k - 1]!;
      const x1 = w.position[k]!;
      t = x1 > x0 ? w.t[k - 1]! + ((x - x0) * (w.t[k]! - w.t[k - 1]!)) / (x1 - x0) : w.t[k]!;
    } else {
      const vEnd = w.velocity.at(-1)!;
      t = vEnd > 0 ? w.t.at(-1)! + (x - w.position.at(-1)!) / vEnd : null;
    }
    return t === null ? null : t - points.t[i]!;
  });
}

