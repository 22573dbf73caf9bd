/**
 * Coverage of a calibrated prediction: a synthetic shot at 5 kV, made by the model at known parameters with
 * seeded noise, is calibrated (L′ and feed inductance), the calibration is written into the scenario and read
 * back by the loader, the charge voltage is changed to 7 kV, and the muzzle velocity is predicted with its 95 %
 * interval (linear propagation of the calibration's covariance, ±1.96σ). Over 30 seeds the true 7 kV velocity
 * must lie inside the interval in at least 90 % of them: a 95 % interval that holds what it says (GUM, JCGM
 * 100:2008, §6.2–6.3, expanded uncertainty and coverage probability).
 */
import { describe, expect, it } from 'vitest';
import { calibratedScenarioRaw } from '../../src/measure/calibrated.js';
import type { Measurement } from '../../src/measure/csv.js';
import { fitScenario } from '../../src/measure/fit.js';
import { interpolateSorted } from '../../src/core/interpolate.js';
import { setScenarioPath } from '../../src/scenario/paths.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { propagateLinear } from '../../src/study/propagate.js';
import { seededNormal } from '../measure/random.js';

// An invented bench: one crowbarred 1 mF module, a 5 g armature on 0.2 m rails; the record spans 3 ms at 10 µs.
const raw = (voltage: string, inductanceGradient: string, feedInductance: string): Record<string, unknown> => ({
  name: 'coverage bench (invented)',
  bank: [{ capacitance: '1 mF', voltage, inductance: '10 uH', esr: '5 mohm', resistance: '2 mohm', crowbar: { drop: '1 V', resistance: '1 mohm' } }],
  feed: { inductance: feedInductance, resistance: '3 mohm' },
  rails: { length: '0.2 m', inductanceGradient },
  armature: { mass: '5 g', resistance: '0.1 mohm', contactResistance: '0.1 mohm' },
  solver: { endTime: '6 ms', sampleInterval: '10 us' },
});
const TRUE_GRADIENT = '0.45 uH/m';
const TRUE_FEED = '2 uH';
const FREE = ['rails.inductanceGradient', 'feed.inductance'];

describe('calibrated prediction at another charge voltage', () => {
  it('the true 7 kV muzzle velocity lies inside the 95 % interval in ≥ 90 % of 30 seeded calibrations at 5 kV (GUM §6)', () => {
    const truthShot = runShot(scenarioFromRaw(raw('5 kV', TRUE_GRADIENT, TRUE_FEED)));
    const truthAt7kV = runShot(scenarioFromRaw(raw('7 kV', TRUE_GRADIENT, TRUE_FEED)), { waveforms: false }).results;
    expect(truthAt7kV.outcome).toBe('exited');
    const times = Array.from({ length: 301 }, (_, k) => k * 10e-6);
    const cleanI = interpolateSorted(truthShot.waveforms!.t, truthShot.waveforms!.current, times);
    const cleanV = interpolateSorted(truthShot.waveforms!.t, truthShot.waveforms!.breechVoltage, times);
    const sigmaI = 0.01 * Math.max(...cleanI);
    const sigmaV = 0.01 * Math.max(...cleanV);
    const start = raw('5 kV', '0.5 uH/m', '2.3 uH');

    let covered = 0;
    const normalised: number[] = [];
    for (let seed = 1; seed <= 30; seed++) {
      const normal = seededNormal(1000 + seed);
      const measurement: Measurement = { t: times, signals: { I: cleanI.map((i) => i + sigmaI * normal()), V_breech: cleanV.map((v) => v + sigmaV * normal()) }, source: 'synthetic.csv', columns: [] };
      const fit = fitScenario({ scenario: scenarioFromRaw(start), measurement, free: FREE.map((path) => ({ path })), runShot: (s) => runShot(s), setPath: setScenarioPath });
      expect(fit.converged).toBe(true);
      const fitted = Object.fromEntries(FREE.map((path) => [path, { value: fit.parameters[path]!.value, uncertainty: fit.parameters[path]!.uncertainty }]));
      const calibrated = calibratedScenarioRaw(start, {
        scenarioFile: 'coverage.json', measurementFile: 'synthetic.csv', date: '2026-12-02', fitted,
        measurementSha256: '0'.repeat(64), correlations: fit.correlations, chiSquaredReduced: fit.residual.chiSquaredReduced,
      });
      (calibrated.bank as Record<string, unknown>[])[0]!.voltage = '7 kV';
      const prediction = propagateLinear(scenarioFromRaw(calibrated), runShot)!;
      expect(prediction.inputs.map((input) => input.source)).toEqual(['calibration', 'calibration']);
      const predicted = prediction.nominal.muzzleVelocity!;
      const sigma = prediction.standardUncertainty.muzzleVelocity!;
      normalised.push((truthAt7kV.muzzleVelocity - predicted) / sigma);
      if (Math.abs(truthAt7kV.muzzleVelocity - predicted) <= 1.96 * sigma) covered += 1;
    }
    expect(covered, `covered ${covered} of 30; (truth − prediction)/σ: ${normalised.map((z) => z.toFixed(2)).join(' ')}`).toBeGreaterThanOrEqual(27);
    // and not by being needlessly wide: for a right σ the normalised errors have unit spread (RMS ≈ 1)
    const rms = Math.sqrt(normalised.reduce((sum, z) => sum + z * z, 0) / normalised.length);
    expect(rms).toBeGreaterThan(0.5);
  }, 120_000);
});
