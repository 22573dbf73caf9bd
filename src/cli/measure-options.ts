/**
 * Command-line options of `overlay` and `fit` → the inputs of src/measure: CSV reading options, measured
 * figures, free parameters with bounds, weights and noise levels. Units are read here, once; every problem
 * is an InputError naming the option, so the user gets one line and exit code 2.
 */
import { readFileSync } from 'node:fs';
import { readMeasurementFile, readMeasurementHeader, readPositionPoints, type Measurement, type MeasurementOptions, type PositionPoints } from '../measure/csv.js';
import type { FitNoise, FreeParameter, ResidualGroup } from '../measure/fit.js';
import { InputError } from '../core/errors.js';
import { dimensionOfPath, fieldAt, quantityPaths } from '../scenario/fields.js';
import { getScenarioPath, inertPathProblem, parsePath } from '../scenario/paths.js';
import { didYouMean } from '../scenario/suggest.js';
import type { Scenario } from '../scenario/types.js';
import { DIMENSIONS, normaliseUnitText, QuantityError, toSI, type Dimension } from '../units/quantity.js';
import { mathUnit } from '../units/unitLibrary.js';

export interface MeasureFlags {
  map?: string[];
  unit?: string[];
  scale?: string[];
  offset?: string[];
  positions?: string;
  muzzleVelocity?: string;
  exitTime?: string;
}

const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** `KEY=VALUE` → [KEY, VALUE], split at the last `=` (a header may hold one, a value never does). */
function keyValue(option: string, text: string, example: string): [string, string] {
  const at = text.lastIndexOf('=');
  const key = at > 0 ? text.slice(0, at).trim() : '';
  const value = at > 0 ? text.slice(at + 1).trim() : '';
  if (!key || !value) throw new InputError(option, `expected ${example}, got "${text}"`);
  return [key, value];
}

function pairs(option: string, list: string[] | undefined, example: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const text of list ?? []) {
    const [key, value] = keyValue(option, text, example);
    if (key in out) throw new InputError(option, `"${key}" is given twice`);
    out[key] = value;
  }
  return out;
}

