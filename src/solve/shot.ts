/**
 * The hybrid integrator: drives odex through the continuous phases of a shot, locates every event by root
 * finding on the dense output, applies it and restarts cleanly. Scenario in, Shot out; no I/O.
 */
import type { Scenario } from '../scenario/types.js';
import {
  type Mode,
  type Plant,
  LOSS_ORDER,
  derivatives,
  initialMode,
  initialState,
  ledger,
  makePlant,
} from '../model/plant.js';
import { type EventSpec, crossed, watchedEvents } from '../model/events.js';
import { applyEvent, isStalled, settle } from '../model/transitions.js';
import { observe, type Observables } from '../model/observables.js';
import { createSolver, OUTCOME_MAX_STEPS, type Dense } from './odex.js';
import { brentRoot } from './roots.js';
import { createPeakTracker, createWaveformRecorder } from './record.js';
import type { EventKind, Losses, Outcome, Shot, ShotEvent } from './types.js';
import { InputError } from '../scenario/errors.js';

export interface RunOptions {
  /** keep waveforms (default true); studies turn them off */
  waveforms?: boolean;
}

/** Points per accepted step at which event functions and peak derivatives are sampled before bracketing. */
const SAMPLES_PER_STEP = 4;
/** Work bounds: a shot that needs more than this is reported as an integration failure, never a hang. */
const MAX_EVENTS = 10_000;
/** Step cap in units of the fastest loop time constant (see fastestDecay). */
const STEP_CAP_DECAYS = 4;

/** An integration that could not complete, with the time and state where it stopped. */
export class IntegrationError extends InputError {
  constructor(problem: string) {
    super('solver', problem);
  }
}

/** Characteristic time of the bank: the fastest group's quarter period through the feed. Scales odex's time. */
function timeScale(plant: Plant): number {
  let scale = Infinity;
  for (let g = 0; g < plant.groups; g++) {
    const quarter = (Math.PI / 2) * Math.sqrt((plant.inductance[g]! + plant.feedInductance) * plant.capacitance[g]!);
    scale = Math.min(scale, quarter);
  }
  return scale;
}

/**
 * Time constant bounding the fastest damped mode: the smallest L/R of a module's loop through the feed and
 * armature. odex is explicit; near its stability limit on such a mode, steps are accepted but the dense output
 * between them degrades, so steps are capped at a few of these.
 */
function fastestDecay(plant: Plant): number {
  const external = plant.feedResistance + plant.armatureResistance + plant.contactResistance + plant.resistanceGradient * plant.railLength;
  let fastest = Infinity;
  for (let g = 0; g < plant.groups; g++) {
    const resistance = Math.max(plant.esr[g]!, plant.diodeResistance[g]!) + plant.seriesResistance[g]! + external;
    const inductance = plant.inductance[g]! + plant.feedInductance;
    if (resistance > 0) fastest = Math.min(fastest, inductance / resistance);
  }
  return fastest;
}

/** Absolute tolerances per component: relTol times a scale that bounds each quantity. */
function absoluteTolerances(plant: Plant, relTol: number, scale: number): number[] {
  const ix = plant.index;
  const e0 = plant.initialEnergy;
  const smallestInductance = plant.feedInductance + Math.min(...plant.inductance);
  const currentScale = Math.sqrt((2 * e0) / smallestInductance);
  const voltageScale = Math.max(...plant.chargeVoltage);
  const velocityScale = Math.sqrt((2 * e0) / plant.mass);
  const atol = new Array<number>(ix.size).fill(relTol * e0);
  for (let g = 0; g < plant.groups; g++) {
    atol[ix.current(g)] = relTol * currentScale;
    atol[ix.voltage(g)] = relTol * voltageScale;
  }
  atol[ix.position] = relTol * plant.railLength;
  atol[ix.velocity] = relTol * velocityScale;
  atol[ix.action] = relTol * currentScale * currentScale * scale;
  atol[ix.impulse] = relTol * plant.mass * velocityScale;
  return atol;
}

const EVENT_ORDER: Record<string, number> = { 'turn-off': 0, crowbar: 1, stop: 2, trigger: 3, 'turn-on': 4, start: 5, floor: 6, exit: 7 };

interface Located {
  time: number;
  state: number[];
  specs: EventSpec[];
}

