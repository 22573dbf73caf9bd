/**
 * `--vary PATH=SPEC`: which scenario number a study changes, and to what.
 *
 *   PATH=20g,40g,80g            a list of values (one value is a list of one)
 *   PATH=4kV:10kV:13            a linear range start:stop:count, both ends included
 *   PATH=log:1mohm:100mohm:9    a logarithmic range (equal ratios), both ends included; start, stop > 0
 *
 * Values carry a unit of the path's dimension, or are plain SI numbers. For the `lhs` and `random` designs only
 * the smallest and largest value of a SPEC count (a log SPEC is sampled in log space).
 */
import { InputError } from '../core/errors.js';
import type { Scenario } from '../scenario/types.js';
import { DIMENSIONS, toSI, type Dimension } from '../units/quantity.js';
import { closestPath, formatPath, getPath, inertPathProblem, listNumericPaths, parsePath, type PathStep } from '../scenario/paths.js';
import { largest, smallest } from '../core/extrema.js';

export type AxisKind = 'list' | 'linear' | 'log';

export interface Axis {
  /** the scenario path, e.g. `bank[0].voltage` (also the column name in the outputs) */
  path: string;
  steps: PathStep[];
  /** the SPEC text as given, kept in the manifest */
  spec: string;
  kind: AxisKind;
  /** SI values of the grid design, in the order given */
  values: number[];
  min: number;
  max: number;
  /** whole numbers only (a module count) */
  integer: boolean;
}

export type DimensionOf = (path: string) => Dimension | undefined;

const OPTION = '--vary';
/** Most values of one --vary range (a grid of such axes is bounded again by MAX_POINTS in design.ts). */
export const MAX_AXIS_VALUES = 1_000_000;

function fail(problem: string): never {
  throw new InputError(OPTION, problem);
}

/** Parse one `--vary` argument against the scenario it will change. */
export function parseVary(argument: string, scenario: Scenario, dimensionOf: DimensionOf, options: { readAgain?: boolean } = {}): Axis {
  const equals = argument.indexOf('=');
  if (equals < 0) fail(`expected PATH=SPEC (e.g. armature.mass=20g,40g or bank[0].voltage=4kV:10kV:13), got "${argument}"`);
  const path = argument.slice(0, equals).trim();
  const spec = argument.slice(equals + 1).trim();
  const steps = checkPath(path, scenario, options);
  // A module count is a whole number with no dimension (the loader lists it as an integer, not a quantity).
  const integer = steps[steps.length - 1] === 'count';
  const dimension = integer ? DIMENSIONS.dimensionless : dimensionOf(path);
  if (!dimension) fail(`${path} is not a quantity a study can vary`);
  if (spec === '') fail(`${path}: no values after "=" (give a list 20g,40g, a range 4kV:10kV:13 or log:1mohm:100mohm:9)`);
  const { kind, values } = parseSpec(path, spec, dimension);
  if (integer && values.some((value) => !Number.isInteger(value) || value < 1)) {
    fail(`${path}: a module count must be a whole number ≥ 1, got ${values.join(', ')}`);
  }
  return { path, steps, spec, kind, values, min: smallest(values), max: largest(values), integer };
}

/** Parse every `--vary`; a path given twice is an error. */
export function parseVaries(argumentsGiven: readonly string[], scenario: Scenario, dimensionOf: DimensionOf, options: { readAgain?: boolean } = {}): Axis[] {
  if (argumentsGiven.length === 0) fail('give at least one --vary PATH=SPEC');
  const axes = argumentsGiven.map((argument) => parseVary(argument, scenario, dimensionOf, options));
  const seen = new Set<string>();
  for (const axis of axes) {
    if (seen.has(axis.path)) fail(`${axis.path} is varied twice`);
    seen.add(axis.path);
  }
  return axes;
}

function checkPath(path: string, scenario: Scenario, options: { readAgain?: boolean }): PathStep[] {
  const steps = parsePath(path);
  if (!steps) fail(`"${path}" is not a scenario path (expected e.g. armature.mass or bank[0].voltage)`);
  // Walk the path so the message names the first step that does not exist.
  let node: unknown = scenario;
  for (let i = 0; i < steps.length; i += 1) {
    const step = steps[i]!;
    if (typeof step === 'number' && Array.isArray(node) && step >= node.length) {
      const where = formatPath(steps.slice(0, i));
      fail(`${path}: ${where} has ${node.length} ${node.length === 1 ? 'entry' : 'entries'} (${where}[0]…${where}[${node.length - 1}])`);
    }
    const next = getPath(node, [step]);
    if (next === null && i < steps.length - 1) fail(`${path}: ${formatPath(steps.slice(0, i + 1))} is not set in the scenario, so it cannot be varied`);
    node = next;
    if (node === undefined) break;
  }
  if (typeof node !== 'number') {
    const suggestion = closestPath(path, listNumericPaths(scenario));
    fail(`${path} is not a number in the scenario${suggestion ? ` (did you mean ${suggestion}?)` : ''}`);
  }
  const inert = inertPathProblem(scenario, path, options);
  if (inert) fail(`${path} ${inert}`);
  return steps;
}

function parseSpec(path: string, spec: string, dimension: Dimension): { kind: AxisKind; values: number[] } {
  const parts = spec.split(':').map((part) => part.trim());
  if (parts.length === 1) {
    const items = spec.split(',').map((item) => item.trim());
    if (items.some((item) => item === '')) fail(`${path}: empty value in the list "${spec}"`);
    return { kind: 'list', values: items.map((item) => quantity(path, item, dimension)) };
  }
  const log = parts[0] === 'log';
  const range = log ? parts.slice(1) : parts;
  if (range.length !== 3) {
    fail(`${path}: a range is start:stop:count${log ? ' after "log:"' : ''} (e.g. ${log ? 'log:1mohm:100mohm:9' : '4kV:10kV:13'}), got "${spec}"`);
  }
  const start = quantity(path, range[0]!, dimension);
  const stop = quantity(path, range[1]!, dimension);
  const count = Number(range[2]);
  if (!Number.isInteger(count) || count < 1) fail(`${path}: the count of a range must be a whole number ≥ 1, got "${range[2]}"`);
  if (count > MAX_AXIS_VALUES) fail(`${path}: a range of ${count} values is more than ${MAX_AXIS_VALUES.toLocaleString('en-US')}; for a finer study sample the range (--design lhs --samples N)`);
  if (count > 1 && start === stop) fail(`${path}: the range ${spec} is empty (start equals stop)`);
  if (log && (start <= 0 || stop <= 0)) fail(`${path}: a log range needs start and stop > 0, got "${spec}"`);
  const values = Array.from({ length: count }, (_, i) => rangeValue(start, stop, count, i, log));
  return { kind: log ? 'log' : 'linear', values };
}

function rangeValue(start: number, stop: number, count: number, i: number, log: boolean): number {
  if (count === 1) return start;
  // Ends exactly as given; interior points by interpolation (in log space for a log range).
  if (i === 0) return start;
  if (i === count - 1) return stop;
  const fraction = i / (count - 1);
  return log ? Math.exp(Math.log(start) + fraction * (Math.log(stop) - Math.log(start))) : start + fraction * (stop - start);
}

const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function quantity(path: string, text: string, dimension: Dimension): number {
  // On the command line every value is text: a bare number is SI, as a JSON number is in a scenario file.
  if (PLAIN_NUMBER.test(text)) return Number(text);
  try {
    return toSI(text, dimension);
  } catch (error) {
    fail(`${path}: ${error instanceof Error ? error.message : String(error)}`);
  }
}
