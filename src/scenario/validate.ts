/**
 * Range checks on an SI scenario: what the model needs to be well posed. Run after loading and again after a
 * study changes a value, so a sweep point outside the physical range is caught with its path.
 *
 * Every quantity is checked against its plausible range from the field table (src/scenario/fields.ts), then the
 * rules that tie keys together. A value exactly at a limit is within it.
 */
import { InputError } from '../core/errors.js';
import type { Scenario } from './types.js';
import { SCENARIO_FIELDS, type Field } from './fields.js';
import { formatBound, rangeProblem } from './ranges.js';

/** Most uniform waveform samples of one shot (each holds every waveform of the record). */
export const MAX_SAMPLES = 2_000_000;
/** Most energy a bank may store: above any laboratory bank, and far from overflowing any state. */
export const MAX_STORED_ENERGY = 10e9;
/** The sample interval when the scenario gives none: 1 µs, or longer when the end time needs it. */
export const BASE_SAMPLE_INTERVAL = 1e-6;

export function defaultSampleInterval(endTime: number): number {
  return Math.max(BASE_SAMPLE_INTERVAL, endTime / MAX_SAMPLES);
}

type Node = Record<string, unknown>;

/** Check every number the field table describes, at the same path in the SI scenario. */
function checkRanges(node: unknown, fields: Record<string, Field>, prefix: string, scenario: Scenario, file?: string): void {
  if (typeof node !== 'object' || node === null) return;
  for (const [key, field] of Object.entries(fields)) {
    const path = prefix ? `${prefix}.${key}` : key;
    const value = Object.hasOwn(node, key) ? (node as Node)[key] : undefined;
    if (field.kind === 'quantity' || field.kind === 'integer') {
      if (typeof value !== 'number') continue;
      const problem = rangeProblem(field, value);
      if (problem) throw new InputError(path, `${problem}${derivedNote(scenario, path)}`, file);
    } else if (field.kind === 'section') {
      checkRanges(value, field.fields, path, scenario, file);
    } else if (field.kind === 'list' && Array.isArray(value)) {
      value.forEach((item, n) => checkRanges(item, field.item.fields, `${path}[${n}]`, scenario, file));
    }
  }
}

/** Values the loader computed from geometry name what they were computed from: the user never wrote them. */
function derivedNote(scenario: Scenario, path: string): string {
  const rails = scenario.rails.derived;
  if (rails && path === 'rails.inductanceGradient' && (scenario.rails.inductanceGradient === rails.inductanceGradientHighFrequency || scenario.rails.inductanceGradient === rails.inductanceGradientUniform)) {
    return ' (computed from rails.geometry)';
  }
  if (rails && path === 'rails.resistanceGradient' && (scenario.rails.resistanceGradient === rails.resistanceGradient || scenario.rails.resistanceGradient === rails.resistanceGradientDC)) {
    return ' (computed from rails.geometry and rails.material)';
  }
  const armature = scenario.armature.derived;
  if (armature && path === 'armature.mass' && scenario.armature.mass === armature.mass) return ' (computed from armature.geometry and armature.material)';
  if (armature && path === 'armature.resistance' && scenario.armature.resistance === armature.resistance) return ' (computed from armature.geometry and armature.material)';
  return '';
}

const LAUNCH_SECTIONS = new Set(['rails', 'armature', 'friction', 'drag', 'target']);

function withoutLaunchSections(fields: Record<string, Field>): Record<string, Field> {
  return Object.fromEntries(Object.entries(fields).filter(([key]) => !LAUNCH_SECTIONS.has(key)));
}

/** A study or a fit that set a launch value on a ring-down is as wrong as a file that gives one. */
function checkShortedLoad(s: Scenario, file?: string): void {
  const { rails, armature, friction, drag } = s;
  const launch: [string, number][] = [
    ['rails.length', rails.length], ['rails.inductanceGradient', rails.inductanceGradient], ['rails.resistanceGradient', rails.resistanceGradient],
    ['armature.mass', armature.mass], ['armature.position', armature.position], ['armature.resistance', armature.resistance],
    ['armature.contactResistance', armature.contactResistance], ['armature.arcDrop', armature.arcDrop],
    ['friction.coefficient', friction.coefficient], ['friction.staticCoefficient', friction.staticCoefficient], ['friction.preload', friction.preload], ['friction.magneticLoading', friction.magneticLoading],
  ];
  for (const [path, value] of launch) {
    if (value !== 0) throw new InputError(path, 'is a launch-only value: this scenario fires the bank into a shorted load (load.kind "short"), which has no rails, armature or friction', file);
  }
  if (drag) throw new InputError('drag', 'is a launch-only key: this scenario fires the bank into a shorted load', file);
}

export function validateScenario(s: Scenario, file?: string): void {
  if (s.bank.length === 0) throw new InputError('bank', 'the bank has no module group, so the shot cannot fire; add at least one group', file);
  if (s.load) checkShortedLoad(s, file);
  // with a shorted load the launch sections hold zeros that no range applies to
  const fields = s.load ? withoutLaunchSections(SCENARIO_FIELDS) : SCENARIO_FIELDS;
  checkRanges(s, fields, '', s, file);
  const { rails, armature, friction, solver } = s;
  if (friction.staticCoefficient < friction.coefficient) {
    throw new InputError('friction.staticCoefficient', `expected a static coefficient ≥ the sliding coefficient (${friction.coefficient}), got ${friction.staticCoefficient}`, file);
  }
  if (!s.load && rails.length <= armature.position) {
    throw new InputError('rails.length', `expected a rail length greater than the armature's initial position (${armature.position} m), got ${rails.length} m`, file);
  }
  const stored = storedEnergy(s);
  if (!(stored <= MAX_STORED_ENERGY)) {
    throw new InputError('bank', `stores ${formatBound(stored, 'J')} (½·C·V² × count over the groups); at most ${formatBound(MAX_STORED_ENERGY, 'J')} is accepted`, file);
  }
  if (solver.sampleInterval > 0 && solver.endTime / solver.sampleInterval > MAX_SAMPLES) {
    const samples = Math.round(solver.endTime / solver.sampleInterval);
    throw new InputError(
      'solver.sampleInterval',
      `${formatBound(solver.sampleInterval, 's')} up to solver.endTime (${formatBound(solver.endTime, 's')}) gives ${samples.toLocaleString('en-US')} samples; at most ${MAX_SAMPLES.toLocaleString('en-US')}: raise the interval to at least ${formatBound(solver.endTime / MAX_SAMPLES, 's')} or shorten the end time`,
      file,
    );
  }
}

/** E0 = Σ ½ n C V0² (model contract §4), summed without overflow for any values within range. */
export function storedEnergy(s: Scenario): number {
  let energy = 0;
  for (const group of s.bank) energy += 0.5 * group.count * group.capacitance * group.voltage * group.voltage;
  return energy;
}
