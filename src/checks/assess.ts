/**
 * The assessment of one shot: its engineering checks, its warnings, the overall status and (for rails given by
 * geometry) the derived rail figures. Computed once per shot and read by the terminal summary, --json, the record,
 * the archive index, studies and calibration alike. Pure and worker-safe.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import type { Check, Verdict } from './engineering.js';
import type { HazardClass } from './hazard.js';
import { railsDerivedJson, shotChecks, type RailsDerivedJson } from './shotChecks.js';
import { shotWarnings, type ShotWarning } from './warnings.js';

/** The overall verdict of a shot: the worst of its checks' verdicts and its warnings (a warning counts as warn). */
export type StatusVerdict = 'pass' | 'warn' | 'fail';

export interface ShotStatus {
  verdict: StatusVerdict;
  /** how many checks gave each verdict */
  checks: Record<Verdict, number>;
  /** how many warnings the shot raised (reversal, stall, timeout, ledger) */
  warnings: number;
  /** the capacitor hazard classes the bank is in (they count as warn) */
  hazardClasses: HazardClass[];
  /** the ids of the checks that fail, then of those that warn: what the verdict rests on */
  failing: string[];
  warning: string[];
}

export interface Assessment {
  checks: Check[];
  warnings: ShotWarning[];
  status: ShotStatus;
  /** present when the rails were given by geometry and material */
  railsDerived?: RailsDerivedJson;
}

const RANK: Record<StatusVerdict, number> = { pass: 0, warn: 1, fail: 2 };

/** The worse of two verdicts ("info" never makes a shot worse). */
export function worse(a: StatusVerdict, b: Verdict | StatusVerdict): StatusVerdict {
  if (b === 'info') return a;
  return RANK[b] > RANK[a] ? b : a;
}

/**
 * Worst of the checks and the warnings. Takes the plain shapes the embedded data of a record has, so the archive
 * index computes exactly what the record shows (check-like objects with a verdict, warnings as anything).
 */
export function statusOf(
  checks: ReadonlyArray<{ id: string; verdict: string; hazardClass?: HazardClass | null | undefined }>,
  warnings: ReadonlyArray<unknown>,
): ShotStatus {
  const counts: Record<Verdict, number> = { pass: 0, warn: 0, fail: 0, info: 0 };
  let verdict: StatusVerdict = warnings.length > 0 ? 'warn' : 'pass';
  const hazardClasses: HazardClass[] = [];
  for (const check of checks) {
    const v: Verdict = (['pass', 'warn', 'fail', 'info'] as const).find((known) => known === check.verdict) ?? 'warn';
    counts[v] += 1;
    verdict = worse(verdict, v);
    if (check.hazardClass) hazardClasses.push(check.hazardClass);
  }
  return {
    verdict,
    checks: counts,
    warnings: warnings.length,
    hazardClasses,
    failing: checks.filter((c) => c.verdict === 'fail').map((c) => c.id),
    warning: checks.filter((c) => c.verdict === 'warn').map((c) => c.id),
  };
}

export function assessShot(scenario: Scenario, shot: Shot): Assessment {
  const railsDerived = railsDerivedJson(scenario, shot);
  const checks = shotChecks(scenario, shot.results);
  const warnings = shotWarnings(scenario, shot);
  return {
    checks,
    warnings,
    status: statusOf(checks, warnings),
    ...(railsDerived ? { railsDerived } : {}),
  };
}
