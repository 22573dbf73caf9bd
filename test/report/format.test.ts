import { describe, expect, it } from 'vitest';
import { flattenLeaves, groupBySection, inputRows, siUnitOfPath } from '../../src/report/inputs.js';
import { syntheticScenario } from './fixtures/synthetic-shot.js';

describe('input table rows', () => {
  it('flattens by scenario path, as a user would name a value', () => {
    const leaves = flattenLeaves({ bank: [{ voltage: '4 kV', crowbar: { drop: 2 } }], drag: null });
    expect([...leaves.entries()]).toEqual([
      ['bank[0].voltage', '4 kV'],
      ['bank[0].crowbar.drop', 2],
      ['drag', null],
    ]);
  });

  it('every SI value appears once, with what was written (or a default) and its SI unit; no $schema row', () => {
    const scenario = syntheticScenario({ groups: 1 });
    const rows = inputRows({ $schema: './railpulse.schema.json', name: scenario.name, bank: [{ voltage: '6 kV', typo: 1 }] }, scenario);
    const voltage = rows.find((r) => r.path === 'bank[0].voltage');
    expect(voltage).toEqual({ path: 'bank[0].voltage', written: '6 kV', si: 6000, unit: 'V' });
    expect(rows.find((r) => r.path === 'rails.inductanceGradient')).toMatchObject({ written: undefined, unit: 'H/m' });
    expect(rows.find((r) => r.path === 'bank[0].typo')).toMatchObject({ written: 1, si: undefined });
    expect(rows.some((r) => r.path === '$schema')).toBe(false);
    expect(new Set(rows.map((r) => r.path)).size).toBe(rows.length);
  });

  it('material properties, limits and derived figures carry their units', () => {
    expect(siUnitOfPath('rails.material.resistivity')).toBe('\u03A9\u00B7m');
    expect(siUnitOfPath('armature.material.specificHeat')).toBe('J/(kg\u00B7K)');
    expect(siUnitOfPath('armature.transition.action')).toBe('A\u00B2\u00B7s');
    expect(siUnitOfPath('materials.myAlloy.density')).toBe('kg/m\u00B3');
    expect(siUnitOfPath('rails.material.meltingTemperature')).toBe('\u00B0C');
    expect(siUnitOfPath('limits.peakAcceleration')).toBe('m/s\u00B2');
    expect(siUnitOfPath('rails.derived.penetrationDepth')).toBe('m');
    expect(siUnitOfPath('armature.derived.currentArea')).toBe('m\u00B2');
  });

  it('groups rows by section: the name and description, each bank group, then each section', () => {
    const rows = ['name', 'description', 'bank[0].voltage', 'bank[0].crowbar.drop', 'bank[1].voltage', 'feed.inductance', 'drag'].map((path) => ({ path }));
    expect(groupBySection(rows).map((s) => [s.section, s.rows.length])).toEqual([
      ['', 2],
      ['bank[0]', 2],
      ['bank[1]', 1],
      ['feed', 1],
      ['drag', 1],
    ]);
  });
});
