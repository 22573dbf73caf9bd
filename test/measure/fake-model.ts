/**
 * A stand-in for runShot for testing the fit engine: the series RLC natural response (any circuits
 * textbook, e.g. Nilsson & Riedel, natural response of a series RLC circuit)
 *     i(t) = V0/(ωd L) e^(−αt) sin(ωd t),   α = R/(2L),  ωd = √(1/(LC) − α²)
 * with L = L_module + L_feed and R the sum of the series resistances, until the current returns to zero
 * (the switch opens). The armature is driven by F = ½ L′ i² without acting back on the circuit
 * (a decoupled approximation, fine for a fit engine test), integrated by the trapezoidal rule.
 */
import type { Scenario } from '../../src/scenario/types.js';
import type { Shot, Waveforms } from '../../src/solve/types.js';
import { LOSS_KEYS } from '../../src/solve/types.js';

export function rlcScenario(): Scenario {
  return {
    name: 'fit engine test bench (invented)',
    description: '',
    bank: [{ label: 'group 1', count: 1, capacitance: 1e-3, voltage: 5000, esr: 5e-3, inductance: 10e-6, resistance: 2e-3, trigger: 0, crowbar: null }],
    feed: { inductance: 2e-6, resistance: 3e-3 },
    rails: { length: 1, inductanceGradient: 0.45e-6, resistanceGradient: 0 },
    armature: { mass: 0.05, position: 0, resistance: 1e-4, contactResistance: 0, arcDrop: 0 },
    friction: { coefficient: 0, staticCoefficient: 0, preload: 0, magneticLoading: 0 },
    drag: null,
    solver: { relTol: 1e-9, endTime: 0.4e-3, sampleInterval: 1e-6, currentFloor: 1, maxSteps: 1e6 },
  };
}

export function rlcCurrent(s: Scenario, t: number): number {
  const group = s.bank[0]!;
  const L = group.inductance + s.feed.inductance;
  const R = group.esr + group.resistance + s.feed.resistance + s.armature.resistance + s.armature.contactResistance;
  const alpha = R / (2 * L);
  const omega = Math.sqrt(1 / (L * group.capacitance) - alpha * alpha);
  if (!(omega > 0)) throw new Error('the fake model covers the underdamped case only');
  if (t <= 0 || t >= Math.PI / omega) return 0;
  return (group.voltage / (omega * L)) * Math.exp(-alpha * t) * Math.sin(omega * t);
}

/** Closed-form peak: t_p = atan(ωd/α)/ωd (same textbook). */
export function rlcPeak(s: Scenario): { time: number; current: number } {
  const group = s.bank[0]!;
  const L = group.inductance + s.feed.inductance;
  const R = group.esr + group.resistance + s.feed.resistance + s.armature.resistance + s.armature.contactResistance;
  const alpha = R / (2 * L);
  const omega = Math.sqrt(1 / (L * group.capacitance) - alpha * alpha);
  const time = Math.atan(omega / alpha) / omega;
  return { time, current: rlcCurrent(s, time) };
}

export function fakeRunShot(s: Scenario): Shot {
  if (!(s.bank[0]!.inductance + s.feed.inductance > 0) || !(s.bank[0]!.capacitance > 0) || !(s.armature.mass > 0)) throw new Error('refused');
  const dt = s.solver.sampleInterval;
  const count = Math.floor(s.solver.endTime / dt + 1e-9) + 1;
  const t = Array.from({ length: count }, (_, k) => k * dt);
  const current = t.map((tk) => rlcCurrent(s, tk));
  const force = current.map((i) => 0.5 * s.rails.inductanceGradient * i * i);
  const velocity = [0];
  const position = [s.armature.position];
  for (let k = 1; k < count; k++) {
    velocity.push(velocity[k - 1]! + ((force[k - 1]! + force[k]!) / (2 * s.armature.mass)) * dt);
    position.push(position[k - 1]! + ((velocity[k - 1]! + velocity[k]!) / 2) * dt);
  }
  const armatureResistance = s.armature.resistance + s.armature.contactResistance;
  const zeros = t.map(() => 0);
  const waveforms: Waveforms = {
    t,
    current,
    groupCurrent: [current],
    groupVoltage: [zeros],
    breechVoltage: current.map((i, k) => armatureResistance * i + s.rails.inductanceGradient * velocity[k]! * i),
    muzzleVoltage: current.map((i) => armatureResistance * i),
    position,
    velocity,
    acceleration: force.map((f) => f / s.armature.mass),
    force,
    energy: { capacitors: zeros, magnetic: zeros, kinetic: zeros, losses: Object.fromEntries(LOSS_KEYS.map((k) => [k, zeros])) as Waveforms['energy']['losses'], residual: zeros },
  };
  const peak = rlcPeak(s);
  const losses = Object.fromEntries(LOSS_KEYS.map((k) => [k, 0])) as Shot['results']['energy']['losses'];
  return {
    results: {
      outcome: 'timeout',
      muzzleVelocity: velocity.at(-1)!,
      exitTime: null,
      finalPosition: position.at(-1)!,
      peakCurrent: peak.current,
      peakCurrentTime: peak.time,
      peakAcceleration: Math.max(...force) / s.armature.mass,
      peakBreechVoltage: 0,
      actionIntegral: 0,
      efficiency: 0,
      energy: { initial: 0, capacitors: 0, magnetic: 0, magneticRails: 0, kinetic: 0, losses, residual: 0 },
      modules: [],
    },
    waveforms,
    events: [],
    stats: { steps: 0, rhsEvaluations: 0, restarts: 0, relTol: s.solver.relTol },
    impulse: 0,
  };
}
