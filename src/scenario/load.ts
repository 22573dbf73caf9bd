/**
 * Scenario files → Scenario (SI numbers, defaults filled in). Every problem a user can fix becomes an
 * InputError naming the JSON path, what was expected and what was found.
 */
import { InputError } from '../core/errors.js';
import { sha256Text } from '../core/sha256.js';
import { QuantityError, toSI } from '../units/quantity.js';
import { SCENARIO_FIELDS, type Field, type SectionField } from './fields.js';
import type { Scenario } from './types.js';
import { defaultSampleInterval, validateScenario } from './validate.js';
import { didYouMean } from './suggest.js';
import { MAX_JSON_DEPTH, findJsonError } from './jsonError.js';
import { deriveFromGeometry } from './derive.js';
import { nestingDepth, readScenarioSource, withoutByteOrderMark } from './source.js';
import { rangeProblem } from './ranges.js';
import { readUncertaintySections } from './uncertainty.js';

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
  return loadScenarioText(readScenarioSource(file), file);
}

export function loadScenarioText(source: string, file: string): LoadedScenario {
  const raw = parseJson(source, file);
  const scenario = scenarioFromRaw(raw, file);
  return { raw, scenario, source, sha256: sha256Text(source), file };
}

/** Line and column (1-based) of an offset in a text, counted without copying the text. */
function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let at = text.indexOf('\n'); at >= 0 && at < offset; at = text.indexOf('\n', at + 1)) {
    line += 1;
    lineStart = at + 1;
  }
  return { line, column: offset - lineStart + 1 };
}

/** JSON.parse with the position turned into line and column; a byte-order mark is not part of the JSON. */
export function parseJson(text: string, file: string): Record<string, unknown> {
  const source = withoutByteOrderMark(text);
  let value: unknown;
  try {
    value = JSON.parse(source);
  } catch {
    throw jsonProblem(source, file, 'malformed JSON');
  }
  // Values nested deeper than any scenario would overflow JSON.stringify and structuredClone downstream.
  if (nestingDepth(value) > MAX_JSON_DEPTH) throw jsonProblem(source, file, 'JSON nested too deeply');
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new InputError('', 'expected a JSON object with the scenario keys (name, bank, feed, rails, armature)', file);
  }
  return value as Record<string, unknown>;
}

function jsonProblem(source: string, file: string, what: string): InputError {
  const problem = findJsonError(source) ?? { offset: source.length, message: 'not valid JSON' };
  const { line, column } = lineAndColumn(source, problem.offset);
  return new InputError(`line ${line}, column ${column}`, `${what} (${problem.message})`, file);
}

/** Read a parsed scenario object: units → SI, defaults, dimension and range checks. */
export function scenarioFromRaw(raw: Record<string, unknown>, file?: string): Scenario {
  checkLoadKeys(raw, file);
  const read = readSection(raw, { kind: 'section', fields: SCENARIO_FIELDS, description: '' }, '', file) as Record<string, unknown>;
  const scenario = normalise(read);
  deriveFromGeometry(scenario, read, raw, file);
  validateScenario(scenario, file);
  readUncertaintySections(scenario, raw, file);
  return scenario;
}

/** Keys that describe a launch: with a shorted load (a ring-down) there is no bore, armature or target. */
export const LAUNCH_ONLY_KEYS = ['rails', 'armature', 'friction', 'drag', 'target'] as const;
/** Check thresholds about rails, armature and payload: they have nothing to judge in a ring-down. */
export const LAUNCH_ONLY_LIMITS = ['actionWarnFraction', 'railHeatingWarnFraction', 'linearCurrentDensityWarn', 'linearCurrentDensityFail', 'contactForcePerAmpere', 'railSeparatingForcePerLength', 'peakAcceleration'] as const;

/** A launch needs rails and an armature; a shorted load (ring-down) must not be given launch-only keys. */
function checkLoadKeys(raw: Record<string, unknown>, file?: string): void {
  const load = raw.load;
  if (load === undefined || load === null) {
    for (const key of ['rails', 'armature'] as const) {
      if (raw[key] === undefined) {
        throw new InputError(key, `missing required key (${(SCENARIO_FIELDS[key] as SectionField).description.replace(' (required unless load is given)', '')}; or give load for a ring-down into a short)`, file);
      }
    }
    return;
  }
  if (typeof load !== 'object' || Array.isArray(load)) return; // readSection reports the shape
  const kind = (load as Record<string, unknown>).kind;
  if (kind !== undefined && kind !== 'short') throw new InputError('load.kind', `expected "short" (the bank fired into a short at the breech), got ${describe(kind)}`, file);
  const why = 'is a launch-only key: this scenario fires the bank into a shorted load (load.kind "short"), which has no rails, armature, friction, drag or target; remove it, or remove load for a launch';
  for (const key of LAUNCH_ONLY_KEYS) if (raw[key] !== undefined) throw new InputError(key, why, file);
  if (raw.heating !== undefined && raw.heating !== 'none') {
    throw new InputError('heating', 'heats the rails and the armature, which a shorted load (load.kind "short") does not have; remove it, or remove load for a launch', file);
  }
  const limits = raw.limits;
  if (typeof limits === 'object' && limits !== null) {
    for (const key of LAUNCH_ONLY_LIMITS) if (Object.hasOwn(limits, key)) throw new InputError(`limits.${key}`, why.replace('key', 'limit'), file);
  }
}

