/**
 * The calibrated scenario file: fitted SI numbers written into the user's JSON, everything else as written.
 * Checked by loading the result with the real scenario loader (the model contract's defaults, §6).
 */
import { describe, expect, it } from 'vitest';
import { calibratedScenarioRaw } from '../../src/measure/calibrated.js';
import { setRawPath } from '../../src/scenario/paths.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';

const RAW = {
  name: 'bench (invented)',
  bank: [{ capacitance: '1 mF', voltage: '5 kV', inductance: '10 uH' }],
  feed: { inductance: '2 uH' },
  rails: { length: '1 m', inductanceGradient: '0.45 uH/m' },
  armature: { mass: '5 g' },
};

describe('calibrated scenario file', () => {
  it('creates a section the file left to its defaults; μ_s then defaults to the fitted μ (model contract §2)', () => {
    const raw = calibratedScenarioRaw(RAW, {
      scenarioFile: 'bench.json',
      measurementFile: 'shot-042.csv',
      date: '2026-12-02T12:00:00Z',
      fitted: { 'friction.coefficient': { value: 0.23, uncertainty: 0.01 }, 'bank[0].esr': { value: 4e-3, uncertainty: NaN } },
    });
    const scenario = scenarioFromRaw(raw);
    expect(scenario.friction.coefficient).toBe(0.23);
    expect(scenario.friction.staticCoefficient).toBe(0.23);
    expect(scenario.bank[0]!.esr).toBe(4e-3);
    expect((raw.bank as Record<string, unknown>[])[0]!.capacitance).toBe('1 mF');
    expect(raw.name).toBe('bench (invented) (calibrated)');
    expect(raw.description).toBe(
      'Calibrated by railpulse fit against shot-042.csv on 2026-12-02 from bench.json: friction.coefficient = 0.230000 ± 0.010, bank[0].esr = 0.00400000 (on a bound) (SI, 1σ).',
    );
    expect(RAW).not.toHaveProperty('friction'); // the input is not modified
  });

  it('carries the calibration: paths, values, covariance cov_ij = r_ij σ_i σ_j (definition of the correlation coefficient), record, SHA-256 and date; loads back', () => {
    const raw = calibratedScenarioRaw(
      { ...RAW, tolerances: [{ path: 'rails.inductanceGradient', normal: '2 %' }, { path: 'armature.mass', normal: '0.1 g' }] },
      {
        scenarioFile: 'bench.json',
        measurementFile: 'shot-042.csv',
        date: '2026-12-02T12:00:00Z',
        fitted: { 'rails.inductanceGradient': { value: 0.43e-6, uncertainty: 0.01e-6 }, 'armature.contactResistance': { value: 1.6e-4, uncertainty: 2e-5 }, 'bank[0].esr': { value: 0, uncertainty: NaN } },
        measurementSha256: 'c'.repeat(64),
        correlations: { 'rails.inductanceGradient|armature.contactResistance': -0.4, 'rails.inductanceGradient|bank[0].esr': NaN },
        chiSquaredReduced: 1.1,
      },
    );
    const { covariance, ...rest } = raw.calibration as { covariance: number[][] };
    const expected = [[1e-16, -0.4 * 1e-8 * 2e-5], [-0.4 * 1e-8 * 2e-5, 4e-10]];
    covariance.forEach((row, i) => row.forEach((c, j) => expect(c / expected[i]![j]! - 1).toBeCloseTo(0, 12)));
    expect(covariance[0]![1]).toBe(covariance[1]![0]);
    expect(rest).toEqual({
      parameters: ['rails.inductanceGradient', 'armature.contactResistance'],
      values: [0.43e-6, 1.6e-4],
      record: 'shot-042.csv',
      recordSha256: 'c'.repeat(64),
      date: '2026-12-02T12:00:00Z',
      scenario: 'bench.json',
      chiSquaredReduced: 1.1,
      onBound: ['bank[0].esr'],
    });
    // the tolerance on the now calibrated L′ is superseded by the calibration; the other stays
    expect(raw.tolerances).toEqual([{ path: 'armature.mass', normal: '0.1 g' }]);
    const scenario = scenarioFromRaw(raw);
    expect(scenario.calibration!.parameters.map((p) => p.path)).toEqual(['rails.inductanceGradient', 'armature.contactResistance']);
    expect(scenario.calibration!.onBound).toEqual(['bank[0].esr']);
    // a second fit replaces the calibration (its values describe the scenario again)
    const again = calibratedScenarioRaw(raw, { scenarioFile: 'x.json', measurementFile: 'shot-043.csv', date: '2026-12-03', fitted: { 'rails.inductanceGradient': { value: 0.44e-6, uncertainty: 0.02e-6 } }, measurementSha256: 'd'.repeat(64) });
    expect((again.calibration as { parameters: string[] }).parameters).toEqual(['rails.inductanceGradient']);
    expect(scenarioFromRaw(again).rails.inductanceGradient).toBe(0.44e-6);
  });

  it('refuses to invent a list item', () => {
    expect(() => setRawPath(structuredClone(RAW), 'bank[2].esr', 1)).toThrow(RangeError);
  });
});
