/**
 * Calibrate a scenario to a measured shot: choose values of a few scenario parameters (by path) so that the
 * model's waveforms, probe arrival positions and muzzle velocity match the measurement, with uncertainties
 * and correlations from the linearised covariance (./lsq.ts). The residuals are in ./residuals.ts.
 *
 * Switching instants (./switching.ts): samples closer than one sample interval to a switching instant of
 * the model are left out, and every residual goes through Huber's loss (threshold 3 noise units). The set
 * left out depends on where the model puts its events, which moves with the parameters; a set that changed
 * inside a Levenberg–Marquardt run would make its objective jump. So the fit runs in outer iterations: the
 * set (with the window and, for a long record, the blocks of ./points.ts) is fixed from the model at the
 * start of each Levenberg–Marquardt run and re-evaluated at its end; the fit stops when the set no longer
 * changes (at most MAX_OUTER_ITERATIONS runs, with a warning if it still moved). The samples the Huber loss
 * down-weighted at the optimum are listed by time in the result.
 *
 * Each residual is "in units of its noise", so the covariance is (J̃ᵀJ̃)⁻¹ of the Huber-transformed
 * residuals (lsq noise 'known'): least squares' for the samples inside the threshold, and a down-weighted
 * sample contributes less information, as in the iteratively reweighted form of the same estimator. If the
 * model misses the data by more than the noise (χ²/ν > 1) the uncertainties are multiplied by √(χ²/ν) (the
 * Birge ratio); χ²/ν > 2 is also a warning.
 *
 * Parameters are fitted as p/s with s = |initial value| (or the bound range, or 1 when it is 0) so the
 * Jacobian columns are comparable. Default bounds: lower 0 for a non-negative initial value (every fitted
 * scenario quantity is a physical magnitude), upper +∞.
 *
 * Window: from the first measured sample (or `window.start`) to the model's end (or `window.end`). After a
 * stall or the end of a ring-down every current is below the floor and stays there, so the model is held at
 * its last values up to the record's end; after an exit or a timeout there is no model, and later samples are
 * not compared (and when only waveforms are fitted, each trial shot ends one interval after the record). The model's sample interval is lowered, if needed, to the record's median interval (but no
 * finer than 1/4000 of the record) so that interpolation adds no error worth mentioning.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import { InputError } from '../core/errors.js';
import { SIGNAL_NAMES, type Measurement, type PositionPoints } from './csv.js';
import { leastSquares, type LeastSquaresResult } from './lsq.js';
import { getScenarioPath } from '../scenario/paths.js';
import { planPoints, samePlan, signalPoints, usableSamples, type PointPlan } from './points.js';
import { groupResiduals, muzzleVelocityGroup, positionGroup, signalGroup, type Group, type ResidualGroup } from './residuals.js';
import { sampledLikeMeasurement } from './sampling.js';
import { HUBER_THRESHOLD, huberResidual, huberWeight, rangesSize, switchingInstants } from './switching.js';
import { estimateNoise, largestMagnitude, median, medianInterval } from './waveform.js';

export type { ResidualGroup } from './residuals.js';
export { positionsAt } from './residuals.js';

export interface FreeParameter {
  path: string;
  lower?: number;
  upper?: number;
}

export interface FitNoise extends Partial<Record<'I' | 'V_breech' | 'V_muzzle', number>> {
  /** probe arrival-time uncertainty (s) */
  arrivalTime?: number;
  /** muzzle velocity uncertainty (m/s) */
  muzzleVelocity?: number;
}

export interface FitOptions {
  scenario: Scenario;
  measurement?: Measurement;
  free: FreeParameter[];
  positions?: PositionPoints;
  muzzleVelocity?: number;
  /** weight per group (default 1); 0 leaves the group out */
  weights?: Partial<Record<ResidualGroup, number>>;
  noise?: FitNoise;
  window?: { start?: number; end?: number };
  maxIterations?: number;
  /** relative finite-difference step on the scaled parameters (default 1e-5, central): well above the solver's relTol */
  jacobianStep?: number;
  /** most points per signal before the record is decimated into block means (default 20,000) */
  maxPointsPerSignal?: number;
  /** leave out samples near switching instants (default true; false only to compare with the plain fit) */
  switchingRule?: boolean;
  runShot: (scenario: Scenario) => Shot;
  setPath: (scenario: Scenario, path: string, value: number) => Scenario;
  getPath?: (scenario: Scenario, path: string) => number;
}

