/**
 * The uncertainty of one shot as `run` shows it: linear propagation always (with the current and velocity bands
 * when a record is written), a Monte Carlo on the workers when asked for, and the three faces of the result —
 * the `uncertainty` key of --json (SI), lines for the terminal, and the record's section and bands.
 */
import type { AssessedShot } from '../pipeline/shoot.js';
import { forTerminal, formatPercent, formatQuantity } from '../units/format.js';
import { siUnitOfPath } from '../report/inputs.js';
import { showHeadline, showWithUncertainty, HEADLINE_LABELS, type RecordUncertainty } from '../report/uncertainty.js';
import { normalQuantile } from '../core/normal.js';
import { validateScenario } from '../scenario/validate.js';
import type { Tolerance } from '../scenario/types.js';
import type { RunShot } from './headline.js';
import type { monteCarlo, MonteCarloSummary } from './montecarlo.js';
import { HEADLINE_KEYS, propagateModel, type HeadlineKey, type LinearPropagation } from './propagate.js';
import { uncertaintyModel } from './uncertainInputs.js';

export interface UncertaintyOptions {
  runShot: RunShot;
  /** propagate to the current and velocity waveforms (for the record's bands) */
  waveforms: boolean;
  /** coverage probability of the intervals and bands; default: ±1σ bands and 95 % intervals */
  band?: number;
  /** with `runMonteCarlo` (montecarlo.ts's `monteCarlo`: passed in, so the linear part needs no worker threads) */
  monteCarlo?: { shots: number; seed: number; jobs?: number; runMonteCarlo: typeof monteCarlo };
  /** m/s: the probability of meeting it (Monte Carlo) */
  targetVelocity?: number;
}

export interface ShotUncertainty {
  linear: LinearPropagation;
  monteCarlo: MonteCarloSummary | null;
  /** coverage of the intervals shown, and the normal coverage factor k */
  interval: { coverage: number; factor: number };
  /** coverage of the record's bands and its factor (±1σ: 0.6827, k = 1) */
  band: { coverage: number; factor: number };
}

const ONE_SIGMA = 0.6826894921370859;

function coverageFactor(coverage: number): number {
  return normalQuantile(0.5 + coverage / 2);
}

/** Linear propagation (and a Monte Carlo when asked) for a shot whose scenario carries tolerances or a calibration. */
export async function shotUncertainty(assessed: AssessedShot, options: UncertaintyOptions): Promise<ShotUncertainty | null> {
  const scenario = assessed.scenario;
  const model = uncertaintyModel(scenario);
  if (!model) return null;
  const linear = propagateModel(scenario, model, options.runShot, { waveforms: options.waveforms && assessed.shot.waveforms !== null, nominal: assessed.shot });
  const limits = scenario.limits?.peakAcceleration !== undefined ? { peakAcceleration: scenario.limits.peakAcceleration } : {};
  const asked = options.monteCarlo;
  const mc = asked
    ? await asked.runMonteCarlo(scenario, model, {
        shots: asked.shots,
        seed: asked.seed,
        ...(asked.jobs === undefined ? {} : { jobs: asked.jobs }),
        validate: (s) => validateScenario(s),
        ...(options.targetVelocity !== undefined ? { targetVelocity: options.targetVelocity } : {}),
        limits,
      })
    : null;
  const interval = options.band ?? 0.95;
  const band = options.band ?? ONE_SIGMA;
  return { linear, monteCarlo: mc, interval: { coverage: interval, factor: coverageFactor(interval) }, band: { coverage: band, factor: options.band === undefined ? 1 : coverageFactor(band) } };
}

function intervalOf(u: ShotUncertainty, key: HeadlineKey): [number, number] | null {
  const nominal = u.linear.nominal[key];
  const sigma = u.linear.standardUncertainty[key];
  return nominal === null || sigma === null ? null : [nominal - u.interval.factor * sigma, nominal + u.interval.factor * sigma];
}

/** The `uncertainty` key of `run --json`: the six standard uncertainties (SI) first, then how they were found. */
export function uncertaintyJson(u: ShotUncertainty): Record<string, unknown> {
  const { linear, monteCarlo: mc } = u;
  const names = linear.inputs.map((input) => input.name);
  const json: Record<string, unknown> = { ...linear.standardUncertainty };
  json.method = 'linear propagation (central finite differences, step 0.1σ; GUM §5)';
  json.interval = { coverage: u.interval.coverage, factor: u.interval.factor, ...Object.fromEntries(HEADLINE_KEYS.map((key) => [key, intervalOf(u, key)])) };
  json.sensitivities = Object.fromEntries(HEADLINE_KEYS.map((key) => [key, Object.fromEntries(names.map((name, j) => [name, linear.sensitivities[key][j]]))]));
  json.inputs = linear.inputs;
  json.outcome = linear.outcome;
  json.outcomeChanges = linear.outcomeChanges;
  json.unquantified = linear.unquantified;
  json.warnings = linear.warnings;
  json.shots = linear.shots;
  if (mc) {
    const { samples: _samples, sampleOutcomes: _outcomes, inputs: _inputs, ...summary } = mc;
    json.monteCarlo = summary;
  }
  return json;
}


