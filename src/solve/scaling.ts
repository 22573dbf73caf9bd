/**
 * How the solver scales the problem for odex: the time unit, the step cap, the absolute tolerances. Pure.
 */
import type { Plant } from '../model/plant.js';

/** Characteristic time of the bank: the fastest group's quarter period through the feed. Scales odex's time. */
export function timeScale(plant: Plant): number {
  let scale = Infinity;
  for (let g = 0; g < plant.groups; g++) {
    const quarter = (Math.PI / 2) * Math.sqrt((plant.inductance[g]! + plant.feedInductance + plant.loadInductance) * plant.capacitance[g]!);
    scale = Math.min(scale, quarter);
  }
  return scale;
}

/**
 * Time constant bounding the fastest damped mode: the smallest L/R of a module's loop through the feed and
 * armature. odex is explicit; near its stability limit on such a mode, steps are accepted but the dense output
 * between them degrades, so steps are capped at a few of these.
 */
export function fastestDecay(plant: Plant): number {
  const external = plant.feedResistance + plant.armatureResistance + plant.contactResistance + plant.resistanceGradient * plant.railLength;
  let fastest = Infinity;
  for (let g = 0; g < plant.groups; g++) {
    const resistance = Math.max(plant.esr[g]!, plant.diodeResistance[g]!) + plant.seriesResistance[g]! + external;
    const inductance = plant.inductance[g]! + plant.feedInductance + plant.loadInductance;
    if (resistance > 0) fastest = Math.min(fastest, inductance / resistance);
  }
  return fastest;
}

/** Absolute tolerances per component: relTol times a scale that bounds each quantity. */
export function absoluteTolerances(plant: Plant, relTol: number): number[] {
  const ix = plant.index;
  const e0 = plant.initialEnergy;
  const smallestInductance = plant.feedInductance + Math.min(...plant.inductance);
  const currentScale = Math.sqrt((2 * e0) / smallestInductance);
  const voltageScale = Math.max(...plant.chargeVoltage);
  const velocityScale = Math.sqrt((2 * e0) / plant.mass);
  const atol = new Array<number>(ix.size);
  for (let g = 0; g < plant.groups; g++) {
    atol[ix.current(g)] = relTol * currentScale;
    atol[ix.voltage(g)] = relTol * voltageScale;
  }
  atol[ix.position] = relTol * plant.railLength;
  atol[ix.velocity] = relTol * velocityScale;
  // the action locates the transition (its scale is the threshold) and sets the heating (scale: e-folding 1/κ)
  if (ix.action >= 0) {
    const scales = [plant.transitionAction, plant.armatureHeating > 0 ? 1 / plant.armatureHeating : Infinity, plant.railHeating > 0 ? 1 / plant.railHeating : Infinity];
    atol[ix.action] = relTol * Math.min(...scales);
  }
  if (ix.railHeat >= 0) atol[ix.railHeat] = relTol * plant.railLength;
  // rail diffusion cells: A_n ≤ x·I, B_n ≤ x·I²
  for (let n = 0; n < plant.modeRate.length; n++) {
    atol[ix.modeFirst(n)] = relTol * currentScale * plant.railLength;
    atol[ix.modeSecond(n)] = relTol * currentScale * currentScale * plant.railLength;
  }
  return atol;
}
