/**
 * Bank sizing: the least stored energy that reaches a target muzzle velocity (or kinetic energy at exit) within
 * limits. Pure: the shot function is injected (the real solver in the CLI, a closed-form stand-in in tests).
 *
 * Search: for each candidate number of modules per group n (every group gets n modules), the charge voltages are
 * scaled by one factor k (keeping their ratios) and k is solved as the root of muzzleVelocity(k) − target by the
 * Illinois method (bracketed regula falsi) to 1e-4 of the target. With several groups, the trigger times of groups
 * 2… are then moved by a coordinate search (steps halving from a quarter period) to the least peak current, the
 * voltage re-solved at every trial; group g fires within g half periods of the start (beyond that the pulses no longer
 * overlap, so a later trigger cannot flatten the current). Limits are checked on each candidate's final design; the feasible candidate
 * with the least stored energy wins. All work is bounded in shots.
 */
import type { Scenario } from '../scenario/types.js';
import type { ShotResults } from '../solve/types.js';
import type { RunShot } from './batch.js';

export interface SizingTarget {
  /** m/s at exit */
  muzzleVelocity?: number;
  /** J at exit (converted with the armature mass) */
  kineticEnergy?: number;
  /** with tolerances or a calibration: the probability with which the target must be met (0 < p < 1) */
  confidence?: number;
  /** among designs of equal stored energy, prefer the lower peak current (default) or take the first found */
  tieBreak?: 'peakCurrent' | 'none';
}

export interface SizingLimits {
  peakCurrent?: number;
  peakAcceleration?: number;
  actionIntegral?: number;
  /** capacitor voltage reversal as a fraction of V0 (default: each group's ratedReversal) */
  reversal?: number;
  /** highest charge voltage of any group (V) */
  chargeVoltage?: number;
  /** most modules in a group (default: 8, or the scenario's largest group if larger) */
  modulesPerGroup?: number;
}

export type LimitName = 'peakCurrent' | 'peakAcceleration' | 'actionIntegral' | 'reversal' | 'chargeVoltage' | 'exit';

export interface LimitViolation {
  limit: LimitName;
  value: number;
  allowed: number;
}

export interface SizingCandidate {
  modulesPerGroup: number;
  /** per group (V) */
  chargeVoltages: number[];
  /** per group (s) */
  triggers: number[];
  storedEnergy: number;
  /** the target was reached within the voltage limit */
  reached: boolean;
  results: ShotResults | null;
  violations: LimitViolation[];
  shots: number;
}

export interface SizingResult {
  feasible: boolean;
  targetVelocity: number;
  best: SizingCandidate | null;
  candidates: SizingCandidate[];
  /** the limits that stop the design: violated by the nearest candidate when infeasible; nearest to binding otherwise */
  binding: LimitName[];
  /** the sized scenario (best candidate), SI */
  scenario: Scenario | null;
  shots: number;
}

export interface SizingOptions {
  /** relative tolerance on the muzzle velocity (default 1e-4, well inside 0.1 %) */
  tolerance?: number;
  /** shot budget for one module count (default 800) */
  shotsPerCount?: number;
  optimiseTriggers?: boolean;
}

const DEFAULT_MAX_MODULES = 8;
const TRIAL_MAX_STEPS = 20_000;
/** Group g fires no later than g half periods after the start: a later stagger no longer overlaps the pulses. */
const MAX_STAGGER_HALF_PERIODS = 1;

export function targetVelocity(scenario: Scenario, target: SizingTarget): number {
  if (target.muzzleVelocity !== undefined) return target.muzzleVelocity;
  if (target.kineticEnergy !== undefined) return Math.sqrt((2 * target.kineticEnergy) / scenario.armature.mass);
  throw new Error('sizing target needs muzzleVelocity or kineticEnergy');
}

interface Trial {
  scale: number;
  results: ShotResults;
}

/** Shots for one candidate design, counted against a budget. */
function makeEvaluator(base: Scenario, modules: number, runShot: RunShot, budget: number) {
  let shots = 0;
  return {
    get shots() {
      return shots;
    },
    exhausted: () => shots >= budget,
    design(scale: number, triggers: number[]): Scenario {
      const scenario = structuredClone(base);
      scenario.bank.forEach((group, g) => {
        group.count = modules;
        group.voltage = base.bank[g]!.voltage * scale;
        group.trigger = triggers[g]!;
      });
      return scenario;
    },
    shot(scale: number, triggers: number[]): ShotResults {
      shots += 1;
      // A normal shot takes tens of steps; a trial the solver cannot finish should fail fast, not run to 1e6 steps.
      const scenario = this.design(scale, triggers);
      scenario.solver.maxSteps = Math.min(scenario.solver.maxSteps, TRIAL_MAX_STEPS);
      return runShot(scenario, { waveforms: false }).results;
    },
  };
}
type Evaluator = ReturnType<typeof makeEvaluator>;

