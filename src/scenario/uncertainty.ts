/**
 * The scenario's uncertainty sections, read after the rest of the scenario (they refer to its values):
 *
 *   "tolerances": [
 *     { "path": "bank[*].capacitance", "uniform": "5 %" },            ±5 % of the value, uniform, each group its own draw
 *     { "path": "bank[*].voltage", "normal": "20 V", "common": true }, σ 20 V, one draw for every group (one charger)
 *     { "path": "armature.mass", "normal": "0.05 g" }
 *   ],
 *   "calibration": { "parameters": [...paths], "values": [...SI], "covariance": [[...SI]], "record": "shot-17.csv",
 *                    "recordSha256": "…", "date": "2026-03-04T10:00:00Z", "scenario": "bench.json",
 *                    "chiSquaredReduced": 1.04, "onBound": [] }     (written by `railpulse fit`)
 *
 * A spread is a quantity of the path's dimension (or a plain SI number), or a percentage of the value ("5 %",
 * "±5 %"); for a dimensionless value "%" still means a fraction of the value, a plain number an absolute spread.
 * Uniform ±a has a standard uncertainty a/√3; normal has σ as given.
 *
 * Checks (each failure one InputError naming the path): known keys; a path that is a model parameter of this
 * scenario (not a solver setting, a count, a rating or a geometry input, which is turned into L′ and R′ when the
 * file is read); exactly one of uniform/normal; a spread > 0; no value moved by two entries; `common` only with
 * bank[*]; the value stays inside the model's valid range over ±a (uniform) or ±4σ (normal). The calibration:
 * unique parameter paths, values equal to the scenario's own, an n×n covariance that is symmetric and positive
 * semi-definite, a record name, a 64-digit SHA-256 and an ISO date. A tolerance on a calibrated value is
 * contradictory (the calibration gives its uncertainty); a bank[*] tolerance leaves a calibrated group to the
 * calibration.
 */
import { InputError } from '../core/errors.js';
import { symmetricEigen } from '../core/eigen.js';
import { QuantityError, toSI } from '../units/quantity.js';
import { fieldAt, quantityPaths } from './fields.js';
import { getPath, inertPathProblem, parsePath, setPath } from './paths.js';
import { didYouMean } from './suggest.js';
import type { Calibration, Scenario, Tolerance, UncertainTarget } from './types.js';
import { validateScenario } from './validate.js';

type Raw = Record<string, unknown>;

const TOLERANCE_KEYS = ['path', 'uniform', 'normal', 'common'];
const CALIBRATION_KEYS = ['parameters', 'values', 'covariance', 'record', 'recordSha256', 'date', 'scenario', 'chiSquaredReduced', 'onBound'];
/** how far a normal spread must stay inside the valid range, in σ */
export const NORMAL_REACH = 4;

function describe(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'object') return 'an object';
  return JSON.stringify(value);
}

function checkKeys(object: Raw, known: string[], where: string, file?: string): void {
  for (const key of Object.keys(object)) {
    if (known.includes(key)) continue;
    const hint = didYouMean(key, known);
    throw new InputError(`${where}.${key}`, `unknown key${hint ? ` (did you mean "${hint}"?)` : ''}; expected one of ${known.join(', ')}`, file);
  }
}

/**
 * Why a path cannot carry an uncertainty in this scenario, or null when it can. Only values the model reads
 * directly qualify: changing them changes the shot.
 */
