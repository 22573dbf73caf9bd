/**
 * Monte Carlo of a scenario's uncertain inputs on the sweep's worker threads: N shots, each with every input drawn
 * from its distribution (seeded, counter-based, so a shot's draw does not depend on the number of workers or the
 * order in which batches finish), then the distribution of each headline result: mean, standard deviation,
 * percentiles, the share of each outcome and, with a target, the probability of meeting it.
 *
 * Draws: a uniform input from one uniform number; a normal input by the normal quantile of one; the calibrated
 * parameters jointly normal through a square root of their correlation matrix (F Fᵀ = R). A draw outside the
 * model's valid range (validateScenario) is not run and is counted; so is a shot the solver could not finish.
 * Shots of different outcomes are never averaged silently: exitTime is over the exited shots only, and a mixed
 * outcome is said in the warnings.
 */
import { availableParallelism } from 'node:os';
import { InputError } from '../core/errors.js';
import { covarianceFactor } from '../core/eigen.js';
import { normalQuantile } from '../core/normal.js';
import { setPath } from '../scenario/paths.js';
import type { Scenario } from '../scenario/types.js';
import type { Outcome, ShotResults } from '../solve/types.js';
import type { BatchContext, BatchRequest, BatchResult } from './batch.js';
import { makeWorkerPool, type PointRunner } from './pool.js';
import { counterUniform } from './prng.js';
import { HEADLINE_KEYS, headlineValues, summariseInputs, type HeadlineKey, type InputSummary } from './propagate.js';
import { defaultWorkerUrl } from './sweep.js';
import { movedPaths, movedValues, type UncertaintyModel } from './uncertainInputs.js';

export const PERCENTILES = [2.5, 5, 16, 50, 84, 95, 97.5] as const;

export interface Distribution {
  /** shots it is taken over */
  count: number;
  mean: number;
  standardDeviation: number;
  /** percent → value (Hyndman & Fan type 7, linear between order statistics) */
  percentiles: Record<string, number>;
}

export interface MonteCarloOptions {
  shots: number;
  seed: number;
  /** worker threads (default: all cores) */
  jobs?: number;
  /** how batches are run (default: the sweep's worker pool) */
  makeRunner?: (context: BatchContext, jobs: number) => PointRunner;
  /** range checks of a drawn scenario (default: none) */
  validate?: (scenario: Scenario) => void;
  /** m/s at exit: the probability that a shot exits at or above it */
  targetVelocity?: number;
  /** headline limits: the share of shots above each */
  limits?: Partial<Record<'peakCurrent' | 'peakAcceleration' | 'actionIntegral', number>>;
}

export interface MonteCarloSummary {
  shots: number;
  seed: number;
  inputs: InputSummary[];
  /** shots run to the end */
  ran: number;
  /** draws outside the model's valid range, not run */
  invalid: number;
  /** shots the solver could not finish */
  failed: number;
  firstError: string | null;
  outcomes: Partial<Record<Outcome, number>>;
  /** over every shot run; exitTime over the exited shots only; null with no shot to take it over */
  results: Record<HeadlineKey, Distribution | null>;
  target: { velocity: number; probability: number; standardError: number } | null;
  limits: Record<string, { limit: number; probabilityExceeded: number }>;
  warnings: string[];
  seconds: number;
  /** the headline values of each shot run, by key (for callers that need more than the summary) */
  samples: Record<HeadlineKey, number[]>;
  sampleOutcomes: Outcome[];
}

/** The standardised inputs of shot `index`: independent uniforms and normals, the calibrated block correlated. */
export function makeDrawer(model: UncertaintyModel, seed: number): (index: number) => number[] {
  const block = model.inputs.map((input, j) => (input.source === 'calibration' ? j : -1)).filter((j) => j >= 0);
  const factor = block.length > 0 ? covarianceFactor(block.map((a) => block.map((b) => model.correlation[a]![b]!))) : [];
  return (index) => {
    const u = model.inputs.map((input, j) => {
      // never exactly 0, whose normal quantile is −∞
      const uniform = Math.max(counterUniform(seed, index, j), 2 ** -60);
      return input.distribution === 'uniform' ? Math.sqrt(3) * (2 * uniform - 1) : normalQuantile(uniform);
    });
    if (block.length > 0) {
      const z = block.map((j) => u[j]!);
      block.forEach((j, a) => (u[j] = factor[a]!.reduce((sum, f, b) => sum + f * z[b]!, 0)));
    }
    return u;
  };
}

/** Percentile p (0–100) of sorted values, linear between order statistics (Hyndman & Fan 1996, type 7). */
export function percentile(sorted: readonly number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const position = (p / 100) * (sorted.length - 1);
  const below = Math.floor(position);
  const above = Math.min(sorted.length - 1, below + 1);
  return sorted[below]! + (position - below) * (sorted[above]! - sorted[below]!);
}

export function distributionOf(values: readonly number[]): Distribution | null {
  if (values.length === 0) return null;
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  const variance = values.length > 1 ? values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1) : 0;
  const sorted = values.slice().sort((a, b) => a - b);
  return { count: values.length, mean, standardDeviation: Math.sqrt(variance), percentiles: Object.fromEntries(PERCENTILES.map((p) => [String(p), percentile(sorted, p)])) };
}

const BATCH = 25;

