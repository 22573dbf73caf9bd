/**
 * Sizing optimality on the real solver, against an independent brute force: every module count, a grid of trigger
 * times, and at each grid point the charge voltage that just reaches the target found by bisection. The sizing must
 * find at least as little stored energy as the best feasible grid point (it searches the triggers continuously, so
 * it may find slightly less), with a design that really is within every limit, and name the limits that bind.
 */
import { describe, expect, it } from 'vitest';
import type { Scenario } from '../../src/scenario/types.js';
import { runShot } from '../../src/solve/shot.js';
import { propagateLinear } from '../../src/study/propagate.js';
import { sizeBank } from '../../src/study/size.js';
import { twoGroupScenario } from './fixtures.js';

const TARGET = 80;
const LIMITS = { peakCurrent: 82e3, chargeVoltage: 10e3, modulesPerGroup: 3 };

function shotAt(base: Scenario, modules: number, voltage: number, triggers: number[]) {
  const s = structuredClone(base);
  s.bank.forEach((group, g) => {
    group.count = modules;
    group.voltage = voltage;
    group.trigger = triggers[g]!;
  });
  return runShot(s, { waveforms: false }).results;
}

/** The least voltage that reaches the target, by bisection on [1 kV, 10 kV] to 0.5 V. */
function voltageRoot(base: Scenario, modules: number, triggers: number[]): number | null {
  let low = 1000;
  let high = LIMITS.chargeVoltage;
  const reaches = (v: number) => {
    const r = shotAt(base, modules, v, triggers);
    return r.outcome === 'exited' && r.muzzleVelocity >= TARGET;
  };
  if (!reaches(high)) return null;
  while (high - low > 0.5) {
    const middle = (low + high) / 2;
    if (reaches(middle)) high = middle;
    else low = middle;
  }
  return high;
}

describe('sizing against a brute-force grid (real solver)', () => {
  it('two groups, 1–3 modules, 82 kA limit: at most the least energy of the grid, within the limits; peak current and module count bind', () => {
    const base = twoGroupScenario();
    const grid = [...Array.from({ length: 51 }, (_, k) => k * 10e-6), 0.6e-3, 1e-3, 2e-3, 4e-3, 8e-3];
    let bestGrid = { energy: Infinity, modules: 0, trigger: NaN };
    for (let modules = 1; modules <= 3; modules++) {
      for (const trigger of grid) {
        const voltage = voltageRoot(base, modules, [0, trigger]);
        if (voltage === null) continue;
        const results = shotAt(base, modules, voltage, [0, trigger]);
        if (results.peakCurrent > LIMITS.peakCurrent) continue;
        const energy = 2 * 0.5 * modules * base.bank[0]!.capacitance * voltage ** 2;
        if (energy < bestGrid.energy) bestGrid = { energy, modules, trigger };
      }
    }
    expect(bestGrid.modules).toBe(3);

    const result = sizeBank(base, { muzzleVelocity: TARGET }, LIMITS, runShot);
    const best = result.best!;
    expect(best.modulesPerGroup).toBe(bestGrid.modules);
    // the grid's voltage is bisected to 0.5 V (≈ 4e-4 of the energy); the sizing's root to 1e-4 of the velocity
    expect(best.storedEnergy).toBeLessThanOrEqual(bestGrid.energy * (1 + 1e-3));
    // a continuous trigger can beat a 10 µs grid only a little
    expect(best.storedEnergy).toBeGreaterThan(bestGrid.energy * (1 - 5e-3));
    const check = shotAt(base, best.modulesPerGroup, best.chargeVoltages[0]!, best.triggers);
    expect(check.outcome).toBe('exited');
    expect(check.muzzleVelocity).toBeGreaterThanOrEqual(TARGET * (1 - 1e-4));
    expect(check.peakCurrent).toBeLessThanOrEqual(LIMITS.peakCurrent * (1 + 1e-9));
    expect(result.binding).toContain('peakCurrent');
    expect(result.binding).toContain('modulesPerGroup');
    expect(result.beyondModuleLimit!.storedEnergy).toBeLessThan(best.storedEnergy);
  }, 300_000);

  it('three groups: at the sized voltage no single trigger moved 20 µs either way gives more velocity within the limits (the symptom of the old search)', () => {
    const base = twoGroupScenario();
    base.bank.push({ ...structuredClone(base.bank[1]!), label: 'third', trigger: 300e-6 });
    const limits = { peakCurrent: 60e3, chargeVoltage: 10e3, modulesPerGroup: 2 };
    const result = sizeBank(base, { muzzleVelocity: TARGET }, limits, runShot);
    expect(result.feasible).toBe(true);
    const best = result.best!;
    const velocity = shotAt(base, best.modulesPerGroup, best.chargeVoltages[0]!, best.triggers).muzzleVelocity;
    for (let g = 1; g < 3; g++) {
      for (const shift of [-20e-6, 20e-6]) {
        const triggers = [...best.triggers];
        triggers[g] = Math.max(0, triggers[g]! + shift);
        const moved = shotAt(base, best.modulesPerGroup, best.chargeVoltages[0]!, triggers);
        const withinLimits = moved.outcome === 'exited' && moved.peakCurrent <= limits.peakCurrent;
        if (withinLimits) expect(moved.muzzleVelocity, `group ${g + 1} moved ${shift * 1e6} µs`).toBeLessThanOrEqual(velocity * (1 + 5e-4));
      }
    }
  }, 300_000);
});

describe('sizing at a confidence', () => {
  it('with tolerances the sized design exceeds the target by Φ⁻¹(0.9)·σ_v, σ_v re-propagated independently on the sized scenario (GUM §6.2, normal coverage)', () => {
    const base = twoGroupScenario();
    base.tolerances = [
      { where: 'test', path: 'bank[*].capacitance', distribution: 'uniform', spread: 0.05, relative: true, common: false, targets: [0, 1].map((g) => ({ path: `bank[${g}].capacitance`, follows: [] })) },
      { where: 'test', path: 'rails.inductanceGradient', distribution: 'normal', spread: 0.02, relative: true, common: false, targets: [{ path: 'rails.inductanceGradient', follows: [] }] },
    ];
    const result = sizeBank(base, { muzzleVelocity: TARGET, confidence: 0.9 }, { chargeVoltage: 10e3, modulesPerGroup: 2 }, runShot);
    expect(result.confidence).toBe(0.9);
    const sized = result.scenario!;
    const linear = propagateLinear(sized, runShot)!;
    const z = 1.2815515655446004; // Φ⁻¹(0.9), tables of the normal distribution
    const atConfidence = linear.nominal.muzzleVelocity! - z * linear.standardUncertainty.muzzleVelocity!;
    expect(atConfidence / TARGET - 1).toBeGreaterThanOrEqual(-1e-3);
    expect(atConfidence / TARGET - 1).toBeLessThan(1e-3);
    expect(linear.nominal.muzzleVelocity!).toBeGreaterThan(TARGET * 1.01);
    expect(result.best!.confidence!.level).toBe(0.9);
    // the same bank sized for the nominal shot stores less energy
    const nominal = sizeBank({ ...base, tolerances: undefined }, { muzzleVelocity: TARGET }, { chargeVoltage: 10e3, modulesPerGroup: 2 }, runShot);
    expect(nominal.best!.storedEnergy).toBeLessThan(result.best!.storedEnergy);
    expect(nominal.confidence).toBeNull();
  }, 300_000);
});
