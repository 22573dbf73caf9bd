/**
 * Calibrate a scenario to a measured shot: choose values of a few scenario parameters (by path) so that the
 * model's waveforms, probe arrival positions and muzzle velocity match the measurement in the
 * least-squares sense, with uncertainties and correlations from the linearised covariance (./lsq.ts).
 *
 * Residuals, each dimensionless:
 *  - waveform s (I, V_breech, V_muzzle): w_s · (model_s(t_j) − y_s,j) / σ_s at every measured sample in
 *    the window; the model waveform is linearly interpolated at the measured times. σ_s is given (`noise`)
 *    or estimated from the measurement (./waveform.ts estimateNoise: MAD of second differences).
 *  - probe points: w · (x_model(t_i) − x_i) / σ_x,i with σ_x,i = v̂_i σ_t; v̂_i is the speed between the
 *    neighbouring measured points (fixed, so the residual stays a smooth function of the parameters) and σ_t
 *    the arrival-time uncertainty (`noise.arrivalTime`, default 1 µs — an assumption, say yours). A position
 *    residual rather than a time residual because x_model(t) exists even when the model armature falls short.
 *    After the model's last sample the armature is carried on at its last velocity (free flight).
 *  - muzzle velocity: w · (v_model − v_measured) / σ_v, σ_v = `noise.muzzleVelocity`, default 1 % of the
 *    measured value (an assumption, say yours).
 * Each residual is "in units of its noise", so the covariance is (JᵀJ)⁻¹ (lsq noise 'known'). If the model
 * misses the data by more than the noise (χ²/ν > 1) the uncertainties are multiplied by √(χ²/ν) (the Birge
 * ratio) so that they reflect the misfit too; χ²/ν > 2 is also a warning. A weight w ≠ 1 acts like σ/w.
 *
 * Parameters are fitted as p/s with s = |initial value| (or the bound range, or 1 when it is 0) so the
 * Jacobian columns are comparable. Default bounds: lower 0 for a non-negative initial value (every fitted
 * scenario quantity is a physical magnitude), upper +∞.
 * The samples used are those of the measurement inside `window` (default: from the first measured sample
 * up to the end of the initial model shot); their number stays fixed during the fit, and a model that ends
 * earlier holds its last value there. The model's sample interval is lowered, if needed, to the
 * measurement's median interval (but no finer than 1/4000 of the window) so interpolation adds no error.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot, Waveforms } from '../solve/types.js';
import { InputError } from '../core/errors.js';
import { SIGNAL_NAMES, type Measurement, type PositionPoints, type SignalName } from './csv.js';
import { leastSquares } from './lsq.js';
import { getScenarioPath } from '../scenario/paths.js';
import { interpolateSorted } from '../core/interpolate.js';
import { estimateNoise, median } from './waveform.js';

export interface FreeParameter {
  path: string;
  lower?: number;
  upper?: number;
}

export type ResidualGroup = SignalName | 'position' | 'muzzleVelocity';

export interface FitNoise extends Partial<Record<SignalName, number>> {
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
  weights?: Partial<Record<ResidualGroup, number>>;
  noise?: FitNoise;
  window?: { start?: number; end?: number };
  maxIterations?: number;
  /** relative finite-difference step on the scaled parameters (default 1e-5, central): well above the solver's relTol */
  jacobianStep?: number;
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
  /** RMS of the weighted, noise-normalised residuals */
  rms: number;
  /** RMS of model − measured in SI (A, V, m, m/s) */
  rmsSI: number;
  /** σ used (SI) */
  noise: number;
  points: number;
}

export interface FitResult {
  parameters: Record<string, FittedParameter>;
  /** 'pathA|pathB' → correlation coefficient, each pair once */
  correlations: Record<string, number>;
  residual: { rms: number; chiSquaredReduced: number; perGroup: Partial<Record<ResidualGroup, GroupResidual>> };
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

const SIGNAL_KEYS: Record<SignalName, keyof Pick<Waveforms, 'current' | 'breechVoltage' | 'muzzleVoltage'>> = {
  I: 'current',
  V_breech: 'breechVoltage',
  V_muzzle: 'muzzleVoltage',
};

interface Group {
  name: ResidualGroup;
  noise: number[];
  weight: number;
  measured: number[];
  model: (shot: Shot) => number[];
}

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

