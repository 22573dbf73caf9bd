/**
 * The hybrid integrator: drives odex through the continuous phases of a shot, locates every event by root
 * finding on the dense output, applies it and restarts cleanly. Scenario in, Shot out; no I/O.
 */
import type { Scenario } from '../scenario/types.js';
import {
  type Mode,
  type Plant,
  LOSS_ORDER,
  derivativesInto,
  evolvingComponents,
  initialMode,
  initialState,
  isConducting,
  makePlant,
  Stage,
} from '../model/plant.js';
import { QUADRATURE, ledger, quadratureIntegrands } from '../model/ledger.js';
import { type EventSpec, crossed, watchedEvents } from '../model/events.js';
import { applyEvent, isStalled, settle } from '../model/transitions.js';
import { emptyObservables, observe, observeInto, type Observables } from '../model/observables.js';
import { createSolver, OUTCOME_MAX_STEPS, type Dense } from './odex.js';
import { brentRoot } from './roots.js';
import { createPeakTracker, createWaveformRecorder } from './record.js';
import { gaussLegendre } from '../core/quadrature.js';
import { absoluteTolerances, fastestDecay, timeScale } from './scaling.js';
import type { EventKind, Losses, Outcome, Shot, ShotEvent } from './types.js';
import { InputError } from '../core/errors.js';
import { phaseSwitch, type ShotProfile } from './profile.js';

export interface RunOptions {
  /** keep waveforms (default true); studies turn them off */
  waveforms?: boolean;
  /** accumulate where the time goes (benchmark only; see profile.ts) */
  profile?: ShotProfile;
}

/** Points per accepted step at which event functions and peak derivatives are sampled before bracketing. */
const SAMPLES_PER_STEP = 4;
/** Work bounds: a shot that needs more than this is reported as an integration failure, never a hang. */
const MAX_EVENTS = 10_000;
/** First step of the first odex run, in units of the time scale (see lastStep in runShot). */
const FIRST_STEP = 0.1;
/** Restarts with a shorter first step after a step overflowed, and how much shorter each is. */
const MAX_OVERFLOW_RETRIES = 8;
const OVERFLOW_STEP_FACTOR = 1e-3;
/** Step cap in units of the fastest loop time constant (see fastestDecay). */
const STEP_CAP_DECAYS = 4;
/**
 * Gauss–Legendre points per step for the quadratures (losses, action, impulse) on the dense output. The step is
 * limited by odex's accuracy on the same smooth solution, so the integrands (squares and products of the state)
 * are well resolved: 8 points (exact to degree 15) agree with 16 to rounding on every demo, 6 points to 1e-13.
 */
const STEP_RULE = gaussLegendre(8);
/**
 * Waveform samples: the quadratures between successive samples inside a step use Simpson's rule on segments
 * shorter than this fraction of the step (error ~ (segment·ω)⁴/2880, far below the ledger's 1e-6), the full
 * step rule on longer ones. Results never use these partial sums: each step's total comes from STEP_RULE.
 */
const SIMPSON_SEGMENT_FRACTION = 1 / 32;

/** An integration that could not complete, with the time and state where it stopped. */
export class IntegrationError extends InputError {
  constructor(problem: string) {
    super('solver', problem);
  }
}

const EVENT_ORDER: Record<string, number> = { 'turn-off': 0, crowbar: 1, stop: 2, transition: 3, trigger: 4, 'turn-on': 5, start: 6, floor: 7, exit: 8 };

interface Located {
  time: number;
  state: number[];
  /** quadratures at the event */
  quadratures: Float64Array;
  specs: EventSpec[];
}

