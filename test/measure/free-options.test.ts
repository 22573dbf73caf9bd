/**
 * `--free`, `--weight`, `--noise` parsing in process (the CLI tests run the common mistakes end to end).
 * Units per the model contract §6: a plain number is SI, a string carries its unit.
 */
import { describe, expect, it } from 'vitest';
import { parseFree, parseNoise, parseWeights } from '../../src/cli/measure-options.js';
import { InputError } from '../../src/core/errors.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { TRUTH_RAW } from './cli-fixture.js';

const scenario = scenarioFromRaw(TRUTH_RAW);
const problem = (work: () => unknown): string => {
  try {
    work();
  } catch (error) {
    if (error instanceof InputError) return error.line();
    throw error;
  }
  throw new Error('expected an InputError');
};

describe('fit options', () => {
  it('bounds are read with their units into SI (0.3 µH/m = 3e-7 H/m); either side may be open', () => {
    expect(parseFree('rails.inductanceGradient=0.3uH/m:0.6 µH/m', scenario)).toEqual({ path: 'rails.inductanceGradient', lower: 3e-7, upper: 6e-7 });
    expect(parseFree('bank[0].esr=:20mohm', scenario)).toEqual({ path: 'bank[0].esr', upper: 0.02 });
    expect(parseFree('friction.coefficient', scenario)).toEqual({ path: 'friction.coefficient' });
  });

  it('refuses what a fit cannot vary, naming it', () => {
    expect(problem(() => parseFree('bank[3].esr', scenario))).toMatch(/^--free: bank\[3\]\.esr: the scenario has no such value/);
    expect(problem(() => parseFree('bank[0].esrr', scenario))).toMatch(/did you mean "bank\[0\]\.esr"/);
    expect(problem(() => parseFree('solver.relTol', scenario))).toMatch(/solver setting/);
    expect(problem(() => parseFree('bank[0].count', scenario))).toMatch(/whole number/);
    expect(problem(() => parseFree('feed.inductance=1uH:2uH:3uH', scenario))).toMatch(/expected PATH=LOWER:UPPER/);
    // F_f = μ(F_N0 + k_N I²), model contract §2: without a normal force μ cannot show in any measurement
    const frictionless = scenarioFromRaw({ ...TRUTH_RAW, friction: undefined });
    expect(problem(() => parseFree('friction.coefficient=0:0.5', frictionless))).toMatch(/no effect in this scenario: the contact normal force is zero/);
  });

  it('weights are plain numbers ≥ 0 for known signals; noise carries the signal’s unit', () => {
    expect(parseWeights(['V_breech=0.5', 'position=2'])).toEqual({ V_breech: 0.5, position: 2 });
    expect(problem(() => parseWeights(['I=-1']))).toMatch(/expected a number ≥ 0/);
    // 0 leaves a signal out of the fit rather than being an error
    expect(parseWeights(['V_breech=0'])).toEqual({ V_breech: 0 });
    expect(parseNoise(['I=0.2kA', 'V_breech=50mV', 'position=2us', 'muzzleVelocity=3m/s'])).toEqual({ I: 200, V_breech: 0.05, arrivalTime: 2e-6, muzzleVelocity: 3 });
    expect(problem(() => parseNoise(['I=3V']))).toMatch(/^--noise: expected a current/);
  });
});
