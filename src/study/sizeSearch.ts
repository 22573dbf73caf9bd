/**
 * The search inside one module count of `railpulse size` (./size.ts): for trigger times t, the least charge-voltage
 * scale k*(t) that reaches the required velocity (a bracketed Illinois root, to the velocity tolerance); stored
 * energy ∝ k*², so the least energy is the least k* over the triggers that keep every limit. Pure: the shot
 * function is injected.
 *
 * Triggers of groups 2… range over [0, span], span the longest exit time among the starting designs (a trigger
 * after the armature has left cannot help). A coarse scan (a grid over the free triggers, or seeded points when
 * there are four or more) finds the basins; a compass search from the best two, with steps halving from an eighth
 * to 1/2048 of the span, settles each. Trials are ranked: a design within the limits beats one outside them; among
 * designs within them the lower stored energy wins; among designs outside them the smaller worst excess wins.
 * The tie-break is a second search, anchored to the least energy found: the least peak current among the designs
 * within the limits whose stored energy is at most 0.1 % above that least energy (anchored, so that a chain of
 * "equal" steps can never walk uphill in energy).
 */
import type { Scenario } from '../scenario/types.js';
import type { ShotResults } from '../solve/types.js';
import type { RunShot } from './headline.js';
import { counterUniform } from './prng.js';

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

export type LimitName = 'peakCurrent' | 'peakAcceleration' | 'actionIntegral' | 'reversal' | 'chargeVoltage' | 'exit' | 'modulesPerGroup';

export interface LimitViolation {
  limit: LimitName;
  value: number;
  allowed: number;
}

/** Stored energies within this fraction count as equal (then the tie-break decides). */
export const ENERGY_TIE = 1e-3;
const TRIAL_MAX_STEPS = 20_000;
/** a design at a limit is within it; this absorbs rounding of the SI value */
const LIMIT_SLACK = 1e-9;

export type Headroom = Partial<Record<'peakCurrent' | 'peakAcceleration' | 'actionIntegral', number>>;

export interface Requirement {
  /** the nominal muzzle velocity a design must reach (the target, plus a margin at a confidence) */
  velocity: number;
  /** margins taken off the headline limits at a confidence (SI) */
  headroom: Headroom;
}

export interface Trial {
  scale: number;
  triggers: number[];
  /** null when the solver could not finish the shot */
  results: ShotResults | null;
  reached: boolean;
  /** highest velocity seen when the target was not reached (at the voltage limit) */
  storedEnergy: number;
  violations: LimitViolation[];
  /** largest value/allowed over the violations; 0 within every limit */
  worst: number;
}

export interface SearchContext {
  base: Scenario;
  modules: number;
  runShot: RunShot;
  limits: SizingLimits;
  requirement: Requirement;
  /** the highest voltage scale the charge-voltage limit allows */
  maxScale: number;
  /** relative tolerance on the velocity */
  tolerance: number;
  budget: { shots: number; limit: number };
  /** earliest trigger of each group: 0, or the reach of its jitter tolerance (a trigger must stay ≥ 0 over it) */
  triggerFloor: number[];
}

/** How trials are ranked: by stored energy, or by peak current among designs up to an energy cap. */
export type Ranking = { by: 'energy' } | { by: 'peakCurrent'; energyCap: number };
export const BY_ENERGY: Ranking = { by: 'energy' };

export function designOf(base: Scenario, modules: number, scale: number, triggers: readonly number[]): Scenario {
  const scenario = structuredClone(base);
  scenario.bank.forEach((group, g) => {
    group.count = modules;
    group.voltage = base.bank[g]!.voltage * scale;
    group.trigger = triggers[g]!;
  });
  return scenario;
}

export function storedEnergy(scenario: Scenario): number {
  return scenario.bank.reduce((sum, group) => sum + 0.5 * group.count * group.capacitance * group.voltage ** 2, 0);
}

function shot(ctx: SearchContext, scale: number, triggers: readonly number[]): ShotResults | null {
  ctx.budget.shots += 1;
  const scenario = designOf(ctx.base, ctx.modules, scale, triggers);
  // a normal shot takes tens of steps; a trial the solver cannot finish should fail fast, not run to 1e6 steps
  scenario.solver.maxSteps = Math.min(scenario.solver.maxSteps, TRIAL_MAX_STEPS);
  try {
    return ctx.runShot(scenario, { waveforms: false }).results;
  } catch {
    return null;
  }
}

