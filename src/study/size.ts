/**
 * Bank sizing: the least stored energy that reaches a target muzzle velocity (or kinetic energy at exit) within
 * limits, over the charge voltage, the trigger times and the modules per group. Pure: the shot function is
 * injected (the real solver in the CLI, a closed-form stand-in in tests).
 *
 * Every group gets n modules (n = 1 … limits.modulesPerGroup, default 8 or the scenario's largest group) and the
 * charge voltages keep the scenario's ratios, scaled by one factor k. For each n the trigger times of groups 2…
 * and k are searched together (./sizeSearch.ts): at given triggers, k is the root of v(k) = required velocity, and
 * stored energy ∝ k², so the least energy is the least root over the triggers that keep every limit. Peak current
 * is a limit when limits.peakCurrent is given and, unless target.tieBreak is "none", the tie-break between designs
 * whose stored energies agree within 0.1 %. The feasible candidate of least stored energy wins.
 *
 * With tolerances or a calibration in the scenario the target is met at a confidence (target.confidence, default
 * 0.95): the nominal velocity must exceed the target by z·σ_v, z = Φ⁻¹(confidence), σ_v by linear propagation
 * (./propagate.ts) at the design itself, and the peak current, acceleration and action integral must stay z·σ below
 * their limits. σ depends on the design, so for each n the margin is iterated (search, propagate, re-solve) until it
 * settles; the reversal and charge-voltage limits apply to the nominal design.
 *
 * The binding limits are those that stop a cheaper design: modulesPerGroup when one more module per group would
 * store less energy (that design is sized too, to tell); a limit that alone keeps another module count from
 * storing less energy (for the charge voltage: the energy it would need at the voltage that reaches the target,
 * scaled as V²); a headline limit or the reversal when relaxing it by 5 % lets the search at the optimum's module
 * count find less energy; the charge voltage when the design sits at it. With no feasible design they are the
 * limits the nearest candidate breaks.
 */
import { normalQuantile } from '../core/normal.js';
import { NORMAL_REACH } from '../scenario/uncertainty.js';
import type { Scenario } from '../scenario/types.js';
import type { ShotResults } from '../solve/types.js';
import type { RunShot } from './headline.js';
import { propagateModel } from './propagate.js';
import { compareTrials, compassSearch, type LimitName, type LimitViolation, type SizingLimits, designOf, ENERGY_TIE, searchTriggers, tieBreakSearch, trialAt, type Headroom, type Requirement, type SearchContext, type Trial } from './sizeSearch.js';
import { uncertaintyModel } from './uncertainInputs.js';

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

export type { LimitName, LimitViolation, SizingLimits } from './sizeSearch.js';

/** What the design meets at the stated confidence (linear propagation at the design). */
export interface SizingConfidence {
  level: number;
  /** Φ⁻¹(level) */
  z: number;
  /** standard uncertainties at the design (SI) */
  sigma: { muzzleVelocity: number; peakCurrent: number; peakAcceleration: number; actionIntegral: number };
  /** nominal velocity − z σ_v: the velocity met with the stated probability */
  velocityAtConfidence: number;
}

export interface SizingCandidate {
  modulesPerGroup: number;
  /** per group (V) */
  chargeVoltages: number[];
  /** per group (s) */
  triggers: number[];
  storedEnergy: number;
  /** the required velocity was reached within the voltage limit */
  reached: boolean;
  results: ShotResults | null;
  violations: LimitViolation[];
  shots: number;
  confidence: SizingConfidence | null;
}

export interface SizingResult {
  feasible: boolean;
  targetVelocity: number;
  best: SizingCandidate | null;
  candidates: SizingCandidate[];
  /** the limits that stop a cheaper design (see above); with no feasible design, those the nearest candidate breaks */
  binding: LimitName[];
  /** the design with one module per group more than allowed, sized to tell whether the module count binds */
  beyondModuleLimit: SizingCandidate | null;
  /** the confidence the target is met with, or null for a nominal sizing (nothing uncertain) */
  confidence: number | null;
  notes: string[];
  /** the sized scenario (best candidate), SI */
  scenario: Scenario | null;
  shots: number;
}

