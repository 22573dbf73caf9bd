/**
 * What happens at an event instant: the discrete mode changes and the state is set exactly
 * (a crowbarred capacitor at 0 V, a switch that opened at 0 A, an armature that stopped at 0 m/s).
 */
import type { EventSpec, ModelEventKind } from './events.js';
import { forwardBias } from './events.js';
import { type Mode, type Plant, Stage, isConducting, solveBus, startMargin, derivatives } from './plant.js';

export type TransitionLog = (kind: ModelEventKind, group: number) => void;

/** Apply one located event to the state and mode (both mutated). */
export function applyEvent(plant: Plant, y: number[], mode: Mode, spec: EventSpec, log: TransitionLog): void {
  const ix = plant.index;
  const g = spec.group;
  switch (spec.kind) {
    case 'trigger':
      mode.stage[g] = Stage.Armed;
      break;
    case 'turn-on':
      mode.stage[g] = Stage.Capacitor;
      y[ix.current(g)] = 0;
      break;
    case 'crowbar':
      mode.stage[g] = Stage.Crowbar;
      y[ix.voltage(g)] = 0;
      break;
    case 'turn-off':
      mode.stage[g] = Stage.Off;
      y[ix.current(g)] = 0;
      break;
    case 'start':
      mode.moving = true;
      break;
    case 'stop':
      mode.moving = false;
      y[ix.velocity] = 0;
      break;
    case 'transition':
      mode.arcing = true;
      break;
    case 'exit':
      break; // x is left as located (within the root tolerance of the rail length), not forced
    case 'floor':
      return; // only prompts the stall test
  }
  log(spec.kind, g);
}

/**
 * Settle the mode at an instant: arm every module whose trigger time has come, turn on the armed modules that
 * are forward-biased (highest capacitor voltage first, each re-tested with those already added), and start the
 * armature if the force beats static friction.
 */
export function settle(plant: Plant, t: number, y: number[], mode: Mode, log: TransitionLog): void {
  const ix = plant.index;
  for (let g = 0; g < plant.groups; g++) {
    if (mode.stage[g] === Stage.Waiting && plant.trigger[g]! <= t) {
      mode.stage[g] = Stage.Armed;
      log('trigger', g);
    }
  }
  const armed: number[] = [];
  for (let g = 0; g < plant.groups; g++) if (mode.stage[g] === Stage.Armed) armed.push(g);
  armed.sort((a, b) => y[ix.voltage(b)]! - y[ix.voltage(a)]!);
  for (const g of armed) {
    if (forwardBias(plant, y, mode, g) > 0) {
      mode.stage[g] = Stage.Capacitor;
      y[ix.current(g)] = 0;
      log('turn-on', g);
    }
  }
  if (!mode.moving && startMargin(plant, solveBus(plant, y, mode).current) > 0) {
    mode.moving = true;
    log('start', -1);
  }
}

/**
 * Stall (contract §3): armature at rest, no trigger pending, no triggered module waiting for forward bias, and
 * every conducting module below the current floor and not rising.
 */
export function isStalled(plant: Plant, y: number[], mode: Mode): boolean {
  if (mode.moving) return false;
  let rates: number[] | null = null;
  for (let g = 0; g < plant.groups; g++) {
    const stage = mode.stage[g]!;
    if (stage === Stage.Waiting || stage === Stage.Armed) return false;
    if (!isConducting(stage)) continue;
    const i = y[plant.index.current(g)]!;
    if (i >= plant.floor[g]!) return false;
    rates ??= derivatives(plant, y, mode);
    if (rates[plant.index.current(g)]! > 0) return false;
  }
  return true;
}
