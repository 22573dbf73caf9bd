import { describe, expect, it } from 'vitest';
import { readMeasurement, type Measurement } from '../../src/measure/csv.js';
import { fitScenario } from '../../src/measure/fit.js';
import { goodnessOfFit } from '../../src/measure/goodness.js';
import { getScenarioPath, setScenarioPath } from '../../src/scenario/paths.js';
import type { Scenario } from '../../src/scenario/types.js';
import { fakeRunShot, rlcCurrent, rlcPeak, rlcScenario } from './fake-model.js';
import { mean, seededNormal, standardDeviation } from './random.js';

const FREE = ['feed.inductance', 'bank[0].esr', 'bank[0].capacitance'];

/** A "measured" current: the true model sampled every 1 µs over the first 380 µs, plus seeded noise. */
function measuredCurrent(truth: Scenario, sigma: number, seed: number): Measurement {
  const normal = seededNormal(seed);
  const t = Array.from({ length: 381 }, (_, k) => k * 1e-6);
  return { t, signals: { I: t.map((tk) => rlcCurrent(truth, tk) + sigma * normal()) }, source: 'synthetic.csv', columns: [] };
}

function perturbed(s: Scenario, factors: number[]): Scenario {
  return FREE.reduce((acc, path, i) => setScenarioPath(acc, path, getScenarioPath(acc, path) * factors[i]!), s);
}

const truth = rlcScenario();
const trueValues = FREE.map((p) => getScenarioPath(truth, p));

describe('fitScenario with a series RLC stand-in model (natural response, circuits textbook)', () => {
  it('a noiseless self-fit returns the true L_feed, ESR and C to 1e-6 from starts 15–25 % off', () => {
    const fit = fitScenario({
      scenario: perturbed(truth, [1.25, 0.8, 1.15]),
      measurement: measuredCurrent(truth, 0, 1),
      noise: { I: 1 },
      free: FREE.map((path) => ({ path })),
      runShot: fakeRunShot,
      setPath: setScenarioPath,
    });
    expect(fit.converged).toBe(true);
    FREE.forEach((path, i) => expect(Math.abs(fit.parameters[path]!.value / trueValues[i]! - 1)).toBeLessThan(1e-6));
    expect(fit.parameters['feed.inductance']!.initial).toBeCloseTo(2.5e-6, 18);
    expect(fit.residual.perGroup.I!.rmsSI).toBeLessThan(1e-3);
    // L, R and C of one half-cycle are strongly (|r| ≈ 0.95–0.97) but not perfectly correlated: warned, still recovered
    expect(fit.warnings.filter((w) => !w.includes('not separately identifiable'))).toEqual([]);
  });

  it('with noise (σ = 0.5 % of peak, 30 seeded draws) each fit lands within 4 reported σ, and the reported σ is within a factor 2 of the spread', () => {
    const peak = rlcPeak(truth).current;
    const estimates: number[][] = [];
    const uncertainties: number[][] = [];
    for (let draw = 0; draw < 30; draw++) {
      const fit = fitScenario({
        scenario: perturbed(truth, [1.1, 0.9, 1.05]),
        measurement: measuredCurrent(truth, 0.005 * peak, 1000 + draw),
        free: FREE.map((path) => ({ path })),
        runShot: fakeRunShot,
        setPath: setScenarioPath,
      });
      expect(fit.converged).toBe(true);
      const values = FREE.map((p) => fit.parameters[p]!.value);
      const sigmas = FREE.map((p) => fit.parameters[p]!.uncertainty);
      values.forEach((v, i) => expect(Math.abs(v - trueValues[i]!)).toBeLessThan(4 * sigmas[i]!));
      expect(fit.residual.chiSquaredReduced).toBeGreaterThan(0.7);
      expect(fit.residual.chiSquaredReduced).toBeLessThan(1.3);
      estimates.push(values);
      uncertainties.push(sigmas);
    }
    FREE.forEach((_, i) => {
      const spread = standardDeviation(estimates.map((v) => v[i]!));
      const reported = mean(uncertainties.map((s) => s[i]!));
      expect(reported / spread).toBeGreaterThan(0.5);
      expect(reported / spread).toBeLessThan(2);
    });
  });

  it('two resistances that only appear as a sum (feed resistance and ESR) are reported as correlated', () => {
    const fit = fitScenario({
      scenario: perturbed(truth, [1, 0.7, 1]),
      measurement: measuredCurrent(truth, 50, 7),
      free: [{ path: 'feed.resistance' }, { path: 'bank[0].esr' }],
      runShot: fakeRunShot,
      setPath: setScenarioPath,
    });
    const r = fit.correlations['feed.resistance|bank[0].esr']!;
    expect(r).toBeLessThan(-0.95);
    expect(fit.warnings.some((w) => w.includes('feed.resistance and bank[0].esr are not separately identifiable'))).toBe(true);
    const sum = fit.parameters['feed.resistance']!.value + fit.parameters['bank[0].esr']!.value;
    expect(Math.abs(sum - 8e-3)).toBeLessThan(1e-4);
  });

  it('probe arrival positions and a muzzle velocity recover the armature mass (noise-free self-fit, probes after the model ends use free flight)', () => {
    const truthShot = fakeRunShot(truth);
    const w = truthShot.waveforms!;
    const indices = [100, 200, 300, 400];
    const positions = { x: indices.map((k) => w.position[k]!), t: indices.map((k) => w.t[k]!), source: 'probes.csv' };
    positions.x.push(w.position.at(-1)! + w.velocity.at(-1)! * 1e-3);
    positions.t.push(w.t.at(-1)! + 1e-3);
    const fit = fitScenario({
      scenario: setScenarioPath(truth, 'armature.mass', 0.07),
      positions,
      muzzleVelocity: truthShot.results.muzzleVelocity,
      free: [{ path: 'armature.mass' }],
      runShot: fakeRunShot,
      setPath: setScenarioPath,
    });
    expect(Math.abs(fit.parameters['armature.mass']!.value / 0.05 - 1)).toBeLessThan(1e-6);
    expect(fit.residual.perGroup.position!.points).toBe(5);
    expect(fit.residual.perGroup.muzzleVelocity!.points).toBe(1);
  });

  it('a bound below the true value holds the parameter there and says so', () => {
    const fit = fitScenario({
      scenario: truth,
      measurement: measuredCurrent(truth, 0, 1),
      noise: { I: 1 },
      free: [{ path: 'bank[0].capacitance', upper: 0.9e-3 }],
      runShot: fakeRunShot,
      setPath: setScenarioPath,
    });
    expect(fit.parameters['bank[0].capacitance']!.value).toBeCloseTo(0.9e-3, 15);
    expect(fit.parameters['bank[0].capacitance']!.atBound).toBe(true);
    expect(fit.warnings.join('\n')).toMatch(/stopped on its bound/);
  });
});

