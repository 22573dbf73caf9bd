import { describe, expect, it } from 'vitest';
import { formatPercent, formatPlain, formatQuantity, formatScientific, scaleFor } from '../../src/report/format.js';
import { flattenLeaves, inputRows } from '../../src/report/inputs.js';
import { syntheticScenario } from './fixtures/synthetic-shot.js';

const NBSP = '\u00A0';

describe('figures for people (SI prefixes, SI Brochure style digit grouping)', () => {
  it('engineering prefixes keep 4 significant figures', () => {
    expect(formatQuantity(12345, 'A')).toBe(`12.35${NBSP}kA`);
    expect(formatQuantity(2.3386e-4, 's')).toBe(`233.9${NBSP}\u00B5s`);
    expect(formatQuantity(999.96, 'V')).toBe(`1.000${NBSP}kV`);
    expect(formatQuantity(-0.0125, 'm')).toBe(`-12.50${NBSP}mm`);
    expect(formatQuantity(0, 'J')).toBe(`0${NBSP}J`);
    expect(formatQuantity(null, 's')).toBe('\u2014');
  });

  it('plain numbers group thousands with thin spaces and never switch to exponent form', () => {
    expect(formatPlain(34450.2)).toBe('34\u2009450');
    expect(formatPlain(1234.56)).toBe('1235');
    expect(formatQuantity(230.84, 'm/s', { prefix: false })).toBe(`230.8${NBSP}m/s`);
  });

  it('scientific notation for units a prefix would garble, and tiny percentages', () => {
    expect(formatScientific(5.3592e6, 'A\u00B2\u00B7s')).toBe(`5.359 \u00D7 10\u2076${NBSP}A\u00B2\u00B7s`);
    expect(formatScientific(2e-6, '', 2)).toBe('2.0 \u00D7 10\u207B\u2076');
    expect(formatPercent(0.00873)).toBe(`0.873${NBSP}%`);
    expect(formatPercent(1.26e-9)).toBe(`1.3 \u00D7 10\u207B\u2077${NBSP}%`);
  });

  it('plot axes scale to a power of 1000', () => {
    expect(scaleFor(86_902)).toEqual({ factor: 1e-3, prefix: 'k' });
    expect(scaleFor(5.19e-3)).toEqual({ factor: 1e3, prefix: 'm' });
    expect(scaleFor(0)).toEqual({ factor: 1, prefix: '' });
  });
});

describe('input table rows', () => {
  it('flattens by scenario path, as a user would name a value', () => {
    const leaves = flattenLeaves({ bank: [{ voltage: '4 kV', crowbar: { drop: 2 } }], drag: null });
    expect([...leaves.entries()]).toEqual([
      ['bank[0].voltage', '4 kV'],
      ['bank[0].crowbar.drop', 2],
      ['drag', null],
    ]);
  });

  it('every SI value appears once, with what was written (or a default) and its SI unit', () => {
    const scenario = syntheticScenario({ groups: 1 });
    const rows = inputRows({ name: scenario.name, bank: [{ voltage: '6 kV', typo: 1 }] }, scenario);
    const voltage = rows.find((r) => r.path === 'bank[0].voltage');
    expect(voltage).toEqual({ path: 'bank[0].voltage', written: '6 kV', si: 6000, unit: 'V' });
    expect(rows.find((r) => r.path === 'rails.inductanceGradient')).toMatchObject({ written: undefined, unit: 'H/m' });
    expect(rows.find((r) => r.path === 'bank[0].typo')).toMatchObject({ written: 1, si: undefined });
    expect(new Set(rows.map((r) => r.path)).size).toBe(rows.length);
  });
});