export function uncertainPathProblem(scenario: Scenario, path: string): string | null {
  const steps = parsePath(path);
  if (!steps) return 'expected a scenario path such as bank[0].capacitance or rails.inductanceGradient';
  const field = fieldAt(path);
  const inert = inertPathProblem(scenario, path);
  if (inert) return inert;
  if (path.startsWith('solver.')) return 'is a solver setting, not a model parameter';
  if (field?.kind === 'integer') return 'is a whole number (a module count); give tolerances on continuous values';
  if (/\.geometry\./.test(path)) return 'is a geometry input, turned into the model values when the file is read; give the tolerance on rails.inductanceGradient, rails.resistanceGradient (a constant R′), armature.mass or armature.resistance';
  if (path.endsWith('ratedReversal')) return 'is a rating for the checks and does not change the shot';
  if (field?.kind !== 'quantity') {
    const pattern = path.replace(/\[\d+\]/g, '[n]');
    const hint = didYouMean(pattern, quantityPaths());
    const index = /\[(\d+)\]/.exec(path)?.[1] ?? '0';
    return `is not a model parameter of the scenario format${hint ? ` (did you mean ${hint.replace(/\[n\]/g, `[${index}]`)}?)` : ''}`;
  }
  const value = getPath(scenario, steps);
  if (typeof value !== 'number') {
    const index = steps[1];
    if (steps[0] === 'bank' && typeof index === 'number' && index >= scenario.bank.length) return `the bank has ${scenario.bank.length} group(s) (bank[0]…bank[${scenario.bank.length - 1}])`;
    return 'the scenario has no such value (its section is absent)';
  }
  return null;
}

/** Values whose default follows `path` and that the file left to that default (they move with it). */
function followersOf(path: string, raw: Raw): string[] {
  if (path !== 'friction.coefficient') return [];
  const friction = raw.friction;
  const written = typeof friction === 'object' && friction !== null && 'staticCoefficient' in friction;
  return written ? [] : ['friction.staticCoefficient'];
}

const PERCENT = /^\s*(?:±|\+\/-)?\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*%\s*$/;

function readSpread(value: unknown, path: string, where: string, file?: string): { spread: number; relative: boolean } {
  let spread: number;
  let relative = false;
  const percent = typeof value === 'string' ? PERCENT.exec(value) : null;
  if (percent) {
    spread = Number(percent[1]) / 100;
    relative = true;
  } else {
    const dimension = fieldAt(path.replace('[*]', '[0]'));
    if (dimension?.kind !== 'quantity') throw new InputError(where, 'the path is not a quantity', file);
    const text = typeof value === 'string' ? value.replace(/^\s*(±|\+\/-)\s*/, '') : value;
    try {
      spread = toSI(text, dimension.dimension);
    } catch (error) {
      if (error instanceof QuantityError) throw new InputError(where, `${error.message}, or a percentage of the value such as "5 %"`, file);
      throw error;
    }
  }
  if (!(spread > 0) || !Number.isFinite(spread)) throw new InputError(where, `expected a spread > 0, got ${describe(value)}`, file);
  return { spread, relative };
}

/** The concrete paths of a written path: `bank[*].x` → bank[0].x … bank[G−1].x. */
function expand(path: string, groups: number): string[] {
  if (!path.includes('[*]')) return [path];
  return Array.from({ length: groups }, (_, g) => path.replace('[*]', `[${g}]`));
}

