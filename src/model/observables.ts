/**
 * Quantities derived from a state in a mode, with the time derivatives needed to locate their peaks as roots
 * of the derivative (model contract §5). Pure.
 */
import { type Mode, type Plant, Stage } from './plant.js';

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

/**
 * Observables of a state in a mode. Called at every sample point, event side and root-finding iterate, so it
 * solves the bus equation inline (the same algebra as solveBus) and allocates only its result.
 */
export function observe(plant: Plant, y: ArrayLike<number>, mode: Mode): Observables {
  const groups = plant.groups;
  const lp = plant.inductanceGradient;
  const x = y[2 * groups]!;
  const v = mode.moving ? y[2 * groups + 1]! : 0;
  const loopInductance = plant.feedInductance + lp * x;
  const loopResistance =
    plant.feedResistance + plant.resistanceGradient * x + plant.armatureResistance + plant.contactResistance;
  const groupCurrent = new Array<number>(groups);
  const groupRate = new Array<number>(groups);
  let conductance = 0;
  let drive = 0;
  let current = 0;
  let anyConducting = false;
  for (let g = 0; g < groups; g++) {
    const stage = mode.stage[g]!;
    if (stage !== Stage.Capacitor && stage !== Stage.Crowbar) continue;
    anyConducting = true;
    const i = y[g]!;
    const crowbar = stage === Stage.Crowbar;
    const source = crowbar ? -plant.diodeDrop[g]! : y[groups + g]!;
    const resistance = crowbar ? plant.crowbarBranchResistance[g]! : plant.capacitorBranchResistance[g]!;
    const invL = 1 / plant.inductance[g]!;
    conductance += invL;
    drive += (source - resistance * i) * invL;
    current += i;
  }
  const loadResistance = loopResistance + lp * v;
  const busVoltage = (loopInductance * drive + loadResistance * current + plant.arcDrop) / (1 + loopInductance * conductance);
  if (!anyConducting) current = 0;
  const currentRate = anyConducting ? drive - conductance * busVoltage : 0;
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
    const crowbar = stage === Stage.Crowbar;
    const source = crowbar ? -plant.diodeDrop[g]! : y[groups + g]!;
    const resistance = crowbar ? plant.crowbarBranchResistance[g]! : plant.capacitorBranchResistance[g]!;
    const inductance = plant.inductance[g]!;
    const rate = (source - resistance * i - busVoltage) / inductance;
    groupCurrent[g] = i;
    groupRate[g] = rate;
    const sourceRate = crowbar ? 0 : -i / plant.capacitance[g]!;
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
    const loopRate = lp * v;
    const load = loadResistance * current + plant.arcDrop;
    const loadRate = (plant.resistanceGradient * v + lp * acceleration) * current + loadResistance * currentRate;
    const denominator = 1 + loopInductance * conductance;
    const busRate =
      (loopRate * drive + loopInductance * driveRate + loadRate) / denominator -
      ((loopInductance * drive + load) * loopRate * conductance) / (denominator * denominator);
    const currentAcceleration = driveRate - conductance * busRate;
    breechVoltage = busVoltage - plant.feedInductance * currentRate - plant.feedResistance * current;
    breechVoltageRate = busRate - plant.feedInductance * currentAcceleration - plant.feedResistance * currentRate;
    muzzleVoltage = (plant.armatureResistance + plant.contactResistance) * current + plant.arcDrop;
  }
  return {
    current,
    currentRate,
    groupCurrent,
    groupRate,
    acceleration,
    accelerationRate,
    breechVoltage,
    breechVoltageRate,
    muzzleVoltage,
    force,
  };
}