export function runShot(scenario: Scenario, options: RunOptions = {}): Shot {
  const enter = phaseSwitch(options.profile);
  const plant = makePlant(scenario);
  const ix = plant.index;
  const relTol = scenario.solver.relTol;
  const endTime = scenario.solver.endTime;
  const sampleInterval = scenario.solver.sampleInterval;
  const keepWaveforms = options.waveforms !== false;
  const scale = timeScale(plant);
  const tolerances = absoluteTolerances(plant, relTol);
  const stepBudget = scenario.solver.maxSteps;
  const maxStepSize = (STEP_CAP_DECAYS * fastestDecay(plant)) / scale;

  const core = ix.size;
  let t = 0;
  let y = initialState(plant);
  /** quadratures (layout QUADRATURE) at t */
  let q: Float64Array = new Float64Array(QUADRATURE.size);
  const mode: Mode = initialMode(plant);
  const events: ShotEvent[] = [];
  const log = (kind: string, group: number) => {
    if (kind === 'floor') return;
    events.push(group >= 0 ? { t, kind: kind as EventKind, group } : { t, kind: kind as EventKind });
  };
  const recorder = keepWaveforms ? createWaveformRecorder(plant) : null;
  const tracker = createPeakTracker(plant, mode);
  let steps = 0;
  let evaluations = 0;
  let restarts = 0;
  let nextSample = sampleInterval > 0 ? sampleInterval : Infinity;
  /**
   * First step of each odex run, in scaled time. A restart is where odex spends most (its first step climbs
   * through the extrapolation table from order 2), and a good first step makes it cheap: the step the
   * integrator had reached before the event, which suits the smooth solution after it; for the very first run,
   * a tenth of the time scale (the fastest quarter period). odex rejects and shrinks a step that is too long.
   */
  let lastStep = FIRST_STEP;
  /** time and state of the last accepted step, for the message of a failed integration */
  let reached = { t: 0, y: [] as number[] };
  const rates = new Array<number>(core);
  const integrand = new Float64Array(QUADRATURE.size);
  const sum = new Float64Array(QUADRATURE.size);

  // Buffers reused by every step of the shot (a shot allocates per restart, not per step or per sample): slot 0
  // holds the state at the start of a step, slots 1…SAMPLES_PER_STEP its samples, the last an event's instant;
  // each slot has its observables and event-function values.
  const slots = SAMPLES_PER_STEP + 2;
  const states: number[][] = Array.from({ length: slots }, () => new Array<number>(core).fill(0));
  const seen: Observables[] = Array.from({ length: slots }, () => emptyObservables(plant.groups));
  const values: Float64Array[] = Array.from({ length: slots }, () => new Float64Array(0));
  const times = new Float64Array(slots);
  /** the dense state at a root-finding iterate, and its observables */
  const probe = new Array<number>(core).fill(0);
  const probeSeen = emptyObservables(plant.groups);
  const qStep = new Float64Array(QUADRATURE.size);

  /** Count and record the state at an event instant; called on both sides of every event. */
  const instantSeen = emptyObservables(plant.groups);
  const instant = () => {
    const was = enter('recording');
    const o = observeInto(plant, y, mode, instantSeen);
    tracker.observePoint(t, y, o);
    recorder?.record(t, y, q, mode, o);
    enter(was);
  };

  instant();
  settle(plant, t, y, mode, log);
  instant();
  // a ring-down ends where a launch would stall: nothing moves, nothing pending, every current below the floor
  const settled: Outcome = plant.shorted ? 'discharged' : 'stalled';
  let outcome: Outcome | null = isStalled(plant, y, mode) ? settled : null;

  /** events that fired at the current instant: not to fire again at the restart point */
  let justFired = new Set<string>();
  let locatedCount = 0;
  /** the armature transition, when it happened */
  let transition: { t: number; x: number } | null = null;
  let overflowRetries = 0;
  while (outcome === null) {
    enter('restart');
    if (locatedCount > MAX_EVENTS) {
      throw new IntegrationError(`more than ${MAX_EVENTS} events by t = ${t} s; the shot does not settle`);
    }
    const specs = watchedEvents(plant, mode);
    const specCount = specs.length;
    // odex carries only the components that change in this mode; the others keep their values from `base`
    const active = evolvingComponents(plant, mode);
    const dimension = active.length;
    const idle = !mode.moving && !mode.stage.some(isConducting);
    const base = y.slice();
    const full = y.slice();
    const node = y.slice();
    const reducedRates = new Array<number>(dimension);
    // odex 2.0.4 copies the returned array into its own buffer at once (its `F` wrapper), so one buffer serves
    // every call.
    const rhs = (_tau: number, reduced: number[]): number[] => {
      const was = enter('rhs');
      for (let j = 0; j < dimension; j++) full[active[j]!] = reduced[j]!;
      derivativesInto(plant, full, mode, rates);
      for (let j = 0; j < dimension; j++) reducedRates[j] = rates[active[j]!]! * scale;
      enter(was);
      return reducedRates;
    };
    const expand = (reduced: ArrayLike<number>): number[] => {
      const s = base.slice();
      for (let j = 0; j < dimension; j++) s[active[j]!] = reduced[j]!;
      return s;
    };
    let located: Located | null = null;
    // the sample slots start each run as the restart state (odex writes only the evolving components)
    if (values[0]!.length < specCount) for (let k = 0; k < slots; k++) values[k] = new Float64Array(specCount);
    for (let k = 0; k < slots; k++) copyInto(y, states[k]!);
    copyInto(y, probe);
    // A function that has just crossed sits at ~0 at the restart; count it as on its far side so rounding
    // cannot make it fire again at the same instant.
    for (let n = 0; n < specCount; n++) {
      const spec = specs[n]!;
      const value = spec.value(t, states[0]!);
      values[0]![n] = !justFired.has(eventKey(spec)) ? value : spec.direction === 'down' ? Math.min(value, 0) : Math.max(value, Number.MIN_VALUE);
    }
    /** are seen[0]'s observables those of states[0] (the end of the previous step)? */
    let startSeen = false;
    /** odex's dense output of the current step */
    let odexDense: Dense = () => NaN;
    const profile = options.profile;
    /** the state at `time` on the current step's dense output, written into `into` */
    const stateInto = (time: number, into: number[]): number[] => {
      const u = time / scale;
      if (profile) profile.denseEvaluations += dimension;
      for (let j = 0; j < dimension; j++) into[active[j]!] = odexDense(j, u);
      return into;
    };
    const stateAt = (time: number): number[] => stateInto(time, base.slice());
    /** ∫ of the quadrature integrands over [a, b] on the dense output, added to `into` */
    const integrate = (a: number, b: number, into: Float64Array) => {
      const was = enter('quadrature');
      const rule = STEP_RULE;
      sum.fill(0);
      for (let p = 0; p < rule.nodes.length; p++) {
        stateInto((a + (b - a) * rule.nodes[p]!), node);
        quadratureIntegrands(plant, node, mode, integrand);
        const w = rule.weights[p]!;
        for (let k = 0; k < QUADRATURE.size; k++) sum[k]! += w * integrand[k]!;
      }
      for (let k = 0; k < QUADRATURE.size; k++) into[k]! += (b - a) * sum[k]!;
      enter(was);
    };
    const eventValueAt = (n: number) => {
      const spec = specs[n]!;
      return (u: number) => spec.value(u, stateInto(u, probe));
    };
    const observeAt = (time: number) => observeInto(plant, stateInto(time, probe), mode, probeSeen);

    const observer = (_n: number, tauOld: number, tau: number, yEnd: number[], stepDense?: Dense): boolean => {
      if (!stepDense) return true;
      enter('events');
      odexDense = stepDense;
      steps++;
      // a state that is no longer finite cannot be integrated further: stop here and report it (below)
      if (!allFinite(yEnd)) {
        blownUp = { t: tau * scale, y: expand(yEnd) };
        return false;
      }
      const tOld = tauOld * scale;
      const tNew = tau * scale;
      // sample the step, bracket the first sign change of any event function
      times[0] = tOld;
      let last = 0;
      for (let k = 1; k <= SAMPLES_PER_STEP; k++) {
        const time = k === SAMPLES_PER_STEP ? tNew : tOld + ((tNew - tOld) * k) / SAMPLES_PER_STEP;
        const state = states[k]!;
        if (k === SAMPLES_PER_STEP) for (let j = 0; j < dimension; j++) state[active[j]!] = yEnd[j]!;
        else stateInto(time, state);
        const before = values[k - 1]!;
        const next = values[k]!;
        for (let n = 0; n < specCount; n++) next[n] = specs[n]!.value(time, state);
        const left = times[k - 1]!;
        let first = Infinity;
        let firing: { spec: EventSpec; root: number }[] | null = null;
        for (let n = 0; n < specCount; n++) {
          const spec = specs[n]!;
          if (!crossed(spec, before[n]!, next[n]!)) continue;
          const root = spec.kind === 'trigger' ? plant.trigger[spec.group]! : brentRoot(eventValueAt(n), left, time, before[n]!, next[n]!);
          (firing ??= []).push({ spec, root });
          if (root < first) first = root;
        }
        if (firing) {
          const together = 1e-12 * Math.max(Math.abs(first), scale);
          const quadratures = q.slice();
          integrate(tOld, first, quadratures);
          located = {
            time: first,
            state: stateAt(first),
            quadratures,
            specs: firing.filter((f) => f.root <= first + together).map((f) => f.spec),
          };
          // the event's instant takes the slot after the last sample before it
          copyInto(located.state, states[k]!);
          times[k] = first;
          last = k;
          break;
        }
        times[k] = time;
        last = k;
      }
      const found = located as Located | null;
      const end = found ? found.time : tNew;
      enter('peaks');
      // observables at every point of the step (those at its start were seen as the end of the last step)
      for (let k = startSeen ? 1 : 0; k <= last; k++) observeInto(plant, states[k]!, mode, seen[k]!);
      for (let k = 1; k <= last; k++) {
        tracker.locate(times[k - 1]!, seen[k - 1]!, times[k]!, seen[k]!, observeAt);
        tracker.observePoint(times[k]!, states[k]!, seen[k]!);
      }
      // the step odex took, cut or not, is the first guess after a restart (see lastStep); a phase in which
      // nothing moves (waiting for a trigger) takes steps that say nothing about the dynamics to come
      if (!idle) lastStep = tau - tauOld;
      if (!found) {
        qStep.set(q);
        integrate(tOld, tNew, qStep);
      }
      enter('recording');
      if (recorder) recordSamples(tOld, end, tNew - tOld, !found, stateAt, integrate);
      enter(found ? 'restart' : 'integration');
      if (found) return false;
      // the step's end is the next step's start: rotate the buffers rather than copy them
      swap(states, 0, last);
      swap(seen, 0, last);
      swap(values, 0, last);
      startSeen = true;
      q.set(qStep);
      reached.t = tNew;
      copyInto(states[0]!, reached.y);
      return true;
    };

    /**
     * Waveform samples in (tOld, end] (end included when the step is not cut by an event): each sample's
     * quadratures are the running sum from the step start, segment by segment.
     */
    const recordSamples = (
      tOld: number,
      end: number,
      step: number,
      includeEnd: boolean,
      stateAt: (time: number) => number[],
      integrate: (a: number, b: number, into: Float64Array) => void,
    ) => {
      let segmentStart = tOld;
      const running = q.slice();
      const left = new Float64Array(QUADRATURE.size);
      const middle = new Float64Array(QUADRATURE.size);
      const right = new Float64Array(QUADRATURE.size);
      let leftKnown = false;
      while (nextSample < end || (includeEnd && nextSample <= end)) {
        const sampleTime = nextSample;
        const state = stateAt(sampleTime);
        const length = sampleTime - segmentStart;
        if (length <= SIMPSON_SEGMENT_FRACTION * step) {
          if (!leftKnown) quadratureIntegrands(plant, stateAt(segmentStart), mode, left);
          quadratureIntegrands(plant, stateAt(segmentStart + 0.5 * length), mode, middle);
          quadratureIntegrands(plant, state, mode, right);
          for (let k = 0; k < QUADRATURE.size; k++) running[k]! += (length / 6) * (left[k]! + 4 * middle[k]! + right[k]!);
          left.set(right);
          leftKnown = true;
        } else {
          integrate(segmentStart, sampleTime, running);
          leftKnown = false;
        }
        recorder!.record(sampleTime, state, running, mode);
        segmentStart = sampleTime;
        nextSample += sampleInterval;
      }
    };

    reached = { t, y: y.slice() };
    let blownUp: { t: number; y: number[] } | null = null;
    const solver = createSolver(dimension);
    solver.denseOutput = true;
    solver.relativeTolerance = relTol;
    solver.absoluteTolerance = active.map((c) => tolerances[c]!);
    solver.maxStepSize = maxStepSize;
    solver.maxSteps = Math.max(1, stepBudget - steps);
    solver.initialStepSize = lastStep;
    enter('integration');
    const result = solver.solve(rhs, t / scale, doubleArray(active, y), endTime / scale, observer);
    enter('restart');
    evaluations += result.nEval;
    restarts++;
    if (blownUp) {
      // odex accepts a step whose error estimate is NaN, so a first step far too long for a fast mode that has just
      // switched on can overflow: restart once more from the last finite step with a much shorter first step.
      if (overflowRetries >= MAX_OVERFLOW_RETRIES) throw nonFinite(plant, (blownUp as { t: number; y: number[] }).t, reached);
      overflowRetries++;
      if (reached.t !== t) justFired = new Set();
      t = reached.t;
      y = reached.y.slice();
      lastStep = Math.min(lastStep, FIRST_STEP) * OVERFLOW_STEP_FACTOR;
      continue;
    }
    if (result.outcome === OUTCOME_MAX_STEPS) {
      throw new IntegrationError(
        `integration stopped after ${stepBudget} steps (solver.maxSteps) at t = ${reached.t} s with I = ${observe(plant, reached.y, mode).current} A, x = ${reached.y[ix.position]} m, v = ${reached.y[ix.velocity]} m/s`,
      );
    }
    if (!located) {
      t = endTime;
      y = expand(result.y);
      checkFinite(y, t);
      outcome = 'timeout';
      break;
    }
    const found = located as Located;
    locatedCount++;
    justFired = new Set(found.specs.map(eventKey));
    t = found.time;
    y = found.state;
    q = found.quadratures;
    checkFinite(y, t);
    instant();
    const ordered = found.specs.slice().sort((a, b) => EVENT_ORDER[a.kind]! - EVENT_ORDER[b.kind]!);
    let exited = false;
    for (const spec of ordered) {
      if (spec.kind === 'transition') transition = { t, x: y[ix.position]! };
      applyEvent(plant, y, mode, spec, log);
      if (spec.kind === 'exit') exited = true;
    }
    if (exited) {
      instant();
      outcome = 'exited';
      break;
    }
    settle(plant, t, y, mode, log);
    instant();
    if (isStalled(plant, y, mode)) outcome = settled;
  }
  enter('finish');
  if (outcome === 'stalled') events.push({ t, kind: 'stall' });
  if (outcome === 'discharged') events.push({ t, kind: 'discharged' });
  if (outcome === 'timeout') events.push({ t, kind: 'timeout' });
  const shot = finish(plant, scenario, y, q, t, outcome, mode, transition, tracker.peaks, recorder?.waveforms ?? null, events, {
    steps,
    rhsEvaluations: evaluations,
    restarts,
    relTol,
  });
  enter('setup');
  return shot;
}

