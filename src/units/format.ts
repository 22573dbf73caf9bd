/**
 * The one way railpulse writes numbers for people: terminal, shot records, comparisons, overlays and fits,
 * study pages and the archive index all call this module. SI values come in; text goes out, formatted once, at
 * the edge. Nothing here changes a value beyond rounding it to the digits shown.
 *
 * House rules, after the SI Brochure (BIPM, 9th edition, 2019; chapter 3 on prefixes and §5.4 on writing
 * quantity values — section numbers from memory):
 *  - a space (no-break) between the number and the unit; a prefix joins its unit symbol with no space;
 *  - one prefix per figure, chosen so the number lies in [1, 1000); no compound prefixes; the kilogram takes
 *    its prefix on the gram;
 *  - a prefix on a symbol with an exponent applies to the power (km² = (km)²), which readers misread, so a unit
 *    whose first symbol carries an exponent (A²·s, m², N/A²) or that reads badly with a prefix (K, °C, gₙ) is
 *    written in its own unit with a power of ten (× 10ⁿ) when the number is far from 1;
 *  - digits grouped in threes by a thin space, but never a lone group of four;
 *  - SIGNIFICANT_DIGITS significant digits for every figure; an uncertainty to UNCERTAINTY_DIGITS digits and the
 *    value rounded to the same decimal place, both in the value's unit and prefix (as in the Guide to the
 *    Expression of Uncertainty in Measurement, JCGM 100:2008, §7.2.6).
 */

/** Standard gravity (BIPM SI Brochure, 9th ed., 2019: g_n = 9.80665 m/s² exactly). */
export const STANDARD_GRAVITY = 9.80665;

/** The symbol of standard gravity used as a unit of acceleration (g with subscript n). */
export const GN = 'g\u2099';

export const NO_VALUE = '\u2014';
export const SIGNIFICANT_DIGITS = 4;
export const UNCERTAINTY_DIGITS = 2;

const NBSP = '\u00A0';
/** Below this a number without a prefix is written with a power of ten (0.0393 reads; 0.003 93 less so). */
const PLAIN_FROM = 1e-2;
const THIN = '\u2009';

const PREFIXES: ReadonlyArray<{ exponent: number; symbol: string }> = [
  { exponent: -15, symbol: 'f' },
  { exponent: -12, symbol: 'p' },
  { exponent: -9, symbol: 'n' },
  { exponent: -6, symbol: '\u00B5' },
  { exponent: -3, symbol: 'm' },
  { exponent: 0, symbol: '' },
  { exponent: 3, symbol: 'k' },
  { exponent: 6, symbol: 'M' },
  { exponent: 9, symbol: 'G' },
  { exponent: 12, symbol: 'T' },
];
const PREFIX_BY_EXPONENT = new Map(PREFIXES.map((p) => [p.exponent, p.symbol]));
const MIN_EXPONENT = PREFIXES[0]!.exponent;
const MAX_EXPONENT = PREFIXES[PREFIXES.length - 1]!.exponent;

/** Unit symbols that take a prefix when they lead a unit without an exponent (A, kA/m, µH/m, Mm/s²). */
const PREFIXABLE = new Set(['A', 'V', 'J', 's', 'm', 'F', 'H', '\u03A9', 'W', 'N', 'Pa', 'T', 'Hz', 'C', 'S', 'Wb']);

export interface Scale {
  /** multiply SI values by this to get display values */
  factor: number;
  /** the prefix symbol ('' for none) */
  prefix: string;
}

/** How a unit is written: with a prefix, as a multiple of ten, or (percent) scaled by 100. */
type UnitStyle =
  | { kind: 'prefix'; unit: string; offset: number }
  | { kind: 'power'; unit: string }
  | { kind: 'percent' };

