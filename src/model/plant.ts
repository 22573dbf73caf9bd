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
  /** the solid contact has turned into an arc (armature transition); false without a transition criterion */
  arcing?: boolean;
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
  /** a ring-down: the bank fires into a short at the breech (no rails, no armature motion) */
  shorted: boolean;
  /** the short's own inductance (0 for a launch); in series with the feed, beyond the breech */
  loadInductance: number;
  railLength: number;
  inductanceGradient: number;
  resistanceGradient: number;
  /** rail current diffusion: loop R′_n and λ_n of each integrated cell (empty without diffusion) */
  modeResistance: number[];
  modeRate: number[];
  /** inductance gradient of the circuit: L′ plus the fast cells' inductance held as inductance (no force) */
  circuitGradient: number;
  /** that held inductance gradient Σ L′_n of the fast cells (0 without diffusion) */
  tailInductanceGradient: number;
  mass: number;
  startPosition: number;
  armatureResistance: number;
  contactResistance: number;
  arcDrop: number;
  /** armature transition: action ∫I²dt at which the solid contact becomes an arc (Infinity: never), the arc drop after */
  transitionAction: number;
  transitionArcDrop: number;
  /**
   * adiabatic heating, ρ = ρ0(1 + αΔT) with ∫I²dt/A² = γc/(ρ0α)·ln(1 + αΔT): the resistance grows as exp(κ S) with
   * κ = ρ0α/(A²γc) and S the action through the conductor (0: no heating). Armature: S = ∫I²dt; each rail section:
   * the action since the armature passed it.
   */
  armatureHeating: number;
  railHeating: number;
  mu: number;
  muStatic: number;
  preload: number;
  magneticLoading: number;
  /** ½ ρ_g C_d A_b, 0 without drag */
  dragFactor: number;
  initialEnergy: number;
  /** branch resistance R_eff,k of each stage: R_esr + R (capacitor), R_D + R (crowbar) */
  capacitorBranchResistance: number[];
  crowbarBranchResistance: number[];
  /** state layout */
  index: StateIndex;
}

export interface StateIndex {
  /** length of the integrated state: group currents and voltages, position, velocity */
  size: number;
  current: (g: number) => number;
  voltage: (g: number) => number;
  position: number;
  velocity: number;
  /** rail diffusion cell n: A_n = ∫₀ˣ i_L dξ and B_n = ∫₀ˣ i_L² dξ over the rails behind the armature */
  modeFirst: (n: number) => number;
  modeSecond: (n: number) => number;
  /** the action ∫I²dt (armature transition or heating; -1 without) */
  action: number;
  /** rail heating: W = ∫₀ˣ exp(−κ_r S_pass(ξ)) dξ over the rails behind the armature (-1 without) */
  railHeat: number;
}

function stateIndex(groups: number, modes = 0, action = false, railHeat = false): StateIndex {
  const position = 2 * groups;
  const after = 2 * groups + 2 + 2 * modes;
  return {
    size: after + (action ? 1 : 0) + (railHeat ? 1 : 0),
    action: action ? after : -1,
    railHeat: railHeat ? after + (action ? 1 : 0) : -1,
    current: (g) => g,
    voltage: (g) => groups + g,
    position,
    velocity: position + 1,
    modeFirst: (n) => position + 2 + n,
    modeSecond: (n) => position + 2 + modes + n,
  };
}