export interface FittedParameter {
  value: number;
  /** one standard uncertainty (SI); NaN on a bound */
  uncertainty: number;
  initial: number;
  atBound: boolean;
}

export interface GroupResidual {
  /** RMS of the weighted, noise-normalised residuals (before the Huber loss) */
  rms: number;
  /** RMS of model − measured in SI (A, V, m, m/s) over the points */
  rmsSI: number;
  /** σ of one sample (SI) */
  noise: number;
  /** points compared (a block of a decimated record counts once) */
  points: number;
  /** measured samples those points hold */
  samples: number;
}

/** A point the Huber loss counted with less than full weight at the optimum. */
export interface DownWeighted {
  group: ResidualGroup;
  /** time of the sample (or the mean time of a block, or a probe's arrival time); null for the muzzle velocity */
  t: number | null;
  /** the measured value compared there (SI): a sample, a block mean, a probe position */
  measured: number;
  /** weighted residual (model − measured)/σ, in noise units */
  residual: number;
  /** Huber weight c/|r| */
  weight: number;
}

export interface SampleUse {
  /** the record's median sample interval Δt (s) */
  interval: number;
  /** the model's switching instants the rule was applied at (s) */
  instants: number[];
  /** times of the samples left out: closer than Δt to a switching instant */
  excluded: number[];
  /** samples of the record outside the compared window (before its start or after the model's end) */
  outsideWindow: number;
  huberThreshold: number;
  downWeighted: DownWeighted[];
  /** samples per block when the record was decimated (1: every sample compared) */
  blockSize: number;
  /** Levenberg–Marquardt runs, each with the set of samples fixed */
  outerIterations: number;
}

export interface FitResult {
  parameters: Record<string, FittedParameter>;
  /** 'pathA|pathB' → correlation coefficient, each pair once */
  correlations: Record<string, number>;
  residual: { rms: number; chiSquaredReduced: number; perGroup: Partial<Record<ResidualGroup, GroupResidual>> };
  samples: SampleUse;
  /** √(χ²/ν) applied to the uncertainties, or 1 */
  uncertaintyScale: number;
  warnings: string[];
  iterations: number;
  shots: number;
  converged: boolean;
  message: string;
  scenario: Scenario;
  shot: Shot;
}

const MAX_OUTER_ITERATIONS = 6;
/** P(|z| > 3) for a standard normal z: the share of points beyond the Huber threshold from noise alone */
const GAUSSIAN_TAIL = 0.0026998;
const DEFAULT_MAX_POINTS = 20_000;

