/**
 * Range checks on an SI scenario: what the model needs to be well posed. Run after loading and again after a
 * study changes a value, so a sweep point outside the physical range is caught with its path.
 */
import { InputError } from '../core/errors.js';
import type { Scenario } from './types.js';

type Rule = [path: string, value: number, ok: boolean, expected: string];

function solverRules({ solver }: Scenario): Rule[] {
  return [
    ['solver.relTol', solver.relTol, solver.relTol >= 1e-13 && solver.relTol <= 1e-3, 'a relative tolerance from 1e-13 to 1e-3'],
    ['solver.endTime', solver.endTime, solver.endTime > 0 && solver.endTime <= 10, 'an end time > 0 and ≤ 10 s'],
    ['solver.sampleInterval', solver.sampleInterval, solver.sampleInterval >= 0, 'a sample interval ≥ 0 (0: events only)'],
    ['solver.currentFloor', solver.currentFloor, solver.currentFloor > 0, 'a current floor > 0'],
    ['solver.maxSteps', solver.maxSteps, Number.isInteger(solver.maxSteps) && solver.maxSteps >= 1, 'a whole number of steps ≥ 1'],
  ];
}

export function validateScenario(s: Scenario, file?: string): void {
  if (s.bank.length === 0) throw new InputError('bank', 'the bank has no module group, so the shot cannot fire; add at least one group', file);
  const rules: Rule[] = [];
  s.bank.forEach((g, n) => {
    const p = `bank[${n}]`;
    rules.push(
      [`${p}.count`, g.count, Number.isInteger(g.count) && g.count >= 1, 'a whole number ≥ 1'],
      [`${p}.capacitance`, g.capacitance, g.capacitance > 0, 'a capacitance > 0'],
      [`${p}.voltage`, g.voltage, g.voltage > 0, 'a charge voltage > 0'],
      [`${p}.esr`, g.esr, g.esr >= 0, 'a resistance ≥ 0'],
      [`${p}.inductance`, g.inductance, g.inductance > 0, 'an inductance > 0'],
      [`${p}.resistance`, g.resistance, g.resistance >= 0, 'a resistance ≥ 0'],
      [`${p}.trigger`, g.trigger, g.trigger >= 0, 'a trigger time ≥ 0'],
      [`${p}.ratedReversal`, g.ratedReversal ?? 0.2, (g.ratedReversal ?? 0.2) >= 0 && (g.ratedReversal ?? 0.2) <= 1, 'a fraction from 0 to 1'],
    );
    if (g.crowbar) {
      rules.push(
        [`${p}.crowbar.drop`, g.crowbar.drop, g.crowbar.drop >= 0, 'a forward drop ≥ 0'],
        [`${p}.crowbar.resistance`, g.crowbar.resistance, g.crowbar.resistance >= 0, 'a resistance ≥ 0'],
      );
    }
  });
  const { feed, rails, armature, friction, drag, solver } = s;
  rules.push(
    ['feed.inductance', feed.inductance, feed.inductance > 0, 'an inductance > 0 (every real feed has some)'],
    ['feed.resistance', feed.resistance, feed.resistance >= 0, 'a resistance ≥ 0'],
  );
  if (s.load) {
    rules.push(
      ['load.inductance', s.load.inductance, s.load.inductance >= 0, 'an inductance ≥ 0'],
      ['load.resistance', s.load.resistance, s.load.resistance >= 0, 'a resistance ≥ 0'],
    );
    // a study or a fit that set a launch value on a ring-down is as wrong as a file that gives one
    const launch: [string, number][] = [
      ['rails.length', rails.length], ['rails.inductanceGradient', rails.inductanceGradient], ['rails.resistanceGradient', rails.resistanceGradient],
      ['armature.mass', armature.mass], ['armature.position', armature.position], ['armature.resistance', armature.resistance],
      ['armature.contactResistance', armature.contactResistance], ['armature.arcDrop', armature.arcDrop],
      ['friction.coefficient', friction.coefficient], ['friction.staticCoefficient', friction.staticCoefficient], ['friction.preload', friction.preload], ['friction.magneticLoading', friction.magneticLoading],
    ];
    for (const [path, value] of launch) {
      if (value !== 0) throw new InputError(path, 'is a launch-only value: this scenario fires the bank into a shorted load (load.kind "short"), which has no rails, armature or friction', file);
    }
    if (drag) throw new InputError('drag', 'is a launch-only key: this scenario fires the bank into a shorted load', file);
  }
  rules.push(...solverRules(s));
  if (!s.load) rules.push(
    ['rails.length', rails.length, rails.length > 0, 'a length > 0'],
    ['rails.inductanceGradient', rails.inductanceGradient, rails.inductanceGradient > 0, 'an inductance gradient > 0'],
    ['rails.resistanceGradient', rails.resistanceGradient, rails.resistanceGradient >= 0, 'a resistance gradient ≥ 0'],
    ['armature.mass', armature.mass, armature.mass > 0, 'a mass > 0'],
    ['armature.position', armature.position, armature.position >= 0, 'a position ≥ 0'],
    ['armature.resistance', armature.resistance, armature.resistance >= 0, 'a resistance ≥ 0'],
    ['armature.contactResistance', armature.contactResistance, armature.contactResistance >= 0, 'a resistance ≥ 0'],
    ['armature.arcDrop', armature.arcDrop, armature.arcDrop >= 0, 'an arc drop ≥ 0'],
    ['friction.coefficient', friction.coefficient, friction.coefficient >= 0, 'a friction coefficient ≥ 0'],
    ['friction.staticCoefficient', friction.staticCoefficient, friction.staticCoefficient >= friction.coefficient, `a static coefficient ≥ the sliding coefficient (${friction.coefficient})`],
    ['friction.preload', friction.preload, friction.preload >= 0, 'a preload ≥ 0'],
    ['friction.magneticLoading', friction.magneticLoading, friction.magneticLoading >= 0, 'a magnetic loading ≥ 0'],
  );
  if (drag) {
    rules.push(
      ['drag.gasDensity', drag.gasDensity, drag.gasDensity >= 0, 'a density ≥ 0'],
      ['drag.dragCoefficient', drag.dragCoefficient, drag.dragCoefficient >= 0, 'a drag coefficient ≥ 0'],
      ['drag.boreArea', drag.boreArea, drag.boreArea >= 0, 'an area ≥ 0'],
    );
  }
  for (const [path, value, ok, expected] of rules) {
    if (!Number.isFinite(value)) throw new InputError(path, `expected ${expected}, got ${value}`, file);
    if (!ok) throw new InputError(path, `expected ${expected}, got ${value}`, file);
  }
  if (!s.load && rails.length <= armature.position) {
    throw new InputError('rails.length', `expected a rail length greater than the armature's initial position (${armature.position} m), got ${rails.length} m`, file);
  }
  if (solver.sampleInterval > 0 && solver.endTime / solver.sampleInterval > 2e6) {
    throw new InputError('solver.sampleInterval', `expected at most 2,000,000 samples up to the end time, got ${Math.round(solver.endTime / solver.sampleInterval)}; raise the interval`, file);
  }
}
