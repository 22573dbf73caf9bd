/**
 * SI numbers → text for people, with an engineering prefix. Used only at the edges (terminal, reports).
 */
const PREFIXES: [number, string][] = [
  [1e12, 'T'],
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
];

/** Format with an SI prefix: formatSI(61234, 'A') → "61.2 kA". */
export function formatSI(value: number | null | undefined, unit: string, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return `0 ${unit}`.trim();
  const magnitude = Math.abs(value);
  const [factor, prefix] = PREFIXES.find(([f]) => magnitude >= f * 0.9995) ?? PREFIXES[PREFIXES.length - 1]!;
  return `${(value / factor).toPrecision(digits)} ${prefix}${unit}`.trim();
}

/** Format a fraction as a percentage. */
export function formatPercent(fraction: number, digits = 3): string {
  if (!Number.isFinite(fraction)) return '—';
  return `${(fraction * 100).toPrecision(digits)} %`;
}

/** Standard gravity (BIPM SI Brochure, 9th ed., 2019: g_n = 9.80665 m/s² exactly). */
export const STANDARD_GRAVITY = 9.80665;
