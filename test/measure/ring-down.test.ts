/**
 * Ring-down calibration of a bank (a module fired into a shorted load) against the closed form of the
 * series RLC natural response (any circuits textbook, e.g. Nilsson & Riedel, "Natural and step responses of
 * RLC circuits"): with the capacitor charged to V0 and the switch closed at t0,
 *     i(t) = V0/(ωd L) · e^(−α(t−t0)) · sin(ωd (t−t0)),   α = R/(2L),  ωd² = 1/(LC) − α²,
 * until the current returns to zero at t0 + π/ωd, where the one-way switch opens (model contract §1). A lab
 * reads the damped frequency f_d = ωd/2π and the logarithmic decrement Λ = α·T_d (T_d = 1/f_d) off the ring,
 * and with the known C these give L = 1/(C(ωd² + α²)) and R = 2αL. The record here is that damped sinusoid,
 * specified by f_d and Λ (not by the model), sampled on a 1 µs grid that contains the trigger instant, with
 * the voltage across the short (L_s di/dt + R_s i), which jumps at the trigger.
 */
import { describe, expect, it } from 'vitest';
import type { Measurement } from '../../src/measure/csv.js';
import { fitScenario } from '../../src/measure/fit.js';
import { interpolateSorted } from '../../src/core/interpolate.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { setScenarioPath } from '../../src/scenario/paths.js';
import { runShot } from '../../src/solve/shot.js';
import { seededNormal } from './random.js';

const C = 500e-6; // F
const V0 = 2000; // V
const TRIGGER = 50e-6; // s, on the sampling grid
const FREQUENCY = 3300; // Hz, damped ring frequency f_d
const DECREMENT = 0.4; // logarithmic decrement per period, Λ = α T_d
const omega = 2 * Math.PI * FREQUENCY;
const alpha = DECREMENT * FREQUENCY;
/** the loop's total inductance and resistance, from the textbook relations */
const L = 1 / (C * (omega * omega + alpha * alpha));
const R = 2 * alpha * L;
// the parts of the loop that are known (invented values); the module's L and R are what the fit finds
const ESR = 2e-3;
const FEED = { inductance: 0.25e-6, resistance: 0.8e-3 };
const SHORT = { inductance: 30e-9, resistance: 0.1e-3 };
const moduleInductance = L - FEED.inductance - SHORT.inductance;
const moduleResistance = R - ESR - FEED.resistance - SHORT.resistance;

function ring(t: number): { current: number; rate: number } {
  const tau = t - TRIGGER;
  if (tau < 0 || tau > Math.PI / omega) return { current: 0, rate: 0 };
  const amplitude = V0 / (omega * L);
  const decay = Math.exp(-alpha * tau);
  return { current: amplitude * decay * Math.sin(omega * tau), rate: amplitude * decay * (omega * Math.cos(omega * tau) - alpha * Math.sin(omega * tau)) };
}

const times = Array.from({ length: 401 }, (_, k) => k / 1e6); // k/1e6, not k·1e-6: exactly 50e-6 at k = 50
/** current and voltage across the short; at the trigger sample the value before the switch closed (0 V) */
function record(noise: { I: number; V_breech: number }, seed: number): Measurement {
  const normal = seededNormal(seed);
  return {
    t: times,
    signals: {
      I: times.map((t) => ring(t).current + noise.I * normal()),
      V_breech: times.map((t) => (t <= TRIGGER ? 0 : SHORT.inductance * ring(t).rate + SHORT.resistance * ring(t).current) + noise.V_breech * normal()),
    },
    source: 'ring-down.csv',
    columns: [],
  };
}

const scenario = (module: { inductance: number; resistance: number }) =>
  scenarioFromRaw({
    name: 'ring-down (invented)',
    bank: [{ capacitance: C, voltage: V0, esr: ESR, inductance: module.inductance, resistance: module.resistance, trigger: TRIGGER }],
    feed: FEED,
    load: { kind: 'short', ...SHORT },
    solver: { sampleInterval: '1 us' },
  });
const FREE = [{ path: 'bank[0].inductance' }, { path: 'bank[0].resistance' }];
const nominal = scenario({ inductance: 4e-6, resistance: 3e-3 });

describe('ring-down into a shorted load (series RLC natural response, circuits textbook)', () => {
  it('the model with the true values rings as the closed form and ends "discharged" when the switch opens', () => {
    const shot = runShot(scenario({ inductance: moduleInductance, resistance: moduleResistance }));
    expect(shot.results.outcome).toBe('discharged');
    expect(shot.results.finalPosition).toBe(0);
    const w = shot.waveforms!;
    const peak = Math.max(...w.current);
    for (let k = 0; k < w.t.length; k++) expect(Math.abs(w.current[k]! - ring(w.t[k]!).current)).toBeLessThan(1e-6 * peak);
    // the switch opens at the current zero: half a damped period after the trigger
    const off = shot.events.find((e) => e.kind === 'turn-off')!;
    expect(off.t).toBeCloseTo(TRIGGER + Math.PI / omega, 9);
    // the voltage across the short jumps at the trigger from 0 to V0·L_s/L
    const at = w.t.indexOf(TRIGGER);
    expect(w.t[at + 1]).toBe(TRIGGER);
    expect(w.breechVoltage[at]).toBe(0);
    expect(w.breechVoltage[at + 1]).toBeCloseTo((V0 * SHORT.inductance) / L, 6);
  });

  it('a noiseless ring-down fit gives the loop L and R of frequency and decrement to 1e-6', () => {
    const fit = fitScenario({ scenario: nominal, measurement: record({ I: 0, V_breech: 0 }, 1), noise: { I: 1, V_breech: 1e-3 }, free: FREE, runShot: (s) => runShot(s), setPath: setScenarioPath });
    const loopL = fit.parameters['bank[0].inductance']!.value + FEED.inductance + SHORT.inductance;
    const loopR = fit.parameters['bank[0].resistance']!.value + ESR + FEED.resistance + SHORT.resistance;
    expect(Math.abs(loopL / L - 1)).toBeLessThan(1e-6);
    expect(Math.abs(loopR / R - 1)).toBeLessThan(1e-6);
    // the sample on the trigger instant (0 V, the left side) is left out, not fitted
    expect(fit.samples.excluded).toContain(TRIGGER);
    expect(fit.samples.downWeighted).toEqual([]);
  });

  it('with noise (20 A, 50 mV) the fitted module L and R lie within 3σ of the closed-form values, σ below 1 %', () => {
    const fit = fitScenario({ scenario: nominal, measurement: record({ I: 20, V_breech: 0.05 }, 7), free: FREE, runShot: (s) => runShot(s), setPath: setScenarioPath });
    expect(fit.converged).toBe(true);
    const truth = { 'bank[0].inductance': moduleInductance, 'bank[0].resistance': moduleResistance };
    for (const [path, value] of Object.entries(truth)) {
      const p = fit.parameters[path]!;
      expect(Math.abs(p.value - value)).toBeLessThan(3 * p.uncertainty);
      expect(p.uncertainty / value).toBeLessThan(0.01);
    }
    expect(fit.samples.excluded).toContain(TRIGGER);
    // after the switch opens the model holds zero current, as the record does: those samples are compared too
    expect(fit.samples.outsideWindow).toBe(0);
    // the fitted loop reproduces the record's ring: the model current at the samples
    const shot = runShot(fit.scenario);
    const model = interpolateSorted(shot.waveforms!.t, shot.waveforms!.current, times);
    const peak = V0 / (omega * L);
    model.forEach((i, k) => expect(Math.abs(i - ring(times[k]!).current)).toBeLessThan(0.002 * peak));
  });
});