/** What `unit` (an SI unit symbol as railpulse writes it: 'A', 'm/s²', 'A²·s', 'kg', '%', '1', '') allows. */
function unitStyle(unit: string): UnitStyle {
  if (unit === '%') return { kind: 'percent' };
  if (unit === '1') return { kind: 'power', unit: '' };
  // the kilogram takes its prefix on the gram: 0.003 kg is 3 g, 40 kg stays 40 kg
  if (unit === 'kg') return { kind: 'prefix', unit: 'g', offset: 3 };
  const lead = /^([A-Za-z\u03A9]+)(.*)$/.exec(unit);
  if (lead && PREFIXABLE.has(lead[1]!) && !/^[\u00B2\u00B3\u2074-\u2079\u207B^]/.test(lead[2]!)) return { kind: 'prefix', unit, offset: 0 };
  return { kind: 'power', unit };
}

/** The engineering prefix (a power of 1000, f … T) under which `magnitude` reads between 1 and 999. */
export function scaleFor(magnitude: number): Scale {
  const abs = Math.abs(magnitude);
  if (!Number.isFinite(abs) || abs === 0) return { factor: 1, prefix: '' };
  const exponent = Math.min(Math.max(Math.floor(Math.log10(abs) / 3) * 3, MIN_EXPONENT), MAX_EXPONENT);
  return { factor: 10 ** -exponent, prefix: PREFIX_BY_EXPONENT.get(exponent) ?? '' };
}

/** The unit with the prefix of `exponent` (kilo on the gram is the kilogram). */
function prefixedUnit(style: { unit: string; offset: number }, exponent: number): string {
  return `${PREFIX_BY_EXPONENT.get(exponent) ?? ''}${style.unit}`;
}

/** Round to `digits` significant digits; -0 becomes 0. */
function roundTo(value: number, digits: number): number {
  const rounded = Number(value.toPrecision(digits));
  return rounded === 0 ? 0 : rounded;
}

/** Decimal exponent of a (nonzero, finite) number: 1234 → 3, 0.05 → -2. */
function decade(value: number): number {
  return Math.floor(Math.log10(Math.abs(value)) + 1e-12);
}

/**
 * Group the integer digits in threes with thin spaces, as in SI writing style (not a lone group of four). The
 * decimals are left ungrouped: with at most a few of them, a space there reads as two numbers.
 */
function groupDigits(text: string): string {
  const [whole = '', fraction] = text.split('.');
  const sign = whole.startsWith('-') ? '-' : '';
  const digits = sign ? whole.slice(1) : whole;
  const grouped = digits.length > 4 ? digits.replace(/\B(?=(\d{3})+(?!\d))/g, THIN) : digits;
  return sign + grouped + (fraction !== undefined ? '.' + fraction : '');
}

/**
 * A number with a fixed count of decimals, digits grouped. Rounded on the decimal value (9.9225 to three decimals
 * is 9.923), not on its binary neighbour as toFixed alone would.
 */
function fixed(value: number, decimals: number): string {
  const places = Math.min(Math.max(decimals, 0), 20);
  const shifted = Number((value * 10 ** places).toPrecision(15));
  const text = (Math.round(Math.abs(shifted)) / 10 ** places).toFixed(places);
  const signed = value < 0 && Number(text) !== 0 ? `-${text}` : text;
  return groupDigits(signed);
}

const SUPERSCRIPT: Record<string, string> = {
  '-': '\u207B',
  '0': '\u2070',
  '1': '\u00B9',
  '2': '\u00B2',
  '3': '\u00B3',
  '4': '\u2074',
  '5': '\u2075',
  '6': '\u2076',
  '7': '\u2077',
  '8': '\u2078',
  '9': '\u2079',
};

function powerOfTen(exponent: number): string {
  return `10${String(exponent).replace(/./g, (c) => SUPERSCRIPT[c] ?? c)}`;
}

function withUnit(number: string, unit: string): string {
  if (unit === '') return number;
  // a unit that starts with a solidus (1/K written /K after a number) still takes the space
  return `${number}${NBSP}${unit}`;
}

/** `digits` significant digits of `value`, trailing zeros kept (they are part of the claim). */
function significant(value: number, digits: number): string {
  if (value === 0) return '0';
  return fixed(value, digits - 1 - decade(value));
}

export interface QuantityOptions {
  /** significant digits (default SIGNIFICANT_DIGITS) */
  digits?: number;
}

