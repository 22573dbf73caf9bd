/**
 * The uncertain inputs of a scenario, from its tolerances and its calibration, as one model that both the linear
 * propagation and the Monte Carlo read. Worker-safe (no units, no mathjs).
 *
 * Every input is a standardised variable u (mean 0, variance 1): uniform on [−√3, √3] for a uniform tolerance ±a
 * (σ = a/√3), normal otherwise. An input moves one or more scenario values: value = nominal + σ_path · u, and a
 * value whose default follows it (μ_s = μ) by the same amount. Tolerances are independent of each other and of the
 * calibration; the calibrated parameters are jointly normal with the correlation of their covariance.
 */
import { getPath, parsePath, setPath, type PathStep } from '../scenario/paths.js';
import type { Scenario } from '../scenario/types.js';

export type InputSource = 'tolerance' | 'calibration';

export interface InputTarget {
  path: string;
  /** values that move with it by the same amount */
  follows: string[];
  /** standard uncertainty of the value (SI) */
  sigma: number;
}

export interface UncertainInput {
  /** the path as written (bank[*].voltage for a common draw), or the concrete path */
  name: string;
  source: InputSource;
  distribution: 'uniform' | 'normal';
  targets: InputTarget[];
}

export interface UncertaintyModel {
  inputs: UncertainInput[];
  /** correlation matrix of the standardised inputs */
  correlation: number[][];
  /** calibrated values that sit on a bound: fitted, but with no uncertainty to propagate */
  unquantified: string[];
}

const SQRT3 = Math.sqrt(3);

function valueAt(scenario: Scenario, path: string): number {
  return getPath(scenario, parsePath(path)!) as number;
}

/** The scenario's uncertain inputs at its current values (relative spreads scale with them), or null if none. */
export function uncertaintyModel(scenario: Scenario): UncertaintyModel | null {
  const inputs: UncertainInput[] = [];
  for (const tolerance of scenario.tolerances ?? []) {
    const sigmaOf = (path: string): number => {
      const spread = tolerance.relative ? tolerance.spread * Math.abs(valueAt(scenario, path)) : tolerance.spread;
      return tolerance.distribution === 'uniform' ? spread / SQRT3 : spread;
    };
    const targets = tolerance.targets.map((target) => ({ path: target.path, follows: target.follows, sigma: sigmaOf(target.path) }));
    if (tolerance.common || targets.length === 1) {
      inputs.push({ name: tolerance.common ? tolerance.path : targets[0]!.path, source: 'tolerance', distribution: tolerance.distribution, targets });
    } else {
      for (const target of targets) inputs.push({ name: target.path, source: 'tolerance', distribution: tolerance.distribution, targets: [target] });
    }
  }
  const toleranceCount = inputs.length;
  const calibration = scenario.calibration;
  const calibrated: number[] = [];
  calibration?.parameters.forEach((parameter, i) => {
    const sigma = Math.sqrt(calibration.covariance[i]![i]!);
    if (!(sigma > 0)) return; // a value the fit pinned exactly moves nothing
    calibrated.push(i);
    inputs.push({ name: parameter.path, source: 'calibration', distribution: 'normal', targets: [{ path: parameter.path, follows: parameter.follows, sigma }] });
  });
  if (inputs.length === 0) return null;
  const correlation: number[][] = inputs.map((_, a) => inputs.map((__, b) => (a === b ? 1 : 0)));
  calibrated.forEach((i, a) => {
    calibrated.forEach((j, b) => {
      if (a === b) return;
      const covariance = calibration!.covariance;
      correlation[toleranceCount + a]![toleranceCount + b] = covariance[i]![j]! / Math.sqrt(covariance[i]![i]! * covariance[j]![j]!);
    });
  });
  return { inputs, correlation, unquantified: [...(calibration?.onBound ?? [])] };
}

export interface MovedPath {
  path: string;
  steps: PathStep[];
  nominal: number;
  /** which input moves it, and by how much per unit of that input (SI) */
  input: number;
  sigma: number;
}

/** Every scenario value the model moves (targets and their followers), once each. */
export function movedPaths(scenario: Scenario, model: UncertaintyModel): MovedPath[] {
  const moved: MovedPath[] = [];
  model.inputs.forEach((input, j) => {
    for (const target of input.targets) {
      for (const path of [target.path, ...target.follows]) {
        moved.push({ path, steps: parsePath(path)!, nominal: valueAt(scenario, path), input: j, sigma: target.sigma });
      }
    }
  });
  return moved;
}

/** The values of the moved paths for standardised inputs u. */
export function movedValues(moved: readonly MovedPath[], u: ArrayLike<number>): number[] {
  return moved.map((m) => m.nominal + m.sigma * u[m.input]!);
}

/** A copy of the scenario with the inputs at u (the input scenario is not changed). */
export function scenarioAt(scenario: Scenario, moved: readonly MovedPath[], u: ArrayLike<number>): Scenario {
  const copy = structuredClone(scenario);
  moved.forEach((m) => setPath(copy, m.steps, m.nominal + m.sigma * u[m.input]!));
  return copy;
}

/** How far the spread of an input reaches, in its own σ: the edge ±a of a uniform (√3 σ), ±2σ of a normal. */
export function reachOf(input: UncertainInput): number {
  return input.distribution === 'uniform' ? SQRT3 : 2;
}
