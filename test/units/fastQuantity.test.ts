/**
 * The fast quantity reader against mathjs (reference library, mathjs 15: `unit(text).toNumber(si)`): wherever
 * the fast reader gives a value, mathjs gives the identical double; wherever mathjs refuses a string or its
 * dimension, the fast reader declines (so toSI asks mathjs and its messages are mathjs's path's). Strings: an
 * enumerated corpus of number spellings × unit expressions × every target dimension, plus random ones.
 */
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FAST_PREFIXES, FAST_UNITS, fastSI } from '../../src/units/fastQuantity.js';
import { DIMENSIONS, normaliseUnitText, toSI } from '../../src/units/quantity.js';
import { demoFiles } from '../regression/demo-results.js';

const mathjs = createRequire(import.meta.url)('mathjs') as { unit: (text: string) => { toNumber: (si: string) => number } };

/** mathjs's answer: the number, or 'refused' when it throws. */
function reference(text: string, si: string): number | 'refused' {
  try {
    return mathjs.unit(text).toNumber(si);
  } catch {
    return 'refused';
  }
}

const TARGETS = [...new Set(Object.values(DIMENSIONS).map((dim) => dim.si).filter((si) => si !== ''))];

/** Every disagreement between the fast reader and mathjs for `text` against every target. */
function disagreements(text: string): string[] {
  const out: string[] = [];
  for (const si of TARGETS) {
    const fast = fastSI(text, si);
    if (fast === null) continue;
    const ref = reference(text, si);
    if (ref === 'refused' || !Object.is(ref, fast)) out.push(`${JSON.stringify(text)} in ${si}: fast ${fast}, mathjs ${ref}`);
  }
  return out;
}

const NUMBERS = ['0', '-0', '1', '+2', '-3', '10', '250', '0.46', '.5', '5.', '1.5e3', '1e-8', '1E+3', '2.5e-12', '7e300', '1e400', '12.75', '-4.2e-7', '3e0', '0.1', '0.3', '1.1'];
const TOKENS = Object.keys(FAST_UNITS).flatMap((unit) => Object.keys(FAST_PREFIXES).map((prefix) => prefix + unit));
const COMPOUND = [
  'uH/m', 'mohm/m', 'kg/m^3', 'g/cm^3', 'N/A^2', 'A^2 s/m^4', 'A^2*s/m^4', 'ohm m', 'ohm*m', 'uohm cm', 'J/kg K', 'J/kg/K', 'm/s^2', 'km/s',
  'mm^2', 'cm^2', 'm^ 2', 'm ^2', 'N/A', 'A/m', 'kA/mm', 'J/kg', 'kJ/g', 'V s', 'W s', 'mF', 'nH/cm', 'm^-1', 'm^0.5', 'm^2.', 's^-2 m',
  'K^-1', 'A^2', 'H/m', 'F V^2', 'C/s', 'Wb/A', 'T m^2', 'Pa m^2', 'S^-1', 'Hz^-1', 'kHz', 'us', 'ms/s', 'g m/s^2',
];
const ODD = [
  'kV', '10 kV/', '10 (kV)', '10 kV)', '10 mohm2', '10 e3 V', '10 V^', '10 V^x', '10V', '10\tkV', '10  kV', ' 10 kV', '1e V', '1eV',
  '4 /s', '4/s', '4 * m', '4 m*', '3 J/(kg K)', '5 degC', '5 %', '10 kV kV', '1 min', '1 ft', '1 h', '1 Pa', '1 cd', '1 L', '2 in',
  '1.2.3 V', '- 5 V', '--5 V', '1 _V', '1 V,', '1,5 V', '1 mm Hg', '1 mmHg', '1 da', '1 dam', '1 ha', '1 Gs', '5 uF^2/uF',
];

describe('fast quantity reader = mathjs where it answers', () => {
  it('every prefix + unit of its table is the unit mathjs reads', () => {
    const bad: string[] = [];
    for (const token of TOKENS) for (const number of ['1', '2.5e-3']) bad.push(...disagreements(`${number} ${token}`));
    expect(bad).toEqual([]);
    // and it does answer for them (a reader that always declines would pass the line above)
    expect(TOKENS.every((token) => fastSI(`1 ${token}`, 'm') !== null || fastSI(`1 ${token}`, 'kg') !== null || reference(`1 ${token}`, 'm') === 'refused')).toBe(true);
  });

  it('number spellings × unit expressions × every target', () => {
    const bad: string[] = [];
    let answered = 0;
    for (const number of NUMBERS) {
      for (const unit of [...COMPOUND, ...TOKENS.filter((_, k) => k % 7 === 0)]) {
        for (const text of [`${number} ${unit}`, `${number}${unit}`]) {
          bad.push(...disagreements(text));
          if (TARGETS.some((si) => fastSI(text, si) !== null)) answered++;
        }
      }
    }
    expect(bad).toEqual([]);
    expect(answered).toBeGreaterThan(1000);
  });

  it('odd strings: declined, or identical to mathjs', () => {
    const bad = ODD.flatMap(disagreements);
    expect(bad).toEqual([]);
    // what mathjs refuses, the fast reader never answers
    for (const text of ODD) for (const si of TARGETS) if (reference(text, si) === 'refused') expect(fastSI(text, si), `${text} in ${si}`).toBeNull();
  });

  it('random strings built from its alphabet', () => {
    const piece = fc.constantFrom(...NUMBERS, ...TOKENS.slice(0, 60), ...COMPOUND, ' ', '\t', '/', '*', '^', '^2', '^-1', '(', ')', 'e', '.', '-', '+', 'x');
    fc.assert(
      fc.property(fc.array(piece, { minLength: 1, maxLength: 6 }), (pieces) => {
        expect(disagreements(pieces.join(''))).toEqual([]);
      }),
      { seed: 16, numRuns: 3000 },
    );
  });

  it('toSI gives mathjs results for every value of the demo scenarios', () => {
    const strings: string[] = [];
    const walk = (value: unknown): void => {
      if (typeof value === 'string') strings.push(value);
      else if (value && typeof value === 'object') Object.values(value).forEach(walk);
    };
    for (const file of demoFiles()) walk(JSON.parse(readFileSync(`scenarios/${file}`, 'utf8')));
    let answered = 0;
    for (const value of strings) {
      const text = normaliseUnitText(value);
      for (const si of TARGETS) {
        const fast = fastSI(text, si);
        if (fast === null) continue;
        answered++;
        expect(fast).toBe(reference(text, si));
      }
    }
    expect(answered).toBeGreaterThan(50);
    expect(toSI('250 uF', DIMENSIONS.capacitance)).toBe(mathjs.unit('250 uF').toNumber('F'));
  });

  it("toSI's messages are unchanged for values the fast reader declines or cannot finish", () => {
    expect(() => toSI('1e400 V', DIMENSIONS.voltage)).toThrow('expected a voltage (V), got "1e400 V"');
    expect(() => toSI('10 kA', DIMENSIONS.voltage)).toThrow('expected a voltage (V), got "10 kA"');
    expect(() => toSI('10 kV/', DIMENSIONS.voltage)).toThrow('expected a voltage (V), got "10 kV/" (not a number with a known unit)');
  });
});