/**
 * A figure with its unit: formatQuantity(12345, 'A') → "12.35 kA", formatQuantity(1.53e6, 'A²·s') →
 * "1.530 × 10⁶ A²·s", formatQuantity(0.003, 'kg') → "3.000 g", formatQuantity(0.0734, '%')… use formatPercent.
 */
export function formatQuantity(value: number | null | undefined, unit: string, options: QuantityOptions = {}): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  const digits = options.digits ?? SIGNIFICANT_DIGITS;
  const style = unitStyle(unit);
  if (style.kind === 'percent') return formatPercent(value / 100, options);
  if (value === 0) return withUnit('0', style.unit);
  const rounded = roundTo(value, digits);
  if (style.kind === 'prefix') {
    const exponent = Math.floor(decade(rounded) / 3) * 3 + style.offset;
    if (exponent >= MIN_EXPONENT && exponent <= MAX_EXPONENT) {
      return withUnit(significant(rounded / 10 ** (exponent - style.offset), digits), prefixedUnit(style, exponent));
    }
    return scientific(rounded, digits, style.offset === 3 ? 'kg' : style.unit);
  }
  // in its own unit: plainly from 0.01 up to the first number whose integer digits outnumber the significant ones
  const magnitude = Math.abs(rounded);
  if (magnitude >= PLAIN_FROM && magnitude < 10 ** digits) return withUnit(significant(rounded, digits), style.unit);
  return scientific(rounded, digits, style.unit);
}

function scientific(value: number, digits: number, unit: string): string {
  const exponent = decade(value);
  const mantissa = significant(roundTo(value / 10 ** exponent, digits), digits);
  return withUnit(`${mantissa}\u00A0\u00D7\u00A0${powerOfTen(exponent)}`, unit);
}

/** A fraction as a percentage, e.g. 0.0734 → "7.340 %"; tiny fractions with a power of ten. */
export function formatPercent(fraction: number | null | undefined, options: QuantityOptions = {}): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return NO_VALUE;
  return formatQuantity(fraction * 100, '1', options).replace(/$/, `${NBSP}%`);
}

/**
 * A difference of two percentages in percentage points, signed: 0.0734 − 0.0612 → "+1.220 percentage points"
 * (a relative change of a percentage would be a per cent of a per cent).
 */
export function formatPercentagePoints(differenceOfFractions: number | null | undefined, options: QuantityOptions = {}): string {
  if (differenceOfFractions === null || differenceOfFractions === undefined || !Number.isFinite(differenceOfFractions)) return NO_VALUE;
  const text = formatQuantity(differenceOfFractions * 100, '1', options);
  return `${differenceOfFractions > 0 ? '+' : ''}${text}${NBSP}percentage points`;
}

/** A signed relative change: 0.0312 → "+3.120 %". */
export function formatChange(relative: number | null | undefined, options: QuantityOptions = {}): string {
  if (relative === null || relative === undefined || !Number.isFinite(relative)) return NO_VALUE;
  return `${relative > 0 ? '+' : ''}${formatPercent(relative, options)}`;
}

/** A plain number (a count, a ratio, a tolerance): formatNumber(1e-9) → "1.000 × 10⁻⁹". */
export function formatNumber(value: number | null | undefined, options: QuantityOptions = {}): string {
  return formatQuantity(value, '1', options);
}

/**
 * A value with its standard uncertainty, both in the value's unit and prefix, the uncertainty to two digits and
 * the value to the same decimal place: (4.2992e-7, 8.7e-10, 'H/m') → "(429.92 ± 0.87) nH/m". An uncertainty
 * that is not a finite number gives the value alone and "(uncertainty not known)".
 */
