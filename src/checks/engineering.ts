/**
 * Engineering checks of a shot: each compares one figure with a limit in a stated direction (the figure must stay
 * at most, or at least, the limit) and says where the limit comes from. Verdicts are advice for a designer, not
 * certification. A check whose inputs are absent (no armature cross-section, no rail geometry, …) is left out
 * rather than passed; a figure with no limit to judge it against is "info". The capacitor hazard classes are
 * classes, never passed: a bank in a class warns, one below every threshold is "info".
 */
import type { ShotResults } from '../solve/types.js';
import { formatPercent, formatQuantity, GN, STANDARD_GRAVITY } from '../units/format.js';
import { fusionAction, meltingAction, temperatureAfterAction, DEFAULT_AMBIENT } from '../conductors/heating.js';
import { inductanceGradientOf, type RailGeometry } from '../conductors/inductance.js';
import type { Material } from '../conductors/materials.js';
import { currentCarryingArea, penetrationDepth } from '../conductors/resistance.js';
import { DEFAULT_LIMITS, LIMIT_SOURCES, type EngineeringLimits } from '../scenario/limits.js';
import { bankHazard, HAZARD_CLASS_NAMES, HAZARD_SOURCE, SAFETY_CAUTION, type HazardClass } from './hazard.js';

/** "info": a figure shown with no limit to judge it by (no payload limit given; a bank below every hazard class). */
export type Verdict = 'pass' | 'warn' | 'fail' | 'info';

/** How a figure is judged: it must stay at most (≤) or at least (≥) its limit. */
export type CheckDirection = 'at-most' | 'at-least';

export interface Check {
  id: string;
  title: string;
  verdict: Verdict;
  /** the figure checked (SI, in `unit`) */
  value: number;
  /**
   * the boundary it is judged against (SI, in `unit`): crossing it gives the check's worst verdict (fail, or warn
   * for a check that only warns); null when there is none
   */
  limit: number | null;
  /** at-most: the figure passes while ≤ limit; at-least: while ≥ limit; null for a hazard class (a classification) */
  direction: CheckDirection | null;
  /** where a banded check starts to warn, before it fails at `limit` */
  warnAt?: number;
  /** for the capacitor hazard checks: the class the bank is in, or null below the class's threshold */
  hazardClass?: HazardClass | null;
  unit: string;
  source: string;
  note?: string;
}

/** What the checks read. Every optional part switches its checks on. */
export interface EngineeringInput {
  results: ShotResults;
  /** per group, per module values as in the scenario */
  bank: ReadonlyArray<{ label: string; count: number; capacitance: number; voltage: number; ratedReversal?: number }>;
  rails?: {
    geometry?: RailGeometry;
    material?: Material;
    /** τ for current penetration into the rails (s); default the shot's time to peak current */
    characteristicTime?: number;
  };
  armature?: {
    /** cross-section the current crosses (m²), e.g. deriveArmature(...).currentArea */
    currentArea?: number;
    material?: Material;
  };
  /** contact normal force model of a solid armature (omit for a plasma armature) */
  contact?: { preload: number; magneticLoading: number };
  /** °C, default 20 */
  ambientTemperature?: number;
  limits?: Partial<EngineeringLimits>;
}

const MU0 = 4e-7 * Math.PI;

export function engineeringChecks(input: EngineeringInput): Check[] {
  const limits: EngineeringLimits = { ...DEFAULT_LIMITS, ...input.limits };
  const ambient = input.ambientTemperature ?? DEFAULT_AMBIENT;
  return [
    ...armatureAction(input, limits, ambient),
    ...railHeating(input, limits, ambient),
    ...linearCurrentDensity(input, limits),
    ...contactForce(input, limits),
    ...railSeparatingForce(input, limits),
    peakAcceleration(input, limits),
    ...capacitorReversal(input, limits),
    ...capacitorHazards(input, limits),
  ];
}

