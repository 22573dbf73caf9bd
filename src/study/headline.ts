/** The headline results of a shot that uncertainty is propagated to (the `uncertainty` key of --json, study columns). Worker-safe. */
import type { ShotResults } from '../solve/types.js';
import type { Shot } from '../solve/types.js';
import type { Scenario } from '../scenario/types.js';

export const HEADLINE_KEYS = ['muzzleVelocity', 'exitTime', 'peakCurrent', 'efficiency', 'peakAcceleration', 'actionIntegral'] as const;
export type HeadlineKey = (typeof HEADLINE_KEYS)[number];
export type Headline = Record<HeadlineKey, number | null>;

/** The headline values of a shot, the exit time NaN when it did not exit. */
export function headlineValues(results: ShotResults): number[] {
  return HEADLINE_KEYS.map((key) => (key === 'exitTime' ? results.exitTime ?? NaN : results[key]));
}

export type RunShot = (scenario: Scenario, options?: { waveforms?: boolean }) => Shot;