describe('from a scope file to fitted values', () => {
  it('a semicolon/decimal-comma export in µs and kA with a probe factor, read and fitted, gives back the true values (noise-free)', () => {
    // The probe writes volts at 0.5 kA/V (scale 0.5 in kA), the scope's zero is 3 µs after the trigger.
    const rows = ['Instrument;example DAQ', 'Channels;1', 'Zeit [us];Kanal A [V]'];
    for (let k = 0; k <= 300; k++) {
      const tTrue = k * 1e-6 + 3e-6;
      rows.push(`${k.toFixed(1).replace('.', ',')};${(rlcCurrent(truth, tTrue) / 500).toExponential(12).replace('.', ',')}`);
    }
    const measurement = readMeasurement(rows.join('\n'), {
      source: 'shot07.csv',
      map: { Zeit: 't', 'Kanal A': 'I' },
      units: { I: 'kA' },
      scale: { I: 0.5 },
      offset: { t: 3 },
    });
    const fit = fitScenario({
      scenario: perturbed(truth, [1.1, 1.2, 0.9]),
      measurement,
      noise: { I: 1 },
      free: FREE.map((path) => ({ path })),
      runShot: fakeRunShot,
      setPath: setScenarioPath,
    });
    FREE.forEach((path, i) => expect(Math.abs(fit.parameters[path]!.value / trueValues[i]! - 1)).toBeLessThan(1e-6));
  });
});

describe('goodnessOfFit', () => {
  it('locates the measured peak at the closed-form t_p = atan(ωd/α)/ωd and reports zero error for the true model', () => {
    const g = goodnessOfFit(fakeRunShot(truth), measuredCurrent(truth, 0, 1));
    const peak = rlcPeak(truth);
    expect(Math.abs(g.peakCurrent!.relativeError)).toBeLessThan(1e-4); // cubic through the top 3 % of a 1 µs-sampled pulse
    expect(Math.abs(g.peakCurrentTime!.error)).toBeLessThan(0.01e-6); // 1 % of the sample interval
    expect(g.peakCurrentTime!.measured).toBeCloseTo(peak.time, 8);
    expect(g.signals.I!.rms).toBeLessThan(1e-6 * peak.current);
  });

  it('a model 10 % high shows +10 % peak error and an RMS of 10 % of the signal RMS', () => {
    const measured = measuredCurrent(truth, 0, 1);
    const lowered: Measurement = { ...measured, signals: { I: measured.signals.I!.map((i) => i / 1.1) } };
    const g = goodnessOfFit(fakeRunShot(truth), lowered, { muzzleVelocity: 2 });
    expect(g.peakCurrent!.relativeError).toBeCloseTo(0.1, 3);
    const signalRms = Math.sqrt(mean(Array.from(lowered.signals.I!, (i) => i * i)));
    expect(g.signals.I!.rms / signalRms).toBeCloseTo(0.1, 3);
    expect(g.muzzleVelocity!.measured).toBe(2);
    expect(g.exitTime).toBeUndefined();
  });
});
