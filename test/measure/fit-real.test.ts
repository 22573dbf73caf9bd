/**
 * The fit engine on the real shot solver (src/solve/shot.ts): one crowbarred module, a moving armature,
 * the current and breech voltage "measured" by sampling a shot of known parameters. These are self-
 * consistency checks of fit + solver (the physics itself is tested against closed forms elsewhere).
 */
import { describe, expect, it } from 'vitest';
import type { Measurement } from '../../src/measure/csv.js';
import { fitScenario } from '../../src/measure/fit.js';
import { getScenarioPath, setScenarioPath } from '../../src/scenario/paths.js';
import { interpolateSorted } from '../../src/core/interpolate.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import type { Scenario } from '../../src/scenario/types.js';
import { runShot } from '../../src/solve/shot.js';
import { seededNormal } from './random.js';

// An invented bench: 1 mF at 5 kV through 10 µH, crowbar diode, 5 g armature on 1 m rails.
const truth = scenarioFromRaw({
  name: 'fit bench (invented)',
  bank: [{ capacitance: '1 mF', voltage: '5 kV', inductance: '10 uH', esr: '5 mohm', resistance: '2 mohm', crowbar: { drop: '1 V', resistance: '1 mohm' } }],
  feed: { inductance: '2 uH', resistance: '3 mohm' },
  rails: { length: '1 m', inductanceGradient: '0.45 uH/m' },
  armature: { mass: '5 g', resistance: '0.1 mohm' },
  solver: { endTime: '0.5 ms', sampleInterval: '2 us' },
});
const FREE = ['feed.inductance', 'bank[0].esr', 'rails.inductanceGradient'];
const shot = runShot(truth);
const times = Array.from({ length: 251 }, (_, k) => k * 2e-6);
const cleanI = interpolateSorted(shot.waveforms!.t, shot.waveforms!.current, times);
const cleanV = interpolateSorted(shot.waveforms!.t, shot.waveforms!.breechVoltage, times);

function measured(sigmaI: number, sigmaV: number, seed: number): Measurement {
  const normal = seededNormal(seed);
  return { t: times, signals: { I: cleanI.map((i) => i + sigmaI * normal()), V_breech: cleanV.map((v) => v + sigmaV * normal()) }, source: 'synthetic.csv', columns: [] };
}

const startFrom = (factors: number[], paths = FREE): Scenario =>
  paths.reduce((s, path, i) => setScenarioPath(s, path, getScenarioPath(s, path) * factors[i]!), truth);

describe('fitScenario with the real solver (1 module, moving armature)', () => {
  it('noiseless self-fit recovers feed inductance, ESR and L′ to 1e-6 from starts 15–20 % off', () => {
    const fit = fitScenario({
      scenario: startFrom([1.2, 0.85, 1.15]),
      measurement: measured(0, 0, 1),
      noise: { I: 1, V_breech: 1e-3 },
      free: FREE.map((path) => ({ path })),
      runShot: (s) => runShot(s),
      setPath: setScenarioPath,
    });
    expect(fit.converged).toBe(true);
    for (const path of FREE) expect(Math.abs(fit.parameters[path]!.value / getScenarioPath(truth, path) - 1)).toBeLessThan(1e-6);
    // every sample is compared but those within one sample interval of a switching instant (trigger at 0, crowbar onset)
    expect(fit.samples.excluded.length).toBeGreaterThan(0);
    expect(fit.residual.perGroup.I!.points).toBe(251 - fit.samples.excluded.length);
    expect(fit.samples.downWeighted).toEqual([]);
  });

  it('with 0.5 % noise on I and V_breech (two seeded draws) the estimates lie within 4 reported σ of the truth', () => {
    const peakI = Math.max(...cleanI);
    const peakV = Math.max(...cleanV);
    for (const seed of [21, 22]) {
      const fit = fitScenario({
        scenario: startFrom([1.1, 0.9, 1.1]),
        measurement: measured(0.005 * peakI, 0.005 * peakV, seed),
        free: FREE.map((path) => ({ path })),
        runShot: (s) => runShot(s),
        setPath: setScenarioPath,
      });
      expect(fit.converged).toBe(true);
      for (const path of FREE) {
        const p = fit.parameters[path]!;
        expect(Math.abs(p.value - getScenarioPath(truth, path))).toBeLessThan(4 * p.uncertainty);
      }
      expect(fit.residual.chiSquaredReduced).toBeGreaterThan(0.7);
      expect(fit.residual.chiSquaredReduced).toBeLessThan(1.3);
    }
  });

  it('module and feed resistance, in series for a single module (model contract §1), are reported as not separately identifiable', () => {
    const fit = fitScenario({
      scenario: startFrom([1.3, 0.8], ['feed.resistance', 'bank[0].resistance']),
      measurement: measured(40, 0.02, 5),
      free: [{ path: 'feed.resistance' }, { path: 'bank[0].resistance' }],
      runShot: (s) => runShot(s),
      setPath: setScenarioPath,
    });
    expect(fit.correlations['feed.resistance|bank[0].resistance']!).toBeLessThan(-0.95);
    expect(fit.warnings.some((w) => w.includes('not separately identifiable'))).toBe(true);
  });
});
