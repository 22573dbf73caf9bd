/**
 * Linear propagation of the scenario's uncertain inputs (./uncertainInputs.ts) to the headline results of a shot:
 * σ_f² = J R Jᵀ, with J the Jacobian of the results with respect to the standardised inputs (a change per one σ
 * of each input) and R their correlation (GUM, JCGM 100:2008, §5.2, law of propagation of uncertainty).
 *
 * J is formed by the same finite-difference Jacobian the calibration uses (src/measure/lsq.ts): central
 * differences with a step of a tenth of each input's σ (large against the solver's tolerance, small against the
 * spread), but never below 1e-6 of the value. The same Jacobian, with the waveforms resampled on the nominal
 * shot's time grid as extra rows, gives the σ of the current and velocity at every instant (the record's bands).
 *
 * Honesty checks, each reported: the outcome (exit, stall, timeout) of every shot is compared with the nominal one;
 * if it changes within the differences the σ are not defined (null). Each input is also shot at the edge of its
 * spread (±a uniform, ±2σ normal): an outcome that changes there, or a response whose curvature there exceeds a
 * quarter of its slope, is named, since the linear σ then misstates the spread and the Monte Carlo is the better
 * tool. 1 + 4k shots for k inputs.
 */
import { interpolateSorted } from '../core/interpolate.js';
import { finiteDifferenceJacobian } from '../measure/lsq.js';
import type { Scenario } from '../scenario/types.js';
import type { Outcome, Shot } from '../solve/types.js';
import { HEADLINE_KEYS, headlineValues, type Headline, type HeadlineKey, type RunShot } from './headline.js';
import { movedPaths, reachOf, scenarioAt, uncertaintyModel, type InputSource, type UncertaintyModel } from './uncertainInputs.js';

export { HEADLINE_KEYS, headlineValues, type Headline, type HeadlineKey } from './headline.js';

/** step of the differences, in σ of the input */
const STEP_IN_SIGMA = 0.1;
/** smallest step relative to the value (the solver's results are good to ~1e-9 relative) */
const MIN_RELATIVE_STEP = 1e-6;
/** a response whose curvature over the spread exceeds this fraction of its slope is named */
const CURVATURE_LIMIT = 0.25;

function asHeadline(values: readonly (number | null)[]): Headline {
  return Object.fromEntries(HEADLINE_KEYS.map((key, i) => [key, values[i] === null || !Number.isFinite(values[i]!) ? null : values[i]!])) as Headline;
}

export interface InputSummary {
  name: string;
  source: InputSource;
  distribution: 'uniform' | 'normal';
  /** standard uncertainty (SI) of each value it moves */
  sigma: Record<string, number>;
}

export interface OutcomeChange {
  input: string;
  /** found by a difference step (next to the nominal values) or at the edge of the spread */
  stage: 'difference' | 'spread';
  /** where along the input, e.g. "+2σ" or "−a" */
  at: string;
  outcome: Outcome;
}

export interface Nonlinearity {
  result: HeadlineKey;
  input: string;
  /** (f(+r) + f(−r) − 2 f(0)) / (f(+r) − f(−r)) over the spread's reach r */
  curvature: number;
}

export interface WaveformSigma {
  /** the nominal shot's sample times */
  t: number[];
  current: number[];
  velocity: number[];
}

export interface LinearPropagation {
  nominal: Headline;
  /** one standard uncertainty of each result (SI); null where it is not defined */
  standardUncertainty: Headline;
  /** change of each result for +1σ of each input alone (SI), inputs in the order of `inputs` */
  sensitivities: Record<HeadlineKey, (number | null)[]>;
  inputs: InputSummary[];
  outcome: Outcome;
  outcomeChanges: OutcomeChange[];
  nonlinear: Nonlinearity[];
  /** calibrated values on a bound, whose uncertainty is unknown and not included */
  unquantified: string[];
  warnings: string[];
  shots: number;
  /** σ of the current and velocity on the nominal time grid (when asked for) */
  waveforms: WaveformSigma | null;
}

export interface PropagationOptions {
  /** also propagate to the current and velocity waveforms (runs every shot with waveforms) */
  waveforms?: boolean;
  /** the nominal shot, when the caller already has it (with waveforms if they are asked for) */
  nominal?: Shot;
  /** shoot each input at the edge of its spread (default true) */
  probeSpread?: boolean;
}

export function summariseInputs(model: UncertaintyModel): InputSummary[] {
  return model.inputs.map((input) => ({
    name: input.name,
    source: input.source,
    distribution: input.distribution,
    sigma: Object.fromEntries(input.targets.map((target) => [target.path, target.sigma])),
  }));
}

/** Linear propagation for a scenario with tolerances or a calibration; null when it has neither. */
export function propagateLinear(scenario: Scenario, runShot: RunShot, options: PropagationOptions = {}): LinearPropagation | null {
  const model = uncertaintyModel(scenario);
  return model ? propagateModel(scenario, model, runShot, options) : null;
}

