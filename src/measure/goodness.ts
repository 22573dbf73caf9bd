/**
 * How well a shot matches a measurement, for the overlay report: RMS error per signal, the peak current and
 * its time, exit time and muzzle velocity when they were measured, probe arrival times. Errors are
 * model − measured, in SI. Pure.
 *
 * The measured peak is the signed maximum of I refined by a parabola (./waveform.ts locatePeak); a probe
 * wired with reversed polarity should be read with scale −1. The model peak is the located one from the
 * shot's results.
 */
import type { Shot } from '../solve/types.js';
import { SIGNAL_NAMES, type Measurement, type PositionPoints, type SignalName } from './csv.js';
import { interpolateSorted } from '../core/interpolate.js';
import { locatePeak } from './waveform.js';

export interface Comparison {
  model: number;
  measured: number;
  /** model − measured */
  error: number;
  /** error / |measured| */
  relativeError: number;
}

export interface SignalAgreement {
  /** RMS of model − measured over the measured samples within the model's time span (SI) */
  rms: number;
  /** rms divided by the largest |measured| value */
  relativeRms: number;
  points: number;
}

export interface GoodnessOfFit {
  signals: Partial<Record<SignalName, SignalAgreement>>;
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
  if (measurement && waveforms && waveforms.t.length > 0) {
    const tEnd = waveforms.t.at(-1)!;
    const tStart = waveforms.t[0]!;
    const used = measurement.t.map((_, j) => j).filter((j) => measurement.t[j]! >= tStart && measurement.t[j]! <= tEnd);
    const times = used.map((j) => measurement.t[j]!);
    const keys = { I: waveforms.current, V_breech: waveforms.breechVoltage, V_muzzle: waveforms.muzzleVoltage };
    for (const name of SIGNAL_NAMES) {
      const series = measurement.signals[name];
      if (!series || used.length === 0) continue;
      const model = interpolateSorted(waveforms.t, keys[name], times);
      const errors = model.map((v, k) => v - series[used[k]!]!);
      const peak = Math.max(...used.map((j) => Math.abs(series[j]!)));
      const rms = Math.sqrt(errors.reduce((s, e) => s + e * e, 0) / errors.length);
      result.signals[name] = { rms, relativeRms: peak > 0 ? rms / peak : NaN, points: errors.length };
    }
    const current = measurement.signals.I;
    if (current) {
      const peak = locatePeak(measurement.t, current);
      result.peakCurrent = compare(shot.results.peakCurrent, peak.value);
      result.peakCurrentTime = compare(shot.results.peakCurrentTime, peak.time);
    }
  }
  if (figures.muzzleVelocity !== undefined) result.muzzleVelocity = compare(shot.results.muzzleVelocity, figures.muzzleVelocity);
  if (figures.exitTime !== undefined && shot.results.exitTime !== null) result.exitTime = compare(shot.results.exitTime, figures.exitTime);
  if (figures.positions && waveforms) result.arrivalTimeErrors = arrivalTimeErrors(shot, figures.positions);
  return result;
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

