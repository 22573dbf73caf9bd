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

  it('refuses to invent a list item', () => {
    expect(() => setRawPath(structuredClone(RAW), 'bank[2].esr', 1)).toThrow(RangeError);
  });
});