export interface SizingOptions {
  /** relative tolerance on the muzzle velocity (default 1e-4, well inside 0.1 %) */
  tolerance?: number;
  /** shot budget for one module count (default 4000) */
  shotsPerCount?: number;
  optimiseTriggers?: boolean;
}

const DEFAULT_MAX_MODULES = 8;
const DEFAULT_CONFIDENCE = 0.95;
/** relax a limit by this much to see whether it binds */
const RELAX = 1.05;

export function targetVelocity(scenario: Scenario, target: SizingTarget): number {
  if (target.muzzleVelocity !== undefined) return target.muzzleVelocity;
  if (target.kineticEnergy !== undefined) return Math.sqrt((2 * target.kineticEnergy) / scenario.armature.mass);
  throw new Error('sizing target needs muzzleVelocity or kineticEnergy');
}

interface Sizer {
  base: Scenario;
  velocity: number;
  limits: SizingLimits;
  runShot: RunShot;
  settings: Required<SizingOptions>;
  tieBreak: boolean;
  /** z of the confidence, 0 for a nominal sizing */
  z: number;
}

function context(sizer: Sizer, modules: number, requirement: Requirement, limits = sizer.limits): SearchContext {
  const highest = Math.max(...sizer.base.bank.map((group) => group.voltage));
  return {
    base: sizer.base,
    modules,
    runShot: sizer.runShot,
    limits,
    requirement,
    maxScale: limits.chargeVoltage !== undefined ? limits.chargeVoltage / highest : Infinity,
    tolerance: sizer.settings.tolerance,
    budget: { shots: 0, limit: sizer.settings.shotsPerCount },
    triggerFloor: triggerFloors(sizer.base),
  };
}

/** A trigger with an absolute jitter tolerance must stay that far (±a, or 4σ) above 0, as the loader requires. */
function triggerFloors(scenario: Scenario): number[] {
  const floors = scenario.bank.map(() => 0);
  for (const tolerance of scenario.tolerances ?? []) {
    if (tolerance.relative) continue;
    const reach = tolerance.distribution === 'uniform' ? tolerance.spread : NORMAL_REACH * tolerance.spread;
    for (const target of tolerance.targets) {
      const match = /^bank\[(\d+)\]\.trigger$/.exec(target.path);
      if (match) floors[Number(match[1])] = reach;
    }
  }
  return floors;
}

/** The longest exit time of the starting designs: a trigger later than that cannot help. */
function triggerSpan(sizer: Sizer, modules: number, starts: Trial[]): number {
  const exits = starts.map((trial) => trial.results?.exitTime ?? 0).filter((t) => t > 0);
  if (exits.length > 0) return Math.max(...exits);
  const group = sizer.base.bank[0]!;
  const quarter = (Math.PI / 2) * Math.sqrt((group.inductance / modules + sizer.base.feed.inductance) * group.capacitance * modules);
  return 2 * sizer.base.bank.length * quarter;
}

/** The best design for n modules per group at this requirement: scan and compass search, or only the voltage. */
function searchCount(sizer: Sizer, ctx: SearchContext): Trial {
  const given = sizer.base.bank.map((group) => group.trigger);
  const initial = trialAt(ctx, given, 1);
  if (!sizer.settings.optimiseTriggers || sizer.base.bank.length === 1) return initial;
  const together = given.map((_, g) => (g === 0 ? given[0]! : Math.max(given[0]!, ctx.triggerFloor[g]!)));
  const simultaneous = trialAt(ctx, together, initial.scale);
  const span = triggerSpan(sizer, ctx.modules, [initial, simultaneous]);
  const start = compareTrials(initial, simultaneous) <= 0 ? initial : simultaneous;
  const best = searchTriggers(ctx, start, span, [given, together]);
  return sizer.tieBreak ? tieBreakSearch(ctx, best, span) : best;
}