function readTolerance(entry: unknown, where: string, scenario: Scenario, raw: Raw, calibrated: Map<string, number>, file?: string): Tolerance {
  if (typeof entry !== 'object' || entry === null || Array.isArray(entry)) throw new InputError(where, `expected an object such as { "path": "bank[0].capacitance", "uniform": "5 %" }, got ${describe(entry)}`, file);
  const object = entry as Raw;
  checkKeys(object, TOLERANCE_KEYS, where, file);
  const path = object.path;
  if (typeof path !== 'string' || path.trim() === '') throw new InputError(`${where}.path`, `expected a scenario path such as "bank[0].capacitance", got ${describe(path)}`, file);
  const wildcard = path.includes('[*]');
  if (wildcard && !/^bank\[\*\]\.[^*]+$/.test(path)) throw new InputError(`${where}.path`, `only bank[*] may stand for every group, got "${path}"`, file);
  const concrete = expand(path, scenario.bank.length);
  for (const target of concrete) {
    const problem = uncertainPathProblem(scenario, target);
    if (problem) throw new InputError(`${where}.path`, `${target}: ${problem}`, file);
  }
  const given = (['uniform', 'normal'] as const).filter((key) => object[key] !== undefined);
  if (given.length !== 1) throw new InputError(where, `give exactly one of "uniform" (half-width: ±a) or "normal" (σ), got ${given.length === 0 ? 'neither' : 'both'}`, file);
  const distribution = given[0]!;
  const { spread, relative } = readSpread(object[distribution], path, `${where}.${distribution}`, file);
  const common = object.common ?? false;
  if (typeof common !== 'boolean') throw new InputError(`${where}.common`, `expected true or false, got ${describe(common)}`, file);
  if (common && !wildcard) throw new InputError(`${where}.common`, `only applies to a bank[*] path (one draw for every group), but the path is ${path}`, file);
  const targets: UncertainTarget[] = [];
  for (const target of concrete) {
    const index = calibrated.get(target);
    if (index === undefined) {
      targets.push({ path: target, follows: followersOf(target, raw) });
    } else if (!wildcard) {
      throw new InputError(`${where}.path`, `${target} is calibrated (calibration.parameters[${index}]), so its uncertainty comes from the calibration's covariance; remove the tolerance or the calibration`, file);
    }
  }
  if (targets.length === 0) throw new InputError(`${where}.path`, `every value of ${path} is calibrated, so its uncertainty comes from the calibration; remove the tolerance`, file);
  return { where, path, distribution, spread, relative, common, targets };
}

/** The value must stay inside the model's valid range over the spread: ±a uniform, ±4σ normal. */
function checkReach(tolerance: Tolerance, scenario: Scenario, file?: string): void {
  const reach = tolerance.distribution === 'uniform' ? 1 : NORMAL_REACH;
  const label = tolerance.distribution === 'uniform' ? 'a' : `${NORMAL_REACH}σ`;
  for (const target of tolerance.targets) {
    const nominal = getPath(scenario, parsePath(target.path)!) as number;
    const spread = tolerance.relative ? tolerance.spread * Math.abs(nominal) : tolerance.spread;
    if (tolerance.relative && nominal === 0) throw new InputError(`${tolerance.where}.${tolerance.distribution}`, `${target.path} is 0, so a percentage of it is no spread; give an absolute spread`, file);
    for (const sign of [-1, 1]) {
      const value = nominal + sign * reach * spread;
      const probe = structuredClone(scenario);
      for (const path of [target.path, ...target.follows]) setPath(probe, parsePath(path)!, (getPath(scenario, parsePath(path)!) as number) + sign * reach * spread);
      try {
        validateScenario(probe);
      } catch (error) {
        if (!(error instanceof InputError)) throw error;
        throw new InputError(`${tolerance.where}.${tolerance.distribution}`, `${target.path} at its nominal ${sign < 0 ? '−' : '+'} ${label} (${Number(value.toPrecision(4))} in SI) leaves the model's valid range (${error.message}); a spread must stay inside it`, file);
      }
    }
  }
}

function numberList(value: unknown, where: string, length: number | null, file?: string): number[] {
  if (!Array.isArray(value)) throw new InputError(where, `expected an array of numbers, got ${describe(value)}`, file);
  if (length !== null && value.length !== length) throw new InputError(where, `expected ${length} number(s), one a parameter, got ${value.length}`, file);
  return value.map((item, i) => {
    if (typeof item !== 'number' || !Number.isFinite(item)) throw new InputError(`${where}[${i}]`, `expected a finite number (SI), got ${describe(item)}`, file);
    return item;
  });
}

function textKey(object: Raw, key: string, where: string, required: boolean, file?: string): string | undefined {
  const value = object[key];
  if (value === undefined && !required) return undefined;
  if (typeof value !== 'string' || value.trim() === '') throw new InputError(`${where}.${key}`, `expected a text string, got ${value === undefined ? 'nothing (missing required key)' : describe(value)}`, file);
  return value;
}