export function violationsOf(scenario: Scenario, results: ShotResults | null, limits: SizingLimits, headroom: Headroom = {}): LimitViolation[] {
  if (!results) return [{ limit: 'exit', value: NaN, allowed: scenario.rails.length }];
  const found: LimitViolation[] = [];
  const check = (limit: LimitViolation['limit'], value: number, allowed: number | undefined): void => {
    if (allowed !== undefined && value > allowed * (1 + LIMIT_SLACK)) found.push({ limit, value, allowed });
  };
  if (results.outcome !== 'exited') found.push({ limit: 'exit', value: results.finalPosition, allowed: scenario.rails.length });
  check('peakCurrent', results.peakCurrent + (headroom.peakCurrent ?? 0), limits.peakCurrent);
  check('peakAcceleration', results.peakAcceleration + (headroom.peakAcceleration ?? 0), limits.peakAcceleration);
  check('actionIntegral', results.actionIntegral + (headroom.actionIntegral ?? 0), limits.actionIntegral);
  check('chargeVoltage', Math.max(...scenario.bank.map((group) => group.voltage)), limits.chargeVoltage);
  results.modules.forEach((module, g) => check('reversal', module.reversal, limits.reversal ?? scenario.bank[g]?.ratedReversal));
  return found;
}

/**
 * The least scale that reaches `velocity` at these triggers: the root of v(k) − velocity, accepted on its reaching
 * side (0 ≤ v − velocity ≤ tolerance · velocity), by the Illinois method on a bracket; or the trial at the highest
 * allowed scale when the target cannot be reached there.
 */
function solveScale(ctx: SearchContext, triggers: readonly number[], start: number): { scale: number; results: ShotResults | null; reached: boolean } {
  const velocity = ctx.requirement.velocity;
  const accept = ctx.tolerance * velocity;
  const at = (scale: number) => {
    const results = shot(ctx, scale, triggers);
    return { scale, results, f: (results?.muzzleVelocity ?? NaN) - velocity };
  };
  const done = (trial: ReturnType<typeof at>, reached: boolean) => ({ scale: trial.scale, results: trial.results, reached });
  const good = (f: number): boolean => f >= 0 && f <= accept;
  let a = at(Math.min(start, ctx.maxScale));
  if (good(a.f)) return done(a, true);
  if (!Number.isFinite(a.f)) return done(a, false);
  // bracket, guessing the next scale from v ∝ k (a little beyond, so that one step usually brackets)
  let b = a;
  for (let i = 0; i < 40 && (a === b || Math.sign(a.f) === Math.sign(b.f)); i++) {
    if (b.f < 0 && b.scale >= ctx.maxScale) return done(b, false);
    const v = b.f + velocity;
    const guess = v > 0 ? Math.min(2, Math.max(0.5, (velocity / v) * (b.f < 0 ? 1.02 : 0.98))) : 1.5;
    a = b;
    b = at(b.f < 0 ? Math.min(ctx.maxScale, b.scale * guess) : b.scale * guess);
    if (!Number.isFinite(b.f)) return done(b, false);
    if (good(b.f)) return done(b, true);
  }
  if (Math.sign(a.f) === Math.sign(b.f)) return done(b, b.f >= 0);
  // keep `low` below the target and `high` above it
  let [low, high] = a.f < 0 ? [a, b] : [b, a];
  let fLow = low.f;
  let fHigh = high.f;
  let side = 0;
  for (let i = 0; i < 60; i++) {
    const secant = (low.scale * fHigh - high.scale * fLow) / (fHigh - fLow);
    const inside = Number.isFinite(secant) && secant > low.scale && secant < high.scale;
    const c = at(inside ? secant : (low.scale + high.scale) / 2);
    if (!Number.isFinite(c.f)) return done(c, false);
    if (good(c.f)) return done(c, true);
    if (c.f > 0) {
      high = c;
      fHigh = c.f;
      if (side === 1) fLow /= 2;
      side = 1;
    } else {
      low = c;
      fLow = c.f;
      if (side === -1) fHigh /= 2;
      side = -1;
    }
    if (high.scale - low.scale <= 1e-12 * high.scale) break;
  }
  return done(high, true);
}

/** A design at these triggers, with the voltage solved for the requirement. */
export function trialAt(ctx: SearchContext, triggers: readonly number[], start: number): Trial {
  const solved = solveScale(ctx, triggers, start);
  const design = designOf(ctx.base, ctx.modules, solved.scale, triggers);
  let violations = violationsOf(design, solved.results, ctx.limits, ctx.requirement.headroom);
  if (!solved.reached) {
    // the voltage limit stops the design short of the target (a shot that then does not exit is the same story):
    // the value is the voltage it would need if velocity grew in proportion (an estimate, for the ranking)
    violations = violations.filter((v) => v.limit !== 'exit' && v.limit !== 'chargeVoltage');
    const highest = Math.max(...design.bank.map((group) => group.voltage));
    violations.push({ limit: 'chargeVoltage', value: (highest * ctx.requirement.velocity) / Math.max(solved.results?.muzzleVelocity ?? 0, 1e-9), allowed: ctx.limits.chargeVoltage ?? highest });
  }
  const worst = violations.length === 0 ? 0 : Math.max(...violations.map((v) => (v.allowed > 0 && Number.isFinite(v.value / v.allowed) ? v.value / v.allowed : Infinity)));
  return { scale: solved.scale, triggers: [...triggers], results: solved.results, reached: solved.reached, storedEnergy: storedEnergy(design), violations, worst };
}