/** Peak temperatures with adiabatic heating: 20 °C + (exp(κS) − 1)/α, S the action through the conductor. */
function temperatures(scenario: Scenario, action: number): { armatureTemperature?: number; railTemperature?: number } {
  const h = scenario.heating;
  if (!h) return {};
  const rise = (kappa: number, alpha: number) => 20 + Math.expm1(kappa * action) / alpha;
  return {
    ...(h.armature > 0 ? { armatureTemperature: rise(h.armature, h.armatureAlpha) } : {}),
    ...(h.rails > 0 ? { railTemperature: rise(h.rails, h.railAlpha) } : {}),
  };
}

/**
 * Energy that leaves the in-bore phase with the armature (model contract §4): all magnetic energy still stored plus
 * the capacitors of the modules still conducting or armed at exit, which discharge into the muzzle arc (or a shunt)
 * and the circuit's resistances. An upper bound on the muzzle-arc energy.
 */
function afterExit(plant: Plant, y: number[], mode: Mode, magnetic: number): number {
  let capacitors = 0;
  for (let g = 0; g < plant.groups; g++) {
    const stage = mode.stage[g]!;
    if (stage !== Stage.Capacitor && stage !== Stage.Armed) continue;
    const v = y[plant.index.voltage(g)]!;
    capacitors += 0.5 * plant.capacitance[g]! * v * v;
  }
  return magnetic + capacitors;
}