export function fitScenario(options: FitOptions): FitResult {
  const getPath = options.getPath ?? getScenarioPath;
  if (options.free.length === 0) throw new InputError('fit', 'no free parameters: name at least one scenario path to fit');
  const initial = options.free.map((f) => getPath(options.scenario, f.path));
  const lower = options.free.map((f, i) => f.lower ?? (initial[i]! >= 0 ? 0 : -Infinity));
  const upper = options.free.map((f) => f.upper ?? Infinity);
  const scale = initial.map((value, i) => (value !== 0 ? Math.abs(value) : Number.isFinite(upper[i]! - lower[i]!) ? upper[i]! - lower[i]! : 1));
  const warnings: string[] = [];
  options.free.forEach((f, i) => {
    if (initial[i] === 0 && !Number.isFinite(upper[i]! - lower[i]!)) {
      warnings.push(`${f.path} starts at 0 with no upper bound, so the fit has no scale for it; give a typical starting value or bounds`);
    }
  });

  const base = withinRecord(sampledLikeMeasurement(options.scenario, options.measurement), options);
  const scenarioAt = (q: number[]): Scenario => q.reduce((s, qi, i) => options.setPath(s, options.free[i]!.path, qi * scale[i]!), base);
  const signals = measuredSignals(options, warnings);
  const interval = options.measurement ? medianInterval(options.measurement.t) : NaN;
  const planAt = (shot: Shot): PointPlan | null => (signals.length > 0 ? planFor(options, shot, interval) : null);

  let shots = 1;
  let q = initial.map((v, i) => v / scale[i]!);
  let shot = options.runShot(scenarioAt(q));
  let plan = planAt(shot);
  let fit: LeastSquaresResult | undefined;
  let groups: Group[] = [];
  let outer = 0;
  let settled = false;
  const refusals: string[] = [];
  while (outer < MAX_OUTER_ITERATIONS && !settled) {
    outer++;
    groups = buildGroups(options, signals, plan);
    if (groups.length === 0) throw new InputError('fit', 'nothing to fit to: give a measurement with signals, probe positions or a muzzle velocity (a weight of 0 leaves a signal out)');
    const scratch: number[] = [];
    const residuals = (p: number[]): number[] => {
      shots++;
      let trial: Shot;
      try {
        trial = options.runShot(scenarioAt(p));
      } catch (error) {
        // a parameter set the model refuses (e.g. a zero inductance) is a rejected step, not the end of the fit
        refusals.push(error instanceof Error ? error.message : String(error));
        return [NaN];
      }
      return groupResiduals(groups, trial, scratch).map((r) => huberResidual(r));
    };
    fit = leastSquares({
      residuals,
      p0: q,
      lower: lower.map((v, i) => v / scale[i]!),
      upper: upper.map((v, i) => v / scale[i]!),
      typicalSize: initial.map(() => 1),
      maxIterations: options.maxIterations ?? 50,
      ...(options.jacobianStep !== undefined ? { jacobianStep: options.jacobianStep } : {}),
      noise: 'known',
    });
    q = fit.p;
    shots++;
    shot = options.runShot(scenarioAt(q));
    const next = planAt(shot);
    settled = plan === null || next === null || samePlan(plan, next);
    if (!settled) plan = next;
  }
  if (!settled) {
    warnings.push(`the samples left out near switching instants still changed after ${MAX_OUTER_ITERATIONS} fits (an event moving across a sample); the last set was used`);
  }
  const result = fit!;
  const scenario = scenarioAt(q);
  const chiSquaredReduced = result.degreesOfFreedom > 0 ? result.residualNorm ** 2 / result.degreesOfFreedom : NaN;
  const uncertaintyScale = chiSquaredReduced > 1 ? Math.sqrt(chiSquaredReduced) : 1;
  if (chiSquaredReduced > 2) {
    warnings.push(`the model misses the measurement by more than its noise (χ²/ν = ${chiSquaredReduced.toPrecision(3)}); uncertainties are scaled by √(χ²/ν) = ${uncertaintyScale.toPrecision(3)} and reflect the misfit`);
  }
  const names = options.free.map((f) => f.path);
  const parameters: Record<string, FittedParameter> = {};
  names.forEach((name, i) => {
    parameters[name] = {
      value: result.p[i]! * scale[i]!,
      uncertainty: result.standardErrors[i]! * scale[i]! * uncertaintyScale,
      initial: initial[i]!,
      atBound: result.atBound[i]!,
    };
    if (result.atBound[i]) warnings.push(`${name} stopped on its bound ${fmt(result.p[i]! * scale[i]!)}; its uncertainty is not defined`);
  });
  const correlations: Record<string, number> = {};
  names.forEach((a, i) => names.forEach((b, j) => j > i && (correlations[`${a}|${b}`] = result.correlations[i]![j]!)));
  for (const [i, j, r] of result.correlatedPairs) {
    warnings.push(`${names[i]} and ${names[j]} are not separately identifiable from this measurement (correlation ${r.toFixed(3)}): fix one of them or add a measurement that tells them apart`);
  }
  if (!result.converged) warnings.push(`the fit did not converge: ${result.message}`);
  if (refusals.length > 0) warnings.push(`the model refused ${refusals.length} trial parameter set(s) during the fit (first: ${refusals[0]}); those steps were rejected`);

  const { perGroup, downWeighted, rms } = summarise(groups, shot, signals);
  // Gaussian noise alone puts 0.27 % of the points beyond 3σ: warn only well above that (Poisson margin)
  const expected = GAUSSIAN_TAIL * result.residuals.length;
  if (downWeighted.length > expected + 3 * Math.sqrt(expected) + 3) {
    warnings.push(`${downWeighted.length} point(s) lie beyond ${HUBER_THRESHOLD} noise units at the optimum, where noise alone would put about ${Math.round(expected)}: they were down-weighted (Huber loss); look at them (listed) before trusting the fit`);
  }
  return {
    parameters,
    correlations,
    residual: { rms, chiSquaredReduced, perGroup },
    samples: sampleUse(options.measurement, plan, shot, interval, downWeighted, outer, options.switchingRule !== false),
    uncertaintyScale,
    warnings,
    iterations: result.iterations,
    shots,
    converged: result.converged,
    message: result.message,
    scenario,
    shot,
  };
}