export function makePlant(scenario: Scenario): Plant {
  const bank = scenario.bank;
  const n = bank.map((g) => g.count);
  const drag = scenario.drag;
  const load = scenario.load ?? null;
  const diffusion = scenario.rails.diffusion;
  if (load) {
    // the short stands where rails and armature would be: its resistance takes the armature's place in the
    // loop (and its loss the armature's ledger entry); L′ = 0, so no force and the "armature" never starts.
    // Length and mass are unit placeholders for the tolerance scales; nothing else reads them.
    return {
      ...makePlant({ ...scenario, load: undefined, drag: null, rails: { length: 1, inductanceGradient: 0, resistanceGradient: 0 }, armature: { mass: 1, position: 0, resistance: load.resistance, contactResistance: 0, arcDrop: 0 }, friction: { coefficient: 0, staticCoefficient: 0, preload: 0, magneticLoading: 0 } }),
      shorted: true,
      loadInductance: load.inductance,
    };
  }
  return {
    shorted: false,
    loadInductance: 0,
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
    modeResistance: diffusion ? diffusion.modes.map((m) => m.resistanceGradient) : [],
    modeRate: diffusion ? diffusion.modes.map((m) => m.rate) : [],
    circuitGradient: scenario.rails.inductanceGradient + (diffusion ? diffusion.tailInductanceGradient : 0),
    tailInductanceGradient: diffusion ? diffusion.tailInductanceGradient : 0,
    mass: scenario.armature.mass,
    startPosition: scenario.armature.position,
    armatureResistance: scenario.armature.resistance,
    contactResistance: scenario.armature.contactResistance,
    arcDrop: scenario.armature.arcDrop,
    // from its parts, so a study that varies either moves it
    transitionAction: scenario.armature.transition ? scenario.armature.transition.specificAction * scenario.armature.transition.contactArea ** 2 : Infinity,
    transitionArcDrop: scenario.armature.transition?.arcDrop ?? 0,
    armatureHeating: scenario.heating?.armature ?? 0,
    railHeating: scenario.heating?.rails ?? 0,
    mu: scenario.friction.coefficient,
    muStatic: scenario.friction.staticCoefficient,
    preload: scenario.friction.preload,
    magneticLoading: scenario.friction.magneticLoading,
    // strong shock: (γ+1)/2·ρ0·A (read from γ, so a study that varies drag.heatCapacityRatio moves it)
    dragFactor: drag
      ? drag.model === 'strong-shock'
        ? 0.5 * drag.gasDensity * (drag.heatCapacityRatio! + 1) * drag.boreArea
        : 0.5 * drag.gasDensity * drag.dragCoefficient * drag.boreArea
      : 0,
    capacitorBranchResistance: bank.map((g) => (g.esr / g.count) + (g.resistance / g.count)),
    crowbarBranchResistance: bank.map((g) => ((g.crowbar?.resistance ?? 0) / g.count) + (g.resistance / g.count)),
    initialEnergy: bank.reduce((sum, g) => sum + 0.5 * g.capacitance * g.count * g.voltage * g.voltage, 0),
    index: stateIndex(
      bank.length,
      diffusion ? diffusion.modes.length : 0,
      scenario.armature.transition !== undefined || scenario.heating !== undefined,
      (scenario.heating?.rails ?? 0) > 0,
    ),
  };
}

export function initialState(plant: Plant): number[] {
  const y = new Array<number>(plant.index.size).fill(0);
  // the rails behind the armature's start carry current from the first instant: W(0) = x0
  if (plant.index.railHeat >= 0) y[plant.index.railHeat] = plant.startPosition;
  for (let g = 0; g < plant.groups; g++) y[plant.index.voltage(g)] = plant.chargeVoltage[g]!;
  y[plant.index.position] = plant.startPosition;
  return y;
}

export function initialMode(plant: Plant): Mode {
  return { stage: new Array<Stage>(plant.groups).fill(Stage.Waiting), moving: false };
}

export const isConducting = (stage: Stage): boolean => stage === Stage.Capacitor || stage === Stage.Crowbar;

/**
 * The state components that change in a mode: the current of each conducting group, the voltage of each group in
 * its capacitor stage, position and velocity while the armature moves. Every other component is constant until
 * the next event (a waiting or switched-off group, a crowbarred capacitor held at 0 V, an armature at rest), so
 * the integrator need not carry it. Never empty: with nothing changing, the position is kept as a trivial state.
 */
export function evolvingComponents(plant: Plant, mode: Mode): number[] {
  const ix = plant.index;
  const components: number[] = [];
  for (let g = 0; g < plant.groups; g++) if (isConducting(mode.stage[g]!)) components.push(ix.current(g));
  for (let g = 0; g < plant.groups; g++) if (mode.stage[g] === Stage.Capacitor) components.push(ix.voltage(g));
  if (mode.moving) components.push(ix.position, ix.velocity);
  for (let n = 0; n < plant.modeRate.length; n++) components.push(ix.modeFirst(n), ix.modeSecond(n));
  if (ix.action >= 0) components.push(ix.action);
  if (ix.railHeat >= 0 && mode.moving) components.push(ix.railHeat);
  if (components.length === 0) components.push(ix.position);
  return components;
}

/** Source voltage u_k of a conducting group in its stage: the capacitor voltage, or −V_D through the crowbar. */
export function branchSource(plant: Plant, g: number, stage: Stage, y: ArrayLike<number>): number {
  return stage === Stage.Crowbar ? -plant.diodeDrop[g]! : y[plant.groups + g]!;
}

/** Branch resistance R_eff,k of a conducting group in its stage. */
export function branchResistance(plant: Plant, g: number, stage: Stage): number {
  return stage === Stage.Crowbar ? plant.crowbarBranchResistance[g]! : plant.capacitorBranchResistance[g]!;
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
  /** G = Σ 1/L_k and A = Σ (u_k − R_eff,k i_k)/L_k over the conducting groups */
  conductance: number;
  drive: number;
  anyConducting: boolean;
}

