/**
 * The assessment of one shot: its engineering checks, its warnings and (for rails given by geometry) the
 * derived rail figures. Computed once per shot and read by the terminal summary, --json, the record, studies
 * and calibration alike. Pure and worker-safe.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import type { Check } from './engineering.js';
import { railsDerivedJson, shotChecks, type RailsDerivedJson } from './shotChecks.js';
import { shotWarnings, type ShotWarning } from './warnings.js';

export interface Assessment {
  checks: Check[];
  warnings: ShotWarning[];
  /** present when the rails were given by geometry and material */
  railsDerived?: RailsDerivedJson;
}

export function assessShot(scenario: Scenario, shot: Shot): Assessment {
  const railsDerived = railsDerivedJson(scenario);
  return {
    checks: shotChecks(scenario, shot.results),
    warnings: shotWarnings(scenario, shot),
    ...(railsDerived ? { railsDerived } : {}),
  };
}
