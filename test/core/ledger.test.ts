/**
 * Conservation laws on every demo scenario: the energy ledger closes to 1e-6·E0 at every sample (energy
 * conservation, model contract §4) and m·v equals the impulse ∫(F_em − F_f − F_d)dt over the moving
 * intervals to 1e-7 (Newton's second law).
 */
import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadScenarioFile } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';

const demos = readdirSync('scenarios').filter((f) => f.endsWith('.json') && !f.includes('schema'));

describe.each(demos)('demo %s', (file) => {
  const { scenario } = loadScenarioFile(`scenarios/${file}`);
  const shot = runShot(scenario);
  const e0 = shot.results.energy.initial;

  it('energy ledger closes to 1e-6·E0 at every sample (energy conservation)', () => {
    const residual = shot.waveforms!.energy.residual;
    expect(residual.length).toBeGreaterThan(100);
    const worst = Math.max(...residual.map(Math.abs));
    expect(worst / e0).toBeLessThan(1e-6);
  });

  it('m·v equals the impulse of the net force over the moving intervals to 1e-7 (Newton\'s second law)', () => {
    if (scenario.load) {
      // a ring-down into a shorted load: nothing moves, no force acts
      expect(Math.max(...shot.waveforms!.velocity)).toBe(0);
      expect(shot.impulse).toBe(0);
      return;
    }
    const momentum = scenario.armature.mass * shot.results.muzzleVelocity;
    const vmax = Math.max(...shot.waveforms!.velocity);
    expect(vmax).toBeGreaterThan(0);
    expect(Math.abs(momentum - shot.impulse) / (scenario.armature.mass * vmax)).toBeLessThan(1e-7);
  });

  it('the end-of-bore budget adds up to the stored energy', () => {
    const e = shot.results.energy;
    const losses = Object.values(e.losses).reduce((a, b) => a + b, 0);
    expect(Math.abs(e.capacitors + e.magnetic + e.kinetic + losses + e.residual - e0) / e0).toBeLessThan(1e-12);
  });
});

it('there are at least three demo scenarios: bench, staggered crowbarred bank, bank that reverses', () => {
  expect(demos.length).toBeGreaterThanOrEqual(3);
  const shots = demos.map((f) => {
    const { scenario } = loadScenarioFile(`scenarios/${f}`);
    return { scenario, results: runShot(scenario, { waveforms: false }).results };
  });
  const e0 = shots.map((s) => s.results.energy.initial);
  expect(e0.some((e) => e > 5e3 && e < 20e3)).toBe(true);
  expect(shots.some((s) => s.scenario.bank.length > 1 && s.results.energy.initial >= 100e3 && s.results.energy.initial <= 300e3 && s.scenario.bank.every((g) => g.crowbar))).toBe(true);
  expect(shots.some((s) => s.results.modules.some((m) => m.reversal > 0))).toBe(true);
});