export const emptyBus = (): Bus => ({
  current: 0,
  busVoltage: 0,
  currentRate: 0,
  loopInductance: 0,
  loopResistance: 0,
  conductance: 0,
  drive: 0,
  anyConducting: false,
});

/**
 * The algebraic bus equation: V_b = (L(x)A + B)/(1 + L(x)G), dI/dt = A − G V_b, written into `bus` so the
 * integrator's inner loop allocates nothing. `extra` adds a group as if conducting with zero current (the
 * turn-on test of the contract).
 */
export function solveBusInto(plant: Plant, y: ArrayLike<number>, mode: Mode, bus: Bus, extra = -1): Bus {
  const groups = plant.groups;
  const x = y[2 * groups]!;
  const v = mode.moving ? y[2 * groups + 1]! : 0;
  const loopInductance = plant.feedInductance + plant.loadInductance + plant.circuitGradient * x;
  const loopResistance =
    plant.feedResistance + railResistance(plant, y, x) + armatureResistanceOf(plant, y) + contactResistanceOf(plant, mode);
  let conductance = 0;
  let drive = 0;
  let current = 0;
  let anyConducting = false;
  for (let g = 0; g < groups; g++) {
    const stage = g === extra ? Stage.Capacitor : mode.stage[g]!;
    if (stage !== Stage.Capacitor && stage !== Stage.Crowbar) continue;
    anyConducting = true;
    const i = g === extra ? 0 : y[g]!;
    const invL = 1 / plant.inductance[g]!;
    conductance += invL;
    drive += (branchSource(plant, g, stage, y) - branchResistance(plant, g, stage) * i) * invL;
    current += i;
  }
  let loadDrop = (loopResistance + plant.circuitGradient * v) * current + arcDropOf(plant, mode);
  if (plant.modeRate.length > 0 && anyConducting) loadDrop += diffusionDrop(plant, y, x, current);
  const busVoltage = (loopInductance * drive + loadDrop) / (1 + loopInductance * conductance);
  bus.current = anyConducting ? current : 0;
  bus.busVoltage = busVoltage;
  bus.currentRate = anyConducting ? drive - conductance * busVoltage : 0;
  bus.loopInductance = loopInductance;
  bus.loopResistance = loopResistance;
  bus.conductance = conductance;
  bus.drive = drive;
  bus.anyConducting = anyConducting;
  return bus;
}

/** Heating factor exp(κ S) of a conductor with heating coefficient κ at the state's action (1 without heating). */
function heated(plant: Plant, kappa: number, y: ArrayLike<number>): number {
  if (!(kappa > 0)) return 1;
  const exponent = kappa * y[plant.index.action]!;
  // the right-hand side, the ledger and the observables ask for the same factor several times at one state
  if (exponent === lastExponent[0]) return lastFactor[0]!;
  if (exponent === lastExponent[1]) return lastFactor[1]!;
  const factor = Math.exp(exponent);
  lastExponent[1] = lastExponent[0]!;
  lastFactor[1] = lastFactor[0]!;
  lastExponent[0] = exponent;
  lastFactor[0] = factor;
  return factor;
}
/** The last two heating exponents and their factors (a cache of pure values: any plant may share it). */
const lastExponent = new Float64Array([NaN, NaN]);
const lastFactor = new Float64Array([1, 1]);

/** The armature's resistance, heated: R_a·exp(κ_a S). */
export const armatureResistanceOf = (plant: Plant, y: ArrayLike<number>): number =>
  plant.armatureHeating > 0 ? plant.armatureResistance * heated(plant, plant.armatureHeating, y) : plant.armatureResistance;

/**
 * The rails' DC resistance behind the armature: R′x, or heated R′·exp(κ_r S)·W (each section by the action since the
 * armature passed it).
 */
export function railResistance(plant: Plant, y: ArrayLike<number>, x: number): number {
  if (plant.railHeating <= 0) return plant.resistanceGradient * x;
  return plant.resistanceGradient * heated(plant, plant.railHeating, y) * y[plant.index.railHeat]!;
}

/**
 * The factor by which heating raises the rails' diffusion cells, the mean over the rails behind the armature,
 * exp(κ_r S)·W/x (1 without rail heating). Scaling R_n and λ_n together keeps L_n, so the ledger still closes.
 */
export function railHeatFactor(plant: Plant, y: ArrayLike<number>, x: number): number {
  if (plant.railHeating <= 0 || !(x > 0)) return 1;
  return (heated(plant, plant.railHeating, y) * y[plant.index.railHeat]!) / x;
}

