/**
 * Numbers for people: SI values formatted once, at the edge, with an engineering prefix or in
 * scientific notation. Nothing here changes a value beyond rounding it to the digits shown.
 */

const PREFIXES: ReadonlyArray<{ exponent: number; symbol: string }> = [
  { exponent: -12, symbol: 'p' },
  { exponent: -9, symbol: 'n' },
  { exponent: -6, symbol: '\u00B5' },
  { exponent: -3, symbol: 'm' },
  { exponent: 0, symbol: '' },
  { exponent: 3, symbol: 'k' },
  { exponent: 6, symbol: 'M' },
  { exponent: 9, symbol: 'G' },
];

export const NO_VALUE = '\u2014';

export interface Scale {
  /** multiply SI values by this to get display values */
  factor: number;
  prefix: string;
}

/** The engineering prefix (a power of 1000) under which `magnitude` reads between 1 and 999. */
export function scaleFor(magnitude: number): Scale {
  const abs = Math.abs(magnitude);
  if (!Number.isFinite(abs) || abs === 0) return { factor: 1, prefix: '' };
  const exponent = Math.floor(Math.log10(abs) / 3) * 3;
  const first = PREFIXES[0]!;
  const last = PREFIXES[PREFIXES.length - 1]!;
  const clamped = Math.min(Math.max(exponent, first.exponent), last.exponent);
  const found = PREFIXES.find((p) => p.exponent === clamped) ?? { exponent: 0, symbol: '' };
  return { factor: 10 ** -found.exponent, prefix: found.symbol };
}

/** Group the integer digits in threes with thin spaces, as in SI writing style. */
function groupDigits(text: string): string {
  const [whole = '', fraction] = text.split('.');
  const sign = whole.startsWith('-') ? '-' : '';
  const digits = sign ? whole.slice(1) : whole;
  const grouped = digits.length > 4 ? digits.replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009') : digits;
  return sign + grouped + (fraction !== undefined ? '.' + fraction : '');
}

/** `digits` significant figures, never in exponent form, trailing zeros of a fraction kept. */
export function formatPlain(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return NO_VALUE;
  if (value === 0) return '0';
  const rounded = Number(value.toPrecision(digits));
  const magnitude = Math.floor(Math.log10(Math.abs(rounded)));
  const decimals = Math.max(0, digits - 1 - magnitude);
  return groupDigits(rounded.toFixed(Math.min(decimals, 20)));
}

/** e.g. formatQuantity(12345, 'A') → "12.35 kA"; with prefix false → "12 350 A". */
export function formatQuantity(
  value: number | null | undefined,
  unit: string,
  options: { digits?: number; prefix?: boolean } = {},
): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  const digits = options.digits ?? 4;
  if (options.prefix === false || unit === '') {
    return `${formatPlain(value, digits)}${unit ? '\u00A0' + unit : ''}`;
  }
  const scale = scaleFor(Number(value.toPrecision(digits)));
  return `${formatPlain(value * scale.factor, digits)}\u00A0${scale.prefix}${unit}`;
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

/** e.g. formatScientific(1.2345e6, 'A²·s') → "1.235 × 10⁶ A²·s" (for units a prefix would garble). */
export function formatScientific(value: number | null | undefined, unit: string, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  const [mantissa = '0', exponentText = '0'] = value.toExponential(digits - 1).split('e');
  const exponent = Number(exponentText);
  const power = exponent === 0 ? '' : ` \u00D7 10${String(exponent).replace(/./g, (c) => SUPERSCRIPT[c] ?? c)}`;
  return `${mantissa}${power}${unit ? '\u00A0' + unit : ''}`;
}

/** A fraction shown as a percentage, e.g. 0.0321 → "3.21 %". */
export function formatPercent(fraction: number | null | undefined, digits = 3): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return NO_VALUE;
  if (fraction !== 0 && Math.abs(fraction) < 1e-5) return formatScientific(fraction * 100, '%', 2);
  return `${formatPlain(fraction * 100, digits)}\u00A0%`;
}
