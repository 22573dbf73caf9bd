/**
 * The scenario's tolerances and calibration sections: what they mean in SI (uniform ±a has σ = a/√3, GUM
 * JCGM 100:2008 §4.3.7) and every malformed or contradictory section refused with one message naming its path.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { uncertaintyModel } from '../../src/study/uncertainInputs.js';

const BASE = {
  name: 'tolerance bench (invented)',
  bank: [
    { capacitance: '400 uF', voltage: '5 kV', inductance: '5 uH', esr: '2 mohm' },
    { capacitance: '400 uF', voltage: '5 kV', inductance: '5 uH', trigger: '100 us', crowbar: { drop: '2 V' } },
  ],
  feed: { inductance: '0.3 uH' },
  rails: { length: '1 m', inductanceGradient: '0.45 uH/m' },
  armature: { mass: '10 g' },
  friction: { coefficient: 0.1, preload: '50 N' },
};
const COVARIANCE = [[1e-16, 0.5 * 1e-8 * 1e-6], [0.5 * 1e-8 * 1e-6, 1e-12]];
const CALIBRATION = {
  parameters: ['rails.inductanceGradient', 'feed.inductance'],
  values: [0.45e-6, 0.3e-6],
  covariance: COVARIANCE,
  record: 'shot-17.csv',
  recordSha256: 'ab'.repeat(32),
  date: '2026-03-04T10:00:00Z',
};

function load(extra: Record<string, unknown>) {
  return scenarioFromRaw({ ...structuredClone(BASE), ...extra }, 'bench.json');
}

function problem(extra: Record<string, unknown>): string {
  try {
    load(extra);
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    const line = (error as InputError).line();
    expect(line.split('\n')).toHaveLength(1);
    return line;
  }
  throw new Error('expected the scenario to be refused');
}

describe('tolerances section', () => {
  it('reads spreads in SI: uniform ±5 % → σ = a/√3 (GUM §4.3.7), normal 20 V → σ 20 V, bank[*] one input a group or one common draw', () => {
    const s = load({
      tolerances: [
        { path: 'bank[*].capacitance', uniform: '±5 %' },
        { path: 'bank[*].voltage', normal: '20 V', common: true },
        { path: 'armature.mass', normal: '0.1 g' },
        { path: 'friction.coefficient', uniform: 0.01 },
      ],
    });
    const model = uncertaintyModel(s)!;
    expect(model.inputs.map((input) => input.name)).toEqual(['bank[0].capacitance', 'bank[1].capacitance', 'bank[*].voltage', 'armature.mass', 'friction.coefficient']);
    expect(model.inputs[0]!.targets[0]!.sigma).toBeCloseTo((0.05 * 400e-6) / Math.sqrt(3), 15);
    expect(model.inputs[2]!.targets.map((t) => [t.path, t.sigma])).toEqual([['bank[0].voltage', 20], ['bank[1].voltage', 20]]);
    expect(model.inputs[3]!.targets[0]!.sigma).toBeCloseTo(1e-4, 15);
    // μ_s is left to its default (= μ, model contract §2), so it moves with μ
    expect(model.inputs[4]!.targets[0]!.follows).toEqual(['friction.staticCoefficient']);
    expect(model.correlation).toEqual(model.inputs.map((_, a) => model.inputs.map((__, b) => (a === b ? 1 : 0))));
  });

  it.each([
    [{ path: 'bank[2].voltage', normal: '20 V' }, /tolerances\[0\]\.path: bank\[2\]\.voltage: the bank has 2 group\(s\)/],
    [{ path: 'rails.inductanceGradent', normal: '2 %' }, /tolerances\[0\]\.path: .*did you mean rails\.inductanceGradient/],
    [{ path: 'bank[0].crowbar.drop', normal: '1 V' }, /bank\[0\]\.crowbar\.drop: the scenario has no such value/],
    [{ path: 'solver.relTol', normal: '1 %' }, /solver setting/],
    [{ path: 'bank[0].count', normal: 1 }, /whole number/],
    [{ path: 'rails.geometry.height', normal: '1 mm' }, /tolerances\[0\]\.path: .*no such value|geometry input/],
    [{ path: 'bank[0].capacitance', uniform: '5 %', normal: '1 uF' }, /tolerances\[0\]: give exactly one of "uniform".*both/],
    [{ path: 'bank[0].capacitance' }, /tolerances\[0\]: give exactly one .*neither/],
    [{ path: 'bank[0].capacitance', normal: '5 kV' }, /tolerances\[0\]\.normal: expected a capacitance/],
    [{ path: 'bank[0].capacitance', normal: '-1 uF' }, /tolerances\[0\]\.normal: expected a spread > 0/],
    [{ path: 'bank[0].capacitance', normal: '30 %' }, /tolerances\[0\]\.normal: bank\[0\]\.capacitance at its nominal − 4σ .* leaves the model's valid range/],
    [{ path: 'bank[0].resistance', uniform: '1 %' }, /bank\[0\]\.resistance is 0, so a percentage of it is no spread/],
    [{ path: 'bank[0].capacitance', normal: '1 %', common: true }, /tolerances\[0\]\.common: only applies to a bank\[\*\] path/],
    [{ path: 'armature.mass', normal: '1 %', width: 2 }, /tolerances\[0\]\.width: unknown key/],
    [{ path: 'bank[*]', normal: '1 %' }, /tolerances\[0\]\.path/],
  ])('refuses %j with one line naming its path', (entry, pattern) => {
    expect(problem({ tolerances: [entry] })).toMatch(pattern);
  });

  it('refuses a value given two tolerances, also through a follower (μ_s follows μ)', () => {
    expect(problem({ tolerances: [{ path: 'bank[*].voltage', normal: '1 %' }, { path: 'bank[1].voltage', normal: '2 %' }] })).toMatch(/tolerances\[1\]\.path: bank\[1\]\.voltage is already moved by tolerances\[0\]/);
    expect(problem({ tolerances: [{ path: 'friction.coefficient', normal: 0.001 }, { path: 'friction.staticCoefficient', normal: 0.001 }] })).toMatch(/friction\.staticCoefficient is already moved by tolerances\[0\]/);
    expect(problem({ tolerances: { path: 'armature.mass' } })).toMatch(/^bench\.json: tolerances: expected an array/);
  });
});

describe('calibration section', () => {
  it('reads the calibrated paths, values and covariance; the inputs are correlated as the covariance says', () => {
    const s = load({ calibration: CALIBRATION, tolerances: [{ path: 'armature.mass', normal: '0.1 g' }] });
    const model = uncertaintyModel(s)!;
    expect(model.inputs.map((input) => [input.name, input.source])).toEqual([['armature.mass', 'tolerance'], ['rails.inductanceGradient', 'calibration'], ['feed.inductance', 'calibration']]);
    expect(model.inputs[1]!.targets[0]!.sigma).toBeCloseTo(1e-8, 20);
    expect(model.correlation[1]![2]).toBeCloseTo(0.5, 12);
    expect(model.correlation[0]![1]).toBe(0);
  });

  it.each([
    [{ covariance: [[1e-16, 2e-15], [1e-15, 1e-12]] }, /calibration\.covariance\[0\]\[1\]: the covariance must be symmetric/],
    [{ covariance: [[1e-16, 1.2e-14], [1.2e-14, 1e-12]] }, /calibration\.covariance: the covariance is not positive semi-definite/],
    [{ covariance: [[-1e-16, 0], [0, 1e-12]] }, /calibration\.covariance\[0\]\[0\]: a variance must be ≥ 0/],
    [{ covariance: [[1e-16, 0]] }, /calibration\.covariance: expected a 2×2 matrix/],
    [{ covariance: [[1e-16, 0], [0, 'x']] }, /calibration\.covariance\[1\]\[1\]: expected a finite number/],
    [{ values: [0.46e-6, 0.3e-6] }, /calibration\.values\[0\]: 4\.6e-7 does not match rails\.inductanceGradient = 4\.5e-7/],
    [{ values: [0.45e-6] }, /calibration\.values: expected 2 number\(s\)/],
    [{ parameters: ['rails.inductanceGradient', 'rails.inductanceGradient'] }, /calibration\.parameters\[1\]: rails\.inductanceGradient is already/],
    [{ parameters: ['rails.inductanceGradient', 'bank[3].esr'] }, /calibration\.parameters\[1\]: bank\[3\]\.esr: the bank has 2/],
    [{ recordSha256: 'abc' }, /calibration\.recordSha256: expected the record's SHA-256 as 64 hexadecimal digits/],
    [{ date: 'yesterday' }, /calibration\.date: expected an ISO date/],
    [{ record: undefined }, /calibration\.record: expected a text string, got nothing/],
    [{ fittedBy: 'me' }, /calibration\.fittedBy: unknown key/],
  ])('refuses %j with one line naming its path', (change, pattern) => {
    expect(problem({ calibration: { ...CALIBRATION, ...change } })).toMatch(pattern);
  });

  it('a tolerance on a calibrated value contradicts the calibration; a bank[*] tolerance leaves a calibrated group to it', () => {
    expect(problem({ calibration: CALIBRATION, tolerances: [{ path: 'feed.inductance', normal: '1 %' }] })).toMatch(
      /tolerances\[0\]\.path: feed\.inductance is calibrated \(calibration\.parameters\[1\]\)/,
    );
    const calibration = { ...CALIBRATION, parameters: ['bank[0].inductance'], values: [5e-6], covariance: [[1e-14]] };
    const s = load({ calibration, tolerances: [{ path: 'bank[*].inductance', normal: '2 %' }] });
    expect(s.tolerances![0]!.targets.map((t) => t.path)).toEqual(['bank[1].inductance']);
  });
});