/**
 * When only waveforms are fitted, the model past the record's end is never compared: end each trial shot
 * one sample interval after the record (a slow armature can take far longer than the record to exit).
 */
function withinRecord(scenario: Scenario, options: FitOptions): Scenario {
  const t = options.measurement?.t;
  const needsWholeShot = (options.positions && options.positions.x.length > 0 && (options.weights?.position ?? 1) > 0) || (options.muzzleVelocity !== undefined && (options.weights?.muzzleVelocity ?? 1) > 0);
  if (!t || t.length < 2 || needsWholeShot) return scenario;
  const end = t[t.length - 1]! + medianInterval(t);
  if (!(end > 0) || end >= scenario.solver.endTime) return scenario;
  return { ...scenario, solver: { ...scenario.solver, endTime: end } };
}

interface MeasuredSignal {
  name: (typeof SIGNAL_NAMES)[number];
  values: Measurement['t'];
  weight: number;
  /** σ of one sample: given by the user, or estimated from the whole record */
  noise: number;
  given: boolean;
}

/** The measured signals that take part (weight > 0), with a usable noise level. */
function measuredSignals(options: FitOptions, warnings: string[]): MeasuredSignal[] {
  const measurement = options.measurement;
  if (!measurement) return [];
  const out: MeasuredSignal[] = [];
  for (const name of SIGNAL_NAMES) {
    const values = measurement.signals[name];
    const weight = options.weights?.[name] ?? 1;
    if (!values || weight === 0) continue;
    const given = options.noise?.[name];
    let noise = given ?? estimateNoise(values);
    if (!(noise > 0)) {
      const peak = largestMagnitude(values);
      noise = peak > 0 ? 1e-6 * peak : 1;
      warnings.push(`the noise of ${name} estimated as 0 (quantised or synthetic data?); using ${fmt(noise)} — give it explicitly`);
    }
    out.push({ name, values, weight, noise, given: given !== undefined });
  }
  return out;
}

/** The window and the samples the rule leaves out, at this model. */
function planFor(options: FitOptions, shot: Shot, interval: number): PointPlan {
  const measurement = options.measurement!;
  const t = measurement.t;
  const lastModelTime = shot.waveforms?.t.at(-1) ?? Infinity;
  // after a stall or a ring-down's end every current stays below the floor: the held model holds
  const held = shot.results.outcome === 'stalled' || (shot.results.outcome as string) === 'discharged';
  const modelEnd = held ? Infinity : lastModelTime;
  const window = { start: options.window?.start ?? t[0]!, end: Math.min(options.window?.end ?? Infinity, modelEnd) };
  const instants = options.switchingRule === false ? [] : switchingInstants(shot);
  const plan = planPoints(t, window, instants, Number.isFinite(interval) ? interval : 0, options.maxPointsPerSignal ?? DEFAULT_MAX_POINTS);
  if (usableSamples(plan) === 0) {
    const us = (x: number): string => `${Number((x * 1e6).toPrecision(6))} µs`;
    const span = `${us(window.start)} to ${Number.isFinite(window.end) ? us(window.end) : 'the record\'s end'}`;
    throw new InputError(
      '',
      `no usable samples: of ${t.length} samples, ${plan.to - plan.from} lie in the compared span (${span}) and ${rangesSize(plan.excluded)} of those are closer than one sample interval to a switching instant of the model (Δt = ${us(interval)}); compare a record of the shot itself, or check its time offset (--offset t=…)`,
      measurement.source,
    );
  }
  return plan;
}

