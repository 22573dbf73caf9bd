/**
 * Armature transition: the solid contact becomes an arc once its action ∫I²dt reaches the threshold
 * specificAction·contactArea² (common practice: an action per contact area; calibrate it). A located event.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { moduleGroup, scenario } from '../helpers/scenario.js';

describe('transition at constant current', () => {
  // a lossless LC quarter period, then a crowbarred loop of 0.1 H: the current is I0 = V0√(C/L) and then stays
  // constant (L′Δx/L ~ 1e-6) [derived: lossless series LC, then flux conservation]
  const C = 10e-6;
  const V0 = 10e3;
  const L = 1e-6 + 0.1;
  const arcDrop = 50;
  const build = (threshold: number) =>
    scenario({
      bank: [moduleGroup({ capacitance: C, voltage: V0, esr: 0, inductance: 1e-6, resistance: 0, crowbar: { drop: 0, resistance: 0 } })],
      feed: { inductance: 0.1, resistance: 0 },
      rails: { length: 1, inductanceGradient: 0.45e-6, resistanceGradient: 0 },
      armature: { mass: 1e-3, position: 0.01, resistance: 0, contactResistance: 0, arcDrop: 0, transition: { specificAction: threshold, contactArea: 1, arcDrop, action: threshold } },
      solver: { sampleInterval: 10e-6, endTime: 0.05, currentFloor: 1e-9 },
    });

  it('happens at t_c + (threshold − I0²t_c/2)/I0², the action reaching the threshold at constant current (1e-6)', () => {
    const I0 = V0 * Math.sqrt(C / L);
    const tc = (Math.PI / 2) * Math.sqrt(L * C);
    const threshold = (I0 * I0 * tc) / 2 + I0 * I0 * 5e-3;
    const shot = runShot(build(threshold));
    expect(shot.results.transitionTime).toBeDefined();
    const expected = tc + (threshold - (I0 * I0 * tc) / 2) / (I0 * I0);
    expect(Math.abs(shot.results.transitionTime! / expected - 1)).toBeLessThan(1e-6);
    expect(shot.events.some((e) => e.kind === 'transition')).toBe(true);
    const w = shot.waveforms!;
    const k = w.t.findIndex((t) => t >= shot.results.transitionTime!);
    expect(Math.abs(shot.results.transitionPosition! - w.position[k]!)).toBeLessThan(1e-9);
    // after it the arc drop opposes the current: L dI/dt = −V_arc, a linear fall (1e-4 of the slope) [derived]
    const later = w.t.findIndex((t) => t >= shot.results.transitionTime! + 2e-3);
    const slope = (w.current[later]! - w.current[k + 1]!) / (w.t[later]! - w.t[k + 1]!);
    expect(Math.abs(slope / (-arcDrop / L) - 1)).toBeLessThan(1e-3);
    // the arc's loss is V_arc ∫I dt from the transition on, and the contact has no loss (R_c = 0 here)
    expect(shot.results.energy.losses.arc).toBeGreaterThan(0);
  });

  it('does not happen below the threshold: no transitionTime, no transitionPosition', () => {
    const shot = runShot(build(1e12));
    expect(shot.results.transitionTime).toBeUndefined();
    expect(shot.results.transitionPosition).toBeUndefined();
    expect(shot.results.energy.losses.arc).toBe(0);
  });
});

describe('on a demo', () => {
  const raw = () => JSON.parse(readFileSync('scenarios/staggered-bank.json', 'utf8'));
  it('the ledger still closes to 1e-6·E0 at every sample with the transition in the shot', () => {
    const file = raw();
    file.armature.transition = { specificAction: '5e12 A^2 s/m^4', contactArea: '3 cm^2', arcDrop: '60 V' };
    const shot = runShot(scenarioFromRaw(file, 'x.json'));
    expect(shot.results.transitionTime).toBeGreaterThan(0);
    const e0 = shot.results.energy.initial;
    expect(Math.max(...shot.waveforms!.energy.residual.map(Math.abs)) / e0).toBeLessThan(1e-6);
  });
  it('refuses a transition beside an arc drop from the start, and one without an arc drop', () => {
    const attempt = (armature: Record<string, unknown>) => {
      const file = raw();
      Object.assign(file.armature, armature);
      try {
        scenarioFromRaw(file, 'x.json');
      } catch (error) {
        return (error as { where: string }).where;
      }
      return null;
    };
    expect(attempt({ arcDrop: '30 V', transition: { specificAction: 1e12, contactArea: 1e-4, arcDrop: 60 } })).toBe('armature.transition');
    expect(attempt({ transition: { specificAction: 1e12, contactArea: 1e-4 } })).toBe('armature.transition.arcDrop');
    expect(attempt({ transition: { specificAction: 1e12, contactArea: 1e-4, arcDrop: 0 } })).toBe('armature.transition.arcDrop');
  });
});
