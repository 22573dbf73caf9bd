/**
 * Thresholds of the engineering checks, with their defaults and where each comes from. A scenario may
 * override any of them under `limits` (SI numbers after unit parsing; LIMIT_DIMENSIONS tells the loader
 * which dimension each key has).
 */
import { InputError } from '../core/errors.js';
import type { Dimension } from '../units/quantity.js';

export interface EngineeringLimits {
  /** fraction of the action to melting at which the armature check warns */
  actionWarnFraction: number;
  /** fraction of the temperature rise to melting at which the rail check warns */
  railHeatingWarnFraction: number;
  /** peak current per rail height (A/m) from which the check warns */
  linearCurrentDensityWarn: number;
  /** … and from which it fails */
  linearCurrentDensityFail: number;
  /** contact force wanted per ampere of peak current (N/A) */
  contactForcePerAmpere: number;
  /** containment rating (N/m); none by default */
  railSeparatingForcePerLength?: number;
  /** payload acceleration limit (m/s²); none by default */
  peakAcceleration?: number;
  /** capacitor voltage reversal rating, fraction of the charge voltage */
  ratedReversal: number;
  /** V at and above which stored energy is a shock hazard */
  shockVoltage: number;
  /** J at and above which a bank at shockVoltage or more is a shock hazard */
  shockEnergy: number;
  /** J above which a bank below shockVoltage is a thermal hazard */
  thermalEnergy: number;
  /** J at and above which a bank at shockVoltage or more is an arc-flash hazard */
  arcFlashEnergy: number;
}

export const DEFAULT_LIMITS: EngineeringLimits = {
  actionWarnFraction: 0.8,
  railHeatingWarnFraction: 0.5,
  linearCurrentDensityWarn: 40e6,
  linearCurrentDensityFail: 50e6,
  contactForcePerAmpere: 9.80665e-3,
  ratedReversal: 0.2,
  shockVoltage: 100,
  shockEnergy: 10,
  thermalEnergy: 100,
  arcFlashEnergy: 10e3,
};

const DOE = 'published: DOE-HDBK-1092 capacitor hazard classes, as used in national-laboratory electrical safety manuals';

export const LIMIT_SOURCES: Record<keyof EngineeringLimits, string> = {
  actionWarnFraction: 'design margin chosen here, not a published value',
  railHeatingWarnFraction: 'design margin chosen here, not a published value (copper softens far below melting)',
  linearCurrentDensityWarn: 'common practice, from memory (medium): solid-armature guns with copper rails are kept below about 40–50 kA per mm of rail height',
  linearCurrentDensityFail: 'common practice, from memory (medium): upper end of the 40–50 kA/mm band',
  contactForcePerAmpere: 'common practice: about 1 gram-force of total contact force per ampere of peak current for solid armatures, a rule of the trade with no single published source',
  railSeparatingForcePerLength: 'containment rating given in the scenario',
  peakAcceleration: 'payload limit given in the scenario',
  ratedReversal: 'common practice: pulse-discharge capacitors are commonly rated for 10–20 % reversal',
  shockVoltage: DOE,
  shockEnergy: DOE,
  thermalEnergy: DOE,
  arcFlashEnergy: DOE,
};

// Written out (same shape as DIMENSIONS in src/units/quantity.ts) so that the checks do not load mathjs.
const dim = (si: string, noun: string, display = si): Dimension => ({ si, noun, display });
const FRACTION = dim('', 'a plain number');
const LINEAR_CURRENT_DENSITY = dim('A/m', 'a current per length (A/m)');
const ENERGY = dim('J', 'an energy (J)');

/** The dimension of each threshold, for toSI when the loader reads `limits` (N/m is not in DIMENSIONS). */
export const LIMIT_DIMENSIONS: Record<keyof EngineeringLimits, Dimension> = {
  actionWarnFraction: FRACTION,
  railHeatingWarnFraction: FRACTION,
  linearCurrentDensityWarn: LINEAR_CURRENT_DENSITY,
  linearCurrentDensityFail: LINEAR_CURRENT_DENSITY,
  contactForcePerAmpere: dim('N/A', 'a force per current (N/A)'),
  railSeparatingForcePerLength: dim('N/m', 'a force per length (N/m)'),
  peakAcceleration: dim('m/s^2', 'an acceleration (m/s²)', 'm/s²'),
  ratedReversal: FRACTION,
  shockVoltage: dim('V', 'a voltage (V)'),
  shockEnergy: ENERGY,
  thermalEnergy: ENERGY,
  arcFlashEnergy: ENERGY,
};

/**
 * Check a scenario's `limits` object (values already SI numbers): known keys, positive finite numbers,
 * fractions within (0, 1], the fail band above the warn band.
 */
export function validateLimits(raw: unknown, path = 'limits'): Partial<EngineeringLimits> {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) throw new InputError(path, 'expected an object of thresholds');
  const out: Partial<EngineeringLimits> = {};
  for (const [key, value] of Object.entries(raw as Record<string, unknown>)) {
    if (!Object.hasOwn(LIMIT_SOURCES, key)) throw new InputError(`${path}.${key}`, `unknown threshold; known: ${Object.keys(LIMIT_SOURCES).join(', ')}`);
    if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0)
      throw new InputError(`${path}.${key}`, `expected a number greater than 0, got ${JSON.stringify(value)}`);
    if (key.endsWith('Fraction') && value > 1) throw new InputError(`${path}.${key}`, `expected a fraction within 0…1, got ${value}`);
    out[key as keyof EngineeringLimits] = value;
  }
  const merged = { ...DEFAULT_LIMITS, ...out };
  if (merged.linearCurrentDensityFail < merged.linearCurrentDensityWarn)
    throw new InputError(`${path}.linearCurrentDensityFail`, `expected at least linearCurrentDensityWarn (${merged.linearCurrentDensityWarn} A/m)`);
  return out;
}
