/**
 * Quantities derived from a state in a mode, with the time derivatives needed to locate their peaks as roots
 * of the derivative (model contract §5). Pure.
 */
import {
  type Mode,
  type Plant,
  Stage,
  isConducting,
  solveBus,
  electromagneticForce,
  armatureForces,
  breechVoltage,
  muzzleVoltage,
} from './plant.js';

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

export function observe(plant: Plant, y: ArrayLike<number>, mode: Mode): Observables {
  const ix = plant.index;
  const bus = solveBus(plant, y, mode);
  const v = mode.moving ? y[ix.velocity]! : 0;
  const current = bus.current;
  const currentRate = bus.currentRate;
  const groupCurrent: number[] = [];
  const groupRate: number[] = [];
  // dA/dt = Σ (du_k/dt − R_eff,k di_k/dt)/L_k, needed for d²I/dt² and the breech-voltage rate
  let driveRate = 0;
  let conductance = 0;
  let drive = 0;
  for (let g = 0; g < plant.groups; g++) {
    const stage = mode.stage[g]!;
    const i = y[ix.current(g)]!;
    groupCurrent.push(isConducting(stage) ? i : 0);
    if (!isConducting(stage)) {
      groupRate.push(0);
      continue;
    }
    const crowbar = stage === Stage.Crowbar;
    const source = crowbar ? -plant.diodeDrop[g]! : y[ix.voltage(g)]!;
    const resistance = (crowbar ? plant.diodeResistance[g]! : plant.esr[g]!) + plant.seriesResistance[g]!;
    const inductance = plant.inductance[g]!;
    const rate = (source - resistance * i - bus.busVoltage) / inductance;
    groupRate.push(rate);
    const sourceRate = crowbar ? 0 : -i / plant.capacitance[g]!;
    driveRate += (sourceRate - resistance * rate) / inductance;
    conductance += 1 / inductance;
    drive += (source - resistance * i) / inductance;
  }
  const forces = armatureForces(plant, current, v);
  const acceleration = mode.moving ? (forces.em - forces.friction - forces.drag) / plant.mass : 0;
  const accelerationRate = mode.moving
    ? ((plant.inductanceGradient - 2 * plant.mu * plant.magneticLoading) * current * currentRate -
        2 * plant.dragFactor * v * acceleration) /
      plant.mass
    : 0;
  let breechVoltageRate = 0;
  if (bus.anyConducting) {
    const lp = plant.inductanceGradient;
    const loopRate = lp * v;
    const loadResistance = bus.loopResistance + lp * v;
    const load = loadResistance * current + plant.arcDrop;
    const loadRate = (plant.resistanceGradient * v + lp * acceleration) * current + loadResistance * currentRate;
    const denominator = 1 + bus.loopInductance * conductance;
    const busRate =
      (loopRate * drive + bus.loopInductance * driveRate + loadRate) / denominator -
      ((bus.loopInductance * drive + load) * loopRate * conductance) / (denominator * denominator);
    const currentAcceleration = driveRate - conductance * busRate;
    breechVoltageRate = busRate - plant.feedInductance * currentAcceleration - plant.feedResistance * currentRate;
  }
  return {
    current,
    currentRate,
    groupCurrent,
    groupRate,
    acceleration,
    accelerationRate,
    breechVoltage: breechVoltage(plant, bus),
    breechVoltageRate,
    muzzleVoltage: muzzleVoltage(plant, bus),
    force: electromagneticForce(plant, current),
  };
}