/** The arc drop in a mode: the armature's own, or after a transition the transition's arc drop. */
export const arcDropOf = (plant: Plant, mode: Mode): number => (mode.arcing ? plant.transitionArcDrop : plant.arcDrop);

/** The contact resistance in a mode: the solid contact's, none once it has turned into an arc. */
export const contactResistanceOf = (plant: Plant, mode: Mode): number => (mode.arcing ? 0 : plant.contactResistance);

/** Voltage across the rails' diffusion cells, Σ R′_n (x I − A_n): the current through each cell's resistor. */
export function diffusionDrop(plant: Plant, y: ArrayLike<number>, x: number, current: number): number {
  const first = plant.index.position + 2;
  let drop = 0;
  for (let n = 0; n < plant.modeRate.length; n++) drop += plant.modeResistance[n]! * (x * current - y[first + n]!);
  return drop * railHeatFactor(plant, y, x);
}

/** The bus equation as a new object (event functions, settling, records). */
export function solveBus(plant: Plant, y: ArrayLike<number>, mode: Mode, extra = -1): Bus {
  return solveBusInto(plant, y, mode, emptyBus(), extra);
}

/** Contact normal force F_N = F_N0 + k_N I². */
export const normalForce = (plant: Plant, current: number): number =>
  plant.preload + plant.magneticLoading * current * current;

/** Electromagnetic force ½ L′ I². */
export const electromagneticForce = (plant: Plant, current: number): number =>
  0.5 * plant.inductanceGradient * current * current;

/** dy/dt of the state in the given mode, as a new array. */
export function derivatives(plant: Plant, y: ArrayLike<number>, mode: Mode): number[] {
  const dy = new Array<number>(plant.index.size);
  derivativesInto(plant, y, mode, dy);
  return dy;
}

/** Scratch for the inner loop: filled and read within one call, never kept. */
const scratchBus = emptyBus();

/** dy/dt written into `out` (length index.size). The integrator's inner loop: it allocates nothing. */
export function derivativesInto(plant: Plant, y: ArrayLike<number>, mode: Mode, out: number[] | Float64Array): void {
  const groups = plant.groups;
  const bus = solveBusInto(plant, y, mode, scratchBus);
  for (let g = 0; g < groups; g++) {
    const stage = mode.stage[g]!;
    out[g] = 0;
    out[groups + g] = 0;
    if (stage !== Stage.Capacitor && stage !== Stage.Crowbar) continue;
    const i = y[g]!;
    out[g] = (branchSource(plant, g, stage, y) - branchResistance(plant, g, stage) * i - bus.busVoltage) / plant.inductance[g]!;
    if (stage === Stage.Capacitor) out[groups + g] = -i / plant.capacitance[g]!;
  }
  if (mode.moving) {
    const v = y[2 * groups + 1]!;
    const i2 = bus.current * bus.current;
    const em = 0.5 * plant.inductanceGradient * i2;
    const friction = plant.mu * (plant.preload + plant.magneticLoading * i2);
    const drag = plant.dragFactor * v * v;
    out[2 * groups] = v;
    out[2 * groups + 1] = (em - friction - drag) / plant.mass;
  } else {
    out[2 * groups] = 0;
    out[2 * groups + 1] = 0;
  }
  if (plant.index.action >= 0) out[plant.index.action] = bus.current * bus.current;
  if (plant.index.railHeat >= 0) {
    out[plant.index.railHeat] = mode.moving ? y[2 * groups + 1]! / heated(plant, plant.railHeating, y) : 0;
  }
  const modes = plant.modeRate.length;
  if (modes > 0) {
    // each rail section is born with empty cells as the armature passes it, so no term at the moving end:
    // dA_n/dt = λ_n (x I − A_n), dB_n/dt = 2 λ_n (I A_n − B_n)
    const x = y[2 * groups]!;
    const current = bus.current;
    const first = 2 * groups + 2;
    const factor = railHeatFactor(plant, y, x);
    for (let n = 0; n < modes; n++) {
      const a = y[first + n]!;
      const rate = plant.modeRate[n]! * factor;
      out[first + n] = rate * (x * current - a);
      out[first + modes + n] = 2 * rate * (current * a - y[first + modes + n]!);
    }
  }
}

/** Margin of the static-friction test: the armature starts when ½L′I² exceeds μ_s F_N (margin > 0). */
export const startMargin = (plant: Plant, current: number): number =>
  electromagneticForce(plant, current) - plant.muStatic * normalForce(plant, current);