/** Longest text read as a quantity ("450 uF"); a longer one is surely not one. */
const MAX_QUANTITY_TEXT = 100;

function describe(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'object') return 'an object';
  return JSON.stringify(value);
}

function readField(value: unknown, field: Field, path: string, file?: string): unknown {
  switch (field.kind) {
    case 'quantity': {
      if (typeof value === 'string' && value.length > MAX_QUANTITY_TEXT) {
        throw new InputError(path, `expected ${field.dimension.noun} such as "450 uF", got a text of ${value.length} characters`, file);
      }
      let si: number;
      try {
        si = toSI(value, field.dimension);
      } catch (error) {
        if (error instanceof QuantityError) throw new InputError(path, error.message, file);
        throw error;
      }
      const problem = rangeProblem(field, si);
      if (problem) throw new InputError(path, problem, file);
      return si;
    }
    case 'integer': {
      if (typeof value !== 'number' || !Number.isInteger(value)) {
        throw new InputError(path, `expected a whole number, got ${describe(value)}`, file);
      }
      const problem = rangeProblem(field, value);
      if (problem) throw new InputError(path, problem, file);
      return value;
    }
    case 'raw':
      return value;
    case 'text':
      if (typeof value !== 'string') throw new InputError(path, `expected a text string, got ${describe(value)}`, file);
      if (value.length > field.maxLength) throw new InputError(path, `expected a text of at most ${field.maxLength} characters, got ${value.length}`, file);
      return value;
    case 'section':
      return readSection(value, field, path, file);
    case 'list': {
      if (!Array.isArray(value)) throw new InputError(path, `expected an array, got ${describe(value)}`, file);
      if (value.length > field.maxItems) throw new InputError(path, `expected at most ${field.maxItems} entries, got ${value.length}`, file);
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
    // own keys only: "constructor" or "__proto__" in a file are unknown keys like any other, never Object's
    if (!Object.hasOwn(section.fields, key)) {
      const where = path ? `${path}.${key}` : key;
      const hint = didYouMean(key, known);
      throw new InputError(where, `unknown key${hint ? ` (did you mean "${hint}"?)` : ''}; expected one of ${known.filter((k) => k !== '$schema').join(', ')}`, file);
    }
  }
  for (const [key, field] of Object.entries(section.fields)) {
    const where = path ? `${path}.${key}` : key;
    const present = Object.hasOwn(object, key) && object[key] !== undefined;
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
  const load = read.load as { kind: 'short'; inductance: number; resistance: number } | null | undefined;
  if (load) {
    // a ring-down: no bore, no armature; the launch sections hold zeros that nothing reads
    return {
      name: read.name as string,
      description: (read.description as string | undefined) ?? '',
      bank,
      feed: read.feed as unknown as Scenario['feed'],
      rails: { length: 0, inductanceGradient: 0, resistanceGradient: 0 },
      armature: { mass: 0, position: 0, resistance: 0, contactResistance: 0, arcDrop: 0 },
      friction: { coefficient: 0, staticCoefficient: 0, preload: 0, magneticLoading: 0 },
      drag: null,
      load: { kind: 'short', inductance: load.inductance, resistance: load.resistance },
      ...(record ? { record } : {}),
      solver: solverOptions({ ...sectionDefaults('solver'), ...(solver ?? {}) }),
    };
  }
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
    // drag.model and drag.heatCapacityRatio are read by the derivation step (./derive.ts), which completes drag
    drag: drag ? { gasDensity: drag.gasDensity!, dragCoefficient: drag.dragCoefficient!, boreArea: drag.boreArea! } : null,
    solver: solverOptions({ ...sectionDefaults('solver'), ...(solver ?? {}) }),
  };
}

/** The solver section with its one default that depends on another key: the sample interval follows the end time. */
function solverOptions(given: Record<string, number | undefined>): Scenario['solver'] {
  const endTime = given.endTime!;
  return { ...given, sampleInterval: given.sampleInterval ?? defaultSampleInterval(endTime) } as Scenario['solver'];
}
