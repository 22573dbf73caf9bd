/**
 * The residual groups of a fit: each measured signal (its points under the current plan, ./points.ts), the
 * probe arrival positions and the muzzle velocity. A residual is w · (model − measured) / σ, "in noise
 * units"; the fit passes it through the Huber loss (./switching.ts). Pure.
 *
 *  - waveform s (I, V_breech, V_muzzle): the model waveform is linearly interpolated at each point's time
 *    (its two samples at an event instant keep the interpolation on the right side of every event).
 *  - probe points: w · (x_model(t_i) − x_i) / σ_x,i with σ_x,i = v̂_i σ_t; v̂_i is the speed between the
 *    neighbouring measured points (fixed, so the residual stays a smooth function of the parameters) and σ_t
 *    the arrival-time uncertainty (`noise.arrivalTime`, default 1 µs — an assumption, say yours). A position
 *    residual rather than a time residual because x_model(t) exists even when the model armature falls short.
 *    After the model's last sample the armature is carried on at its last velocity (free flight).
 *  - muzzle velocity: w · (v_model − v_measured) / σ_v, σ_v = `noise.muzzleVelocity`, default 1 % of the
 *    measured value (an assumption, say yours).
 * A weight w ≠ 1 acts like σ/w; a weight 0 leaves the group out.
 */
import type { Shot, Waveforms } from '../solve/types.js';
import { interpolateSorted } from '../core/interpolate.js';
import type { PositionPoints, SampleArray, SignalName } from './csv.js';
import type { SignalPoints } from './points.js';

export type ResidualGroup = SignalName | 'position' | 'muzzleVelocity';

export interface Group {
  name: ResidualGroup;
  /** comparison times (s), increasing; the probe times for positions, NaN for the muzzle velocity */
  times: ArrayLike<number>;
  measured: ArrayLike<number>;
  noise: ArrayLike<number>;
  weight: number;
  /** the model's values at the comparison times */
  model: (shot: Shot) => ArrayLike<number>;
  /** samples in each point (a block of a decimated record holds several) */
  samples?: ArrayLike<number>;
}

const WAVEFORM_KEYS: Record<SignalName, 'current' | 'breechVoltage' | 'muzzleVoltage'> = {
  I: 'current',
  V_breech: 'breechVoltage',
  V_muzzle: 'muzzleVoltage',
};

export function signalGroup(name: SignalName, points: SignalPoints, weight: number): Group {
  const key = WAVEFORM_KEYS[name];
  return {
    name,
    times: points.time,
    measured: points.value,
    noise: points.noise,
    weight,
    samples: points.count,
    model: (shot) => waveformAt(shot, key, points.time),
  };
}

/**
 * The model's waveform at the comparison times. Past the end of a shot that stalled or ended its ring-down,
 * every current is below the floor and not rising (model contract §3): the signals are taken as zero there
 * (not as the last sample, which can hold the steep slope of a current about to reach zero).
 */
function waveformAt(shot: Shot, key: 'current' | 'breechVoltage' | 'muzzleVoltage', times: ArrayLike<number>): number[] {
  const w = waveformsOf(shot);
  const values = interpolateSorted(w.t, w[key], times);
  const outcome = shot.results.outcome as string;
  if (outcome === 'stalled' || outcome === 'discharged') {
    const end = w.t[w.t.length - 1]!;
    for (let j = values.length - 1; j >= 0 && times[j]! > end; j--) values[j] = 0;
  }
  return values;
}

export function positionGroup(positions: PositionPoints, arrivalTimeNoise: number, weight: number): Group {
  const speeds = probeSpeeds(positions);
  return {
    name: 'position',
    times: positions.t,
    measured: positions.x,
    noise: speeds.map((v) => v * arrivalTimeNoise),
    weight,
    model: (shot) => positionsAt(waveformsOf(shot), positions.t),
  };
}

export function muzzleVelocityGroup(measured: number, noise: number, weight: number): Group {
  return { name: 'muzzleVelocity', times: [NaN], measured: [measured], noise: [noise], weight, model: (shot) => [shot.results.muzzleVelocity] };
}

/** The residuals of every group in order, in noise units (before any loss function). */
export function groupResiduals(groups: readonly Group[], shot: Shot, into: number[] = []): number[] {
  into.length = 0;
  for (const g of groups) {
    const model = g.model(shot);
    for (let j = 0; j < g.measured.length; j++) into.push((g.weight * (model[j]! - g.measured[j]!)) / g.noise[j]!);
  }
  return into;
}

export function waveformsOf(shot: Shot): Waveforms {
  if (!shot.waveforms) throw new Error('runShot must return waveforms for a fit');
  return shot.waveforms;
}

/** Speed at each probe from its measured neighbours (central difference where it can). */
function probeSpeeds(points: PositionPoints): number[] {
  const { x, t } = points;
  if (x.length === 1) return [x[0]! / t[0]!];
  return x.map((_, i) => {
    const a = Math.max(0, i - 1);
    const b = Math.min(x.length - 1, i + 1);
    return (x[b]! - x[a]!) / (t[b]! - t[a]!);
  });
}

/** Model position at the given times; after the last sample the armature flies on at its last velocity. */
export function positionsAt(waveforms: Waveforms, times: SampleArray): number[] {
  const tEnd = waveforms.t.at(-1)!;
  const inside = interpolateSorted(waveforms.t, waveforms.position, times);
  return inside.map((x, i) => (times[i]! > tEnd ? waveforms.position.at(-1)! + waveforms.velocity.at(-1)! * (times[i]! - tEnd) : x));
}