  const firstShot = options.runShot(options.scenario);
  const window = chooseWindow(options, firstShot);
  const base = withSampling(options.scenario, options.measurement, window);
  const scenarioAt = (q: number[]): Scenario => q.reduce((s, qi, i) => options.setPath(s, options.free[i]!.path, qi * scale[i]!), base);
  const groups = buildGroups(options, window, warnings);
  if (groups.length === 0) throw new InputError('fit', 'nothing to fit to: give a measurement with signals, probe positions or a muzzle velocity');

  let shots = 0;
  const refusals: string[] = [];
  const residualsOf = (shot: Shot): number[] =>
    groups.flatMap((g) => g.model(shot).map((value, j) => (g.weight * (value - g.measured[j]!)) / g.noise[j]!));
  const residuals = (q: number[]): number[] => {
    shots++;
    let shot: Shot;
    try {
      shot = options.runShot(scenarioAt(q));
    } catch (error) {
      // a parameter set the model refuses (e.g. a zero inductance) is a rejected step, not the end of the fit
      refusals.push(error instanceof Error ? error.message : String(error));
      return [NaN];
    }
    return residualsOf(shot);
  };

  const fit = leastSquares({
    residuals,
    p0: initial.map((v, i) => v / scale[i]!),
    lower: lower.map((v, i) => v / scale[i]!),
    upper: upper.map((v, i) => v / scale[i]!),
    typicalSize: initial.map(() => 1),
    maxIterations: options.maxIterations ?? 50,
    ...(options.jacobianStep !== undefined ? { jacobianStep: options.jacobianStep } : {}),
    noise: 'known',
  });

  const scenario = scenarioAt(fit.p);
  const shot = options.runShot(scenario);
  const chiSquaredReduced = fit.degreesOfFreedom > 0 ? fit.residualNorm ** 2 / fit.degreesOfFreedom : NaN;
  const uncertaintyScale = chiSquaredReduced > 1 ? Math.sqrt(chiSquaredReduced) : 1;
  if (chiSquaredReduced > 2) {
    warnings.push(`the model misses the measurement by more than its noise (χ²/ν = ${chiSquaredReduced.toPrecision(3)}); uncertainties are scaled by √(χ²/ν) = ${uncertaintyScale.toPrecision(3)} and reflect the misfit`);
  }
  const names = options.free.map((f) => f.path);
  const parameters: Record<string, FittedParameter> = {};
  names.forEach((name, i) => {
    parameters[name] = {
      value: fit.p[i]! * scale[i]!,
      uncertainty: fit.standardErrors[i]! * scale[i]! * uncertaintyScale,
      initial: initial[i]!,
      atBound: fit.atBound[i]!,
    };
    if (fit.atBound[i]) warnings.push(`${name} stopped on its bound ${fmt(fit.p[i]! * scale[i]!)}; its uncertainty is not defined`);
  });
  const correlations: Record<string, number> = {};
  names.forEach((a, i) => names.forEach((b, j) => j > i && (correlations[`${a}|${b}`] = fit.correlations[i]![j]!)));
  for (const [i, j, r] of fit.correlatedPairs) {
    warnings.push(`${names[i]} and ${names[j]} are not separately identifiable from this measurement (correlation ${r.toFixed(3)}): fix one of them or add a measurement that tells them apart`);
  }
  if (!fit.converged) warnings.push(`the fit did not converge: ${fit.message}`);
  if (refusals.length > 0) warnings.push(`the model refused ${refusals.length} trial parameter set(s) during the fit (first: ${refusals[0]}); those steps were rejected`);

  const finalResiduals = residualsOf(shot);
  const perGroup: Partial<Record<ResidualGroup, GroupResidual>> = {};
  let offset = 0;
  for (const g of groups) {
    const part = finalResiduals.slice(offset, offset + g.measured.length);
    offset += g.measured.length;
    const model = g.model(shot);
    perGroup[g.name] = { rms: rms(part), rmsSI: rms(model.map((v, j) => v - g.measured[j]!)), noise: median(g.noise), points: part.length };
  }
  return {
    parameters,
    correlations,
    residual: { rms: rms(finalResiduals), chiSquaredReduced, perGroup },
    uncertaintyScale,
    warnings,
    iterations: fit.iterations,
    shots: shots + 2,
    converged: fit.converged,
    message: fit.message,
    scenario,
    shot,
  };
}

function chooseWindow(options: FitOptions, firstShot: Shot): { start: number; end: number } {
  const t = options.measurement?.t ?? [];
  const modelEnd = firstShot.waveforms?.t.at(-1) ?? Infinity;
  return { start: options.window?.start ?? t[0] ?? 0, end: options.window?.end ?? modelEnd };
}

