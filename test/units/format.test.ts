/**
 * The one number formatter against explicit expectations. Rules from the SI Brochure (BIPM, 9th edition, 2019:
 * chapter 3, decimal multiples and prefixes; §5.4, writing quantity values; section numbers from memory) and, for
 * value ± uncertainty, the Guide to the Expression of Uncertainty in Measurement (JCGM 100:2008, §7.2).
 */
import { describe, expect, it } from 'vitest';
import {
  columnFormatter,
  formatChange,
  formatCount,
  formatExact,
  formatNumber,
  formatPercent,
  formatPercentagePoints,
  formatQuantity,
  formatWithUncertainty,
  forTerminal,
  GN,
  readableLocalDate,
  readableUtcDate,
  scaleFor,
  sharedPrefixFormatter,
} from '../../src/units/format.js';

const NB = '\u00A0';
const THIN = '\u2009';

describe('prefixes (SI Brochure ch. 3): one prefix per figure, the number between 1 and 1000', () => {
  it('chooses the prefix after rounding to four significant digits', () => {
    expect(formatQuantity(12345, 'A')).toBe(`12.35${NB}kA`);
    expect(formatQuantity(2.3386e-4, 's')).toBe(`233.9${NB}\u00B5s`);
    expect(formatQuantity(999.96, 'V')).toBe(`1.000${NB}kV`); // rounds up into the next prefix
    expect(formatQuantity(-0.0125, 'm')).toBe(`-12.50${NB}mm`);
    expect(formatQuantity(0, 'J')).toBe(`0${NB}J`);
    expect(formatQuantity(null, 's')).toBe('\u2014');
    expect(formatQuantity(Number.NaN, 's')).toBe('\u2014');
  });

  it('puts the prefix on the first symbol of a compound unit, never two prefixes', () => {
    expect(formatQuantity(4.5e-7, 'H/m')).toBe(`450.0${NB}nH/m`);
    expect(formatQuantity(1.244e6, 'm/s\u00B2')).toBe(`1.244${NB}Mm/s\u00B2`);
    expect(formatQuantity(8.645e-4, '\u03A9/m')).toBe(`864.5${NB}\u00B5\u03A9/m`);
  });

  it('gives the kilogram its prefix on the gram (SI Brochure: prefixes attach to "gram")', () => {
    expect(formatQuantity(0.003, 'kg')).toBe(`3.000${NB}g`);
    expect(formatQuantity(40, 'kg')).toBe(`40.00${NB}kg`);
    expect(formatQuantity(2500, 'kg')).toBe(`2.500${NB}Mg`);
  });

  it('writes a unit whose first symbol has an exponent, and kelvin and gₙ, with a power of ten instead of a prefix', () => {
    // kA²·s would mean (kA)²·s = 10⁶ A²·s: a prefix on a powered symbol applies to the power, which readers misread
    expect(formatQuantity(1.53e6, 'A\u00B2\u00B7s')).toBe(`1.530${NB}\u00D7${NB}10\u2076${NB}A\u00B2\u00B7s`);
    expect(formatQuantity(1.46e15, 'A\u00B2\u00B7s/m\u2074')).toBe(`1.460${NB}\u00D7${NB}10\u00B9\u2075${NB}A\u00B2\u00B7s/m\u2074`);
    expect(formatQuantity(1050.3, 'K')).toBe(`1050${NB}K`);
    expect(formatQuantity(12345, 'K')).toBe(`1.235${NB}\u00D7${NB}10\u2074${NB}K`);
    expect(formatQuantity(126812, GN)).toBe(`1.268${NB}\u00D7${NB}10\u2075${NB}g\u2099`);
    expect(formatQuantity(8960, 'kg/m\u00B3')).toBe(`8960${NB}kg/m\u00B3`);
    expect(formatNumber(1e-9)).toBe(`1.000${NB}\u00D7${NB}10\u207B\u2079`);
  });

  it('beyond the prefixes (f … T) falls back to a power of ten', () => {
    expect(formatQuantity(2e-16, 's')).toBe(`2.000${NB}\u00D7${NB}10\u207B\u00B9\u2076${NB}s`);
    expect(formatQuantity(3e16, 'J')).toBe(`3.000${NB}\u00D7${NB}10\u00B9\u2076${NB}J`);
  });

  it('plot axes scale to a power of 1000', () => {
    expect(scaleFor(86_902)).toEqual({ factor: 1e-3, prefix: 'k' });
    expect(scaleFor(5.19e-3)).toEqual({ factor: 1e3, prefix: 'm' });
    expect(scaleFor(0)).toEqual({ factor: 1, prefix: '' });
  });
});

