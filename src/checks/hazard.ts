/**
 * What a charged bank is, before anything is simulated: its stored energy, its highest charge voltage and the
 * capacitor hazard classes it falls in. Read by the hazard checks, the terminal summary and the safety banner at
 * the top of every page, so all of them say the same. Pure.
 */
import { DEFAULT_LIMITS, LIMIT_SOURCES, type EngineeringLimits } from '../scenario/limits.js';

/** Capacitor hazard classes [published: DOE-HDBK-1092, capacitor hazard classes]. */
export type HazardClass = 'shock' | 'thermal' | 'arc-flash';

export const HAZARD_CLASS_NAMES: Record<HazardClass, string> = {
  shock: 'shock hazard',
  thermal: 'thermal (burn) hazard',
  'arc-flash': 'arc-flash hazard',
};

export interface BankHazard {
  /** Σ ½·n·C·V0² over the groups (J) */
  storedEnergy: number;
  /** the highest charge voltage of any group (V) */
  maxChargeVoltage: number;
  /** the classes the bank is in, most severe last (empty below every threshold) */
  classes: HazardClass[];
}

export interface HazardBankGroup {
  count: number;
  capacitance: number;
  voltage: number;
}

export type HazardLimits = Pick<EngineeringLimits, 'shockVoltage' | 'shockEnergy' | 'thermalEnergy' | 'arcFlashEnergy'>;

export function bankHazard(bank: ReadonlyArray<HazardBankGroup>, limits: Partial<HazardLimits> = {}): BankHazard {
  const l = { ...DEFAULT_LIMITS, ...limits };
  const storedEnergy = bank.reduce((sum, g) => sum + 0.5 * g.count * g.capacitance * g.voltage * g.voltage, 0);
  const maxChargeVoltage = bank.reduce((max, g) => Math.max(max, g.voltage), 0);
  const highVoltage = maxChargeVoltage >= l.shockVoltage;
  const classes: HazardClass[] = [];
  if (highVoltage && storedEnergy >= l.shockEnergy) classes.push('shock');
  if (!highVoltage && storedEnergy > l.thermalEnergy) classes.push('thermal');
  if (highVoltage && storedEnergy >= l.arcFlashEnergy) classes.push('arc-flash');
  return { storedEnergy, maxChargeVoltage, classes };
}

export const HAZARD_SOURCE = LIMIT_SOURCES.shockVoltage;

/**
 * The discharge rule of the US electrical code, as railpulse cites it. From memory (medium confidence): NFPA 70,
 * National Electrical Code, 2023 edition, Article 460: capacitors rated 1000 V or less are discharged to 50 V or
 * less within 1 minute of disconnection (460.6(A)), capacitors over 1000 V within 5 minutes (Part II). Editions
 * before 2014 drew that line at 600 V; California's Title 8 §2893 words its own rule. Local codes decide.
 */
export const DISCHARGE_RULE =
  'NFPA 70 (US National Electrical Code), 2023 edition, Article 460 [from memory, medium confidence]: capacitors rated 1000 V or less are to be discharged to 50 V or less within 1 minute of disconnection, capacitors over 1000 V within 5 minutes; editions before 2014 drew this line at 600 V, and state rules (e.g. Cal/OSHA Title 8 §2893) word their own. Your local code and your institution\'s rules decide which applies.';

/** The short caution every hazard note and summary carries. */
export const SAFETY_CAUTION =
  'Charged capacitor banks can kill. Follow local codes, your institution\'s electrical safety rules and licensed practice; discharge, short and ground the bank before any work.';