export function propagateModel(scenario: Scenario, model: UncertaintyModel, runShot: RunShot, options: PropagationOptions = {}): LinearPropagation {
  const withWaveforms = options.waveforms ?? false;
  const moved = movedPaths(scenario, model);
  const nominalShot = options.nominal ?? runShot(scenario, { waveforms: withWaveforms });
  const grid = withWaveforms ? nominalShot.waveforms?.t ?? null : null;
  const outcome = nominalShot.results.outcome;
  let shots = options.nominal ? 0 : 1;
  const changes: OutcomeChange[] = [];
  const shootAt = (u: number[]): Shot => {
    shots += 1;
    return runShot(scenarioAt(scenario, moved, u), { waveforms: grid !== null });
  };
  const rowsOf = (shot: Shot): number[] => {
    const head = headlineValues(shot.results);
    if (!grid) return head;
    const w = shot.waveforms!;
    return [...head, ...interpolateSorted(w.t, w.current, grid), ...interpolateSorted(w.t, w.velocity, grid)];
  };

  const k = model.inputs.length;
  // the step floor, in σ: a relative step of MIN_RELATIVE_STEP on the value the input moves most gently
  const typical = model.inputs.map((input) =>
    Math.max(1, ...input.targets.map((target) => (MIN_RELATIVE_STEP * Math.abs(moved.find((m) => m.path === target.path)!.nominal)) / (STEP_IN_SIGMA * target.sigma))),
  );
  const centre = rowsOf(nominalShot);
  const jacobian = finiteDifferenceJacobian(
    (u) => {
      const shot = shootAt(u);
      if (shot.results.outcome !== outcome) {
        const j = u.findIndex((x) => x !== 0);
        changes.push({ input: model.inputs[j]!.name, stage: 'difference', at: `${u[j]! > 0 ? '+' : '−'}${Math.abs(u[j]!).toPrecision(2)}σ`, outcome: shot.results.outcome });
      }
      return rowsOf(shot);
    },
    new Array<number>(k).fill(0),
    centre,
    { lower: new Array<number>(k).fill(-Infinity), upper: new Array<number>(k).fill(Infinity), relStep: STEP_IN_SIGMA, typical, differences: 'central' },
  );
  const localChange = changes.length > 0;
  const sigmaOfRow = (row: readonly number[]): number | null => {
    let variance = 0;
    for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) variance += row[a]! * row[b]! * model.correlation[a]![b]!;
    return Number.isFinite(variance) && !localChange ? Math.sqrt(Math.max(0, variance)) : null;
  };
  const headlineSigma = HEADLINE_KEYS.map((_, r) => sigmaOfRow(jacobian[r]!));
  const sensitivities = Object.fromEntries(
    HEADLINE_KEYS.map((key, r) => [key, jacobian[r]!.map((d) => (Number.isFinite(d) && !localChange ? d : null))]),
  ) as Record<HeadlineKey, (number | null)[]>;

  const warnings: string[] = [];
  if (localChange) {
    const first = changes[0]!;
    warnings.push(`the outcome changes right at the nominal values (${outcome} nominally, ${first.outcome} at ${first.input} ${first.at}): linear propagation does not apply; run a Monte Carlo`);
  }
  const nonlinear: Nonlinearity[] = [];
  if (options.probeSpread ?? true) {
    model.inputs.forEach((input, j) => {
      const reach = reachOf(input);
      const label = input.distribution === 'uniform' ? 'a' : '2σ';
      const ends = [reach, -reach].map((x) => {
        const u = new Array<number>(k).fill(0);
        u[j] = x;
        const shot = shootAt(u);
        if (shot.results.outcome !== outcome) changes.push({ input: input.name, stage: 'spread', at: `${x > 0 ? '+' : '−'}${label}`, outcome: shot.results.outcome });
        return { outcome: shot.results.outcome, values: headlineValues(shot.results) };
      });
      if (ends.some((end) => end.outcome !== outcome)) return;
      HEADLINE_KEYS.forEach((result, r) => {
        const [up, down] = [ends[0]!.values[r]!, ends[1]!.values[r]!];
        const slope = up - down;
        const curvature = (up + down - 2 * centre[r]!) / slope;
        const share = headlineSigma[r] ? Math.abs(jacobian[r]![j]!) / headlineSigma[r]! : 0;
        // only worth saying for an input that matters to the result (a tenth of its σ or more)
        if (Number.isFinite(curvature) && Math.abs(curvature) > CURVATURE_LIMIT && share > 0.1) nonlinear.push({ result, input: input.name, curvature });
      });
    });
    const spread = changes.filter((change) => change.stage === 'spread');
    if (spread.length > 0) {
      warnings.push(`the outcome changes within the spread (${outcome} nominally; ${spread.map((c) => `${c.outcome} at ${c.input} ${c.at}`).join(', ')}): the linear σ describe only the ${outcome} shots; run a Monte Carlo for the share of each outcome`);
    }
    for (const n of nonlinear) {
      warnings.push(`${n.result} responds nonlinearly to ${n.input} over its spread (curvature ${(100 * n.curvature).toFixed(0)} % of the slope): the linear σ is approximate; a Monte Carlo gives the better interval`);
    }
  }
  if (model.unquantified.length > 0) warnings.push(`calibrated on a bound, with no uncertainty included: ${model.unquantified.join(', ')}`);

  let waveforms: WaveformSigma | null = null;
  if (grid) {
    const n = grid.length;
    const band = (offset: number): number[] => Array.from({ length: n }, (_, i) => sigmaOfRow(jacobian[offset + i]!) ?? NaN);
    waveforms = { t: grid, current: band(HEADLINE_KEYS.length), velocity: band(HEADLINE_KEYS.length + n) };
  }
  return {
    nominal: asHeadline(headlineValues(nominalShot.results)),
    standardUncertainty: asHeadline(headlineSigma),
    sensitivities,
    inputs: summariseInputs(model),
    outcome,
    outcomeChanges: changes,
    nonlinear,
    unquantified: model.unquantified,
    warnings,
    shots,
    waveforms,
  };
}
