/**
 * A Monte Carlo of the sized design (`size --monte-carlo N`): the sizing meets the target at its confidence by
 * linear propagation; drawing the tolerances and calibration N times shows whether that holds for the spread as
 * it is (the probability of the target, the share of shots above each headline limit).
 */
import { validateScenario } from '../scenario/validate.js';
import { monteCarlo, type MonteCarloSummary } from './montecarlo.js';
import type { SizingLimits, SizingResult } from './size.js';
import { uncertaintyModel } from './uncertainInputs.js';

export async function monteCarloOfSizing(result: SizingResult, limits: SizingLimits, options: { shots: number; seed: number; jobs?: number }): Promise<MonteCarloSummary | null> {
  if (!result.scenario) return null;
  const model = uncertaintyModel(result.scenario);
  if (!model) return null;
  const headline: MonteCarloSummaryLimits = {};
  if (limits.peakCurrent !== undefined) headline.peakCurrent = limits.peakCurrent;
  if (limits.peakAcceleration !== undefined) headline.peakAcceleration = limits.peakAcceleration;
  if (limits.actionIntegral !== undefined) headline.actionIntegral = limits.actionIntegral;
  return monteCarlo(result.scenario, model, { ...options, validate: (s) => validateScenario(s), targetVelocity: result.targetVelocity, limits: headline });
}

type MonteCarloSummaryLimits = Partial<Record<'peakCurrent' | 'peakAcceleration' | 'actionIntegral', number>>;

export function monteCarloLines(result: SizingResult, mc: MonteCarloSummary): string[] {
  const lines: string[] = [];
  const v = mc.results.muzzleVelocity;
  if (mc.target) {
    const stated = result.confidence !== null ? ` (stated confidence ${(100 * result.confidence).toFixed(1)} %)` : '';
    lines.push(`Monte Carlo of the sized design, ${mc.ran} of ${mc.shots} shots (seed ${mc.seed}): P(v ≥ ${result.targetVelocity.toFixed(1)} m/s at exit) = ${(100 * mc.target.probability).toFixed(1)} % ± ${(100 * mc.target.standardError).toFixed(1)} %${stated}`);
  }
  if (v) lines.push(`  muzzle velocity: mean ${v.mean.toFixed(1)} m/s, σ ${v.standardDeviation.toFixed(1)} m/s, 5th percentile ${v.percentiles['5']!.toFixed(1)} m/s`);
  for (const [key, limit] of Object.entries(mc.limits)) lines.push(`  ${key} above its limit in ${(100 * limit.probabilityExceeded).toFixed(1)} % of the shots`);
  for (const warning of mc.warnings) lines.push(`  warning: ${warning}`);
  return lines;
}