/** Negative when `a` is the better design. */
export function compareTrials(a: Trial, b: Trial, ranking: Ranking = BY_ENERGY): number {
  const feasibleA = a.violations.length === 0;
  const feasibleB = b.violations.length === 0;
  if (feasibleA !== feasibleB) return feasibleA ? -1 : 1;
  if (!feasibleA) return a.worst - b.worst || a.storedEnergy - b.storedEnergy;
  if (ranking.by === 'energy') return a.storedEnergy - b.storedEnergy;
  const underA = a.storedEnergy <= ranking.energyCap;
  const underB = b.storedEnergy <= ranking.energyCap;
  if (underA !== underB) return underA ? -1 : 1;
  if (!underA) return a.storedEnergy - b.storedEnergy;
  return a.results!.peakCurrent - b.results!.peakCurrent || a.storedEnergy - b.storedEnergy;
}

const exhausted = (ctx: SearchContext): boolean => ctx.budget.shots >= ctx.budget.limit;

/** Compass search over the free triggers (groups 2…), from `start`. */
export function compassSearch(ctx: SearchContext, start: Trial, span: number, ranking: Ranking = BY_ENERGY, firstStep = span / 8): Trial {
  let best = start;
  let step = firstStep;
  while (step >= span / 2048 && !exhausted(ctx)) {
    let improved = false;
    for (let g = 1; g < best.triggers.length && !exhausted(ctx); g++) {
      for (const direction of [1, -1]) {
        const moved = [...best.triggers];
        moved[g] = Math.min(span, Math.max(ctx.triggerFloor[g]!, moved[g]! + direction * step));
        if (moved[g] === best.triggers[g]) continue;
        const trial = trialAt(ctx, moved, best.scale);
        if (compareTrials(trial, best, ranking) < 0) {
          best = trial;
          improved = true;
          break;
        }
      }
    }
    if (!improved) step /= 2;
  }
  return best;
}

/** Starting trigger sets for the scan: a grid over [0, span] per free trigger (seeded points beyond three). */
export function scanPoints(groups: number, firstTrigger: number, span: number, extra: number[][]): number[][] {
  const free = groups - 1;
  const points: number[][] = [...extra];
  if (free <= 3) {
    const perAxis = free === 1 ? 9 : free === 2 ? 5 : 4;
    const axis = Array.from({ length: perAxis }, (_, i) => (span * i) / (perAxis - 1));
    const total = perAxis ** free;
    for (let index = 0; index < total; index++) {
      const point = [firstTrigger];
      for (let d = 0, rest = index; d < free; d++, rest = Math.floor(rest / perAxis)) point.push(axis[rest % perAxis]!);
      points.push(point);
    }
  } else {
    for (let index = 0; index < 48; index++) points.push([firstTrigger, ...Array.from({ length: free }, (_, d) => span * counterUniform(17, index, d))]);
  }
  return points;
}

/** The best design for this module count: scan, then compass searches from the best two distinct starts. */
export function searchTriggers(ctx: SearchContext, initial: Trial, span: number, extra: number[][]): Trial {
  if (ctx.base.bank.length === 1) return initial;
  let scale = initial.scale;
  const scanned = [initial];
  for (const point of scanPoints(ctx.base.bank.length, ctx.base.bank[0]!.trigger, span, extra)) {
    if (exhausted(ctx)) break;
    const trial = trialAt(ctx, point.map((t, g) => (g === 0 ? t : Math.max(t, ctx.triggerFloor[g]!))), scale);
    if (trial.reached) scale = trial.scale;
    scanned.push(trial);
  }
  scanned.sort((a, b) => compareTrials(a, b));
  const starts = scanned.filter((trial, i) => i === 0 || trial.triggers.some((t, g) => Math.abs(t - scanned[0]!.triggers[g]!) > span / 16)).slice(0, 2);
  return starts.map((start) => compassSearch(ctx, start, span)).reduce((best, trial) => (compareTrials(trial, best) < 0 ? trial : best));
}

/** The tie-break: from the least-energy design, the least peak current within 0.1 % of its energy. */
export function tieBreakSearch(ctx: SearchContext, best: Trial, span: number): Trial {
  if (best.violations.length > 0 || ctx.base.bank.length === 1) return best;
  return compassSearch(ctx, best, span, { by: 'peakCurrent', energyCap: best.storedEnergy * (1 + ENERGY_TIE) }, span / 32);
}
