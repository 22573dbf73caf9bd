/** Scenarios built in code for the checks against closed forms (SI numbers, every key explicit). */
import type { ModuleGroup, Scenario } from '../../src/scenario/types.js';

export function moduleGroup(overrides: Partial<ModuleGroup> = {}): ModuleGroup {
  return {
    label: 'test module',
    count: 1,
    capacitance: 400e-6,
    voltage: 5000,
    esr: 2e-3,
    inductance: 5e-6,
    resistance: 3e-3,
    trigger: 0,
    crowbar: null,
    ratedReversal: 0.2,
    ...overrides,
  };
}

type Sections = Partial<{ [K in keyof Scenario]: Partial<Scenario[K]> }> & { bank?: ModuleGroup[] };

export function scenario(overrides: Sections = {}): Scenario {
  return {
    name: overrides.name ?? 'closed-form check',
    description: '',
    bank: overrides.bank ?? [moduleGroup()],
    feed: { inductance: 0.3e-6, resistance: 1e-3, ...overrides.feed },
    rails: { length: 1.0, inductanceGradient: 0.45e-6, resistanceGradient: 0.2e-3, ...overrides.rails },
    armature: { mass: 0.01, position: 0.05, resistance: 50e-6, contactResistance: 100e-6, arcDrop: 0, ...overrides.armature },
    friction: { coefficient: 0, staticCoefficient: 0, preload: 0, magneticLoading: 0, ...overrides.friction },
    drag: overrides.drag === undefined ? null : (overrides.drag as Scenario['drag']),
    solver: { relTol: 1e-9, endTime: 0.1, sampleInterval: 1e-6, currentFloor: 1, maxSteps: 1_000_000, ...overrides.solver },
  };
}

/** A friction preload so large that ½L′I² never beats it: the armature stays locked at its start position. */
export const LOCKED = { coefficient: 1, staticCoefficient: 1, preload: 1e12, magneticLoading: 0 };

/** Series loop of one module (capacitor stage) with a locked armature: total L and R seen by the capacitor. */
export function lockedLoop(s: Scenario, stage: 'capacitor' | 'crowbar' = 'capacitor') {
  const g = s.bank[0]!;
  const x = s.armature.position;
  const inductance = g.inductance + s.feed.inductance + s.rails.inductanceGradient * x;
  const external = g.resistance + s.feed.resistance + s.rails.resistanceGradient * x + s.armature.resistance + s.armature.contactResistance;
  const resistance = external + (stage === 'capacitor' ? g.esr : (g.crowbar?.resistance ?? 0));
  return { inductance, resistance, capacitance: g.capacitance, voltage: g.voltage };
}