function pathList(value: unknown, where: string, scenario: Scenario, file?: string): string[] {
  if (!Array.isArray(value)) throw new InputError(where, `expected an array of scenario paths, got ${describe(value)}`, file);
  const seen = new Map<string, number>();
  return value.map((path, i) => {
    if (typeof path !== 'string') throw new InputError(`${where}[${i}]`, `expected a scenario path, got ${describe(path)}`, file);
    const problem = uncertainPathProblem(scenario, path);
    if (problem) throw new InputError(`${where}[${i}]`, `${path}: ${problem}`, file);
    if (seen.has(path)) throw new InputError(`${where}[${i}]`, `${path} is already ${where}[${seen.get(path)}]`, file);
    seen.set(path, i);
    return path;
  });
}

/** Symmetric to rounding and positive semi-definite (eigenvalues of the correlation matrix ≥ −1e-9). */
function checkCovariance(covariance: number[][], where: string, file?: string): void {
  const n = covariance.length;
  const sigma = covariance.map((row, i) => {
    if (row[i]! < 0) throw new InputError(`${where}[${i}][${i}]`, `a variance must be ≥ 0, got ${row[i]}`, file);
    return Math.sqrt(row[i]!);
  });
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const a = covariance[i]![j]!;
      const b = covariance[j]![i]!;
      const scale = sigma[i]! * sigma[j]!;
      if (Math.abs(a - b) > 1e-9 * Math.max(scale, Math.abs(a), Math.abs(b))) {
        throw new InputError(`${where}[${i}][${j}]`, `the covariance must be symmetric: ${a} here but ${b} at [${j}][${i}]`, file);
      }
      if (scale === 0 && a !== 0) throw new InputError(`${where}[${i}][${j}]`, `a parameter with zero variance cannot covary with another, got ${a}; the matrix is not positive semi-definite`, file);
    }
  }
  const correlation = covariance.map((row, i) => row.map((c, j) => (sigma[i]! > 0 && sigma[j]! > 0 ? c / (sigma[i]! * sigma[j]!) : i === j ? 1 : 0)));
  const smallest = Math.min(...symmetricEigen(correlation).values);
  if (smallest < -1e-9) {
    throw new InputError(where, `the covariance is not positive semi-definite (its correlation matrix has an eigenvalue ${smallest.toPrecision(3)} < 0; e.g. a correlation beyond ±1, or three correlations that cannot hold together)`, file);
  }
}

