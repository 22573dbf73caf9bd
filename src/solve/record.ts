/**
 * What the solver keeps while it integrates: waveform samples (uniform grid + both sides of every event)
 * and running peaks located on the dense output.
 */
import { type Mode, type Plant, LOSS_ORDER, Stage } from '../model/plant.js';
import { ledger } from '../model/ledger.js';
import { observe, type Observables } from '../model/observables.js';
import type { LossKey, Waveforms } from './types.js';
import { brentRoot } from './roots.js';

export function createWaveformRecorder(plant: Plant) {
  const groups = plant.groups;
  const losses = Object.fromEntries(LOSS_ORDER.map((k) => [k, [] as number[]])) as Record<LossKey, number[]>;
  const w: Waveforms = {
    t: [],
    current: [],
    groupCurrent: Array.from({ length: groups }, () => []),
    groupVoltage: Array.from({ length: groups }, () => []),
    breechVoltage: [],
    muzzleVoltage: [],
    position: [],
    velocity: [],
    acceleration: [],
    force: [],
    energy: { capacitors: [], magnetic: [], kinetic: [], losses, residual: [] },
  };
  const ix = plant.index;
  // the loss series by channel index: a keyed lookup per sample on the record was half the cost of recording
  const lossSeries = LOSS_ORDER.map((k) => losses[k]);
  return {
    waveforms: w,
    /** one sample: the state y and its quadratures q (layout QUADRATURE) at t */
    record(t: number, y: ArrayLike<number>, q: ArrayLike<number>, mode: Mode, seen?: Observables): void {
      const o = seen ?? observe(plant, y, mode);
      const e = ledger(plant, y, q);
      w.t.push(t);
      w.current.push(o.current);
      for (let g = 0; g < groups; g++) {
        w.groupCurrent[g]!.push(o.groupCurrent[g]!);
        w.groupVoltage[g]!.push(y[ix.voltage(g)]!);
      }
      w.breechVoltage.push(o.breechVoltage);
      w.muzzleVoltage.push(o.muzzleVoltage);
      w.position.push(y[ix.position]!);
      w.velocity.push(y[ix.velocity]!);
      w.acceleration.push(o.acceleration);
      w.force.push(o.force);
      w.energy.capacitors.push(e.capacitors);
      w.energy.magnetic.push(e.magnetic);
      w.energy.kinetic.push(e.kinetic);
      for (let n = 0; n < lossSeries.length; n++) lossSeries[n]!.push(e.losses[n]!);
      w.energy.residual.push(e.residual);
    },
  };
}

export interface Peaks {
  current: number;
  currentTime: number;
  /** per group, total group current */
  groupCurrent: number[];
  acceleration: number;
  breechVoltage: number;
  /** most negative capacitor voltage of each group */
  minimumVoltage: number[];
  /** per group, the largest total group current while it conducts through its crowbar diode (0 if never) */
  crowbarCurrent: number[];
}

/**
 * Running maxima. `observePoint` counts a value at an instant (step ends, event sides); `locate` finds an
 * interior maximum between two points as the root of the quantity's derivative on the dense output.
 */
export function createPeakTracker(plant: Plant, mode?: Mode) {
  const peaks: Peaks = {
    current: 0,
    currentTime: 0,
    groupCurrent: new Array<number>(plant.groups).fill(0),
    acceleration: -Infinity,
    breechVoltage: -Infinity,
    minimumVoltage: plant.chargeVoltage.slice(),
    crowbarCurrent: new Array<number>(plant.groups).fill(0),
  };
  const inCrowbar = (g: number) => mode !== undefined && mode.stage[g] === Stage.Crowbar;
  const ix = plant.index;
  function observePoint(t: number, y: ArrayLike<number>, o: Observables): void {
    if (o.current > peaks.current) {
      peaks.current = o.current;
      peaks.currentTime = t;
    }
    for (let g = 0; g < plant.groups; g++) {
      if (o.groupCurrent[g]! > peaks.groupCurrent[g]!) peaks.groupCurrent[g] = o.groupCurrent[g]!;
      if (inCrowbar(g) && o.groupCurrent[g]! > peaks.crowbarCurrent[g]!) peaks.crowbarCurrent[g] = o.groupCurrent[g]!;
      const v = y[ix.voltage(g)]!;
      if (v < peaks.minimumVoltage[g]!) peaks.minimumVoltage[g] = v;
    }
    if (o.acceleration > peaks.acceleration) peaks.acceleration = o.acceleration;
    if (o.breechVoltage > peaks.breechVoltage) peaks.breechVoltage = o.breechVoltage;
  }

  /**
   * Between two sample points a (left) and b (right) of one step, find the interior maxima whose derivative
   * changes sign from + to −, and count them. `at(t)` gives the observables on the dense output.
   */
  function locate(ta: number, oa: Observables, tb: number, ob: Observables, at: (t: number) => Observables): void {
    const bracketed = (da: number, db: number) => da > 0 && db < 0;
    if (bracketed(oa.currentRate, ob.currentRate)) {
      const tp = brentRoot((t) => at(t).currentRate, ta, tb, oa.currentRate, ob.currentRate);
      const o = at(tp);
      if (o.current > peaks.current) {
        peaks.current = o.current;
        peaks.currentTime = tp;
      }
    }
    for (let g = 0; g < plant.groups; g++) {
      if (bracketed(oa.groupRate[g]!, ob.groupRate[g]!)) {
        const tp = brentRoot((t) => at(t).groupRate[g]!, ta, tb, oa.groupRate[g]!, ob.groupRate[g]!);
        const value = at(tp).groupCurrent[g]!;
        if (value > peaks.groupCurrent[g]!) peaks.groupCurrent[g] = value;
        if (inCrowbar(g) && value > peaks.crowbarCurrent[g]!) peaks.crowbarCurrent[g] = value;
      }
    }
    if (bracketed(oa.accelerationRate, ob.accelerationRate)) {
      const tp = brentRoot((t) => at(t).accelerationRate, ta, tb, oa.accelerationRate, ob.accelerationRate);
      const value = at(tp).acceleration;
      if (value > peaks.acceleration) peaks.acceleration = value;
    }
    if (bracketed(oa.breechVoltageRate, ob.breechVoltageRate)) {
      const tp = brentRoot((t) => at(t).breechVoltageRate, ta, tb, oa.breechVoltageRate, ob.breechVoltageRate);
      const value = at(tp).breechVoltage;
      if (value > peaks.breechVoltage) peaks.breechVoltage = value;
    }
  }
  return { peaks, observePoint, locate };
}