/** σ of the headline results at a design, by linear propagation. */
function sigmaAt(sizer: Sizer, modules: number, trial: Trial): SizingConfidence['sigma'] | null {
  const design = designOf(sizer.base, modules, trial.scale, trial.triggers);
  const model = uncertaintyModel(design);
  if (!model) return null;
  const linear = propagateModel(design, model, sizer.runShot, { probeSpread: false });
  const s = linear.standardUncertainty;
  if (s.muzzleVelocity === null) return null;
  return { muzzleVelocity: s.muzzleVelocity, peakCurrent: s.peakCurrent ?? 0, peakAcceleration: s.peakAcceleration ?? 0, actionIntegral: s.actionIntegral ?? 0 };
}

function requirementFor(sizer: Sizer, sigma: SizingConfidence['sigma'] | null): Requirement {
  if (!sigma || sizer.z === 0) return { velocity: sizer.velocity, headroom: {} };
  const headroom: Headroom = { peakCurrent: sizer.z * sigma.peakCurrent, peakAcceleration: sizer.z * sigma.peakAcceleration, actionIntegral: sizer.z * sigma.actionIntegral };
  return { velocity: sizer.velocity + sizer.z * sigma.muzzleVelocity, headroom };
}

/**
 * Size n modules per group. At a confidence: search at the nominal target, then repeat — propagate at the design,
 * raise the requirement by z σ, search again from there (compass only, then the voltage only) — until the
 * required velocity moves by less than the tolerance.
 */
function sizeForCount(sizer: Sizer, modules: number, limits = sizer.limits, from?: Trial): { trial: Trial; confidence: SizingConfidence | null; shots: number } {
  let requirement: Requirement = from && sizer.z > 0 ? requirementFor(sizer, sigmaAt(sizer, modules, from)) : { velocity: sizer.velocity, headroom: {} };
  let ctx = context(sizer, modules, requirement, limits);
  let shots = 0;
  let trial = from ? compassSearch(ctx, trialAt(ctx, from.triggers, from.scale), triggerSpanOf(from, sizer, modules)) : searchCount(sizer, ctx);
  shots += ctx.budget.shots;
  let sigma: SizingConfidence['sigma'] | null = null;
  if (sizer.z > 0 && trial.reached) {
    for (let iteration = 0; iteration < 6; iteration++) {
      sigma = sigmaAt(sizer, modules, trial);
      shots += 1 + 2 * (uncertaintyModel(sizer.base)?.inputs.length ?? 0);
      const next = requirementFor(sizer, sigma);
      const moved = Math.abs(next.velocity - requirement.velocity);
      requirement = next;
      if (moved <= 0.5 * sizer.settings.tolerance * sizer.velocity && iteration > 0) break;
      ctx = context(sizer, modules, requirement, limits);
      trial = iteration === 0 && sizer.settings.optimiseTriggers && sizer.base.bank.length > 1 ? compassSearch(ctx, trialAt(ctx, trial.triggers, trial.scale), triggerSpanOf(trial, sizer, modules)) : trialAt(ctx, trial.triggers, trial.scale);
      shots += ctx.budget.shots;
      if (!trial.reached) break;
    }
    if (sizer.tieBreak && sizer.settings.optimiseTriggers && trial.reached) {
      ctx = context(sizer, modules, requirement, limits);
      trial = tieBreakSearch(ctx, trial, triggerSpanOf(trial, sizer, modules));
      shots += ctx.budget.shots;
    }
  }
  const confidence = sigma && sizer.z > 0 && trial.results
    ? { level: 0, z: sizer.z, sigma, velocityAtConfidence: trial.results.muzzleVelocity - sizer.z * sigma.muzzleVelocity }
    : null;
  return { trial, confidence, shots };
}

