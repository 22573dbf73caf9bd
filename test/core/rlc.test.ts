/**
 * Locked armature, one module: the bank discharges into a fixed series R-L-C loop, so the current must be the
 * natural response of a series RLC circuit (J. W. Nilsson & S. A. Riedel, "Electric Circuits", natural response
 * of a series RLC circuit; any circuits textbook).
 */
import { describe, expect, it } from 'vitest';
import { runShot } from '../../src/solve/shot.js';
import { LOCKED, lockedLoop, moduleGroup, scenario } from '../helpers/scenario.js';
import type { Scenario } from '../../src/scenario/types.js';

function compareWithClosedForm(s: Scenario, closedForm: (t: number) => number, until: number) {
  const shot = runShot(s);
  const w = shot.waveforms!;
  let worst = 0;
  let compared = 0;
  for (let k = 0; k < w.t.length; k++) {
    const t = w.t[k]!;
    if (t > until) break;
    worst = Math.max(worst, Math.abs(w.current[k]! - closedForm(t)));
    compared++;
  }
  return { shot, worst, compared };
}

/** A current floor far below every current of interest, so the switch opens at a true current zero. */
const TO_ZERO = { currentFloor: 1e-9 };

describe('locked armature, no crowbar: series RLC natural response (circuits textbook)', () => {
  it('underdamped current matches V0/(ωd L) e^(−αt) sin(ωd t) to 1e-7 of the peak, and the peak and its time match', () => {
    const s = scenario({ friction: LOCKED, solver: TO_ZERO });
    const { inductance: L, resistance: R, capacitance: C, voltage: V0 } = lockedLoop(s);
    const alpha = R / (2 * L);
    const omegaD = Math.sqrt(1 / (L * C) - alpha * alpha);
    const current = (t: number) => (V0 / (omegaD * L)) * Math.exp(-alpha * t) * Math.sin(omegaD * t);
    const peakTime = Math.atan(omegaD / alpha) / omegaD;
    const peak = current(peakTime);
    const { shot, worst, compared } = compareWithClosedForm(s, current, Math.PI / omegaD);
    expect(compared).toBeGreaterThan(100);
    expect(worst / peak).toBeLessThan(1e-7);
    expect(Math.abs(shot.results.peakCurrent - peak) / peak).toBeLessThan(1e-8);
    expect(Math.abs(shot.results.peakCurrentTime - peakTime) / peakTime).toBeLessThan(1e-7);
    // the switch opens when the current returns to zero, half a damped period after firing
    const off = shot.events.find((e) => e.kind === 'turn-off')!;
    expect(Math.abs(off.t - Math.PI / omegaD) / (Math.PI / omegaD)).toBeLessThan(1e-8);
    expect(shot.results.outcome).toBe('stalled');
    expect(shot.results.finalPosition).toBe(s.armature.position);
  });

  it('voltage reversal equals exp(−π/√(4Q²−1)) of the charge, Q = √(L/C)/R (derived from the underdamped closed form)', () => {
    const s = scenario({ friction: LOCKED, solver: TO_ZERO });
    const { inductance: L, resistance: R, capacitance: C } = lockedLoop(s);
    const Q = Math.sqrt(L / C) / R;
    const expected = Math.exp(-Math.PI / Math.sqrt(4 * Q * Q - 1));
    expect(Math.abs(runShot(s).results.modules[0]!.reversal - expected)).toBeLessThan(1e-8);
  });

  it('critically damped (R = 2√(L/C) exactly): i = (V0/L) t e^(−αt), peak 2V0/(eR) at t = 2L/R', () => {
    const base = scenario({ friction: LOCKED, solver: TO_ZERO });
    const loop = lockedLoop(base);
    const target = 2 * Math.sqrt(loop.inductance / loop.capacitance);
    const esr = base.bank[0]!.esr + (target - loop.resistance);
    const s = scenario({ friction: LOCKED, solver: TO_ZERO, bank: [moduleGroup({ esr })] });
    const { inductance: L, resistance: R, voltage: V0 } = lockedLoop(s);
    expect(Math.abs(R - target) / target).toBeLessThan(1e-14);
    const alpha = R / (2 * L);
    const current = (t: number) => (V0 / L) * t * Math.exp(-alpha * t);
    const peak = (2 * V0) / (Math.E * R);
    const { shot, worst } = compareWithClosedForm(s, current, 1);
    expect(worst / peak).toBeLessThan(1e-7);
    expect(Math.abs(shot.results.peakCurrent - peak) / peak).toBeLessThan(1e-8);
    expect(Math.abs(shot.results.peakCurrentTime - (2 * L) / R) / ((2 * L) / R)).toBeLessThan(1e-7);
  });

  it('overdamped: i = V0/(L(s1 − s2))(e^(s1 t) − e^(s2 t)), peak at ln(s2/s1)/(s1 − s2), through the dense output', () => {
    const s = scenario({ friction: LOCKED, bank: [moduleGroup({ esr: 0.5 })] });
    const { inductance: L, resistance: R, capacitance: C, voltage: V0 } = lockedLoop(s);
    const alpha = R / (2 * L);
    const root = Math.sqrt(alpha * alpha - 1 / (L * C));
    const s1 = -alpha + root;
    const s2 = -alpha - root;
    const current = (t: number) => (V0 / (L * (s1 - s2))) * (Math.exp(s1 * t) - Math.exp(s2 * t));
    const peakTime = Math.log(s2 / s1) / (s1 - s2);
    const peak = current(peakTime);
    const { shot, worst, compared } = compareWithClosedForm(s, current, 1);
    expect(compared).toBeGreaterThan(100);
    expect(worst / peak).toBeLessThan(1e-7);
    expect(Math.abs(shot.results.peakCurrent - peak) / peak).toBeLessThan(1e-8);
    expect(Math.abs(shot.results.peakCurrentTime - peakTime) / peakTime).toBeLessThan(1e-7);
  });
});

