/**
 * The full input table: every scenario value by path, as the user wrote it and in SI. Paths follow the
 * scenario JSON (`bank[0].voltage`), because Scenario key names mirror the file.
 */
import { dimensionOfPath } from '../scenario/fields.js';
import type { Scenario } from '../scenario/types.js';

export type Leaf = string | number | boolean | null;

export interface InputRow {
  path: string;
  /** what the scenario file says; undefined when the value was not written (a default applies) */
  written: Leaf | undefined;
  /** the SI value the model used; undefined when the path has no SI counterpart */
  si: Leaf | undefined;
  /** SI unit of the value, '' for plain numbers or text */
  unit: string;
}

/** The SI unit symbol of the quantity at a scenario path ('' for counts, text and plain numbers). */
export function siUnitOfPath(path: string): string {
  return dimensionOfPath(path)?.display ?? '';
}

/** Leaves of a JSON-like value in document order, keyed by path. */
export function flattenLeaves(value: unknown, prefix = '', out = new Map<string, Leaf>()): Map<string, Leaf> {
  if (Array.isArray(value)) {
    if (value.length === 0) out.set(prefix, '[]');
    value.forEach((item, index) => flattenLeaves(item, `${prefix}[${index}]`, out));
  } else if (typeof value === 'object' && value !== null) {
    const entries = Object.entries(value as Record<string, unknown>);
    if (entries.length === 0 && prefix) out.set(prefix, '{}');
    for (const [key, item] of entries) flattenLeaves(item, prefix ? `${prefix}.${key}` : key, out);
  } else if (value === null || ['string', 'number', 'boolean'].includes(typeof value)) {
    out.set(prefix, value as Leaf);
  } else {
    out.set(prefix, String(value));
  }
  return out;
}

/**
 * One row per path found in the scenario as used (defaults included), then any path that appears only
 * in the file (e.g. an input the loader turned into another quantity).
 */
export function inputRows(
  scenarioRaw: unknown,
  scenario: Scenario,
  unitOf: (path: string) => string = siUnitOfPath,
): InputRow[] {
  const written = flattenLeaves(scenarioRaw);
  const used = flattenLeaves(scenario);
  const rows: InputRow[] = [];
  for (const [path, si] of used) {
    rows.push({ path, written: written.get(path), si, unit: unitOf(path) });
  }
  for (const [path, value] of written) {
    if (!used.has(path)) rows.push({ path, written: value, si: undefined, unit: unitOf(path) });
  }
  return rows;
}
