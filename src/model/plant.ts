/**
 * The shot model of the physics contract, as pure functions of a state vector and a discrete mode.
 * No I/O, no integrator: the solver in src/solve drives these.
 *
 * A group of n identical modules is one equivalent module with C·n, L/n, R/n, R_esr/n, R_D/n and the same
 * V0 and V_D: the state holds the group's total current and its capacitor voltage.
 */
import type { Scenario } from '../scenario/types.js';

/** Stage of a module group's switch. */
export const enum Stage {
  /** before its trigger time */
  Waiting = 0,
  /** triggered, waiting for forward bias */
  Armed = 1,
  /** conducting, capacitor discharging */
  Capacitor = 2,
  /** conducting through the crowbar diode, capacitor held at 0 V */
  Crowbar = 3,
  /** current returned to zero: off for the rest of the shot */
  Off = 4,
}

export interface Mode {
  stage: Stage[];
  moving: boolean;
}

/** Loss channels, in the order of their quadrature states (model contract §4). */
export const LOSS_ORDER = ['bank', 'crowbar', 'modules', 'feed', 'rails', 'armature', 'contacts', 'arc', 'friction', 'drag'] as const;

/** Everything the right-hand side needs, precomputed once per shot. Group arrays are per equivalent module. */
export interface Plant {
  groups: number;
  count: number[];
  capacitance: number[];
  chargeVoltage: number[];
  inductance: number[];
  esr: number[];
  seriesResistance: number[];
  trigger: number[];
  hasCrowbar: boolean[];
  diodeDrop: number[];
  diodeResistance: number[];
  /** stall floor of the group: n × per-module floor */
  floor: number[];
  feedInductance: number;
  feedResistance: number;
  railLength: number;
  inductanceGradient: number;
  resistanceGradient: number;
  mass: number;
  startPosition: number;
  armatureResistance: number;
  contactResistance: number;
  arcDrop: number;
  mu: number;
  muStatic: number;
  preload: number;
  magneticLoading: number;
  /** ½ ρ_g C_d A_b, 0 without drag */
  dragFactor: number;
  initialEnergy: number;
  /** state layout */
  index: StateIndex;
}

export interface StateIndex {
  size: number;
  current: (g: number) => number;
  voltage: (g: number) => number;
  position: number;
  velocity: number;
  /** first of the 10 loss quadratures, in LOSS_ORDER */
  loss: number;
  action: number;
  impulse: number;
}

function stateIndex(groups: number): StateIndex {
  const position = 2 * groups;
  return {
    size: 2 * groups + 14,
    current: (g) => g,
    voltage: (g) => groups + g,
    position,
    velocity: position + 1,
    loss: position + 2,
    action: position + 12,
    impulse: position + 13,
  };
}

export function makePlant(scenario: Scenario): Plant {
  const bank = scenario.bank;
  const n = bank.map((g) => g.count);
  const drag = scenario.drag;
  return {
    groups: bank.length,
    count: n,
    capacitance: bank.map((g) => g.capacitance * g.count),
    chargeVoltage: bank.map((g) => g.voltage),
    inductance: bank.map((g) => g.inductance / g.count),
    esr: bank.map((g) => g.esr / g.count),
    seriesResistance: bank.map((g) => g.resistance / g.count),
    trigger: bank.map((g) => g.trigger),
    hasCrowbar: bank.map((g) => g.crowbar !== null),
    diodeDrop: bank.map((g) => g.crowbar?.drop ?? 0),
    diodeResistance: bank.map((g) => (g.crowbar?.resistance ?? 0) / g.count),
    floor: bank.map((g) => g.count * scenario.solver.currentFloor),
    feedInductance: scenario.feed.inductance,
    feedResistance: scenario.feed.resistance,
    railLength: scenario.rails.length,
    inductanceGradient: scenario.rails.inductanceGradient,
    resistanceGradient: scenario.rails.resistanceGradient,
    mass: scenario.armature.mass,
    startPosition: scenario.armature.position,
    armatureResistance: scenario.armature.resistance,
    contactResistance: scenario.armature.contactResistance,
    arcDrop: scenario.armature.arcDrop,
    mu: scenario.friction.coefficient,
    muStatic: scenario.friction.staticCoefficient,
    preload: scenario.friction.preload,
    magneticLoading: scenario.friction.magneticLoading,
    dragFactor: drag ? 0.5 * drag.gasDensity * drag.dragCoefficient * drag.boreArea : 0,
    initialEnergy: bank.reduce((sum, g) => sum + 0.5 * g.capacitance * g.count * g.voltage * g.voltage, 0),
    index: stateIndex(bank.length),
  };
}