/** Sample the model at least as finely as the measurement, so that linear interpolation adds no error. */
function withSampling(scenario: Scenario, measurement: Measurement | undefined, window: { start: number; end: number }): Scenario {
  if (!measurement || measurement.t.length < 2) return scenario;
  const steps = measurement.t.slice(1).map((t, i) => t - measurement.t[i]!);
  const span = Math.min(window.end, measurement.t.at(-1)!) - window.start;
  const target = Math.max(median(steps), span / 4000);
  const current = scenario.solver.sampleInterval;
  if (current > 0 && current <= target) return scenario;
  return { ...scenario, solver: { ...scenario.solver, sampleInterval: target } };
}

function buildGroups(options: FitOptions, window: { start: number; end: number }, warnings: string[]): Group[] {
  const groups: Group[] = [];
  const weight = (name: ResidualGroup): number => options.weights?.[name] ?? 1;
  const measurement = options.measurement;
  if (measurement) {
    // a relative slack so that a sample written as 500 µs is not lost to rounding against a model ending at 5e-4 s
    const slack = 1e-9 * Math.max(Math.abs(window.start), Math.abs(window.end));
    const inWindow = measurement.t.map((_, j) => j).filter((j) => measurement.t[j]! >= window.start - slack && measurement.t[j]! <= window.end + slack);
    const times = inWindow.map((j) => measurement.t[j]!);
    for (const name of SIGNAL_NAMES) {
      const series = measurement.signals[name];
      if (!series || inWindow.length === 0) continue;
      const measured = inWindow.map((j) => series[j]!);
      let sigma = options.noise?.[name] ?? estimateNoise(measured);
      if (!(sigma > 0)) {
        const peak = Math.max(...measured.map(Math.abs));
        sigma = peak > 0 ? 1e-6 * peak : 1;
        warnings.push(`the noise of ${name} estimated as 0 (quantised or synthetic data?); using ${fmt(sigma)} — give it explicitly`);
      }
      const key = SIGNAL_KEYS[name];
      groups.push({
        name,
        noise: measured.map(() => sigma),
        weight: weight(name),
        measured,
        model: (shot) => interpolateSorted(waveformsOf(shot).t, waveformsOf(shot)[key], times),
      });
    }
  }
  const positions = options.positions;
  if (positions && positions.x.length > 0) {
    const sigmaT = options.noise?.arrivalTime ?? 1e-6;
    const speeds = probeSpeeds(positions);
    groups.push({
      name: 'position',
      noise: speeds.map((v) => v * sigmaT),
      weight: weight('position'),
      measured: positions.x,
      model: (shot) => positionsAt(waveformsOf(shot), positions.t),
    });
  }
  if (options.muzzleVelocity !== undefined) {
    const measured = options.muzzleVelocity;
    groups.push({
      name: 'muzzleVelocity',
      noise: [options.noise?.muzzleVelocity ?? 0.01 * Math.abs(measured)],
      weight: weight('muzzleVelocity'),
      measured: [measured],
      model: (shot) => [shot.results.muzzleVelocity],
    });
  }
  return groups;
}

function waveformsOf(shot: Shot): Waveforms {
  if (!shot.waveforms) throw new Error('runShot must return waveforms for a fit');
  return shot.waveforms;
}

/** Speed at each probe from its measured neighbours (central difference where it can). */
function probeSpeeds(points: PositionPoints): number[] {
  const { x, t } = points;
  if (x.length === 1) return [x[0]! / t[0]!];
  return x.map((_, i) => {
    const a = Math.max(0, i - 1);
    const b = Math.min(x.length - 1, i + 1);
    return (x[b]! - x[a]!) / (t[b]! - t[a]!);
  });
}

/** Model position at the given times; after the last sample the armature flies on at its last velocity. */
export function positionsAt(waveforms: Waveforms, times: readonly number[]): number[] {
  const tEnd = waveforms.t.at(-1)!;
  const inside = interpolateSorted(waveforms.t, waveforms.position, times);
  return times.map((t, i) => (t > tEnd ? waveforms.position.at(-1)! + waveforms.velocity.at(-1)! * (t - tEnd) : inside[i]!));
}

function rms(values: readonly number[]): number {
  return values.length ? Math.sqrt(values.reduce((s, v) => s + v * v, 0) / values.length) : NaN;
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
