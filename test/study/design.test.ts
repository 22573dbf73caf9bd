import { describe, expect, it } from 'vitest';
import { dimensionOfPath } from '../../src/scenario/load.js';
import { makeDesign } from '../../src/study/design.js';
import { mulberry32 } from '../../src/study/prng.js';
import { parseVaries } from '../../src/study/spec.js';
import { twoGroupScenario } from './fixtures.js';

const scenario = twoGroupScenario();
const axes = parseVaries(['armature.mass=10g,20g,30g', 'bank[0].voltage=log:1kV:100kV:3'], scenario, dimensionOfPath);

describe('study designs', () => {
  it('grid is row-major: the first --vary changes slowest, the last fastest', () => {
    const design = makeDesign(axes, { kind: 'grid', seed: 1 });
    expect(design.count).toBe(9);
    const points = Array.from({ length: 9 }, (_, i) => design.point(i));
    expect(points.map((p) => p[0])).toEqual([0.01, 0.01, 0.01, 0.02, 0.02, 0.02, 0.03, 0.03, 0.03]);
    expect(points.slice(0, 3).map((p) => p[1]!)).toEqual([1000, expect.closeTo(10000, 6), 100000]);
  });

  it('Latin hypercube: each of the N equal strata of every axis holds exactly one point (McKay, Beckman & Conover 1979)', () => {
    const n = 50;
    const design = makeDesign(axes, { kind: 'lhs', samples: n, seed: 7 });
    const massStrata = new Set<number>();
    const voltageStrata = new Set<number>();
    for (let i = 0; i < n; i += 1) {
      const [mass, voltage] = design.point(i) as [number, number];
      massStrata.add(Math.floor(((mass - 0.01) / 0.02) * n));
      // the log axis is stratified in log space
      voltageStrata.add(Math.floor((Math.log(voltage / 1000) / Math.log(100)) * n));
    }
    expect(massStrata.size).toBe(n);
    expect(voltageStrata.size).toBe(n);
  });

  it('sampled designs are fixed by the seed, lie in [min, max], and differ between seeds', () => {
    for (const kind of ['lhs', 'random'] as const) {
      const a = makeDesign(axes, { kind, samples: 200, seed: 3 });
      const b = makeDesign(axes, { kind, samples: 200, seed: 3 });
      const c = makeDesign(axes, { kind, samples: 200, seed: 4 });
      const all = Array.from({ length: 200 }, (_, i) => a.point(i));
      expect(all).toEqual(Array.from({ length: 200 }, (_, i) => b.point(i)));
      expect(all).not.toEqual(Array.from({ length: 200 }, (_, i) => c.point(i)));
      for (const [mass, voltage] of all as [number, number][]) {
        expect(mass).toBeGreaterThanOrEqual(0.01);
        expect(mass).toBeLessThanOrEqual(0.03);
        expect(voltage).toBeGreaterThanOrEqual(1000);
        expect(voltage).toBeLessThanOrEqual(100000);
      }
    }
  });

  it('random draws are uniform: mean ≈ 1/2 and variance ≈ 1/12 of the range (uniform distribution moments)', () => {
    const design = makeDesign(axes.slice(0, 1), { kind: 'random', samples: 20000, seed: 11 });
    const u = Array.from({ length: 20000 }, (_, i) => (design.point(i)[0]! - 0.01) / 0.02);
    const mean = u.reduce((s, x) => s + x, 0) / u.length;
    const variance = u.reduce((s, x) => s + (x - mean) ** 2, 0) / u.length;
    // standard error of the mean: sqrt(1/12/20000) ≈ 0.002
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.01);
    expect(Math.abs(variance - 1 / 12)).toBeLessThan(0.005);
  });

  it('mulberry32 gives numbers in [0, 1) and repeats for the same seed', () => {
    const a = mulberry32(42);
    const b = mulberry32(42);
    for (let i = 0; i < 1000; i += 1) {
      const x = a();
      expect(x).toBe(b());
      expect(x >= 0 && x < 1).toBe(true);
    }
  });

  it('rejects --samples with a grid and a sampled design without --samples', () => {
    expect(() => makeDesign(axes, { kind: 'grid', samples: 5, seed: 1 })).toThrow(/only the lhs and random/);
    expect(() => makeDesign(axes, { kind: 'lhs', seed: 1 })).toThrow(/needs --samples/);
  });
});