/**
 * Solve muzzleVelocity(scale) = target. Returns the trial at the root, or the trial at the highest allowed scale when
 * the target cannot be reached (reached = false).
 */
function solveScale(evaluate: Evaluator, triggers: number[], target: number, start: number, maxScale: number, tolerance: number, growth: number): { trial: Trial; reached: boolean } {
  const at = (scale: number): Trial => ({ scale, results: evaluate.shot(scale, triggers) });
  const error = (trial: Trial): number => trial.results.muzzleVelocity - target;
  let a = at(Math.min(start, maxScale));
  if (Math.abs(error(a)) <= tolerance * target) return { trial: a, reached: true };
  let b = a;
  // Bracket: step the scale by `growth` towards the target until the sign changes (or the voltage limit is hit).
  for (let i = 0; i < 60 && Math.sign(error(a)) === Math.sign(error(b)); i += 1) {
    if (error(b) < 0) {
      if (b.scale >= maxScale) return { trial: b, reached: false };
      a = b;
      b = at(Math.min(b.scale * growth, maxScale));
    } else {
      a = b;
      b = at(b.scale / growth);
    }
  }
  if (Math.sign(error(a)) === Math.sign(error(b))) return { trial: b, reached: error(b) >= 0 };
  // Illinois: regula falsi that halves the weight of an end kept twice, so both ends converge.
  let fa = error(a);
  let fb = error(b);
  let side = 0;
  for (let i = 0; i < 60; i += 1) {
    const falsePosition = (a.scale * fb - b.scale * fa) / (fb - fa);
    // Equal end values (or a degenerate bracket) give no usable secant: bisect instead.
    const inside = Number.isFinite(falsePosition) && falsePosition > Math.min(a.scale, b.scale) && falsePosition < Math.max(a.scale, b.scale);
    const scale = inside ? falsePosition : (a.scale + b.scale) / 2;
    const c = at(scale);
    const fc = error(c);
    if (Math.abs(fc) <= tolerance * target || Math.abs(b.scale - a.scale) <= 1e-12 * scale) return { trial: c, reached: true };
    if (Math.sign(fc) === Math.sign(fb)) {
      b = c;
      fb = fc;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = c;
      fa = fc;
      if (side === 1) fb /= 2;
      side = 1;
    }
  }
  const best = Math.abs(fa) < Math.abs(fb) ? a : b;
  return { trial: best, reached: Math.abs(error(best)) <= tolerance * target };
}

function quarterPeriod(scenario: Scenario, modules: number): number {
  const group = scenario.bank[0]!;
  return (Math.PI / 2) * Math.sqrt((group.inductance / modules + scenario.feed.inductance) * group.capacitance * modules);
}

function violations(scenario: Scenario, results: ShotResults, limits: SizingLimits): LimitViolation[] {
  const found: LimitViolation[] = [];
  const check = (limit: LimitName, value: number, allowed: number | undefined): void => {
    if (allowed !== undefined && value > allowed) found.push({ limit, value, allowed });
  };
  if (results.outcome !== 'exited') found.push({ limit: 'exit', value: results.finalPosition, allowed: scenario.rails.length });
  check('peakCurrent', results.peakCurrent, limits.peakCurrent);
  check('peakAcceleration', results.peakAcceleration, limits.peakAcceleration);
  check('actionIntegral', results.actionIntegral, limits.actionIntegral);
  check('chargeVoltage', Math.max(...scenario.bank.map((group) => group.voltage)), limits.chargeVoltage);
  results.modules.forEach((module, g) => check('reversal', module.reversal, limits.reversal ?? scenario.bank[g]?.ratedReversal));
  return found;
}

