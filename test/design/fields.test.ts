import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { unitRatio } from '../../src/design/canvas-plot.js';
import { controlGroups, enteredValue, sliderSpan, splitWritten, withValue } from '../../src/design/fields.js';
import { quantityPaths } from '../../src/scenario/fields.js';

const demo = JSON.parse(readFileSync('scenarios/staggered-bank.json', 'utf8')) as Record<string, unknown>;

describe('design page controls (from the field table)', () => {
  it('has one control for every numeric quantity of every section the scenario has (and the solver\'s), the bank groups first', () => {
    const groups = controlGroups(demo);
    expect(groups.map((g) => g.path)).toEqual([
      'bank[0]', 'bank[0].crowbar', 'bank[1]', 'bank[1].crowbar', 'bank[2]', 'bank[2].crowbar', 'bank[3]', 'bank[3].crowbar',
      'feed', 'rails', 'armature', 'friction', 'drag', 'solver',
    ]);
    const paths = groups.flatMap((g) => g.controls.map((c) => c.path));
    // every quantity path of the field table in those sections (bank[n] → each group) has its control
    const expected = quantityPaths()
      .flatMap((path) => (path.startsWith('bank[n]') ? [0, 1, 2, 3].map((n) => path.replace('[n]', `[${n}]`)) : [path]))
      .filter((path) => groups.some((g) => path.startsWith(`${g.path}.`) && !path.slice(g.path.length + 1).includes('.')))
      // γ belongs to the strong-shock drag law; the demo's drag is ½ρC_dA v²
      .filter((path) => path !== 'drag.heatCapacityRatio');
    expect(paths.sort()).toEqual(expected.sort());
    const voltage = groups[0]!.controls.find((c) => c.key === 'voltage')!;
    expect(voltage.written).toBe('10 kV');
  });

  it('offers no control the section\'s model does not read: the strong-shock drag law has γ and no drag coefficient', () => {
    const shock = { ...demo, drag: { model: 'strong-shock', gasDensity: '1.2 kg/m^3', boreArea: '1 cm^2' } };
    const drag = controlGroups(shock).find((g) => g.path === 'drag')!;
    expect(drag.controls.map((c) => c.key).sort()).toEqual(['boreArea', 'gasDensity', 'heatCapacityRatio']);
    const coefficient = controlGroups(demo).find((g) => g.path === 'drag')!;
    expect(coefficient.controls.map((c) => c.key).sort()).toEqual(['boreArea', 'dragCoefficient', 'gasDensity']);
  });

  it('writes an entry where the file has it: a plain number stays a number, text stays text, blank removes the key', () => {
    expect(enteredValue(' 0.2 ')).toBe(0.2);
    expect(enteredValue('12 kV')).toBe('12 kV');
    expect(enteredValue('')).toBeUndefined();
    const changed = withValue(demo, 'bank[1].trigger', '150 us');
    expect((changed.bank as Record<string, unknown>[])[1]!.trigger).toBe('150 us');
    expect((demo.bank as Record<string, unknown>[])[1]!.trigger).toBe('140 us'); // the original is untouched
    // the solver section the demo leaves out is made when one of its keys is given
    expect(withValue(demo, 'solver.endTime', '5 ms').solver).toEqual({ endTime: '5 ms' });
    expect(withValue(demo, 'solver.endTime', undefined).solver).toBeUndefined();
    const removed = withValue(demo, 'friction.preload', undefined);
    expect(Object.hasOwn(removed.friction as object, 'preload')).toBe(false);
  });

  it('puts a slider a factor of four either way around a positive value, linearly from zero otherwise', () => {
    expect(splitWritten('10 kV')).toEqual({ number: 10, unit: 'kV' });
    expect(splitWritten(0.15)).toEqual({ number: 0.15, unit: '' });
    expect(splitWritten('kV')).toBeNull();
    expect(sliderSpan(10)).toEqual({ min: 2.5, max: 40, log: true });
    expect(sliderSpan(0, [0, 140, 280, 420])).toEqual({ min: 0, max: 840, log: false });
  });

  it('rescales the ghost when the SI prefix of an axis changes (kA against MA: a factor of 1000)', () => {
    expect(unitRatio('Current (MA)', 'Current (kA)')).toBe(1000);
    expect(unitRatio('Time (\u00B5s)', 'Time (ms)')).toBeCloseTo(1e-3, 15);
    expect(unitRatio('Energy (kJ)', 'Energy (kJ)')).toBe(1);
  });
});