function readCalibration(value: unknown, scenario: Scenario, raw: Raw, file?: string): Calibration {
  const where = 'calibration';
  if (typeof value !== 'object' || value === null || Array.isArray(value)) throw new InputError(where, `expected an object (as written by railpulse fit), got ${describe(value)}`, file);
  const object = value as Raw;
  checkKeys(object, CALIBRATION_KEYS, where, file);
  for (const key of ['parameters', 'values', 'covariance']) {
    if (object[key] === undefined) throw new InputError(`${where}.${key}`, 'missing required key', file);
  }
  const paths = pathList(object.parameters, `${where}.parameters`, scenario, file);
  if (paths.length === 0) throw new InputError(`${where}.parameters`, 'expected at least one calibrated parameter', file);
  const values = numberList(object.values, `${where}.values`, paths.length, file);
  values.forEach((fitted, i) => {
    const own = getPath(scenario, parsePath(paths[i]!)!) as number;
    if (Math.abs(own - fitted) > 1e-9 * Math.max(Math.abs(own), Math.abs(fitted))) {
      throw new InputError(`${where}.values[${i}]`, `${fitted} does not match ${paths[i]} = ${own} in the scenario: the calibration no longer describes it (re-fit, or remove the calibration)`, file);
    }
  });
  const rows = object.covariance;
  if (!Array.isArray(rows) || rows.length !== paths.length) throw new InputError(`${where}.covariance`, `expected a ${paths.length}×${paths.length} matrix (an array of ${paths.length} rows), got ${Array.isArray(rows) ? `${rows.length} row(s)` : describe(rows)}`, file);
  const covariance = rows.map((row, i) => numberList(row, `${where}.covariance[${i}]`, paths.length, file));
  checkCovariance(covariance, `${where}.covariance`, file);
  const record = textKey(object, 'record', where, true, file)!;
  const recordSha256 = textKey(object, 'recordSha256', where, true, file)!;
  if (!/^[0-9a-f]{64}$/i.test(recordSha256)) throw new InputError(`${where}.recordSha256`, `expected the record's SHA-256 as 64 hexadecimal digits, got ${describe(recordSha256)}`, file);
  const date = textKey(object, 'date', where, true, file)!;
  if (!/^\d{4}-\d{2}-\d{2}/.test(date) || Number.isNaN(Date.parse(date))) throw new InputError(`${where}.date`, `expected an ISO date such as 2026-03-04 or 2026-03-04T10:00:00Z, got ${describe(date)}`, file);
  const calibration: Calibration = {
    parameters: paths.map((path) => ({ path, follows: followersOf(path, raw) })),
    values,
    covariance,
    record,
    recordSha256: recordSha256.toLowerCase(),
    date,
    onBound: object.onBound === undefined ? [] : pathList(object.onBound, `${where}.onBound`, scenario, file),
  };
  const from = textKey(object, 'scenario', where, false, file);
  if (from !== undefined) calibration.scenario = from;
  if (object.chiSquaredReduced !== undefined) {
    const chi = object.chiSquaredReduced;
    if (typeof chi !== 'number' || !(chi >= 0)) throw new InputError(`${where}.chiSquaredReduced`, `expected a number ≥ 0, got ${describe(chi)}`, file);
    calibration.chiSquaredReduced = chi;
  }
  calibration.onBound.forEach((path, i) => {
    if (paths.includes(path)) throw new InputError(`${where}.onBound[${i}]`, `${path} is also a calibrated parameter with a covariance; a value on a bound has none`, file);
  });
  return calibration;
}

/** Read `tolerances` and `calibration` from the file as written into the (already loaded) scenario. */
export function readUncertaintySections(scenario: Scenario, raw: Raw, file?: string): void {
  if (raw.calibration !== undefined && raw.calibration !== null) scenario.calibration = readCalibration(raw.calibration, scenario, raw, file);
  const calibrated = new Map((scenario.calibration?.parameters ?? []).map((p, i) => [p.path, i]));
  if (raw.tolerances === undefined || raw.tolerances === null) return;
  if (!Array.isArray(raw.tolerances)) throw new InputError('tolerances', `expected an array of { "path", "uniform" | "normal" } entries, got ${describe(raw.tolerances)}`, file);
  const tolerances = raw.tolerances.map((entry, i) => readTolerance(entry, `tolerances[${i}]`, scenario, raw, calibrated, file));
  // a value moved by two entries (directly or as a follower) would get two uncertainties
  const owner = new Map<string, string>();
  for (const calibratedPath of scenario.calibration?.parameters ?? []) for (const path of [calibratedPath.path, ...calibratedPath.follows]) owner.set(path, 'the calibration');
  for (const tolerance of tolerances) {
    for (const target of tolerance.targets) {
      for (const path of [target.path, ...target.follows]) {
        const first = owner.get(path);
        if (first) throw new InputError(`${tolerance.where}.path`, `${path} is already moved by ${first}; give each value one tolerance`, file);
        owner.set(path, tolerance.where);
      }
    }
  }
  for (const tolerance of tolerances) checkReach(tolerance, scenario, file);
  if (tolerances.length > 0) scenario.tolerances = tolerances;
}