function buildGroups(options: FitOptions, signals: MeasuredSignal[], plan: PointPlan | null): Group[] {
  const groups: Group[] = [];
  const weight = (name: ResidualGroup): number => options.weights?.[name] ?? 1;
  if (plan && options.measurement) {
    for (const s of signals) groups.push(signalGroup(s.name, signalPoints(options.measurement.t, s.values, plan, s.noise, s.given), s.weight));
  }
  if (options.positions && options.positions.x.length > 0 && weight('position') > 0) {
    groups.push(positionGroup(options.positions, options.noise?.arrivalTime ?? 1e-6, weight('position')));
  }
  if (options.muzzleVelocity !== undefined && weight('muzzleVelocity') > 0) {
    const measured = options.muzzleVelocity;
    groups.push(muzzleVelocityGroup(measured, options.noise?.muzzleVelocity ?? 0.01 * Math.abs(measured), weight('muzzleVelocity')));
  }
  return groups;
}

/** Per-group residual figures and the down-weighted points, at the final shot. */
function summarise(groups: Group[], shot: Shot, signals: MeasuredSignal[]) {
  const residuals = groupResiduals(groups, shot);
  const perGroup: Partial<Record<ResidualGroup, GroupResidual>> = {};
  const downWeighted: DownWeighted[] = [];
  let offset = 0;
  let sumSquares = 0;
  for (const g of groups) {
    const model = g.model(shot);
    let squares = 0;
    let squaresSI = 0;
    let samples = 0;
    for (let j = 0; j < g.measured.length; j++) {
      const r = residuals[offset + j]!;
      squares += r * r;
      squaresSI += (model[j]! - g.measured[j]!) ** 2;
      samples += g.samples?.[j] ?? 1;
      if (huberWeight(r) < 1) downWeighted.push({ group: g.name, t: Number.isFinite(g.times[j]!) ? g.times[j]! : null, measured: g.measured[j]!, residual: r, weight: huberWeight(r) });
    }
    const points = g.measured.length;
    offset += points;
    sumSquares += squares;
    const signal = signals.find((s) => s.name === g.name);
    const sampleNoise = signal ? signal.noise : median(g.noise);
    perGroup[g.name] = { rms: Math.sqrt(squares / points), rmsSI: Math.sqrt(squaresSI / points), noise: sampleNoise, points, samples };
  }
  downWeighted.sort((a, b) => (a.t ?? Infinity) - (b.t ?? Infinity));
  return { perGroup, downWeighted, rms: Math.sqrt(sumSquares / Math.max(1, residuals.length)) };
}

function sampleUse(measurement: Measurement | undefined, plan: PointPlan | null, shot: Shot, interval: number, downWeighted: DownWeighted[], outer: number, rule: boolean): SampleUse {
  const excluded: number[] = [];
  if (measurement && plan) for (const [a, b] of plan.excluded) for (let i = a; i < b; i++) excluded.push(measurement.t[i]!);
  return {
    interval,
    instants: rule ? switchingInstants(shot) : [],
    excluded,
    outsideWindow: measurement && plan ? measurement.t.length - (plan.to - plan.from) : 0,
    huberThreshold: HUBER_THRESHOLD,
    downWeighted,
    blockSize: plan?.blockSize ?? 1,
    outerIterations: outer,
  };
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
