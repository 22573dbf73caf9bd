/**
 * Plausible ranges (src/scenario/fields.ts) in words, and the check of a value against one. A value exactly at
 * a bound is within the range: every comparison here is inclusive unless the field says its lower bound is not.
 */
import { formatQuantity, forTerminal } from '../units/format.js';
import type { IntegerField, QuantityField, Range } from './fields.js';

/** A bound or value with its unit, for messages, written by the one formatter without trailing zeros: 1e-12 F → "1 pF". */
export function formatBound(value: number, unit: string): string {
  if (!Number.isFinite(value)) return String(value);
  return trim(forTerminal(formatQuantity(value, unit)));
}

/** "1.000 pF" → "1 pF", "2.500 kV" → "2.5 kV". */
function trim(text: string): string {
  return text.replace(/(\.\d*?)0+(?=\s|$)/, '$1').replace(/\.(?=\s|$)/, '');
}

function unitOf(field: QuantityField | IntegerField): string {
  return field.kind === 'quantity' ? field.dimension.display : '';
}

/** The range in words: "> 0 and ≤ 1 MV", "from 1 pF to 10 F", "≥ 0 and ≤ 1 MΩ". */
export function rangeText(field: QuantityField | IntegerField): string {
  const { min, max, minExclusive } = field.range;
  const unit = unitOf(field);
  const low = formatBound(min, unit);
  const high = formatBound(max, unit);
  if (min === 0) return `${minExclusive ? '> 0' : '≥ 0'} and ≤ ${high}`;
  return minExclusive ? `> ${low} and ≤ ${high}` : `from ${low} to ${high}`;
}

/** What the value is, for messages: the field's own noun, or its dimension's ("a capacitance (F)" → "a capacitance"). */
export function nounOf(field: QuantityField | IntegerField): string {
  if (field.kind === 'integer') return 'a whole number';
  return field.noun ?? field.dimension.noun.replace(/\s*\([^)]*\)$/, '');
}

export function inRange(value: number, range: Range): boolean {
  const aboveMin = range.minExclusive ? value > range.min : value >= range.min;
  return aboveMin && value <= range.max;
}

/** The problem with a value, or null when it is within the field's plausible range. */
export function rangeProblem(field: QuantityField | IntegerField, value: number): string | null {
  if (Number.isFinite(value) && inRange(value, field.range) && (field.kind === 'quantity' || Number.isInteger(value))) return null;
  return `expected ${nounOf(field)} ${rangeText(field)}, got ${formatBound(value, unitOf(field))}`;
}