/** warn at or above warnAt, fail at or above failAt */
export function band(value: number, warnAt: number, failAt: number): Verdict {
  return value >= failAt ? 'fail' : value >= warnAt ? 'warn' : 'pass';
}

function armatureAction(input: EngineeringInput, limits: EngineeringLimits, ambient: number): Check[] {
  const area = input.armature?.currentArea;
  const material = input.armature?.material;
  if (area === undefined || material === undefined) return [];
  const value = input.results.actionIntegral / (area * area);
  const limit = meltingAction(material, ambient);
  return [
    {
      id: 'armature-action',
      title: `Armature specific action (${material.name})`,
      verdict: band(value, limits.actionWarnFraction * limit, limit),
      value,
      limit,
      direction: 'at-most',
      warnAt: limits.actionWarnFraction * limit,
      unit: 'A²·s/m⁴',
      source: `adiabatic action to the onset of melting, g = γc/(ρ0α)·ln(1 + αΔT) [derived; agrees with Onderdonk's equation for copper]; warning at ${limits.actionWarnFraction} of it [${LIMIT_SOURCES.actionWarnFraction}]`,
      note: `${formatPercent(value / limit)} of the action to melting from ${formatQuantity(ambient, '°C')}; melting through would take a further ${formatQuantity(fusionAction(material), 'A²·s/m⁴')} (latent heat, shown for information). Current crowding at the armature's rear edge heats some parts faster than this average.`,
    },
  ];
}

function railHeatingTime(input: EngineeringInput): number {
  const given = input.rails?.characteristicTime;
  if (given !== undefined) return given;
  return input.results.peakCurrentTime > 0 ? input.results.peakCurrentTime : (input.results.exitTime ?? 0);
}

function railHeating(input: EngineeringInput, limits: EngineeringLimits, ambient: number): Check[] {
  const geometry = input.rails?.geometry;
  const material = input.rails?.material;
  const time = railHeatingTime(input);
  if (geometry === undefined || material === undefined || !(time > 0)) return [];
  const area = currentCarryingArea(geometry, material.resistivity, time);
  const temperature = temperatureAfterAction(material, input.results.actionIntegral / (area * area), ambient);
  const value = temperature - ambient;
  const limit = material.meltingTemperature - ambient;
  return [
    {
      id: 'rail-heating',
      title: `Rail temperature rise at the breech (${material.name})`,
      verdict: band(value, limits.railHeatingWarnFraction * limit, limit),
      value,
      limit,
      direction: 'at-most',
      warnAt: limits.railHeatingWarnFraction * limit,
      unit: 'K',
      source: `adiabatic heating by the whole action integral through a layer √(2πρτ/μ0) = ${formatQuantity(penetrationDepth(material.resistivity, time), 'm')} deep behind the inner face (at most the rail), τ = ${formatQuantity(time, 's')} [derived]; limit: rise to melting; warning at ${limits.railHeatingWarnFraction} of it [${LIMIT_SOURCES.railHeatingWarnFraction}]`,
      note: value >= limit ? 'the estimate passes the melting point: beyond it the figure is not physical; the rail surface melts' : 'the velocity skin effect heats the rail surface behind a fast armature further; this does not cover it',
    },
  ];
}

function linearCurrentDensity(input: EngineeringInput, limits: EngineeringLimits): Check[] {
  const geometry = input.rails?.geometry;
  if (geometry?.kind !== 'rectangular') return [];
  const value = input.results.peakCurrent / geometry.height;
  return [
    {
      id: 'linear-current-density',
      title: 'Peak linear current density (peak current per metre of rail height)',
      verdict: band(value, limits.linearCurrentDensityWarn, limits.linearCurrentDensityFail),
      value,
      limit: limits.linearCurrentDensityFail,
      direction: 'at-most',
      warnAt: limits.linearCurrentDensityWarn,
      unit: 'A/m',
      source: `${LIMIT_SOURCES.linearCurrentDensityWarn}: warning from ${formatQuantity(limits.linearCurrentDensityWarn / 1e6, 'kA/mm')}, failing from ${formatQuantity(limits.linearCurrentDensityFail / 1e6, 'kA/mm')}`,
      note: `${formatQuantity(value / 1e6, 'kA/mm')}; above this band solid armatures tend to lose contact (transition) and rails to gouge`,
    },
  ];
}

