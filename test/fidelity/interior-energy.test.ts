/**
 * With rail current diffusion, the magnetic energy splits into the field of the feed and between the rails,
 * ½L(x)I² with L(x) = L_f + L′x (the muzzle arc's share, model contract §4), and the energy inside the rails'
 * conductor (the integrated cells' Σ ½L′_n B_n and the fast cells held as inductance). The split is checked
 * against ½L(x)I² from the recorded exit state; the ledger closes on the sum.
 */
import { describe, expect, it } from 'vitest';
import { loadScenarioFile } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';

describe('energy inside the rails against the field between them [derived: ½L(x)I², L(x) = L_f + L′x]', () => {
  it('magneticRails at exit is ½(L_f + L′ℓ)I² with the L′ of the force law; the held inductance counts inside the rails', () => {
    const { scenario } = loadScenarioFile('scenarios/geometry-shot.json');
    expect(scenario.rails.diffusion!.tailInductanceGradient).toBeGreaterThan(0);
    const shot = runShot(scenario);
    expect(shot.results.outcome).toBe('exited');
    const w = shot.waveforms!;
    const last = w.t.length - 1;
    const current = w.current[last]!;
    const x = w.position[last]!;
    const field = 0.5 * (scenario.feed.inductance + scenario.rails.inductanceGradient * x) * current * current;
    const e = shot.results.energy;
    expect(Math.abs(e.magneticRails / field - 1)).toBeLessThan(1e-12);
    // the fast cells' share, ½L′_tail x I², is inside the rails, on top of the integrated cells' energy
    const tail = 0.5 * scenario.rails.diffusion!.tailInductanceGradient * x * current * current;
    expect(e.railInterior!).toBeGreaterThan(tail);
    expect(Math.abs(e.residual)).toBeLessThan(1e-6 * e.initial);
  });
});