/** How a tolerance reads, e.g. "uniform ±5 %" or "normal σ 20 V" (SI). */
export function describeTolerance(tolerance: Tolerance): string {
  const unit = siUnitOfPath(tolerance.targets[0]!.path);
  // masses read in grams, not in prefixed kilograms
  const spread = tolerance.relative ? formatPercent(tolerance.spread) : formatQuantity(tolerance.spread, unit);
  return `${tolerance.distribution === 'uniform' ? `uniform ±${spread}` : `normal σ ${spread}`}${tolerance.common ? ', one draw for every group' : ''}`;
}

function inputLines(assessed: AssessedShot, u: ShotUncertainty): string[] {
  const scenario = assessed.scenario;
  return u.linear.inputs.map((input) => {
    if (input.source === 'calibration') {
      const c = scenario.calibration!;
      return `${input.name} — calibrated against ${c.record} (${c.date.slice(0, 10)}), σ ${formatQuantity(Object.values(input.sigma)[0]!, siUnitOfPath(input.name), { digits: 3 })}, correlated as fitted`;
    }
    const tolerance = scenario.tolerances!.find((t) => t.path === input.name || t.targets.some((target) => target.path === input.name))!;
    return `${input.name} — tolerance, ${describeTolerance(tolerance)}`;
  });
}

function monteCarloNotes(mc: MonteCarloSummary): string[] {
  const shares = Object.entries(mc.outcomes).map(([kind, n]) => `${formatPercent(n! / mc.ran)} ${kind}`).join(', ');
  const v = mc.results.muzzleVelocity;
  const speed = (value: number): string => showHeadline('muzzleVelocity', value);
  const notes = [`Monte Carlo, ${mc.ran} of ${mc.shots} shots run (seed ${mc.seed}, ${mc.seconds.toFixed(1)} s): ${shares}` +
    (v ? `; muzzle velocity mean ${speed(v.mean)}, σ ${speed(v.standardDeviation)}, 2.5–97.5 percentiles ${speed(v.percentiles['2.5']!)} … ${speed(v.percentiles['97.5']!)}` : '')];
  if (mc.target) notes.push(`probability of leaving at ${speed(mc.target.velocity)} or more: ${formatPercent(mc.target.probability)} (± ${formatPercent(mc.target.standardError, { digits: 2 })}, binomial standard error)`);
  for (const [key, limit] of Object.entries(mc.limits)) notes.push(`share of shots above the ${key} limit: ${formatPercent(limit.probabilityExceeded)}`);
  return [...notes, ...mc.warnings];
}

/** Lines for the terminal. */
export function uncertaintyLines(assessed: AssessedShot, u: ShotUncertainty): string[] {
  const coverage = formatPercent(u.interval.coverage, { digits: 3 });
  const lines = [`uncertainty: linear propagation of ${u.linear.inputs.length} input(s), ${u.linear.shots} shots; ±1σ and the ${coverage} interval (±${u.interval.factor.toFixed(3)}σ, normal approximation):`];
  for (const input of inputLines(assessed, u)) lines.push(`  input ${input}`);
  for (const key of HEADLINE_KEYS) {
    const name = HEADLINE_LABELS[key]![0];
    const label = name[0]!.toLowerCase() + name.slice(1);
    const sigma = u.linear.standardUncertainty[key];
    const range = intervalOf(u, key);
    const value = sigma === null ? `${showHeadline(key, u.linear.nominal[key])} (uncertainty not defined)` : showWithUncertainty(key, u.linear.nominal[key], sigma);
    lines.push(`  ${label.padEnd(24)} ${value}${range ? `   ${coverage}: ${showHeadline(key, range[0])} … ${showHeadline(key, range[1])}` : ''}`);
  }
  for (const warning of u.linear.warnings) lines.push(`  warning: ${warning}`);
  if (u.monteCarlo) for (const note of monteCarloNotes(u.monteCarlo)) lines.push(`  ${note}`);
  return lines.map(forTerminal);
}

/** The record's uncertainty section and bands. */
export function recordUncertainty(assessed: AssessedShot, u: ShotUncertainty): RecordUncertainty {
  const waveforms = u.linear.waveforms;
  const bandLabel = u.band.factor === 1 ? '±1σ (linear propagation)' : `${formatPercent(u.band.coverage, { digits: 3 })} interval, ±${u.band.factor.toFixed(2)}σ (linear propagation, normal approximation)`;
  return {
    method: `Linear propagation of ${u.linear.inputs.length} uncertain input(s) through a finite-difference Jacobian (${u.linear.shots} shots); the intervals assume a normal distribution of each result`,
    intervalLabel: `${formatPercent(u.interval.coverage, { digits: 3 })} interval`,
    rows: HEADLINE_KEYS.map((key) => ({ key, nominal: u.linear.nominal[key], sigma: u.linear.standardUncertainty[key], interval: intervalOf(u, key) })),
    inputs: inputLines(assessed, u),
    notes: [...u.linear.warnings, ...(u.monteCarlo ? monteCarloNotes(u.monteCarlo) : [])],
    bands: waveforms ? { current: waveforms.current.map((s) => s * u.band.factor), velocity: waveforms.velocity.map((s) => s * u.band.factor), label: bandLabel } : null,
  };
}