export function initialState(plant: Plant): number[] {
  const y = new Array<number>(plant.index.size).fill(0);
  for (let g = 0; g < plant.groups; g++) y[plant.index.voltage(g)] = plant.chargeVoltage[g]!;
  y[plant.index.position] = plant.startPosition;
  return y;
}

export function initialMode(plant: Plant): Mode {
  return { stage: new Array<Stage>(plant.groups).fill(Stage.Waiting), moving: false };
}

export const isConducting = (stage: Stage): boolean => stage === Stage.Capacitor || stage === Stage.Crowbar;

/** Source voltage u_k and branch resistance R_eff,k of a conducting group in its stage. */
function branch(plant: Plant, g: number, stage: Stage, capacitorVoltage: number): { source: number; resistance: number } {
  if (stage === Stage.Crowbar) {
    return { source: -plant.diodeDrop[g]!, resistance: plant.diodeResistance[g]! + plant.seriesResistance[g]! };
  }
  return { source: capacitorVoltage, resistance: plant.esr[g]! + plant.seriesResistance[g]! };
}

export interface Bus {
  /** total rail current I */
  current: number;
  /** bus voltage V_b */
  busVoltage: number;
  /** dI/dt */
  currentRate: number;
  /** loop inductance L(x) and resistance R(x) */
  loopInductance: number;
  loopResistance: number;
  anyConducting: boolean;
}

/**
 * The algebraic bus equation: V_b = (L(x)A + B)/(1 + L(x)G), dI/dt = A − G V_b.
 * `extra` adds a group as if conducting with zero current (the turn-on test of the contract).
 */
export function solveBus(plant: Plant, y: ArrayLike<number>, mode: Mode, extra = -1): Bus {
  const ix = plant.index;
  const x = y[ix.position]!;
  const v = mode.moving ? y[ix.velocity]! : 0;
  const loopInductance = plant.feedInductance + plant.inductanceGradient * x;
  const loopResistance =
    plant.feedResistance + plant.resistanceGradient * x + plant.armatureResistance + plant.contactResistance;
  let conductance = 0;
  let drive = 0;
  let current = 0;
  let anyConducting = false;
  for (let g = 0; g < plant.groups; g++) {
    const stage = g === extra ? Stage.Capacitor : mode.stage[g]!;
    if (!isConducting(stage)) continue;
    anyConducting = true;
    const i = g === extra ? 0 : y[ix.current(g)]!;
    const b = branch(plant, g, stage, y[ix.voltage(g)]!);
    const invL = 1 / plant.inductance[g]!;
    conductance += invL;
    drive += (b.source - b.resistance * i) * invL;
    current += i;
  }
  const loadDrop = (loopResistance + plant.inductanceGradient * v) * current + plant.arcDrop;
  const busVoltage = (loopInductance * drive + loadDrop) / (1 + loopInductance * conductance);
  return {
    current: anyConducting ? current : 0,
    busVoltage,
    currentRate: anyConducting ? drive - conductance * busVoltage : 0,
    loopInductance,
    loopResistance,
    anyConducting,
  };
}

/** Contact normal force F_N = F_N0 + k_N I². */
export const normalForce = (plant: Plant, current: number): number =>
  plant.preload + plant.magneticLoading * current * current;

/** Electromagnetic force ½ L′ I². */
export const electromagneticForce = (plant: Plant, current: number): number =>
  0.5 * plant.inductanceGradient * current * current;

/** Net force on a moving armature and its parts. */
export function armatureForces(plant: Plant, current: number, velocity: number): { em: number; friction: number; drag: number } {
  return {
    em: electromagneticForce(plant, current),
    friction: plant.mu * normalForce(plant, current),
    drag: plant.dragFactor * velocity * velocity,
  };
}