function sizeForCount(base: Scenario, modules: number, target: number, limits: SizingLimits, runShot: RunShot, options: Required<SizingOptions>): SizingCandidate {
  const evaluate = makeEvaluator(base, modules, runShot, options.shotsPerCount);
  const highest = Math.max(...base.bank.map((group) => group.voltage));
  const maxScale = limits.chargeVoltage !== undefined ? limits.chargeVoltage / highest : Infinity;
  let triggers = base.bank.map((group) => group.trigger);
  let solved = solveScale(evaluate, triggers, target, 1, maxScale, options.tolerance, 1.5);
  if (solved.reached && options.optimiseTriggers && base.bank.length > 1) {
    const objective = (trial: { trial: Trial; reached: boolean }): number => (trial.reached ? trial.trial.results.peakCurrent : Infinity);
    const initialStep = quarterPeriod(base, modules);
    let step = initialStep;
    while (step > initialStep / 64 && !evaluate.exhausted()) {
      let improved = false;
      for (let g = 1; g < triggers.length && !evaluate.exhausted(); g += 1) {
        for (const direction of [1, -1]) {
          const moved = [...triggers];
          moved[g] = Math.min(g * MAX_STAGGER_HALF_PERIODS * 2 * initialStep, Math.max(0, moved[g]! + direction * step));
          if (moved[g] === triggers[g]) continue;
          let trial: { trial: Trial; reached: boolean };
          try {
            trial = solveScale(evaluate, moved, target, solved.trial.scale, maxScale, options.tolerance, 1.05);
          } catch {
            continue; // a stagger the solver cannot complete is simply not an improvement
          }
          if (objective(trial) < objective(solved)) {
            triggers = moved;
            solved = trial;
            improved = true;
            break;
          }
        }
      }
      if (!improved) step /= 2;
    }
  }
  const design = evaluate.design(solved.trial.scale, triggers);
  const found = violations(design, solved.trial.results, limits);
  if (!solved.reached && !found.some((v) => v.limit === 'chargeVoltage')) {
    found.push({ limit: 'chargeVoltage', value: Math.max(...design.bank.map((group) => group.voltage)), allowed: limits.chargeVoltage ?? Infinity });
  }
  return {
    modulesPerGroup: modules,
    chargeVoltages: design.bank.map((group) => group.voltage),
    triggers,
    storedEnergy: design.bank.reduce((sum, group) => sum + 0.5 * group.count * group.capacitance * group.voltage ** 2, 0),
    reached: solved.reached,
    results: solved.trial.results,
    violations: found,
    shots: evaluate.shots,
  };
}

function worstRatio(candidate: SizingCandidate): number {
  return Math.max(...candidate.violations.map((v) => (v.allowed > 0 && Number.isFinite(v.allowed) ? v.value / v.allowed : Infinity)));
}

/** Which limit is closest to binding in a feasible design (largest value/limit). */
function nearestLimit(candidate: SizingCandidate, limits: SizingLimits): LimitName[] {
  const results = candidate.results;
  if (!results) return [];
  const ratios: [LimitName, number][] = [];
  if (limits.peakCurrent) ratios.push(['peakCurrent', results.peakCurrent / limits.peakCurrent]);
  if (limits.peakAcceleration) ratios.push(['peakAcceleration', results.peakAcceleration / limits.peakAcceleration]);
  if (limits.actionIntegral) ratios.push(['actionIntegral', results.actionIntegral / limits.actionIntegral]);
  if (limits.chargeVoltage) ratios.push(['chargeVoltage', Math.max(...candidate.chargeVoltages) / limits.chargeVoltage]);
  ratios.sort((x, y) => y[1] - x[1]);
  return ratios.length > 0 ? [ratios[0]![0]] : [];
}

export function sizeBank(scenario: Scenario, target: SizingTarget, limits: SizingLimits, runShot: RunShot, options: SizingOptions = {}): SizingResult {
  const settings: Required<SizingOptions> = { tolerance: 1e-4, shotsPerCount: 800, optimiseTriggers: true, ...options };
  const velocity = targetVelocity(scenario, target);
  const largest = Math.max(...scenario.bank.map((group) => group.count));
  const maxModules = limits.modulesPerGroup ?? Math.max(DEFAULT_MAX_MODULES, largest);
  const candidates: SizingCandidate[] = [];
  for (let modules = 1; modules <= maxModules; modules += 1) {
    candidates.push(sizeForCount(scenario, modules, velocity, limits, runShot, settings));
  }
  const feasible = candidates.filter((candidate) => candidate.violations.length === 0);
  const best = feasible.reduce<SizingCandidate | null>((winner, candidate) => (!winner || candidate.storedEnergy < winner.storedEnergy ? candidate : winner), null);
  const shots = candidates.reduce((sum, candidate) => sum + candidate.shots, 0);
  if (!best) {
    const nearest = candidates.reduce((winner, candidate) => (worstRatio(candidate) < worstRatio(winner) ? candidate : winner));
    return { feasible: false, targetVelocity: velocity, best: null, candidates, binding: [...new Set(nearest.violations.map((v) => v.limit))], scenario: null, shots };
  }
  const sized = structuredClone(scenario);
  sized.bank.forEach((group, g) => {
    group.count = best.modulesPerGroup;
    group.voltage = best.chargeVoltages[g]!;
    group.trigger = best.triggers[g]!;
  });
  return { feasible: true, targetVelocity: velocity, best, candidates, binding: nearestLimit(best, limits), scenario: sized, shots };
}