export function formatWithUncertainty(value: number, uncertainty: number, unit: string, options: { uncertaintyDigits?: number } = {}): string {
  if (!Number.isFinite(value)) return NO_VALUE;
  if (!Number.isFinite(uncertainty) || uncertainty < 0) return `${formatQuantity(value, unit)} (uncertainty not known)`;
  if (uncertainty === 0) return formatQuantity(value, unit);
  const style = unitStyle(unit);
  const digits = options.uncertaintyDigits ?? UNCERTAINTY_DIGITS;
  const u = roundTo(uncertainty, digits);
  const reference = value === 0 ? u : value;
  let exponent: number;
  let unitText: string;
  let scaledBy: number;
  if (style.kind === 'prefix') {
    const e = Math.floor(decade(roundTo(reference, SIGNIFICANT_DIGITS)) / 3) * 3 + style.offset;
    if (e >= MIN_EXPONENT && e <= MAX_EXPONENT) {
      exponent = e - style.offset;
      unitText = prefixedUnit(style, e);
      scaledBy = 0;
    } else {
      exponent = decade(reference);
      unitText = style.offset === 3 ? 'kg' : style.unit;
      scaledBy = exponent;
    }
  } else if (style.kind === 'percent') {
    return formatWithUncertainty(value / 100, uncertainty / 100, '1').replace(/$/, `${NBSP}%`);
  } else {
    const magnitude = Math.abs(reference);
    exponent = magnitude >= PLAIN_FROM && magnitude < 10 ** SIGNIFICANT_DIGITS ? 0 : decade(reference);
    unitText = style.unit;
    scaledBy = exponent;
  }
  const uScaled = u / 10 ** exponent;
  const decimals = Math.max(0, digits - 1 - decade(uScaled));
  const pair = `(${fixed(value / 10 ** exponent, decimals)}${NBSP}\u00B1${NBSP}${fixed(uScaled, decimals)})`;
  return withUnit(scaledBy !== 0 ? `${pair}${NBSP}\u00D7${NBSP}${powerOfTen(scaledBy)}` : pair, unitText);
}

/**
 * One prefix and one count of decimals for a column of figures (a table's times, a check's value and limit):
 * chosen so the largest shows `digits` significant digits. Returns the formatter and the unit it writes.
 */
export function columnFormatter(values: ReadonlyArray<number | null | undefined>, unit: string, digits = SIGNIFICANT_DIGITS): { format: (value: number | null | undefined) => string; unit: string } {
  const finite = values.filter((v): v is number => v !== null && v !== undefined && Number.isFinite(v) && v !== 0);
  const style = unitStyle(unit);
  if (finite.length === 0 || style.kind !== 'prefix') {
    return { format: (v) => (v === null || v === undefined ? NO_VALUE : formatQuantity(v, unit, { digits })), unit };
  }
  const largest = Math.max(...finite.map((v) => Math.abs(roundTo(v, digits))));
  const e = Math.min(Math.max(Math.floor(decade(largest) / 3) * 3 + style.offset, MIN_EXPONENT), MAX_EXPONENT);
  const shown = prefixedUnit(style, e);
  const divisor = 10 ** (e - style.offset);
  const decimals = Math.max(0, digits - 1 - decade(largest / divisor));
  return {
    unit: shown,
    format: (v) => (v === null || v === undefined || !Number.isFinite(v) ? NO_VALUE : withUnit(fixed(v / divisor, decimals), shown)),
  };
}

/**
 * Figures to compare at a glance (a check's value, limit and warning boundary) in one prefix, that of the largest,
 * each with its own significant digits; a figure that would read below 0.1 in that prefix keeps its own.
 */
export function sharedPrefixFormatter(values: ReadonlyArray<number | null | undefined>, unit: string, digits = SIGNIFICANT_DIGITS): (value: number | null | undefined) => string {
  const finite = values.filter((v): v is number => v !== null && v !== undefined && Number.isFinite(v) && v !== 0);
  const style = unitStyle(unit);
  const own = (v: number | null | undefined): string => formatQuantity(v, unit, { digits });
  if (finite.length === 0 || style.kind !== 'prefix') return own;
  const largest = Math.max(...finite.map((v) => Math.abs(roundTo(v, digits))));
  const e = Math.floor(decade(largest) / 3) * 3 + style.offset;
  if (e < MIN_EXPONENT || e > MAX_EXPONENT) return own;
  const divisor = 10 ** (e - style.offset);
  return (v) => {
    if (v === null || v === undefined || !Number.isFinite(v)) return NO_VALUE;
    if (v === 0) return withUnit('0', prefixedUnit(style, e));
    const shown = roundTo(v, digits) / divisor;
    return Math.abs(shown) < 0.1 ? own(v) : withUnit(significant(shown, digits), prefixedUnit(style, e));
  };
}