/** dy/dt of the whole state (electrical, mechanical, ledger quadratures) in the given mode. */
export function derivatives(plant: Plant, y: ArrayLike<number>, mode: Mode): number[] {
  const ix = plant.index;
  const dy = new Array<number>(ix.size).fill(0);
  const bus = solveBus(plant, y, mode);
  const current = bus.current;
  let bankLoss = 0;
  let crowbarLoss = 0;
  let moduleLoss = 0;
  for (let g = 0; g < plant.groups; g++) {
    const stage = mode.stage[g]!;
    if (!isConducting(stage)) continue;
    const i = y[ix.current(g)]!;
    const b = branch(plant, g, stage, y[ix.voltage(g)]!);
    dy[ix.current(g)] = (b.source - b.resistance * i - bus.busVoltage) / plant.inductance[g]!;
    if (stage === Stage.Capacitor) {
      dy[ix.voltage(g)] = -i / plant.capacitance[g]!;
      bankLoss += plant.esr[g]! * i * i;
    } else {
      crowbarLoss += plant.diodeResistance[g]! * i * i + plant.diodeDrop[g]! * i;
    }
    moduleLoss += plant.seriesResistance[g]! * i * i;
  }
  const x = y[ix.position]!;
  const i2 = current * current;
  const l = ix.loss;
  dy[l] = bankLoss;
  dy[l + 1] = crowbarLoss;
  dy[l + 2] = moduleLoss;
  dy[l + 3] = plant.feedResistance * i2;
  dy[l + 4] = plant.resistanceGradient * x * i2;
  dy[l + 5] = plant.armatureResistance * i2;
  dy[l + 6] = plant.contactResistance * i2;
  dy[l + 7] = bus.anyConducting ? plant.arcDrop * current : 0;
  dy[ix.action] = i2;
  if (mode.moving) {
    const v = y[ix.velocity]!;
    const f = armatureForces(plant, current, v);
    const net = f.em - f.friction - f.drag;
    dy[ix.position] = v;
    dy[ix.velocity] = net / plant.mass;
    dy[l + 8] = f.friction * v;
    dy[l + 9] = f.drag * v;
    dy[ix.impulse] = net;
  }
  return dy;
}

/** Acceleration of the armature (0 at rest: static friction balances the force). */
export function acceleration(plant: Plant, current: number, velocity: number, moving: boolean): number {
  if (!moving) return 0;
  const f = armatureForces(plant, current, velocity);
  return (f.em - f.friction - f.drag) / plant.mass;
}

/** Margin of the static-friction test: the armature starts when ½L′I² exceeds μ_s F_N (margin > 0). */
export const startMargin = (plant: Plant, current: number): number =>
  electromagneticForce(plant, current) - plant.muStatic * normalForce(plant, current);

/** Breech voltage V_b − (L_f dI/dt + R_f I); 0 with no module conducting. */
export function breechVoltage(plant: Plant, bus: Bus): number {
  if (!bus.anyConducting) return 0;
  return bus.busVoltage - plant.feedInductance * bus.currentRate - plant.feedResistance * bus.current;
}

/** Muzzle (armature) voltage (R_a + R_c) I + V_arc; 0 with no module conducting. */
export function muzzleVoltage(plant: Plant, bus: Bus): number {
  if (!bus.anyConducting) return 0;
  return (plant.armatureResistance + plant.contactResistance) * bus.current + plant.arcDrop;
}

export interface LedgerPoint {
  capacitors: number;
  magnetic: number;
  magneticRails: number;
  kinetic: number;
  losses: number[];
  residual: number;
}

/** The energy ledger of a state: E0 − (E_cap + E_mag + E_kin + W_loss) must stay ~0. */
export function ledger(plant: Plant, y: ArrayLike<number>): LedgerPoint {
  const ix = plant.index;
  let capacitors = 0;
  let moduleMagnetic = 0;
  let current = 0;
  for (let g = 0; g < plant.groups; g++) {
    const v = y[ix.voltage(g)]!;
    const i = y[ix.current(g)]!;
    capacitors += 0.5 * plant.capacitance[g]! * v * v;
    moduleMagnetic += 0.5 * plant.inductance[g]! * i * i;
    current += i;
  }
  const loopInductance = plant.feedInductance + plant.inductanceGradient * y[ix.position]!;
  const magneticRails = 0.5 * loopInductance * current * current;
  const velocity = y[ix.velocity]!;
  const kinetic = 0.5 * plant.mass * velocity * velocity;
  const losses: number[] = [];
  let lossSum = 0;
  for (let k = 0; k < LOSS_ORDER.length; k++) {
    const w = y[ix.loss + k]!;
    losses.push(w);
    lossSum += w;
  }
  const magnetic = moduleMagnetic + magneticRails;
  return {
    capacitors,
    magnetic,
    magneticRails,
    kinetic,
    losses,
    residual: plant.initialEnergy - (capacitors + magnetic + kinetic + lossSum),
  };
}
