/**
 * Engineering checks of a shot: each compares one figure with a limit and says where the limit comes from.
 * Verdicts are advice for a designer, not certification. A check whose inputs are absent (no armature
 * cross-section, no rail geometry, …) is left out rather than passed. Hazard checks never "pass" a bank
 * above the DOE-HDBK-1092 thresholds: they warn, and defer to local codes and the institution's rules.
 */
import type { ShotResults } from '../solve/types.js';
import { STANDARD_GRAVITY } from '../units/format.js';
import { fusionAction, meltingAction, temperatureAfterAction, DEFAULT_AMBIENT } from '../conductors/heating.js';
import { inductanceGradientOf, type RailGeometry } from '../conductors/inductance.js';
import type { Material } from '../conductors/materials.js';
import { currentCarryingArea, penetrationDepth } from '../conductors/resistance.js';
import { DEFAULT_LIMITS, LIMIT_SOURCES, type EngineeringLimits } from '../scenario/limits.js';

export type Verdict = 'pass' | 'warn' | 'fail';

export interface Check {
  id: string;
  title: string;
  verdict: Verdict;
  /** the figure checked (SI, in `unit`) */
  value: number;
  /** the boundary it is judged against (SI, in `unit`); null when there is none */
  limit: number | null;
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
      unit: 'A²·s/m⁴',
      source: `adiabatic action to the onset of melting, g = γc/(ρ0α)·ln(1 + αΔT) [derived; agrees with Onderdonk's equation for copper]; warning at ${limits.actionWarnFraction} of it [${LIMIT_SOURCES.actionWarnFraction}]`,
      note: `${((100 * value) / limit).toFixed(0)} % of the action to melting from ${ambient} °C; melting through would take a further ≈ ${fusionAction(material).toPrecision(2)} A²·s/m⁴ (latent heat, shown for information). Current crowding at the armature's rear edge heats some parts faster than this average.`,
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
      unit: 'K',
      source: `adiabatic heating by the whole action integral through a layer √(2πρτ/μ0) = ${(penetrationDepth(material.resistivity, time) * 1e3).toPrecision(3)} mm deep behind the inner face (at most the rail), τ = ${(time * 1e3).toPrecision(3)} ms [derived]; limit: rise to melting; warning at ${limits.railHeatingWarnFraction} of it [${LIMIT_SOURCES.railHeatingWarnFraction}]`,
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
      limit: limits.linearCurrentDensityWarn,
      unit: 'A/m',
      source: `${LIMIT_SOURCES.linearCurrentDensityWarn}: warning from ${limits.linearCurrentDensityWarn / 1e6} kA/mm, failing from ${limits.linearCurrentDensityFail / 1e6} kA/mm`,
      note: `${(value / 1e6).toFixed(1)} kA/mm; above this band solid armatures tend to lose contact (transition) and rails to gouge`,
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
      unit: 'N',
      source: `preload + magnetic loading·I² against ${limits.contactForcePerAmpere / (STANDARD_GRAVITY * 1e-3)} gf per ampere of peak current [${LIMIT_SOURCES.contactForcePerAmpere}]`,
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
      verdict: limit !== null && value > limit ? 'fail' : 'pass',
      value,
      limit,
      unit: 'N/m',
      source: "the larger of Ampère's force law μ0I²/(2πd) at the rails' centre distance [published: IUPAC Gold Book, ampere] and virtual work ½I²·dL′/ds on the high-frequency field solution [derived]",
      note: `${limit === null ? 'no limit given; a figure for the containment designer. ' : ''}Ampère (thin conductors): ${ampere.toPrecision(3)} N/m${virtualWork === undefined ? '' : `; virtual work: ${virtualWork.toPrecision(3)} N/m`}`,
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
  const inG = `${(value / STANDARD_GRAVITY).toPrecision(3)} g`;
  return {
    id: 'peak-acceleration',
    title: 'Peak acceleration against the payload limit',
    verdict: limit !== null && value > limit ? 'fail' : 'pass',
    value,
    limit,
    unit: 'm/s²',
    source: limit === null ? 'no payload limit given' : 'payload limit given in the scenario',
    note: limit === null ? `${inG}; no limit given` : `${inG} against ${(limit / STANDARD_GRAVITY).toPrecision(3)} g`,
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
      unit: '1',
      source: `rating ${(limit * 100).toPrecision(3)} % (bank[${index}].ratedReversal, else limits.ratedReversal; default ${DEFAULT_LIMITS.ratedReversal * 100} %, ${LIMIT_SOURCES.ratedReversal})`,
      note: `${(value * 100).toFixed(1)} % of the charge voltage; capacitor life falls steeply above the rating — check the maker's data`,
    };
  });
}

const SAFETY_CAUTION =
  'Charged capacitor banks can kill. Follow local codes, your institution\'s electrical safety rules and licensed practice; discharge, short and ground the bank before work (e.g. banks over 600 V to 50 V or less within 5 minutes under OSHA / Cal/OSHA Title 8 §2893, NEC 460).';

function capacitorHazards(input: EngineeringInput, limits: EngineeringLimits): Check[] {
  const energy = input.bank.reduce((sum, g) => sum + 0.5 * g.count * g.capacitance * g.voltage * g.voltage, 0);
  const voltage = input.bank.reduce((max, g) => Math.max(max, g.voltage), 0);
  const source = `${LIMIT_SOURCES.shockVoltage}`;
  const highVoltage = voltage >= limits.shockVoltage;
  const shock = highVoltage && energy >= limits.shockEnergy;
  const thermal = !highVoltage && energy > limits.thermalEnergy;
  const arcFlash = highVoltage && energy >= limits.arcFlashEnergy;
  const describe = `${voltage} V, ${energy.toPrecision(3)} J stored`;
  return [
    {
      id: 'capacitor-shock-hazard',
      title: 'Capacitor bank shock / thermal hazard class',
      verdict: shock || thermal ? 'warn' : 'pass',
      value: energy,
      limit: highVoltage ? limits.shockEnergy : limits.thermalEnergy,
      unit: 'J',
      source: `${source}: shock hazard at ≥ ${limits.shockVoltage} V and ≥ ${limits.shockEnergy} J; thermal hazard below ${limits.shockVoltage} V above ${limits.thermalEnergy} J`,
      note: shock
        ? `SHOCK HAZARD (${describe}). ${SAFETY_CAUTION}`
        : thermal
          ? `THERMAL (burn) HAZARD (${describe}). ${SAFETY_CAUTION}`
          : `below the DOE-HDBK-1092 thresholds (${describe}); local rules still apply.`,
    },
    {
      id: 'capacitor-arc-flash-hazard',
      title: 'Capacitor bank arc-flash hazard class',
      verdict: arcFlash ? 'warn' : 'pass',
      value: energy,
      limit: limits.arcFlashEnergy,
      unit: 'J',
      source: `${source}: arc-flash hazard at ≥ ${limits.shockVoltage} V and ≥ ${limits.arcFlashEnergy} J`,
      note: arcFlash ? `ARC-FLASH HAZARD (${describe}): arc-rated protection and an energised-work permit are typically required. ${SAFETY_CAUTION}` : `below the arc-flash threshold (${describe}).`,
    },
  ];
}