/** "1 group", "4 modules": a count with its noun in the right number. */
export function formatCount(count: number, singular: string, plural = `${singular}s`): string {
  return `${count}${NBSP}${count === 1 ? singular : plural}`;
}

/** The same text for a terminal: ordinary spaces for the no-break and thin spaces a page uses. */
export function forTerminal(text: string): string {
  return text.replace(/[\u00A0\u2009\u202F]/g, ' ');
}

/** A date as people read it, in UTC ("Wed 2 Dec 2026, 10:00 UTC"); pages replace it with the reader's local time. */
export function readableUtcDate(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  const days = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
  const months = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
  const hh = String(date.getUTCHours()).padStart(2, '0');
  const mm = String(date.getUTCMinutes()).padStart(2, '0');
  return `${days[date.getUTCDay()]} ${date.getUTCDate()} ${months[date.getUTCMonth()]} ${date.getUTCFullYear()}, ${hh}:${mm} UTC`;
}

/** A date in the local time of the machine running the command, with its offset ("Wed 2 Dec 2026, 11:00 UTC+1"). */
export function readableLocalDate(iso: string, timeZoneOffsetMinutes = -new Date(iso).getTimezoneOffset()): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  const local = new Date(date.getTime() + timeZoneOffsetMinutes * 60_000);
  const sign = timeZoneOffsetMinutes < 0 ? '-' : '+';
  const hours = Math.floor(Math.abs(timeZoneOffsetMinutes) / 60);
  const minutes = Math.abs(timeZoneOffsetMinutes) % 60;
  const zone = timeZoneOffsetMinutes === 0 ? 'UTC' : `UTC${sign}${hours}${minutes ? `:${String(minutes).padStart(2, '0')}` : ''}`;
  return readableUtcDate(local.toISOString()).replace(/ UTC$/, ` ${zone}`);
}

/**
 * An input value exactly as the model uses it, in the SI unit without a prefix and with no digits added or dropped
 * beyond binary conversion noise (12 significant digits, trailing zeros removed): 6300 → "6300 V",
 * 5e-4 → "5 × 10⁻⁴ F". Computed figures use formatQuantity instead; a given value claims no precision of its own.
 */
export function formatExact(value: number | null | undefined, unit: string): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  const clean = Number(value.toPrecision(12));
  const shownUnit = unit === '1' ? '' : unit;
  if (clean === 0) return withUnit('0', shownUnit);
  const magnitude = Math.abs(clean);
  if (magnitude >= 1e-3 && magnitude < 1e7) return withUnit(groupDigits(String(clean)), shownUnit);
  const exponent = decade(clean);
  const mantissa = Number((clean / 10 ** exponent).toPrecision(12));
  return withUnit(`${groupDigits(String(mantissa))}${NBSP}\u00D7${NBSP}${powerOfTen(exponent)}`, shownUnit);
}

/**
 * The scale of a plot axis holding values up to `magnitude` in `unit`: values × factor read in [1, 1000) under the
 * prefixed unit; a unit that takes no prefix keeps factor 1 and is drawn with powers of ten (`powers`).
 */
export function axisScale(unit: string, magnitude: number): { factor: number; unit: string; powers: boolean } {
  const style = unitStyle(unit);
  if (style.kind === 'percent') return { factor: 1, unit: '%', powers: false };
  if (style.kind === 'power') return { factor: 1, unit: style.unit, powers: true };
  const abs = Math.abs(roundTo(magnitude, SIGNIFICANT_DIGITS));
  const e = !Number.isFinite(abs) || abs === 0 ? style.offset : Math.min(Math.max(Math.floor(decade(abs) / 3) * 3 + style.offset, MIN_EXPONENT), MAX_EXPONENT);
  return { factor: 10 ** -(e - style.offset), unit: prefixedUnit(style, e), powers: false };
}
