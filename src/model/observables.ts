/**
 * Quantities derived from a state in a mode, with the time derivatives needed to locate their peaks as roots
 * of the derivative (model contract §5). Pure.
 */
import { type Mode, type Plant, Stage, arcDropOf, armatureResistanceOf, branchResistance, railHeatFactor, branchSource, contactResistanceOf, diffusionDrop, emptyBus, solveBusInto } from './plant.js';

/** Scratch for the bus: filled and read within one call, never kept. */
const scratchBus = emptyBus();

export interface Observables {
  current: number;
  currentRate: number;
  /** total current of each group and its rate */
  groupCurrent: number[];
  groupRate: number[];
  acceleration: number;
  accelerationRate: number;
  breechVoltage: number;
  breechVoltageRate: number;
  muzzleVoltage: number;
  force: number;
}

/** An Observables to fill with observeInto, sized for the plant's groups. */
export function emptyObservables(groups: number): Observables {
  return {
    current: 0,
    currentRate: 0,
    groupCurrent: new Array<number>(groups).fill(0),
    groupRate: new Array<number>(groups).fill(0),
    acceleration: 0,
    accelerationRate: 0,
    breechVoltage: 0,
    breechVoltageRate: 0,
    muzzleVoltage: 0,
    force: 0,
  };
}

/** Observables of a state in a mode, as a new object. */
export function observe(plant: Plant, y: ArrayLike<number>, mode: Mode): Observables {
  return observeInto(plant, y, mode, emptyObservables(plant.groups));
}

/**
 * Observables of a state in a mode, written into `out` (made by emptyObservables) and returned. The solver calls
 * it at every sample point, event side and root-finding iterate with objects it reuses, so it allocates nothing.
 */
export function observeInto(plant: Plant, y: ArrayLike<number>, mode: Mode, out: Observables): Observables {
  const groups = plant.groups;
  const lp = plant.inductanceGradient;
  const v = mode.moving ? y[2 * groups + 1]! : 0;
  const bus = solveBusInto(plant, y, mode, scratchBus);
  const { current, currentRate, busVoltage, loopInductance, conductance, drive, anyConducting } = bus;
  // the circuit's gradient: L′ plus the rails' fast diffusion cells held as inductance (L′ without diffusion)
  const lc = plant.circuitGradient;
  const loadResistance = bus.loopResistance + lc * v;
  const groupCurrent = out.groupCurrent;
  const groupRate = out.groupRate;
  // dA/dt = Σ (du_k/dt − R_eff,k di_k/dt)/L_k, needed for d²I/dt² and the breech-voltage rate
  let driveRate = 0;
  for (let g = 0; g < groups; g++) {
    const stage = mode.stage[g]!;
    if (stage !== Stage.Capacitor && stage !== Stage.Crowbar) {
      groupCurrent[g] = 0;
      groupRate[g] = 0;
      continue;
    }
    const i = y[g]!;
    const resistance = branchResistance(plant, g, stage);
    const inductance = plant.inductance[g]!;
    const rate = (branchSource(plant, g, stage, y) - resistance * i - busVoltage) / inductance;
    groupCurrent[g] = i;
    groupRate[g] = rate;
    const sourceRate = stage === Stage.Crowbar ? 0 : -i / plant.capacitance[g]!;
    driveRate += (sourceRate - resistance * rate) / inductance;
  }
  const i2 = current * current;
  const force = 0.5 * lp * i2;
  const acceleration = mode.moving
    ? (force - plant.mu * (plant.preload + plant.magneticLoading * i2) - plant.dragFactor * v * v) / plant.mass
    : 0;
  const accelerationRate = mode.moving
    ? ((lp - 2 * plant.mu * plant.magneticLoading) * current * currentRate - 2 * plant.dragFactor * v * acceleration) /
      plant.mass
    : 0;
  let breechVoltage = 0;
  let breechVoltageRate = 0;
  let muzzleVoltage = 0;
  if (anyConducting) {
    const loopRate = lc * v;
    let load = loadResistance * current + arcDropOf(plant, mode);
    // d/dt of the rails' and the armature's resistance: R′v, or heated R′(κ_r I² e^(κ_r S) W + v) and R_a κ_a I²
    const i2 = current * current;
    const heat = plant.railHeating > 0 ? Math.exp(plant.railHeating * y[plant.index.action]!) : 1;
    const railRate =
      plant.railHeating > 0 ? plant.resistanceGradient * (plant.railHeating * i2 * heat * y[plant.index.railHeat]! + v) : plant.resistanceGradient * v;
    const armatureRate = plant.armatureHeating > 0 ? armatureResistanceOf(plant, y) * plant.armatureHeating * i2 : 0;
    let loadRate = (lc * acceleration) * current + loadResistance * currentRate + (railRate + armatureRate) * current;
    if (plant.modeRate.length > 0) {
      const x = y[2 * groups]!;
      load += diffusionDrop(plant, y, x, current);
      // with F the rails' heating factor: d/dt F Σ R′_n (x I − A_n) = F′ Σ R′_n (x I − A_n) + F Σ R′_n (v I + x dI/dt − F λ_n (x I − A_n)),
      // F′ = κ_r I² F + v (1 − F)/x
      const factor = railHeatFactor(plant, y, x);
      const factorRate = plant.railHeating > 0 && x > 0 ? plant.railHeating * i2 * factor + (v * (1 - factor)) / x : 0;
      const first = 2 * groups + 2;
      for (let n = 0; n < plant.modeRate.length; n++) {
        const lag = x * current - y[first + n]!;
        loadRate += plant.modeResistance[n]! * (factorRate * lag + factor * (v * current + x * currentRate - factor * plant.modeRate[n]! * lag));
      }
    }
    const denominator = 1 + loopInductance * conductance;
    const busRate =
      (loopRate * drive + loopInductance * driveRate + loadRate) / denominator -
      ((loopInductance * drive + load) * loopRate * conductance) / (denominator * denominator);
    const currentAcceleration = driveRate - conductance * busRate;
    breechVoltage = busVoltage - plant.feedInductance * currentRate - plant.feedResistance * current;
    breechVoltageRate = busRate - plant.feedInductance * currentAcceleration - plant.feedResistance * currentRate;
    muzzleVoltage = (armatureResistanceOf(plant, y) + contactResistanceOf(plant, mode)) * current + arcDropOf(plant, mode);
  }
  out.current = current;
  out.currentRate = currentRate;
  out.acceleration = acceleration;
  out.accelerationRate = accelerationRate;
  out.breechVoltage = breechVoltage;
  out.breechVoltageRate = breechVoltageRate;
  out.muzzleVoltage = muzzleVoltage;
  out.force = force;
  return out;
}
