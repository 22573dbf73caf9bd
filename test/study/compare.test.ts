import { describe, expect, it } from 'vitest';
import { runShot } from '../../src/solve/shot.js';
import { compareScenarios, compareTable } from '../../src/study/compare.js';
import { TWO_GROUP_FILE, twoGroupScenario } from './fixtures.js';

describe('compare', () => {
  it('reports each shot exactly as runShot does, and relative changes against the first', () => {
    const base = twoGroupScenario();
    const heavier = twoGroupScenario();
    heavier.name = 'heavier';
    heavier.armature.mass *= 2;
    const shots = compareScenarios([{ file: TWO_GROUP_FILE, scenario: base }, { file: 'heavier', scenario: heavier }], runShot);
    expect(shots[0]!.results).toEqual(runShot(base, { waveforms: false }).results);
    expect(shots[1]!.results).toEqual(runShot(heavier, { waveforms: false }).results);
    const v0 = shots[0]!.results.muzzleVelocity;
    const v1 = shots[1]!.results.muzzleVelocity;
    expect(shots[1]!.change.muzzleVelocity).toBeCloseTo((v1 - v0) / v0, 12);
    expect(shots[0]!.change.muzzleVelocity).toBeNull();
    // E0 = Σ ½ n C V² (4 modules × ½ · 500 µF · (3 kV)² = 9 kJ)
    expect(shots[0]!.storedEnergy).toBeCloseTo(9000, 9);
    const table = compareTable(shots);
    expect(table).toMatch(/muzzle velocity .* m\/s/);
    // efficiency is a percentage: its change is a difference in percentage points, not a per cent of a per cent
    const e0 = shots[0]!.results.efficiency;
    const e1 = shots[1]!.results.efficiency;
    expect(shots[1]!.change.efficiency).toBeCloseTo(e1 - e0, 15);
    expect(table).toMatch(/efficiency .*percentage points\)/);
  });
});
