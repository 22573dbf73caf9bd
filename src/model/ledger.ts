/**
 * The energy ledger of the contract's §4 and the other quadratures of a shot (∫I²dt, the net-force impulse):
 * their integrands at a state, and the ledger of a state with its quadratures. Pure.
 */
import { type Mode, type Plant, LOSS_ORDER, Stage, arcDropOf, armatureResistanceOf, contactResistanceOf, railHeatFactor, railResistance } from './plant.js';

/**
 * Layout of the quadratures (the energy-loss channels in LOSS_ORDER, ∫I²dt and the net-force impulse). They are
 * integrals of the state, not part of it: the solver integrates them on the dense output of each step, so the
 * integrator's work (and its step control) covers only the 2G + 2 dynamic states.
 */
export const QUADRATURE = {
  loss: 0,
  action: LOSS_ORDER.length,
  impulse: LOSS_ORDER.length + 1,
  /** ∫ x I² dt: the rails' loss over it is the loss-equivalent loop R′ */
  railAction: LOSS_ORDER.length + 2,
  size: LOSS_ORDER.length + 3,
} as const;

/**
 * The integrands of the quadratures (layout QUADRATURE) at a state: the power of every loss channel of the
 * contract's §4, I² for the action integral, and the net force while moving (impulse). Written into `out`.
 */
export function quadratureIntegrands(plant: Plant, y: ArrayLike<number>, mode: Mode, out: number[] | Float64Array): void {
  const groups = plant.groups;
  let bankLoss = 0;
  let crowbarLoss = 0;
  let moduleLoss = 0;
  let current = 0;
  let anyConducting = false;
  for (let g = 0; g < groups; g++) {
    const s = mode.stage[g]!;
    if (s !== Stage.Capacitor && s !== Stage.Crowbar) continue;
    anyConducting = true;
    const i = y[g]!;
    const i2 = i * i;
    current += i;
    if (s === Stage.Capacitor) bankLoss += plant.esr[g]! * i2;
    else crowbarLoss += plant.diodeResistance[g]! * i2 + plant.diodeDrop[g]! * i;
    moduleLoss += plant.seriesResistance[g]! * i2;
  }
  const x = y[2 * groups]!;
  const i2 = current * current;
  const l = QUADRATURE.loss;
  out[l] = bankLoss;
  out[l + 1] = crowbarLoss;
  out[l + 2] = moduleLoss;
  out[l + 3] = plant.feedResistance * i2;
  out[l + 4] = railResistance(plant, y, x) * i2;
  if (plant.modeRate.length > 0) out[l + 4]! += diffusionLoss(plant, y, x, current, mode.moving ? y[2 * groups + 1]! : 0);
  out[QUADRATURE.railAction] = x * i2;
  out[l + 5] = armatureResistanceOf(plant, y) * i2;
  out[l + 6] = contactResistanceOf(plant, mode) * i2;
  out[l + 7] = anyConducting ? arcDropOf(plant, mode) * current : 0;
  out[QUADRATURE.action] = i2;
  if (mode.moving) {
    const v = y[2 * groups + 1]!;
    const friction = plant.mu * (plant.preload + plant.magneticLoading * i2);
    const drag = plant.dragFactor * v * v;
    out[l + 8] = friction * v;
    out[l + 9] = drag * v;
    out[QUADRATURE.impulse] = 0.5 * plant.inductanceGradient * i2 - friction - drag;
  } else {
    out[l + 8] = 0;
    out[l + 9] = 0;
    out[QUADRATURE.impulse] = 0;
  }
}

/**
 * Joule loss in the rails' diffusion cells, Σ R′_n (x I² − 2 I A_n + B_n) (the cell resistor carries I − i_L in
 * each section), plus the fast cells held as inductance: a section born with them empty at the armature loses as
 * much as they then store, ½ L′_tail v I².
 */
function diffusionLoss(plant: Plant, y: ArrayLike<number>, x: number, current: number, velocity: number): number {
  const modes = plant.modeRate.length;
  const first = plant.index.position + 2;
  let cells = 0;
  for (let n = 0; n < modes; n++) {
    cells += plant.modeResistance[n]! * (x * current * current - 2 * current * y[first + n]! + y[first + modes + n]!);
  }
  return 0.5 * plant.tailInductanceGradient * velocity * current * current + cells * railHeatFactor(plant, y, x);
}

/**
 * Magnetic energy inside the rails held by the integrated diffusion cells, Σ ½ L′_n B_n. B_n = ∫ i_L² dξ is never
 * negative in exact arithmetic; a state that the integrator leaves a hair below zero counts as zero.
 */
export function railInteriorEnergy(plant: Plant, y: ArrayLike<number>): number {
  const modes = plant.modeRate.length;
  const first = plant.index.position + 2;
  let energy = 0;
  for (let n = 0; n < modes; n++) energy += (0.5 * plant.modeResistance[n]! * Math.max(0, y[first + modes + n]!)) / plant.modeRate[n]!;
  return energy;
}

export interface LedgerPoint {
  capacitors: number;
  magnetic: number;
  magneticRails: number;
  /** Σ ½ L′_n B_n, the diffusion cells' energy inside the rails (0 without diffusion) */
  railInterior: number;
  kinetic: number;
  losses: number[];
  residual: number;
}

/** The energy ledger of a state and its quadratures: E0 − (E_cap + E_mag + E_kin + W_loss) must stay ~0. */
export function ledger(plant: Plant, y: ArrayLike<number>, quadratures: ArrayLike<number>): LedgerPoint {
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
  // ½L(x)I² with L(x) = L_f + L′x, the field in the feed and between the rails; the diffusion cells held as
  // inductance (the tail, inside the conductor) count with the cells' energy inside the rails
  const x = y[ix.position]!;
  const tail = 0.5 * plant.tailInductanceGradient * x * current * current;
  const magneticRails = 0.5 * (plant.feedInductance + plant.loadInductance + (plant.circuitGradient - plant.tailInductanceGradient) * x) * current * current;
  const velocity = y[ix.velocity]!;
  const kinetic = 0.5 * plant.mass * velocity * velocity;
  const losses: number[] = [];
  let lossSum = 0;
  for (let k = 0; k < LOSS_ORDER.length; k++) {
    const w = quadratures[QUADRATURE.loss + k]!;
    losses.push(w);
    lossSum += w;
  }
  const railInterior = (plant.modeRate.length > 0 ? railInteriorEnergy(plant, y) : 0) + tail;
  const magnetic = moduleMagnetic + magneticRails + railInterior;
  return {
    capacitors,
    magnetic,
    magneticRails,
    railInterior,
    kinetic,
    losses,
    residual: plant.initialEnergy - (capacitors + magnetic + kinetic + lossSum),
  };
}