/**
 * y[c] for each c of `components`, in an array V8 holds as doubles even when every value is a whole number (a
 * charged bank at rest: 0 A, 0 m, 9000 V). odex copies the initial state with concat, which keeps the elements kind;
 * a run starting from whole numbers gave its optimised code integer arrays where it had learned doubles, and it
 * deoptimised ("wrong map") about once every 25 shots of a sweep.
 */
function doubleArray(components: readonly number[], y: readonly number[]): number[] {
  const out = [0.5];
  out.pop();
  for (const c of components) out.push(y[c]!);
  return out;
}

function copyInto(from: ArrayLike<number>, to: number[]): void {
  for (let c = 0; c < from.length; c++) to[c] = from[c]!;
}

function swap<T>(list: T[], a: number, b: number): void {
  const held = list[a]!;
  list[a] = list[b]!;
  list[b] = held;
}

const eventKey = (spec: EventSpec) => `${spec.kind}:${spec.group}`;

function allFinite(values: ArrayLike<number>): boolean {
  for (let i = 0; i < values.length; i++) if (!Number.isFinite(values[i]!)) return false;
  return true;
}

function checkFinite(y: number[], t: number): void {
  if (allFinite(y)) return;
  throw new IntegrationError(`the state became non-finite at t = ${t} s`);
}

