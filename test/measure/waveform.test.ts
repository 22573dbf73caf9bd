import { describe, expect, it } from 'vitest';
import { estimateNoise, locatePeak } from '../../src/measure/waveform.js';
import { interpolateSorted } from '../../src/core/interpolate.js';
import { getScenarioPath, setScenarioPath } from '../../src/scenario/paths.js';
import { InputError } from '../../src/core/errors.js';
import { rlcScenario } from './fake-model.js';
import { seededNormal } from './random.js';

describe('interpolateSorted', () => {
  it('is exact on a straight line and takes the right limit at a jump sampled twice (model contract §5)', () => {
    const t = [0, 1, 2, 2, 3];
    const y = [0, 1, 2, 10, 11];
    expect(interpolateSorted(t, y, [0.5, 1.5, 2, 2.5, 5, -1])).toEqual([0.5, 1.5, 10, 10.5, 11, 0]);
    expect(interpolateSorted(t, y, [2.5, 0.25])).toEqual([10.5, 0.25]); // unsorted queries restart the scan
  });
});

describe('estimateNoise (MAD of second differences / 0.6745 / √6)', () => {
  it('recovers σ of white Gaussian noise riding on a smooth pulse to within 5 % (10 000 samples)', () => {
    const normal = seededNormal(99);
    const y = Array.from({ length: 10_000 }, (_, k) => 1000 * Math.sin((Math.PI * k) / 10_000) + 2 * normal());
    expect(Math.abs(estimateNoise(y) / 2 - 1)).toBeLessThan(0.05);
  });

  it('is 0 for a straight line (no noise, no curvature)', () => {
    expect(estimateNoise([1, 2, 3, 4, 5, 6])).toBe(0);
  });
});

describe('locatePeak', () => {
  it('finds the vertex of a sampled cubic exactly (least squares reproduces a cubic)', () => {
    const t = Array.from({ length: 101 }, (_, k) => k * 0.01);
    const f = (x: number): number => 5 - 30 * (x - 0.4234) ** 2 + 8 * (x - 0.4234) ** 3;
    const peak = locatePeak(t, t.map(f));
    expect(peak.time).toBeCloseTo(0.4234, 10);
    expect(peak.value).toBeCloseTo(5, 10);
  });
});

describe('scenario paths (src/scenario/paths.ts)', () => {
  it('reads and replaces one number without touching the original', () => {
    const s = rlcScenario();
    const changed = setScenarioPath(s, 'bank[0].esr', 0.01);
    expect(getScenarioPath(changed, 'bank[0].esr')).toBe(0.01);
    expect(getScenarioPath(s, 'bank[0].esr')).toBe(5e-3);
    expect(changed.feed).toBe(s.feed);
  });

  it('refuses a path that is not a number in the scenario, naming the path', () => {
    expect(() => getScenarioPath(rlcScenario(), 'bank[3].esr')).toThrow(InputError);
    expect(() => getScenarioPath(rlcScenario(), 'feed')).toThrow(/feed: is not a number/);
    expect(() => getScenarioPath(rlcScenario(), 'feed..x')).toThrow(/expected a parameter path/);
  });
});