export function runShot(scenario: Scenario, options: RunOptions = {}): Shot {
  const plant = makePlant(scenario);
  const ix = plant.index;
  const relTol = scenario.solver.relTol;
  const endTime = scenario.solver.endTime;
  const sampleInterval = scenario.solver.sampleInterval;
  const keepWaveforms = options.waveforms !== false;
  const scale = timeScale(plant);
  const solver = createSolver(ix.size);
  solver.denseOutput = true;
  solver.relativeTolerance = relTol;
  solver.absoluteTolerance = absoluteTolerances(plant, relTol, scale);
  const stepBudget = scenario.solver.maxSteps;
  solver.maxStepSize = (STEP_CAP_DECAYS * fastestDecay(plant)) / scale;

  let t = 0;
  let y = initialState(plant);
  const mode: Mode = initialMode(plant);
  const events: ShotEvent[] = [];
  const log = (kind: string, group: number) => {
    if (kind === 'floor') return;
    events.push(group >= 0 ? { t, kind: kind as EventKind, group } : { t, kind: kind as EventKind });
  };
  const recorder = keepWaveforms ? createWaveformRecorder(plant) : null;
  const tracker = createPeakTracker(plant);
  let steps = 0;
  let evaluations = 0;
  let restarts = 0;
  let nextSample = sampleInterval > 0 ? sampleInterval : Infinity;
  let lastStep = 1e-4;
  /** time and state of the last accepted step, for the message of a failed integration */
  let reached = { t: 0, y: [] as number[] };

  /** Count and record the state at an event instant; called on both sides of every event. */
  const instant = () => {
    const o = observe(plant, y, mode);
    tracker.observePoint(t, y, o);
    recorder?.record(t, y, mode, o);
  };

  instant();
  settle(plant, t, y, mode, log);
  instant();
  let outcome: Outcome | null = isStalled(plant, y, mode) ? 'stalled' : null;

  /** events that fired at the current instant: not to fire again at the restart point */
  let justFired = new Set<string>();
  let locatedCount = 0;
  while (outcome === null) {
    if (locatedCount > MAX_EVENTS) {
      throw new IntegrationError(`more than ${MAX_EVENTS} events by t = ${t} s; the shot does not settle`);
    }
    const specs = watchedEvents(plant, mode);
    const rhs = (tau: number, state: number[]): number[] => {
      const dy = derivatives(plant, state, mode);
      for (let k = 0; k < dy.length; k++) dy[k]! *= scale;
      return dy;
    };
    let located: Located | null = null;
    let previous = y.slice();
    // A function that has just crossed sits at ~0 at the restart; count it as on its far side so rounding
    // cannot make it fire again at the same instant.
    let previousValues = specs.map((spec) => {
      const value = spec.value(t, previous);
      if (!justFired.has(eventKey(spec))) return value;
      return spec.direction === 'down' ? Math.min(value, 0) : Math.max(value, Number.MIN_VALUE);
    });

    const observer = (_n: number, tauOld: number, tau: number, yEnd: number[], dense?: Dense): boolean => {
      if (!dense) return true;
      steps++;
      const tOld = tauOld * scale;
      const tNew = tau * scale;
      const stateAt = (time: number): number[] => {
        const s = new Array<number>(ix.size);
        for (let c = 0; c < ix.size; c++) s[c] = dense(c, time / scale);
        return s;
      };
      // sample the step, bracket the first sign change of any event function
      const times: number[] = [tOld];
      const states: number[][] = [previous];
      let values = previousValues;
      for (let k = 1; k <= SAMPLES_PER_STEP && !located; k++) {
        const time = k === SAMPLES_PER_STEP ? tNew : tOld + ((tNew - tOld) * k) / SAMPLES_PER_STEP;
        const state = k === SAMPLES_PER_STEP ? yEnd.slice() : stateAt(time);
        const next = specs.map((s) => s.value(time, state));
        const left = times[times.length - 1]!;
        const firing: { spec: EventSpec; root: number }[] = [];
        specs.forEach((spec, n) => {
          if (!crossed(spec, values[n]!, next[n]!)) return;
          const root =
            spec.kind === 'trigger'
              ? plant.trigger[spec.group]!
              : brentRoot((u) => spec.value(u, stateAt(u)), left, time, values[n]!, next[n]!);
          firing.push({ spec, root });
        });
        if (firing.length > 0) {
          const first = Math.min(...firing.map((f) => f.root));
          const together = 1e-12 * Math.max(Math.abs(first), scale);
          located = {
            time: first,
            state: stateAt(first),
            specs: firing.filter((f) => f.root <= first + together).map((f) => f.spec),
          };
          break;
        }
        times.push(time);
        states.push(state);
        values = next;
      }
      const end = located ? (located as Located).time : tNew;
      if (located) {
        times.push(end);
        states.push((located as Located).state);
      }
      trackPeaks(times, states, stateAt);
      while (nextSample < end || (!located && nextSample <= end)) {
        recorder?.record(nextSample, stateAt(nextSample), mode);
        nextSample += sampleInterval;
      }
      if (located) return false;
      lastStep = tau - tauOld;
      previous = yEnd.slice();
      reached = { t: tNew, y: previous };
      previousValues = values;
      return true;
    };

    const trackPeaks = (times: number[], states: number[][], stateAt: (time: number) => number[]) => {
      const seen: Observables[] = states.map((s) => observe(plant, s, mode));
      const at = (time: number) => observe(plant, stateAt(time), mode);
      for (let k = 1; k < times.length; k++) {
        tracker.locate(times[k - 1]!, seen[k - 1]!, times[k]!, seen[k]!, at);
        tracker.observePoint(times[k]!, states[k]!, seen[k]!);
      }
    };

    reached = { t, y };
    solver.maxSteps = Math.max(1, stepBudget - steps);
    solver.initialStepSize = Math.max(lastStep, 1e-4);
    const result = solver.solve(rhs, t / scale, y, endTime / scale, observer);
    evaluations += result.nEval;
    restarts++;
    if (result.outcome === OUTCOME_MAX_STEPS) {
      throw new IntegrationError(
        `integration stopped after ${stepBudget} steps (solver.maxSteps) at t = ${reached.t} s with I = ${observe(plant, reached.y, mode).current} A, x = ${reached.y[ix.position]} m, v = ${reached.y[ix.velocity]} m/s`,
      );
    }
    if (!located) {
      t = endTime;
      y = result.y.slice();
      checkFinite(y, t);
      outcome = 'timeout';
      break;
    }
    const found = located as Located;
    locatedCount++;
    justFired = new Set(found.specs.map(eventKey));
    t = found.time;
    y = found.state;
    checkFinite(y, t);
    instant();
    const ordered = found.specs.slice().sort((a, b) => EVENT_ORDER[a.kind]! - EVENT_ORDER[b.kind]!);
    let exited = false;
    for (const spec of ordered) {
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
    if (isStalled(plant, y, mode)) outcome = 'stalled';
  }
  if (outcome === 'stalled') events.push({ t, kind: 'stall' });
  if (outcome === 'timeout') events.push({ t, kind: 'timeout' });
  return finish(plant, scenario, y, t, outcome, tracker.peaks, recorder?.waveforms ?? null, events, {
    steps,
    rhsEvaluations: evaluations,
    restarts,
    relTol,
  });
}

const eventKey = (spec: EventSpec) => `${spec.kind}:${spec.group}`;

function checkFinite(y: number[], t: number): void {
  if (y.every(Number.isFinite)) return;
  throw new IntegrationError(`the state became non-finite at t = ${t} s`);
}

function finish(
  plant: Plant,
  scenario: Scenario,
  y: number[],
  t: number,
  outcome: Outcome,
  peaks: ReturnType<typeof createPeakTracker>['peaks'],
  waveforms: Shot['waveforms'],
  events: ShotEvent[],
  stats: Shot['stats'],
): Shot {
  const ix = plant.index;
  const e = ledger(plant, y);
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
      actionIntegral: y[ix.action]!,
      efficiency: e.kinetic / plant.initialEnergy,
      energy: {
        initial: plant.initialEnergy,
        capacitors: e.capacitors,
        magnetic: e.magnetic,
        magneticRails: e.magneticRails,
        kinetic: e.kinetic,
        losses,
        residual: e.residual,
      },
      modules: scenario.bank.map((group, g) => ({
        label: group.label,
        peakCurrent: peaks.groupCurrent[g]! / group.count,
        // a crowbarred capacitor is held at 0 V from the instant it gets there: no reversal by construction
        reversal: group.crowbar ? 0 : Math.max(0, -peaks.minimumVoltage[g]! / group.voltage),
      })),
    },
    waveforms,
    events,
    stats,
    impulse: y[ix.impulse]!,
  };
}