function readText(file: string, option: string): string {
  try {
    return readFileSync(file, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(option, code === 'ENOENT' ? `no such file: ${file}` : `cannot read ${file} (${code ?? 'error'})`);
  }
}

/** A quantity given on the command line, with its unit (a plain number is SI). */
export function quantityOption(option: string, text: string, dimension: Dimension): number {
  try {
    return toSI(text, dimension);
  } catch (error) {
    if (error instanceof QuantityError) throw new InputError(option, error.message);
    throw error;
  }
}

/**
 * `--offset HEADER=VALUE`: the CSV reader adds offsets in the column's unit, so a value with a unit
 * (`t=2us`) is converted to the unit of its column (from --unit or the header); a plain number is taken
 * in the column's unit already.
 */
function offsetsInColumnUnits(source: string, offsets: Record<string, string>, units: Record<string, string>, map: Record<string, string>): Record<string, number> {
  const out: Record<string, number> = {};
  if (Object.keys(offsets).length === 0) return out;
  const table = readMeasurementHeader(source, source);
  for (const [key, value] of Object.entries(offsets)) {
    const column = table.columns.find((c) => c.header === key || c.name === key || (map[c.header] ?? map[c.name] ?? c.name) === key);
    if (!column) throw new InputError('--offset', `"${key}" is not a column of ${source} (columns: ${table.columns.map((c) => `"${c.header}"`).join(', ')})`);
    if (PLAIN_NUMBER.test(value)) {
      out[key] = Number(value);
      continue;
    }
    const role = map[column.header] ?? map[column.name] ?? column.name;
    const unit = units[column.header] ?? units[column.name] ?? units[role] ?? column.unit;
    if (unit === undefined) throw new InputError('--offset', `column "${column.header}" has no unit to convert ${value} to; give it with --unit`);
    try {
      out[key] = mathUnit(normaliseUnitText(value)).toNumber(normaliseUnitText(unit));
    } catch {
      throw new InputError('--offset', `${key}=${value}: expected a number or a quantity in the unit of column "${column.header}" (${unit})`);
    }
    if (!Number.isFinite(out[key]!)) throw new InputError('--offset', `${key}=${value} is not a finite value`);
  }
  return out;
}

export interface MeasuredInputs {
  measurement: Measurement;
  positions?: PositionPoints;
  muzzleVelocity?: number;
  exitTime?: number;
}

/** Read the measurement file (streamed: exports of millions of rows) and the measured figures named by the options. */
export function readMeasuredInputs(file: string, flags: MeasureFlags, scenario: Scenario): MeasuredInputs {
  const map = pairs('--map', flags.map, 'HEADER=SIGNAL, e.g. --map CH1=I');
  const units = pairs('--unit', flags.unit, 'HEADER=UNIT, e.g. --unit CH1=kA');
  const scale: Record<string, number> = {};
  for (const [key, value] of Object.entries(pairs('--scale', flags.scale, 'HEADER=FACTOR, e.g. --scale CH1=2'))) {
    if (!PLAIN_NUMBER.test(value) || Number(value) === 0) throw new InputError('--scale', `${key}=${value}: expected a plain non-zero number (the factor, in the column's unit)`);
    scale[key] = Number(value);
  }
  const offset = offsetsInColumnUnits(file, pairs('--offset', flags.offset, 'HEADER=VALUE, e.g. --offset t=2us'), units, map);
  const options: MeasurementOptions = { source: file, map, units, scale, offset };
  const measurement = readMeasurementFile(file, options);
  if (scenario.load) {
    if (measurement.signals.V_muzzle) throw new InputError(file, 'has a V_muzzle column, but the scenario fires into a shorted load (a ring-down) and has no muzzle; map the column to ignore (--map HEADER=ignore)');
    for (const [option, given] of [['--positions', flags.positions], ['--muzzle-velocity', flags.muzzleVelocity], ['--exit-time', flags.exitTime]] as const) {
      if (given !== undefined) throw new InputError(option, 'is a launch measurement, but the scenario fires into a shorted load (a ring-down): there is no armature');
    }
  }
  const railLength = scenario.rails.length;
  const positions = flags.positions ? readPositionPoints(readText(flags.positions, '--positions'), { source: flags.positions }) : undefined;
  const muzzleVelocity = flags.muzzleVelocity === undefined ? undefined : quantityOption('--muzzle-velocity', flags.muzzleVelocity, DIMENSIONS.velocity);
  let exitTime = flags.exitTime === undefined ? undefined : quantityOption('--exit-time', flags.exitTime, DIMENSIONS.time);
  if (exitTime === undefined && positions) {
    // a probe at the muzzle measures the exit time
    const k = positions.x.findIndex((x) => Math.abs(x - railLength) <= 1e-6 * railLength);
    if (k >= 0) exitTime = positions.t[k];
  }
  return { measurement, ...(positions ? { positions } : {}), ...(muzzleVelocity !== undefined ? { muzzleVelocity } : {}), ...(exitTime !== undefined ? { exitTime } : {}) };
}

/** Paths of the format a fit may vary: quantities of the model, not solver settings or check ratings. */
function fittablePaths(): string[] {
  return quantityPaths().filter((p) => !p.startsWith('solver.') && !p.endsWith('.count') && !p.endsWith('ratedReversal'));
}

/** `--free PATH[=lo:hi]`, bounds with units (or plain SI numbers); either bound may be left empty. */
export function parseFree(text: string, scenario: Scenario): FreeParameter {
  const at = text.indexOf('=');
  const path = (at < 0 ? text : text.slice(0, at)).trim();
  const steps = parsePath(path);
  if (!steps) throw new InputError('--free', `"${path}" is not a scenario path (e.g. rails.inductanceGradient, bank[0].esr)`);
  const dimension = dimensionOfPath(path);
  const pattern = path.replace(/\[\d+\]/g, '[n]');
  const inert = inertPathProblem(scenario, path);
  if (inert) throw new InputError('--free', `${path} ${inert}`);
  if (path.startsWith('solver.')) throw new InputError('--free', `${path} is a solver setting, not a model parameter`);
  if (scenario.load && /^(rails|armature|friction|drag)\./.test(path)) {
    throw new InputError('--free', `${path} is a launch parameter, but the scenario fires into a shorted load (a ring-down); fit bank[n].inductance, bank[n].resistance, bank[n].esr, feed.inductance, feed.resistance or load.inductance, load.resistance`);
  }
  if (!scenario.load && path.startsWith('load.')) throw new InputError('--free', `${path} belongs to a ring-down into a shorted load, and this scenario is a launch (it has no load section)`);
  if (!dimension || !fittablePaths().includes(pattern)) {
    if (fieldAt(path)?.kind === 'integer') throw new InputError('--free', `${path} is a whole number; a fit varies continuous quantities only`);
    if (pattern.endsWith('ratedReversal')) throw new InputError('--free', `${path} is a rating for the checks and does not change the shot, so it cannot be fitted`);
    const index = /\[(\d+)\]/.exec(path)?.[1] ?? '0';
    const hint = didYouMean(pattern, fittablePaths());
    throw new InputError('--free', `unknown parameter "${path}"${hint ? ` (did you mean "${hint.replace(/\[n\]/g, `[${index}]`)}"?)` : ''}`);
  }
  try {
    getScenarioPath(scenario, path);
  } catch (error) {
    if (error instanceof InputError) throw new InputError('--free', `${path}: the scenario has no such value (${error.problem})`);
    throw error;
  }
  if (/^friction\.(coefficient|staticCoefficient)$/.test(path) && scenario.friction.preload === 0 && scenario.friction.magneticLoading === 0) {
    // F_f = μ(F_N0 + k_N I²) (model contract §2): with no normal force μ changes nothing the data could show
    throw new InputError('--free', `${path} has no effect in this scenario: the contact normal force is zero (give friction.preload or friction.magneticLoading)`);
  }
  if (at < 0) return { path };
  const bounds = text.slice(at + 1).split(':');
  if (bounds.length !== 2) throw new InputError('--free', `${text}: expected PATH=LOWER:UPPER, e.g. ${path}=${example(dimension)}`);
  const read = (side: 'lower' | 'upper', value: string): number | undefined => {
    if (value.trim() === '') return undefined;
    try {
      return toSI(value.trim(), dimension);
    } catch (error) {
      if (error instanceof QuantityError) throw new InputError('--free', `${path}: ${side} bound: ${error.message}`);
      throw error;
    }
  };
  const lower = read('lower', bounds[0]!);
  const upper = read('upper', bounds[1]!);
  if (lower !== undefined && upper !== undefined && !(lower < upper)) {
    throw new InputError('--free', `${path}: the lower bound ${bounds[0]!.trim()} must be below the upper bound ${bounds[1]!.trim()}`);
  }
  return { path, ...(lower !== undefined ? { lower } : {}), ...(upper !== undefined ? { upper } : {}) };
}

function example(dimension: Dimension): string {
  return dimension.si === '' ? '0:0.5' : `1${dimension.si}:2${dimension.si}`;
}

export function parseFreeList(list: string[] | undefined, scenario: Scenario): FreeParameter[] {
  if (!list || list.length === 0) throw new InputError('--free', 'name at least one parameter to fit, e.g. --free rails.inductanceGradient');
  const free = list.map((text) => parseFree(text, scenario));
  const seen = new Set<string>();
  for (const f of free) {
    if (seen.has(f.path)) throw new InputError('--free', `${f.path} is given twice`);
    seen.add(f.path);
  }
  return free;
}

const GROUPS: ResidualGroup[] = ['I', 'V_breech', 'V_muzzle', 'position', 'muzzleVelocity'];

/** `--weight SIGNAL=W`: a plain factor ≥ 0 per residual group; 0 leaves the group out of the fit. */
export function parseWeights(list: string[] | undefined): Partial<Record<ResidualGroup, number>> {
  const out: Partial<Record<ResidualGroup, number>> = {};
  for (const [key, value] of Object.entries(pairs('--weight', list, 'SIGNAL=W, e.g. --weight V_breech=0.5'))) {
    if (!(GROUPS as string[]).includes(key)) throw new InputError('--weight', `"${key}" is not a signal; expected one of ${GROUPS.join(', ')}`);
    const weight = Number(value);
    if (!PLAIN_NUMBER.test(value) || !(weight >= 0) || !Number.isFinite(weight)) throw new InputError('--weight', `${key}=${value}: expected a number ≥ 0 (0 leaves ${key} out)`);
    out[key as ResidualGroup] = weight;
  }
  return out;
}

const NOISE_KEYS: Record<string, { key: keyof FitNoise; dimension: Dimension }> = {
  I: { key: 'I', dimension: DIMENSIONS.current },
  V_breech: { key: 'V_breech', dimension: DIMENSIONS.voltage },
  V_muzzle: { key: 'V_muzzle', dimension: DIMENSIONS.voltage },
  position: { key: 'arrivalTime', dimension: DIMENSIONS.time },
  arrivalTime: { key: 'arrivalTime', dimension: DIMENSIONS.time },
  muzzleVelocity: { key: 'muzzleVelocity', dimension: DIMENSIONS.velocity },
};

/** `--noise SIGNAL=VALUE` with units: one standard deviation of the measurement noise. */
export function parseNoise(list: string[] | undefined): FitNoise {
  const out: FitNoise = {};
  for (const [key, value] of Object.entries(pairs('--noise', list, 'SIGNAL=VALUE, e.g. --noise I=200A'))) {
    const entry = NOISE_KEYS[key];
    if (!entry) throw new InputError('--noise', `"${key}" is not a signal; expected one of ${Object.keys(NOISE_KEYS).join(', ')}`);
    const sigma = quantityOption('--noise', value, entry.dimension);
    if (!(sigma > 0)) throw new InputError('--noise', `${key}=${value}: the noise must be above zero`);
    out[entry.key] = sigma;
  }
  return out;
}
