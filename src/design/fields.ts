/**
 * The numeric quantities of a scenario object as the page's controls: one per quantity or whole number the field
 * table knows, in the sections the scenario has, with the text written in the file. Pure: no DOM.
 */
import { SCENARIO_FIELDS, type Field } from '../scenario/fields.js';
import { setRawPath } from '../scenario/paths.js';

export interface NumericControl {
  /** scenario path, as the loader's messages name it: "bank[1].trigger" */
  path: string;
  /** the key alone, for the label */
  key: string;
  field: Extract<Field, { kind: 'quantity' | 'integer' }>;
  /** the value as written (a string with a unit or a number), or undefined when the default applies */
  written: unknown;
}

export interface ControlGroup {
  /** section path: "feed", "bank[0]", "rails.geometry" */
  path: string;
  controls: NumericControl[];
}

function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * Keys a section's chosen model does not read, so a control for them could only be refused by the loader: the
 * strong-shock drag law has no drag coefficient, and γ belongs to it alone.
 */
function notApplicable(path: string, written: Record<string, unknown>): Set<string> {
  if (path !== 'drag') return new Set();
  return new Set([written.model === 'strong-shock' ? 'dragCoefficient' : 'heatCapacityRatio']);
}

/** Every numeric field of one section (and of the sub-sections the scenario writes), depth first. */
function sectionGroups(path: string, fields: Record<string, Field>, written: Record<string, unknown>, out: ControlGroup[]): void {
  const group: ControlGroup = { path, controls: [] };
  out.push(group);
  const skipped = notApplicable(path, written);
  for (const [key, field] of Object.entries(fields)) {
    if (skipped.has(key)) continue;
    const where = `${path}.${key}`;
    if (field.kind === 'quantity' || field.kind === 'integer') group.controls.push({ path: where, key, field, written: written[key] });
    else if (field.kind === 'section' && isObject(written[key])) sectionGroups(where, field.fields, written[key] as Record<string, unknown>, out);
  }
}

/**
 * Sections shown even when the scenario leaves them out: every key of theirs has a default and giving one changes
 * nothing else (unlike drag or a crowbar, whose presence is itself a choice).
 */
const ALWAYS_SHOWN = new Set(['solver']);

/** The control groups of a scenario object: the bank's groups first, then every section the scenario has (and the solver's). */
export function controlGroups(raw: Record<string, unknown>): ControlGroup[] {
  const out: ControlGroup[] = [];
  for (const [key, field] of Object.entries(SCENARIO_FIELDS)) {
    const written = raw[key] === undefined && ALWAYS_SHOWN.has(key) ? {} : raw[key];
    if (field.kind === 'list' && Array.isArray(written)) {
      written.forEach((item, n) => {
        if (isObject(item)) sectionGroups(`${key}[${n}]`, field.item.fields, item, out);
      });
    } else if (field.kind === 'section' && isObject(written)) {
      sectionGroups(key, field.fields, written, out);
    }
  }
  return out.filter((group) => group.controls.length > 0);
}

/** A copy of the object with the value at a control's path replaced (undefined removes the key; a missing section is made). */
export function withValue(raw: Record<string, unknown>, path: string, value: unknown): Record<string, unknown> {
  const copy = structuredClone(raw);
  setRawPath(copy, path, value);
  return copy;
}

/** What a typed entry becomes in the file: a plain number stays a number (SI, or a count), anything else is text. */
export function enteredValue(text: string): unknown {
  const trimmed = text.trim();
  if (trimmed === '') return undefined;
  return /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(trimmed) ? Number(trimmed) : trimmed;
}

/** The number and the unit of a written value ("10 kV" → 10, "kV"); null when it does not start with a number. */
export function splitWritten(written: unknown): { number: number; unit: string } | null {
  if (typeof written === 'number') return { number: written, unit: '' };
  if (typeof written !== 'string') return null;
  const match = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/.exec(written);
  return match ? { number: Number(match[1]), unit: match[2]! } : null;
}

/** A slider's span around a written number: a factor of four either way, or a linear span when it is zero or negative. */
export function sliderSpan(number: number, siblings: readonly number[] = []): { min: number; max: number; log: boolean } {
  if (number > 0) return { min: number / 4, max: number * 4, log: true };
  if (number < 0) return { min: number * 3, max: -number, log: false };
  const largest = siblings.reduce((a, b) => Math.max(a, Math.abs(b)), 0);
  return { min: 0, max: largest > 0 ? 2 * largest : 100, log: false };
}

/** A slider position's number, to four significant digits. */
export function roundedNumber(value: number): number {
  return Number(value.toPrecision(4));
}