/** An integration failure: the state stopped being finite after `t`; the last finite state is shown. */
function nonFinite(plant: Plant, t: number, last: { t: number; y: number[] }): IntegrationError {
  const ix = plant.index;
  return new IntegrationError(
    `the state became non-finite (overflow) by t = ${t} s; last finite state at t = ${last.t} s: x = ${last.y[ix.position]} m, v = ${last.y[ix.velocity]} m/s, state [${last.y.join(', ')}]`,
  );
}

function finish(
  plant: Plant,
  scenario: Scenario,
  y: number[],
  q: Float64Array,
  t: number,
  outcome: Outcome,
  mode: Mode,
  transition: { t: number; x: number } | null,
  peaks: ReturnType<typeof createPeakTracker>['peaks'],
  waveforms: Shot['waveforms'],
  events: ShotEvent[],
  stats: Shot['stats'],
): Shot {
  const ix = plant.index;
  if (!allFinite(q) || !Number.isFinite(plant.initialEnergy)) {
    throw new IntegrationError(`the energy ledger became non-finite (overflow) by t = ${t} s, with the state [${y.join(', ')}]`);
  }
  const e = ledger(plant, y, q);
  const losses = Object.fromEntries(LOSS_ORDER.map((k, n) => [k, e.losses[n]!])) as Losses;
  const velocity = y[ix.velocity]!;
  return {
    results: {
      outcome,
      muzzleVelocity: velocity,
      exitTime: outcome === 'exited' ? t : null,
      finalPosition: y[ix.position]!,
      peakCurrent: peaks.current,
      peakCurrentTime: peaks.currentTime,
      peakAcceleration: peaks.acceleration,
      peakBreechVoltage: peaks.breechVoltage,
      actionIntegral: q[QUADRATURE.action]!,
      efficiency: e.kinetic / plant.initialEnergy,
      energy: {
        initial: plant.initialEnergy,
        capacitors: e.capacitors,
        magnetic: e.magnetic,
        magneticRails: e.magneticRails,
        ...(plant.modeRate.length > 0 || plant.tailInductanceGradient > 0 ? { railInterior: e.railInterior } : {}),
        kinetic: e.kinetic,
        losses,
        residual: e.residual,
        ...(outcome === 'exited' ? { afterExit: afterExit(plant, y, mode, e.magnetic) } : {}),
      },
      modules: scenario.bank.map((group, g) => ({
        label: group.label,
        peakCurrent: peaks.groupCurrent[g]! / group.count,
        // a crowbarred capacitor is clamped at −(V_D + R_D·i) per module by its conducting diode
        reversal: group.crowbar
          ? peaks.crowbarCurrent[g]! > 0
            ? (group.crowbar.drop + (group.crowbar.resistance * peaks.crowbarCurrent[g]!) / group.count) / group.voltage
            : 0
          : Math.max(0, -peaks.minimumVoltage[g]! / group.voltage),
      })),
      ...(transition ? { transitionTime: transition.t, transitionPosition: transition.x } : {}),
      ...temperatures(scenario, q[QUADRATURE.action]!),
    },
    waveforms,
    events,
    stats,
    impulse: q[QUADRATURE.impulse]!,
    railAction: q[QUADRATURE.railAction]!,
  };
}