function triggerSpanOf(trial: Trial, sizer: Sizer, modules: number): number {
  return triggerSpan(sizer, modules, [trial]);
}

function candidateOf(sizer: Sizer, modules: number, sized: ReturnType<typeof sizeForCount>, level: number | null): SizingCandidate {
  const design = designOf(sizer.base, modules, sized.trial.scale, sized.trial.triggers);
  return {
    modulesPerGroup: modules,
    chargeVoltages: design.bank.map((group) => group.voltage),
    triggers: sized.trial.triggers,
    storedEnergy: sized.trial.storedEnergy,
    reached: sized.trial.reached,
    results: sized.trial.results,
    violations: sized.trial.violations,
    shots: sized.shots,
    confidence: sized.confidence && level !== null ? { ...sized.confidence, level } : null,
  };
}

function worstRatio(candidate: SizingCandidate): number {
  return Math.max(...candidate.violations.map((v) => (v.allowed > 0 && Number.isFinite(v.allowed) ? v.value / v.allowed : Infinity)));
}

const RELAXABLE = ['peakCurrent', 'peakAcceleration', 'actionIntegral', 'reversal'] as const;

/** The limits that stop a cheaper design at the optimum (see the header). */
function bindingLimits(sizer: Sizer, candidates: SizingCandidate[], best: SizingCandidate, bestTrial: Trial, beyond: SizingCandidate | null): { binding: LimitName[]; shots: number } {
  const binding: LimitName[] = [];
  let shots = 0;
  // another module count that only one limit keeps from storing less energy; a design short of the target at the
  // voltage limit would need about (V_needed/V_limit)² of its energy, so the voltage limit binds only when that is less
  for (const candidate of candidates) {
    const names = [...new Set(candidate.violations.map((v) => v.limit))];
    if (names.length !== 1 || names[0] === 'exit') continue;
    const needed = names[0] === 'chargeVoltage' ? candidate.storedEnergy * Math.max(1, ...candidate.violations.map((v) => v.value / v.allowed)) ** 2 : candidate.storedEnergy;
    if (needed < best.storedEnergy * (1 - ENERGY_TIE) && !binding.includes(names[0]!)) binding.push(names[0]!);
  }
  if (beyond && beyond.violations.length === 0 && beyond.storedEnergy < best.storedEnergy * (1 - ENERGY_TIE)) binding.push('modulesPerGroup');
  const results = best.results!;
  const valueOf: Record<(typeof RELAXABLE)[number], number> = {
    peakCurrent: results.peakCurrent + (best.confidence ? sizer.z * best.confidence.sigma.peakCurrent : 0),
    peakAcceleration: results.peakAcceleration + (best.confidence ? sizer.z * best.confidence.sigma.peakAcceleration : 0),
    actionIntegral: results.actionIntegral + (best.confidence ? sizer.z * best.confidence.sigma.actionIntegral : 0),
    reversal: Math.max(...results.modules.map((m, g) => m.reversal / (sizer.limits.reversal ?? sizer.base.bank[g]?.ratedReversal ?? Infinity))),
  };
  for (const name of RELAXABLE) {
    const allowed = name === 'reversal' ? 1 : sizer.limits[name];
    if (allowed === undefined || !(valueOf[name] >= 0.9 * allowed)) continue;
    const relaxed: SizingLimits = { ...sizer.limits };
    if (name === 'reversal') {
      relaxed.reversal = RELAX * Math.max(...results.modules.map((_, g) => sizer.limits.reversal ?? sizer.base.bank[g]?.ratedReversal ?? 0));
    } else relaxed[name] = RELAX * allowed;
    const again = sizeForCount(sizer, best.modulesPerGroup, relaxed, bestTrial);
    shots += again.shots;
    if (again.trial.violations.length === 0 && again.trial.storedEnergy < best.storedEnergy * (1 - ENERGY_TIE) && !binding.includes(name)) binding.push(name);
  }
  if (sizer.limits.chargeVoltage !== undefined && Math.max(...best.chargeVoltages) >= sizer.limits.chargeVoltage * (1 - 1e-3) && !binding.includes('chargeVoltage')) binding.push('chargeVoltage');
  return { binding, shots };
}

