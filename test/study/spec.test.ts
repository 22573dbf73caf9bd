import { describe, expect, it } from 'vitest';
import { dimensionOfPath } from '../../src/scenario/load.js';
import { InputError } from '../../src/core/errors.js';
import { parseVary, parseVaries } from '../../src/study/spec.js';
import { twoGroupScenario } from './fixtures.js';

const scenario = twoGroupScenario();
const vary = (text: string) => parseVary(text, scenario, dimensionOfPath);

function problemOf(text: string): string {
  try {
    vary(text);
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    const line = (error as InputError).line();
    expect(line).not.toContain('\n');
    expect(line.startsWith('--vary: ')).toBe(true);
    return line;
  }
  throw new Error(`"${text}" was accepted`);
}

describe('--vary PATH=SPEC', () => {
  it('reads a list with units into SI values (50 g = 0.05 kg, SI prefixes)', () => {
    const axis = vary('armature.mass=20g,40g, 80 g');
    expect(axis.kind).toBe('list');
    expect(axis.values).toEqual([0.02, 0.04, 0.08]);
    expect([axis.min, axis.max]).toEqual([0.02, 0.08]);
  });

  it('a linear range start:stop:count includes both ends with equal steps', () => {
    const axis = vary('bank[0].voltage=4kV:10kV:13');
    expect(axis.values).toHaveLength(13);
    expect(axis.values[0]).toBe(4000);
    expect(axis.values[12]).toBe(10000);
    expect(axis.values[1]).toBeCloseTo(4500, 9);
  });

  it('a log range is a geometric sequence: 1 mΩ…100 mΩ in 3 points gives 10 mΩ in the middle (geometric mean)', () => {
    const axis = vary('feed.resistance=log:1mohm:100mohm:3');
    expect(axis.kind).toBe('log');
    expect(axis.values[0]).toBe(0.001);
    expect(axis.values[1]).toBeCloseTo(0.01, 15);
    expect(axis.values[2]).toBe(0.1);
  });

  it('plain numbers are taken as SI; a module count must be whole', () => {
    expect(vary('rails.length=0.5,1').values).toEqual([0.5, 1]);
    expect(vary('bank[1].count=1:4:4').values).toEqual([1, 2, 3, 4]);
    expect(problemOf('bank[1].count=1:2:3')).toMatch(/whole number/);
  });

  it('rejects bad specs with one clear line naming the problem', () => {
    expect(problemOf('armature.mas=20g')).toMatch(/did you mean armature\.mass\?/);
    expect(problemOf('bank[3].voltage=1kV')).toMatch(/bank has 2 entries \(bank\[0\]…bank\[1\]\)/);
    expect(problemOf('armature.mass=20 V')).toMatch(/expected a mass \(kg\)/);
    expect(problemOf('armature.mass=')).toMatch(/no values/);
    expect(problemOf('bank[0].voltage=4kV:4kV:5')).toMatch(/empty/);
    expect(problemOf('bank[0].voltage=4kV:10kV:0')).toMatch(/count of a range must be a whole number ≥ 1/);
    expect(problemOf('feed.resistance=log:0ohm:1ohm:4')).toMatch(/log range needs start and stop > 0/);
    expect(problemOf('feed.resistance=log:-1ohm:1ohm:4')).toMatch(/> 0/);
    expect(problemOf('armature.mass')).toMatch(/expected PATH=SPEC/);
    expect(problemOf('armature.mass=20g,,30g')).toMatch(/empty value/);
    expect(problemOf('bank[0].crowbar.drop.x=1V')).toMatch(/not a number in the scenario/);
  });

  it('refuses the same path twice', () => {
    expect(() => parseVaries(['armature.mass=1g', 'armature.mass=2g'], scenario, dimensionOfPath)).toThrow(/varied twice/);
  });
});