export async function monteCarlo(scenario: Scenario, model: UncertaintyModel, options: MonteCarloOptions): Promise<MonteCarloSummary> {
  if (!Number.isInteger(options.shots) || options.shots < 2) throw new InputError('--monte-carlo', `expected a whole number of shots ≥ 2, got ${options.shots}`);
  const started = performance.now();
  const moved = movedPaths(scenario, model);
  const draw = makeDrawer(model, options.seed);
  const context: BatchContext = { scenario, paths: moved.map((m) => m.path) };
  const requested = options.jobs ?? availableParallelism();
  const jobs = Math.max(1, Math.min(requested, Math.ceil(options.shots / BATCH)));
  const runner = (options.makeRunner ?? ((ctx, n) => makeWorkerPool(defaultWorkerUrl(), ctx, n)))(context, jobs);
  const probe = structuredClone(scenario);
  const request = (sequence: number): BatchRequest => {
    const first = sequence * BATCH;
    const count = Math.min(BATCH, options.shots - first);
    const values = new Float64Array(count * moved.length);
    const indices: number[] = [];
    const invalid: (string | null)[] = [];
    for (let k = 0; k < count; k++) {
      const point = movedValues(moved, draw(first + k));
      indices.push(first + k);
      values.set(point, k * moved.length);
      invalid.push(checkDraw(probe, moved, point, options.validate));
    }
    return { sequence, indices, values, invalid };
  };
  const results: BatchResult[] = [];
  try {
    const batches = Math.ceil(options.shots / BATCH);
    let next = 0;
    // at most two batches a worker in flight, as in the sweep
    const lane = async (): Promise<void> => {
      while (next < batches) {
        const sequence = next++;
        results[sequence] = await runner.submit(request(sequence));
      }
    };
    await Promise.all(Array.from({ length: runner.concurrency * 2 }, lane));
  } finally {
    await runner.close();
  }
  return summarise(results, model, options, (performance.now() - started) / 1000);
}

function checkDraw(probe: Scenario, moved: ReturnType<typeof movedPaths>, point: number[], validate?: (scenario: Scenario) => void): string | null {
  if (!validate) return null;
  moved.forEach((m, d) => setPath(probe, m.steps, point[d]!));
  try {
    validate(probe);
    return null;
  } catch (error) {
    if (error instanceof InputError) return `outside the valid range: ${error.message}`;
    throw error;
  }
}

function summarise(batches: BatchResult[], model: UncertaintyModel, options: MonteCarloOptions, seconds: number): MonteCarloSummary {
  const samples = Object.fromEntries(HEADLINE_KEYS.map((key) => [key, [] as number[]])) as Record<HeadlineKey, number[]>;
  const sampleOutcomes: Outcome[] = [];
  const outcomes: Partial<Record<Outcome, number>> = {};
  let invalid = 0;
  let failed = 0;
  let firstError: string | null = null;
  const rows: ShotResults[] = [];
  for (const batch of batches) {
    for (const line of batch.json.split('\n')) {
      if (line === '') continue;
      const row = JSON.parse(line) as Record<string, unknown>;
      if (typeof row.error === 'string') {
        if (row.error.startsWith('outside the valid range')) invalid += 1;
        else {
          failed += 1;
          firstError ??= row.error;
        }
        continue;
      }
      rows.push(row as unknown as ShotResults);
    }
  }
  for (const results of rows) {
    const values = headlineValues(results);
    HEADLINE_KEYS.forEach((key, i) => {
      if (Number.isFinite(values[i]!)) samples[key].push(values[i]!);
    });
    sampleOutcomes.push(results.outcome);
    outcomes[results.outcome] = (outcomes[results.outcome] ?? 0) + 1;
  }
  const ran = rows.length;
  const warnings: string[] = [];
  const kinds = Object.keys(outcomes) as Outcome[];
  if (kinds.length > 1) {
    const shares = kinds.map((kind) => `${((100 * outcomes[kind]!) / ran).toFixed(1)} % ${kind}`).join(', ');
    warnings.push(`the outcome differs between shots (${shares}): muzzleVelocity is the final velocity for a shot that did not exit, and exitTime covers the ${outcomes.exited ?? 0} exited shots only`);
  }
  if (invalid > 0) warnings.push(`${invalid} of ${options.shots} draws fell outside the model's valid range and were not run: the distributions cover the rest`);
  if (failed > 0) warnings.push(`${failed} shots could not be finished by the solver (first: ${firstError}) and are left out`);
  if (model.unquantified.length > 0) warnings.push(`calibrated on a bound, with no uncertainty included: ${model.unquantified.join(', ')}`);
  let target: MonteCarloSummary['target'] = null;
  if (options.targetVelocity !== undefined && ran > 0) {
    const met = rows.filter((r) => r.outcome === 'exited' && r.muzzleVelocity >= options.targetVelocity!).length;
    const probability = met / ran;
    target = { velocity: options.targetVelocity, probability, standardError: Math.sqrt((probability * (1 - probability)) / ran) };
  }
  const limits: MonteCarloSummary['limits'] = {};
  for (const [key, limit] of Object.entries(options.limits ?? {})) {
    if (limit === undefined || ran === 0) continue;
    limits[key] = { limit, probabilityExceeded: rows.filter((r) => r[key as HeadlineKey]! > limit).length / ran };
  }
  return {
    shots: options.shots,
    seed: options.seed,
    inputs: summariseInputs(model),
    ran,
    invalid,
    failed,
    firstError,
    outcomes,
    results: Object.fromEntries(HEADLINE_KEYS.map((key) => [key, distributionOf(samples[key])])) as Record<HeadlineKey, Distribution | null>,
    target,
    limits,
    warnings,
    seconds,
    samples,
    sampleOutcomes,
  };
}