describe('writing values (SI Brochure §5.4)', () => {
  it('a space between number and unit (no-break, so the unit never starts a line), also before %', () => {
    expect(formatPercent(0.0734)).toBe(`7.340${NB}%`);
    expect(formatPercent(0)).toBe(`0${NB}%`);
    expect(formatPercent(1.26e-9)).toBe(`1.260${NB}\u00D7${NB}10\u207B\u2077${NB}%`);
  });

  it('groups integer digits in threes with a thin space, but not a lone group of four', () => {
    expect(formatExact(1_000_000, '')).toBe(`1${THIN}000${THIN}000`);
    expect(formatExact(9000, 'V')).toBe(`9000${NB}V`);
    expect(formatExact(209_000, 'J/kg')).toBe(`209${THIN}000${NB}J/kg`);
  });

  it('input values exactly as used, in the SI unit without a prefix', () => {
    expect(formatExact(6300, 'V')).toBe(`6300${NB}V`);
    expect(formatExact(5e-4, 'F')).toBe(`5${NB}\u00D7${NB}10\u207B\u2074${NB}F`);
    expect(formatExact(3.9999999999999996e-4, 'F')).toBe(`4${NB}\u00D7${NB}10\u207B\u2074${NB}F`); // conversion noise dropped
    expect(formatExact(0.15, '1')).toBe('0.15');
  });

  it('a difference of percentages is in percentage points, a relative change in per cent', () => {
    expect(formatPercentagePoints(0.0734 - 0.0612)).toBe(`+1.220${NB}percentage points`);
    expect(formatPercentagePoints(-0.01)).toBe(`-1.000${NB}percentage points`);
    expect(formatChange(0.0312)).toBe(`+3.120${NB}%`);
  });

  it('counts agree with their nouns; terminal text uses plain spaces', () => {
    expect(formatCount(1, 'module')).toBe(`1${NB}module`);
    expect(formatCount(4, 'module')).toBe(`4${NB}modules`);
    expect(forTerminal(`1${THIN}000${NB}V`)).toBe('1 000 V');
  });
});

describe('value ± uncertainty in the value\'s unit and prefix (GUM, JCGM 100:2008, §7.2.2 and §7.2.6)', () => {
  it('two digits of uncertainty, the value to the same decimal place, one prefix for both', () => {
    // the GUM's own example: m_S = 100.021 47 g with a standard uncertainty of 0.35 mg
    expect(formatWithUncertainty(0.10002147, 0.35e-6, 'kg')).toBe(`(100.02147${NB}\u00B1${NB}0.00035)${NB}g`);
    expect(formatWithUncertainty(4.2992e-7, 8.7e-10, 'H/m')).toBe(`(429.92${NB}\u00B1${NB}0.87)${NB}nH/m`);
    expect(formatWithUncertainty(1.601e-4, 1.4e-7, '\u03A9')).toBe(`(160.10${NB}\u00B1${NB}0.14)${NB}\u00B5\u03A9`);
    expect(formatWithUncertainty(385, 12, 'J/(kg\u00B7K)')).toBe(`(385${NB}\u00B1${NB}12)${NB}J/(kg\u00B7K)`);
    expect(formatWithUncertainty(1.2345e-5, 2.1e-7, '1/K')).toBe(`(1.235${NB}\u00B1${NB}0.021)${NB}\u00D7${NB}10\u207B\u2075${NB}1/K`);
  });

  it('an uncertainty that is not known is said, not invented', () => {
    expect(formatWithUncertainty(4.3e-7, Number.NaN, 'H/m')).toBe(`430.0${NB}nH/m (uncertainty not known)`);
  });
});

describe('tables: one unit for a column, one prefix for figures compared at a glance', () => {
  it('a column of times shares one unit and one resolution', () => {
    const column = columnFormatter([0, 71.04e-6, 5.734e-3], 's', 6);
    expect(column.unit).toBe('ms');
    expect([0, 71.04e-6, 5.734e-3].map(column.format)).toEqual([`0.00000${NB}ms`, `0.07104${NB}ms`, `5.73400${NB}ms`]);
  });

  it('rounds on the decimal value, not its binary neighbour (9.9225 → 9.923)', () => {
    expect(columnFormatter([9922.5], 'J').format(9922.5)).toBe(`9.923${NB}kJ`);
    expect(formatQuantity(9922.5, 'J')).toBe(`9.923${NB}kJ`);
  });

  it('a value and its limit in the prefix of the larger, each with four significant digits', () => {
    const pair = sharedPrefixFormatter([9922.5, 10_000], 'J');
    expect([pair(9922.5), pair(10_000)]).toEqual([`9.923${NB}kJ`, `10.00${NB}kJ`]);
    const apart = sharedPrefixFormatter([9922.5, 10], 'J');
    expect(apart(10)).toBe(`10.00${NB}J`); // would read 0.01000 kJ: keeps its own prefix
  });
});

describe('dates', () => {
  it('a readable form beside the ISO time, in UTC or in a given local offset', () => {
    expect(readableUtcDate('2026-12-02T10:00:00.000Z')).toBe('Wed 2 Dec 2026, 10:00 UTC');
    expect(readableLocalDate('2026-12-02T10:00:00.000Z', 60)).toBe('Wed 2 Dec 2026, 11:00 UTC+1');
    expect(readableLocalDate('2026-12-02T23:30:00.000Z', -330)).toBe('Wed 2 Dec 2026, 18:00 UTC-5:30');
  });
});
