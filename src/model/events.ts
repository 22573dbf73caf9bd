/**
 * Events of the shot as values: a continuous function whose sign change is the event, a direction, and what
 * happens when it fires. Which events are watched depends on the mode (model contract §1–§3).
 */
import {
  type Mode,
  type Plant,
  Stage,
  isConducting,
  solveBus,
  startMargin,
} from './plant.js';

export type ModelEventKind = 'trigger' | 'turn-on' | 'crowbar' | 'turn-off' | 'floor' | 'start' | 'stop' | 'exit' | 'transition';

export interface EventSpec {
  kind: ModelEventKind;
  /** group index for module events, -1 otherwise */
  group: number;
  /** 'up': fires when the function goes from ≤ 0 to > 0; 'down': from > 0 to ≤ 0 */
  direction: 'up' | 'down';
  value: (t: number, y: ArrayLike<number>) => number;
}

/** Forward bias of a group that is not conducting: > 0 when its switch would carry current (V_k > V_b). */
export function forwardBias(plant: Plant, y: ArrayLike<number>, mode: Mode, group: number): number {
  return y[plant.index.voltage(group)]! - solveBus(plant, y, mode).busVoltage;
}

/** The events to watch in a mode. */
export function watchedEvents(plant: Plant, mode: Mode): EventSpec[] {
  const ix = plant.index;
  const specs: EventSpec[] = [];
  for (let g = 0; g < plant.groups; g++) {
    const stage = mode.stage[g]!;
    if (stage === Stage.Waiting) {
      const at = plant.trigger[g]!;
      specs.push({ kind: 'trigger', group: g, direction: 'up', value: (t) => t - at });
    } else if (stage === Stage.Armed) {
      specs.push({ kind: 'turn-on', group: g, direction: 'up', value: (_t, y) => forwardBias(plant, y, mode, g) });
    } else if (isConducting(stage)) {
      const ci = ix.current(g);
      if (stage === Stage.Capacitor && plant.hasCrowbar[g]) {
        const vi = ix.voltage(g);
        specs.push({ kind: 'crowbar', group: g, direction: 'down', value: (_t, y) => y[vi]! });
      }
      specs.push({ kind: 'turn-off', group: g, direction: 'down', value: (_t, y) => y[ci]! });
      const floor = plant.floor[g]!;
      specs.push({ kind: 'floor', group: g, direction: 'down', value: (_t, y) => y[ci]! - floor });
    }
  }
  if (ix.action >= 0 && plant.transitionAction < Infinity && !mode.arcing) {
    const ai = ix.action;
    const threshold = plant.transitionAction;
    specs.push({ kind: 'transition', group: -1, direction: 'up', value: (_t, y) => y[ai]! - threshold });
  }
  if (mode.moving) {
    const vi = ix.velocity;
    const xi = ix.position;
    const length = plant.railLength;
    specs.push({ kind: 'stop', group: -1, direction: 'down', value: (_t, y) => y[vi]! });
    specs.push({ kind: 'exit', group: -1, direction: 'up', value: (_t, y) => y[xi]! - length });
  } else {
    specs.push({
      kind: 'start',
      group: -1,
      direction: 'up',
      value: (_t, y) => startMargin(plant, solveBus(plant, y, mode).current),
    });
  }
  return specs;
}

/** Has the event function crossed between two successive values, in its direction? */
export function crossed(spec: EventSpec, before: number, after: number): boolean {
  return spec.direction === 'up' ? before <= 0 && after > 0 : before > 0 && after <= 0;
}
