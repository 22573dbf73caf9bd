/**
 * The optional `target` and `limits` keys of a scenario file, read for `railpulse size`:
 *
 *   "target": { "muzzleVelocity": "250 m/s" }            or { "kineticEnergy": "300 J" } (exactly one), and optionally
 *             "confidence": 0.95 (or "95 %"): with tolerances or a calibration, the probability the target must be met
 *             with (default 0.95 when the scenario carries either), and "tieBreak": "peakCurrent" (default) or "none":
 *             among designs of equal stored energy (within 0.1 %) prefer the lower peak current
 *   "limits": { "peakCurrent": "120 kA", "peakAcceleration": "2e6 m/s^2", "actionIntegral": "5e6 A^2 s",
 *               "reversal": 0.2, "chargeVoltage": "10 kV", "modulesPerGroup": 8 }   (all optional)
 *
 * `limits` also holds the engineering-check thresholds (src/scenario/limits.ts), which the loader reads; here
 * they are passed over.
 */
import { createHash } from 'node:crypto';
import { InputError } from '../core/errors.js';
import { parseJson, scenarioFromRaw } from '../scenario/load.js';
import { readScenarioSource } from '../scenario/source.js';
import { didYouMean } from '../scenario/suggest.js';
import type { Scenario } from '../scenario/types.js';
import { DIMENSIONS, QuantityError, toSI, type Dimension } from '../units/quantity.js';
import type { SizingLimits, SizingTarget } from './size.js';
import { LIMIT_SOURCES } from '../scenario/limits.js';

const ACTION: Dimension = { si: 'A^2 s', noun: 'an action integral (A²·s)', display: 'A²·s' };

const TARGET_KEYS: Record<'muzzleVelocity' | 'kineticEnergy', Dimension> = {
  muzzleVelocity: DIMENSIONS.velocity,
  kineticEnergy: DIMENSIONS.energy,
};

const LIMIT_KEYS: Record<Exclude<keyof SizingLimits, 'modulesPerGroup'>, Dimension> = {
  peakCurrent: DIMENSIONS.current,
  peakAcceleration: DIMENSIONS.acceleration,
  actionIntegral: ACTION,
  reversal: DIMENSIONS.dimensionless,
  chargeVoltage: DIMENSIONS.voltage,
};

export interface SizingInput {
  scenario: Scenario;
  raw: Record<string, unknown>;
  sha256: string;
  target: SizingTarget;
  limits: SizingLimits;
}

function section(raw: Record<string, unknown>, key: string, file: string): Record<string, unknown> | undefined {
  const value = raw[key];
  if (value === undefined) return undefined;
  if (typeof value !== 'object' || value === null || Array.isArray(value)) throw new InputError(key, 'expected an object', file);
  return value as Record<string, unknown>;
}

function readQuantities<K extends string>(values: Record<string, unknown>, keys: Record<K, Dimension>, where: string, file: string, extra: string[] = []): Partial<Record<K, number>> {
  const known = [...Object.keys(keys), ...extra];
  const out: Partial<Record<K, number>> = {};
  for (const [key, value] of Object.entries(values)) {
    if (!known.includes(key)) {
      const hint = didYouMean(key, known);
      throw new InputError(`${where}.${key}`, `unknown key${hint ? ` (did you mean ${hint}?)` : ''}; expected one of ${known.join(', ')}`, file);
    }
    if (extra.includes(key)) continue;
    try {
      const si = toSI(value, keys[key as K]);
      if (!(si > 0)) throw new QuantityError(`expected a value > 0, got ${JSON.stringify(value)}`);
      out[key as K] = si;
    } catch (error) {
      if (error instanceof QuantityError) throw new InputError(`${where}.${key}`, error.message, file);
      throw error;
    }
  }
  return out;
}

/** `confidence`: a probability strictly between 0 and 1, as a number or a percentage. */
function readConfidence(value: unknown, file: string): number {
  const percent = typeof value === 'string' ? /^\s*([0-9.]+(?:[eE][-+]?\d+)?)\s*%\s*$/.exec(value) : null;
  const confidence = percent ? Number(percent[1]) / 100 : value;
  if (typeof confidence !== 'number' || !(confidence > 0 && confidence < 1)) {
    throw new InputError('target.confidence', `expected a probability between 0 and 1 (exclusive), e.g. 0.95 or "95 %", got ${JSON.stringify(value)}`, file);
  }
  return confidence;
}

/** The scenario's `target` section, or undefined when it has none. */
export function readTarget(raw: Record<string, unknown>, file: string): SizingTarget | undefined {
  const targetRaw = section(raw, 'target', file);
  if (!targetRaw) return undefined;
  const target: SizingTarget = readQuantities(targetRaw, TARGET_KEYS, 'target', file, ['confidence', 'tieBreak']);
  if ((target.muzzleVelocity === undefined) === (target.kineticEnergy === undefined)) {
    throw new InputError('target', 'give exactly one of muzzleVelocity or kineticEnergy', file);
  }
  if (targetRaw.confidence !== undefined) target.confidence = readConfidence(targetRaw.confidence, file);
  if (targetRaw.tieBreak !== undefined) {
    if (targetRaw.tieBreak !== 'peakCurrent' && targetRaw.tieBreak !== 'none') {
      throw new InputError('target.tieBreak', `expected "peakCurrent" or "none", got ${JSON.stringify(targetRaw.tieBreak)}`, file);
    }
    target.tieBreak = targetRaw.tieBreak;
  }
  return target;
}

export function readSizingInput(file: string): SizingInput {
  const source = readScenarioSource(file);
  const raw = parseJson(source, file);
  const target = readTarget(raw, file);
  const limitsRaw = section(raw, 'limits', file) ?? {};
  if (!target) throw new InputError('target', 'size needs a target in the scenario, e.g. "target": { "muzzleVelocity": "250 m/s" }', file);
  const checkKeys = Object.keys(LIMIT_SOURCES).filter((key) => !(key in LIMIT_KEYS));
  const limits: SizingLimits = readQuantities(limitsRaw, LIMIT_KEYS, 'limits', file, ['modulesPerGroup', ...checkKeys]);
  if (limitsRaw.modulesPerGroup !== undefined) {
    const count = limitsRaw.modulesPerGroup;
    if (typeof count !== 'number' || !Number.isInteger(count) || count < 1 || count > 1000) {
      throw new InputError('limits.modulesPerGroup', `expected a whole number from 1 to 1000, got ${JSON.stringify(count)}`, file);
    }
    limits.modulesPerGroup = count;
  }
  const scenario = scenarioFromRaw(raw, file);
  scenario.calibration?.parameters.forEach((parameter, i) => {
    if (/^bank\[\d+\]\.(voltage|trigger)$/.test(parameter.path)) {
      throw new InputError(`calibration.parameters[${i}]`, `size sets every charge voltage and trigger time, so a calibration of ${parameter.path} cannot carry over to the sized design; remove it from the calibration`, file);
    }
  });
  return { scenario, raw, sha256: createHash('sha256').update(source).digest('hex'), target, limits };
}