function contactForce(input: EngineeringInput, limits: EngineeringLimits): Check[] {
  if (!input.contact) return [];
  const current = input.results.peakCurrent;
  const value = input.contact.preload + input.contact.magneticLoading * current * current;
  const limit = limits.contactForcePerAmpere * current;
  return [
    {
      id: 'contact-force',
      title: 'Solid-armature contact force at peak current',
      verdict: value >= limit ? 'pass' : 'warn',
      value,
      limit,
      direction: 'at-least',
      unit: 'N',
      source: `preload + magnetic loading·I² against ${formatQuantity(limits.contactForcePerAmpere / (STANDARD_GRAVITY * 1e-3), 'gf/A')} (gram-force per ampere) of peak current [${LIMIT_SOURCES.contactForcePerAmpere}]`,
      note: 'a rule of the trade for solid armatures (total contact force); it does not apply to plasma armatures',
    },
  ];
}

function railSeparatingForce(input: EngineeringInput, limits: EngineeringLimits): Check[] {
  const geometry = input.rails?.geometry;
  if (!geometry) return [];
  const current = input.results.peakCurrent;
  const centreDistance = geometry.kind === 'rectangular' ? geometry.separation + geometry.width : geometry.centreDistance;
  const ampere = (MU0 * current * current) / (2 * Math.PI * centreDistance);
  const virtualWork = virtualWorkForce(geometry, current);
  const value = Math.max(ampere, virtualWork ?? 0);
  const limit = limits.railSeparatingForcePerLength ?? null;
  return [
    {
      id: 'rail-separating-force',
      title: 'Rail separating force per metre at peak current',
      verdict: limit === null ? 'info' : value > limit ? 'fail' : 'pass',
      value,
      limit,
      direction: 'at-most',
      unit: 'N/m',
      source: "the larger of Ampère's force law μ0I²/(2πd) at the rails' centre distance [published: IUPAC Gold Book, ampere] and virtual work ½I²·dL′/ds on the high-frequency field solution [derived]",
      note: `${limit === null ? 'no limit given (limits.railSeparatingForcePerLength); a figure for the containment designer. ' : ''}Ampère (thin conductors): ${formatQuantity(ampere, 'N/m')}${virtualWork === undefined ? '' : `; virtual work: ${formatQuantity(virtualWork, 'N/m')}`}`,
    },
  ];
}

/** ½ I² ∂L′/∂s by a central difference of the (cached) field solution; undefined outside its range. */
function virtualWorkForce(geometry: RailGeometry, current: number): number | undefined {
  const step = 0.01;
  try {
    if (geometry.kind === 'rectangular') {
      const at = (s: number) => inductanceGradientOf({ ...geometry, separation: s }).inductanceGradientHighFrequency;
      const s = geometry.separation;
      return (0.5 * current * current * (at(s * (1 + step)) - at(s * (1 - step)))) / (2 * step * s);
    }
    const at = (d: number) => inductanceGradientOf({ ...geometry, centreDistance: d }).inductanceGradientHighFrequency;
    const gap = geometry.centreDistance - 2 * geometry.radius;
    const d = geometry.centreDistance;
    return (0.5 * current * current * (at(d + step * gap) - at(d - step * gap))) / (2 * step * gap);
  } catch {
    return undefined;
  }
}