export function sizeBank(scenario: Scenario, target: SizingTarget, limits: SizingLimits, runShot: RunShot, options: SizingOptions = {}): SizingResult {
  const settings: Required<SizingOptions> = { tolerance: 1e-4, shotsPerCount: 4000, optimiseTriggers: true, ...options };
  const velocity = targetVelocity(scenario, target);
  const uncertain = uncertaintyModel(scenario) !== null;
  const notes: string[] = [];
  const level = uncertain ? target.confidence ?? DEFAULT_CONFIDENCE : null;
  if (uncertain && target.confidence === undefined) notes.push(`the scenario carries tolerances or a calibration: the target is met with ${DEFAULT_CONFIDENCE} probability (the default; set target.confidence)`);
  if (!uncertain && target.confidence !== undefined) notes.push('target.confidence has no effect: the scenario has no tolerances and no calibration, so the sizing is nominal');
  const sizer: Sizer = { base: scenario, velocity, limits, runShot, settings, tieBreak: target.tieBreak !== 'none', z: level === null ? 0 : normalQuantile(level) };
  const largest = Math.max(...scenario.bank.map((group) => group.count));
  const maxModules = limits.modulesPerGroup ?? Math.max(DEFAULT_MAX_MODULES, largest);
  const candidates: SizingCandidate[] = [];
  const trials: Trial[] = [];
  for (let modules = 1; modules <= maxModules; modules += 1) {
    const sized = sizeForCount(sizer, modules);
    trials.push(sized.trial);
    candidates.push(candidateOf(sizer, modules, sized, level));
  }
  let shots = candidates.reduce((sum, candidate) => sum + candidate.shots, 0);
  const feasible = candidates.filter((candidate) => candidate.violations.length === 0);
  // the least stored energy; within 0.1 % of it, the least peak current (the tie-break), else the fewest modules
  const least = Math.min(...feasible.map((candidate) => candidate.storedEnergy));
  const tied = feasible.filter((candidate) => candidate.storedEnergy <= least * (1 + ENERGY_TIE));
  const best = tied.reduce<SizingCandidate | null>((winner, candidate) => (!winner || (sizer.tieBreak && candidate.results!.peakCurrent < winner.results!.peakCurrent) ? candidate : winner), null);
  if (!best) {
    const nearest = candidates.reduce((winner, candidate) => (worstRatio(candidate) < worstRatio(winner) ? candidate : winner));
    return { feasible: false, targetVelocity: velocity, best: null, candidates, binding: [...new Set(nearest.violations.map((v) => v.limit))], beyondModuleLimit: null, confidence: level, notes, scenario: null, shots };
  }
  let beyond: SizingCandidate | null = null;
  if (best.modulesPerGroup === maxModules) {
    const sized = sizeForCount(sizer, maxModules + 1);
    beyond = candidateOf(sizer, maxModules + 1, sized, level);
    shots += sized.shots;
  }
  const found = bindingLimits(sizer, candidates, best, trials[best.modulesPerGroup - 1]!, beyond);
  shots += found.shots;
  const sized = structuredClone(scenario);
  sized.bank.forEach((group, g) => {
    group.count = best.modulesPerGroup;
    group.voltage = best.chargeVoltages[g]!;
    group.trigger = best.triggers[g]!;
  });
  return { feasible: true, targetVelocity: velocity, best, candidates, binding: found.binding, beyondModuleLimit: beyond, confidence: level, notes, scenario: sized, shots };
}