describe('locked armature with crowbar: first-order RL response with the diode drop (circuits textbook)', () => {
  it('after onset i = (i_c + V_D/R) e^(−R t/L) − V_D/R and the switch opens at (L/R) ln(1 + R i_c/V_D)', () => {
    const crowbar = { drop: 30, resistance: 2e-3 };
    const s = scenario({ friction: LOCKED, solver: TO_ZERO, bank: [moduleGroup({ crowbar })] });
    const cap = lockedLoop(s, 'capacitor');
    const alpha = cap.resistance / (2 * cap.inductance);
    const omegaD = Math.sqrt(1 / (cap.inductance * cap.capacitance) - alpha * alpha);
    // onset when the capacitor voltage reaches zero: t_c = (π − atan(ωd/α))/ωd
    const onset = (Math.PI - Math.atan(omegaD / alpha)) / omegaD;
    const shot = runShot(s);
    const crowbarEvent = shot.events.find((e) => e.kind === 'crowbar')!;
    expect(Math.abs(crowbarEvent.t - onset) / onset).toBeLessThan(1e-8);
    const ic = (cap.voltage / (omegaD * cap.inductance)) * Math.exp(-alpha * onset) * Math.sin(omegaD * onset);
    const { inductance: L, resistance: R } = lockedLoop(s, 'crowbar');
    const VD = crowbar.drop;
    const decay = (t: number) => (ic + VD / R) * Math.exp((-R * (t - onset)) / L) - VD / R;
    const opens = onset + (L / R) * Math.log(1 + (R * ic) / VD);
    const w = shot.waveforms!;
    let worst = 0;
    let compared = 0;
    for (let k = 0; k < w.t.length; k++) {
      const t = w.t[k]!;
      if (t < onset || t > opens) continue;
      worst = Math.max(worst, Math.abs(w.current[k]! - decay(t)));
      compared++;
    }
    expect(compared).toBeGreaterThan(100);
    expect(worst / shot.results.peakCurrent).toBeLessThan(1e-7);
    const off = shot.events.find((e) => e.kind === 'turn-off')!;
    expect(Math.abs(off.t - opens) / opens).toBeLessThan(1e-7);
    // the conducting diode clamps the capacitor at −(V_D + R_D·i); the current is largest at onset [derived]
    const clamp = (crowbar.drop + crowbar.resistance * ic) / cap.voltage;
    expect(Math.abs(shot.results.modules[0]!.reversal / clamp - 1)).toBeLessThan(1e-7);
  });
});