function peakAcceleration(input: EngineeringInput, limits: EngineeringLimits): Check {
  const value = input.results.peakAcceleration;
  const limit = limits.peakAcceleration ?? null;
  const inG = formatQuantity(value / STANDARD_GRAVITY, GN);
  return {
    id: 'peak-acceleration',
    title: 'Peak acceleration against the payload limit',
    verdict: limit === null ? 'info' : value > limit ? 'fail' : 'pass',
    value,
    limit,
    direction: 'at-most',
    unit: 'm/s²',
    source: limit === null ? 'no payload limit given (limits.peakAcceleration)' : 'payload limit given in the scenario (limits.peakAcceleration)',
    note: limit === null ? `${inG}; no limit given, so no verdict` : `${inG} against ${formatQuantity(limit / STANDARD_GRAVITY, GN)}`,
  };
}

function capacitorReversal(input: EngineeringInput, limits: EngineeringLimits): Check[] {
  return input.bank.map((group, index) => {
    const value = input.results.modules[index]?.reversal ?? 0;
    const limit = group.ratedReversal ?? limits.ratedReversal;
    return {
      id: `capacitor-reversal[${index}]`,
      title: `Capacitor voltage reversal, ${group.label}`,
      verdict: value > limit ? 'fail' : 'pass',
      value,
      limit,
      direction: 'at-most',
      unit: '1',
      source: `rating ${formatPercent(limit)} (bank[${index}].ratedReversal, else limits.ratedReversal; default ${formatPercent(DEFAULT_LIMITS.ratedReversal)}, ${LIMIT_SOURCES.ratedReversal})`,
      note: `${formatPercent(value)} of the charge voltage; capacitor life falls steeply above the rating — check the maker's data`,
    };
  });
}

function capacitorHazards(input: EngineeringInput, limits: EngineeringLimits): Check[] {
  const hazard = bankHazard(input.bank, limits);
  const describe = `${formatQuantity(hazard.storedEnergy, 'J')} stored, charge voltage up to ${formatQuantity(hazard.maxChargeVoltage, 'V')}`;
  const highVoltage = hazard.maxChargeVoltage >= limits.shockVoltage;
  const shockClass = hazard.classes.find((c) => c === 'shock' || c === 'thermal') ?? null;
  const arcFlash = hazard.classes.includes('arc-flash') ? 'arc-flash' : null;
  const inClass = (hazardClass: HazardClass | null): string =>
    hazardClass === null ? '' : `${HAZARD_CLASS_NAMES[hazardClass].toUpperCase()} (${describe}). `;
  return [
    {
      id: 'capacitor-shock-hazard',
      title: 'Capacitor bank shock / thermal hazard class',
      verdict: shockClass ? 'warn' : 'info',
      value: hazard.storedEnergy,
      limit: highVoltage ? limits.shockEnergy : limits.thermalEnergy,
      direction: null,
      hazardClass: shockClass,
      unit: 'J',
      source: `${HAZARD_SOURCE}: shock hazard at ≥ ${formatQuantity(limits.shockVoltage, 'V')} and ≥ ${formatQuantity(limits.shockEnergy, 'J')}; thermal hazard below ${formatQuantity(limits.shockVoltage, 'V')} above ${formatQuantity(limits.thermalEnergy, 'J')}`,
      note: shockClass
        ? `${inClass(shockClass)}${SAFETY_CAUTION}`
        : `below the DOE-HDBK-1092 shock and thermal thresholds (${describe}); a shorted bank can still burn, and local rules still apply.`,
    },
    {
      id: 'capacitor-arc-flash-hazard',
      title: 'Capacitor bank arc-flash hazard class',
      verdict: arcFlash ? 'warn' : 'info',
      value: hazard.storedEnergy,
      limit: limits.arcFlashEnergy,
      direction: null,
      hazardClass: arcFlash,
      unit: 'J',
      source: `${HAZARD_SOURCE}: arc-flash hazard at ≥ ${formatQuantity(limits.shockVoltage, 'V')} and ≥ ${formatQuantity(limits.arcFlashEnergy, 'J')}`,
      note: arcFlash
        ? `${inClass(arcFlash)}Arc-rated protection and an energised-work permit are typically required. ${SAFETY_CAUTION}`
        : `below the arc-flash threshold (${describe}); the shock class above still applies where it is met.`,
    },
  ];
}
