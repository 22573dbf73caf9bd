/**
 * Scenario files → Scenario (SI numbers, defaults filled in). Every problem a user can fix becomes an
 * InputError naming the JSON path, what was expected and what was found.
 */
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { InputError } from '../core/errors.js';
import { QuantityError, toSI } from '../units/quantity.js';
import { SCENARIO_FIELDS, type Field, type SectionField } from './fields.js';
import type { Scenario } from './types.js';
import { validateScenario } from './validate.js';
import { didYouMean } from './suggest.js';
import { findJsonError } from './jsonError.js';
import { deriveFromGeometry } from './derive.js';

export { validateScenario } from './validate.js';
export { dimensionOfPath } from './fields.js';

export interface LoadedScenario {
  /** the JSON as written */
  raw: Record<string, unknown>;
  scenario: Scenario;
  /** the file's text */
  source: string;
  /** SHA-256 of the file's text, hex */
  sha256: string;
  file: string;
}

export function loadScenarioFile(file: string): LoadedScenario {
  let source: string;
  try {
    source = readFileSync(file, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError('', code === 'ENOENT' ? 'no such file' : `cannot read the file (${code ?? 'error'})`, file);
  }
  return loadScenarioText(source, file);
}

export function loadScenarioText(source: string, file: string): LoadedScenario {
  const raw = parseJson(source, file);
  const scenario = scenarioFromRaw(raw, file);
  return { raw, scenario, source, sha256: createHash('sha256').update(source).digest('hex'), file };
}

/** JSON.parse with the position turned into line and column. */
export function parseJson(source: string, file: string): Record<string, unknown> {
  let value: unknown;
  try {
    value = JSON.parse(source);
  } catch {
    const problem = findJsonError(source) ?? { offset: source.length, message: 'not valid JSON' };
    const before = source.slice(0, problem.offset).split('\n');
    const line = before.length;
    const column = before[before.length - 1]!.length + 1;
    throw new InputError(`line ${line}, column ${column}`, `malformed JSON (${problem.message})`, file);
  }
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new InputError('', 'expected a JSON object with the scenario keys (name, bank, feed, rails, armature)', file);
  }
  return value as Record<string, unknown>;
}

/** Read a parsed scenario object: units → SI, defaults, dimension and range checks. */
export function scenarioFromRaw(raw: Record<string, unknown>, file?: string): Scenario {
  const read = readSection(raw, { kind: 'section', fields: SCENARIO_FIELDS, description: '' }, '', file) as Record<string, unknown>;
  const scenario = normalise(read);
  deriveFromGeometry(scenario, read, raw, file);
  validateScenario(scenario, file);
  return scenario;
}

function describe(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'object') return 'an object';
  return JSON.stringify(value);
}

function readField(value: unknown, field: Field, path: string, file?: string): unknown {
  switch (field.kind) {
    case 'quantity':
      try {
        return toSI(value, field.dimension);
      } catch (error) {
        if (error instanceof QuantityError) throw new InputError(path, error.message, file);
        throw error;
      }
    case 'integer':
      if (typeof value !== 'number' || !Number.isInteger(value)) {
        throw new InputError(path, `expected a whole number, got ${describe(value)}`, file);
      }
      return value;
    case 'raw':
      return value;
    case 'text':
      if (typeof value !== 'string') throw new InputError(path, `expected a text string, got ${describe(value)}`, file);
      return value;
    case 'section':
      return readSection(value, field, path, file);
    case 'list': {
      if (!Array.isArray(value)) throw new InputError(path, `expected an array, got ${describe(value)}`, file);
      return value.map((item, n) => readSection(item, field.item, `${path}[${n}]`, file));
    }
  }
}

function readSection(value: unknown, section: SectionField, path: string, file?: string): Record<string, unknown> | null {
  if (value === null && section.optional) return null;
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new InputError(path, `expected an object, got ${describe(value)}`, file);
  }
  const object = value as Record<string, unknown>;
  const out: Record<string, unknown> = {};
  const known = Object.keys(section.fields);
  for (const key of Object.keys(object)) {
    if (!(key in section.fields)) {
      const where = path ? `${path}.${key}` : key;
      const hint = didYouMean(key, known);
      throw new InputError(where, `unknown key${hint ? ` (did you mean "${hint}"?)` : ''}; expected one of ${known.filter((k) => k !== '$schema').join(', ')}`, file);
    }
  }
  for (const [key, field] of Object.entries(section.fields)) {
    const where = path ? `${path}.${key}` : key;
    const present = key in object && object[key] !== undefined;
    if (!present) {
      if (field.required) throw new InputError(where, `missing required key (${field.description})`, file);
      if ((field.kind === 'quantity' || field.kind === 'integer') && field.default !== undefined) out[key] = field.default;
      continue;
    }
    out[key] = readField(object[key], field, where, file);
  }
  return out;
}

/** Fill the defaults that depend on other keys and shape the typed Scenario. */
function normalise(read: Record<string, unknown>): Scenario {
  const bank = (read.bank as Record<string, unknown>[]).map((group, n) => ({
    label: (group.label as string | undefined) ?? `group ${n + 1}`,
    count: group.count as number,
    capacitance: group.capacitance as number,
    voltage: group.voltage as number,
    esr: group.esr as number,
    inductance: group.inductance as number,
    resistance: group.resistance as number,
    trigger: group.trigger as number,
    crowbar: group.crowbar
      ? { drop: (group.crowbar as Record<string, number>).drop!, resistance: (group.crowbar as Record<string, number>).resistance! }
      : null,
    ...(group.ratedReversal === undefined ? {} : { ratedReversal: group.ratedReversal as number }),
  }));
  const friction = (read.friction as Record<string, number> | null | undefined) ?? null;
  const coefficient = friction?.coefficient ?? 0;
  const solver = (read.solver as Record<string, number> | null | undefined) ?? null;
  const sectionDefaults = (name: string): Record<string, number> => {
    const field = SCENARIO_FIELDS[name] as SectionField;
    return Object.fromEntries(
      Object.entries(field.fields).flatMap(([k, f]) => ((f.kind === 'quantity' || f.kind === 'integer') && f.default !== undefined ? [[k, f.default]] : [])),
    );
  };
  const drag = (read.drag as Record<string, number> | null | undefined) ?? null;
  const record = read.record as Record<string, string> | null | undefined;
  return {
    name: read.name as string,
    description: (read.description as string | undefined) ?? '',
    ...(record ? { record: { ...record } } : {}),
    bank,
    feed: read.feed as unknown as Scenario['feed'],
    rails: { ...(read.rails as Record<string, unknown>), resistanceGradient: (read.rails as Record<string, number>).resistanceGradient ?? 0 } as unknown as Scenario['rails'],
    armature: read.armature as unknown as Scenario['armature'],
    friction: {
      coefficient,
      staticCoefficient: friction?.staticCoefficient ?? coefficient,
      preload: friction?.preload ?? 0,
      magneticLoading: friction?.magneticLoading ?? 0,
    },
    drag: drag ? { gasDensity: drag.gasDensity!, dragCoefficient: drag.dragCoefficient!, boreArea: drag.boreArea! } : null,
    solver: { ...sectionDefaults('solver'), ...(solver ?? {}) } as unknown as Scenario['solver'],
  };
}
