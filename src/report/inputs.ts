/**
 * The input table: every scenario value by path, as the user wrote it and as the model used it (SI), grouped by the
 * scenario's sections. Paths follow the scenario JSON (`bank[0].voltage`), because Scenario key names mirror the
 * file. Units come from the field table, the materials' and the limits' dimensions, and the derived figures' own.
 */
import { MATERIAL_FIELD_DIMENSIONS, type MaterialField } from '../conductors/materials.js';
import { dimensionOfPath } from '../scenario/fields.js';
import { LIMIT_DIMENSIONS, type EngineeringLimits } from '../scenario/limits.js';
import type { Scenario } from '../scenario/types.js';
import { DIMENSIONS } from '../units/quantity.js';

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

/** Units of the figures the loader derives from geometry and materials (rails.derived.*, armature.derived.*). */
const DERIVED_UNITS: Record<string, string> = {
  inductanceGradientHighFrequency: 'H/m',
  inductanceGradientUniform: 'H/m',
  resistanceGradient: '\u03A9/m',
  resistanceGradientDC: '\u03A9/m',
  characteristicTime: 's',
  penetrationDepth: 'm',
  currentArea: 'm\u00B2',
  volume: 'm\u00B3',
  mass: 'kg',
  resistance: '\u03A9',
};

/** Units of the rails' current-diffusion ladder the loader derives (rails.diffusion.*). */
const DIFFUSION_UNITS: Record<string, string> = {
  face: 'm',
  depth: 'm',
  resistanceGradientDC: '\u03A9/m',
  resistanceGradient: '\u03A9/m',
  tailInductanceGradient: 'H/m',
  rate: '1/s',
};

/** The SI unit symbol of the quantity at a scenario path ('' for counts, text and plain numbers). */
export function siUnitOfPath(path: string): string {
  const field = dimensionOfPath(path);
  if (field) return field.display;
  const material = /(?:^|\.)(?:material|materials\.[^.]+)\.([A-Za-z]+)$/.exec(path)?.[1];
  if (material && material in MATERIAL_FIELD_DIMENSIONS) return DIMENSIONS[MATERIAL_FIELD_DIMENSIONS[material as MaterialField]].display;
  const limit = /^limits\.([A-Za-z]+)$/.exec(path)?.[1];
  if (limit && limit in LIMIT_DIMENSIONS) return LIMIT_DIMENSIONS[limit as keyof EngineeringLimits].display;
  const diffusion = /^rails\.diffusion\.(?:modes\[\d+\]\.)?([A-Za-z]+)$/.exec(path)?.[1];
  if (diffusion && diffusion in DIFFUSION_UNITS) return DIFFUSION_UNITS[diffusion]!;
  // the transition threshold the loader derives, specificAction × contactArea²
  if (path === 'armature.transition.action') return 'A\u00B2\u00B7s';
  const heating = /^heating\.([A-Za-z]+)$/.exec(path)?.[1];
  if (heating) return heating.endsWith('Alpha') ? '1/K' : '1/(A\u00B2\u00B7s)';
  const derived = /\.derived\.([A-Za-z]+)$/.exec(path)?.[1];
  if (derived && derived in DERIVED_UNITS) return DERIVED_UNITS[derived]!;
  return '';
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
 * Where a value the file leaves out comes from: the rails' or armature's geometry, the material library (a material
 * given by name), or a default of the format.
 */
export function unwrittenSource(path: string, scenario: Scenario, scenarioRaw: unknown): 'geometry' | 'material' | 'default' {
  if (/\.derived\./.test(path)) return 'geometry';
  const raw = (scenarioRaw ?? {}) as Record<string, Record<string, unknown> | undefined>;
  const material = /^(rails|armature)\.material\./.exec(path)?.[1] as 'rails' | 'armature' | undefined;
  if (material && typeof raw[material]?.['material'] === 'string') return 'material';
  if (scenario.rails.derived && /^rails\.(inductanceGradient|resistanceGradient)$/.test(path)) return 'geometry';
  if (scenario.armature.derived && /^armature\.(mass|resistance)$/.test(path)) return 'geometry';
  return 'default';
}

/** Paths that say nothing about the shot: the editor's schema pointer. */
const NOT_AN_INPUT = new Set(['$schema']);

/**
 * One row per path found in the scenario as used (defaults included), then any path that appears only
 * in the file (e.g. an input the loader turned into another quantity). The `$schema` pointer is left out.
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
    if (!NOT_AN_INPUT.has(path)) rows.push({ path, written: written.get(path), si, unit: unitOf(path) });
  }
  for (const [path, value] of written) {
    if (!used.has(path) && !NOT_AN_INPUT.has(path)) rows.push({ path, written: value, si: undefined, unit: unitOf(path) });
  }
  return rows;
}

/** The section a path belongs to: its first key, or its bank group (`bank[1]`); '' for the name and description. */
export function sectionOfPath(path: string): string {
  if (path === 'name' || path === 'description') return '';
  const match = /^(bank\[\d+\]|[^.[]+)/.exec(path);
  return match ? match[1]! : path;
}

export interface InputSection<Row extends { path: string }> {
  /** `name`, `bank[0]`, `rails`, … */
  section: string;
  rows: Row[];
}

/** Rows grouped by section, sections in the order of their first row (the scenario's own order). */
export function groupBySection<Row extends { path: string }>(rows: readonly Row[]): InputSection<Row>[] {
  const sections = new Map<string, Row[]>();
  for (const row of rows) {
    const key = sectionOfPath(row.path);
    const list = sections.get(key) ?? [];
    list.push(row);
    sections.set(key, list);
  }
  return [...sections.entries()].map(([section, grouped]) => ({ section, rows: grouped }));
}

/** The key of a path within its section ("crowbar.drop" in bank[0]); the path itself for a top-level value. */
export function keyInSection(path: string, section: string): string {
  return section === '' || path === section ? path : path.slice(section.length).replace(/^\./, '');
}
