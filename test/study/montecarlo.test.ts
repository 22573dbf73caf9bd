/**
 * Monte Carlo against linear propagation: for spreads small enough that the response is linear over them, the
 * standard deviation of N seeded shots must equal the linear σ within the sampling error of a standard deviation,
 * about σ/√(2(N − 1)) (GUM Supplement 1, JCGM 101:2008, §5.9: the Monte Carlo and the law of propagation agree
 * for a linear model). The shots run on the sweep's worker threads.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { scenarioFromRaw, validateScenario } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { makeInProcessRunner } from '../../src/study/pool.js';
import { makeDrawer, monteCarlo, percentile } from '../../src/study/montecarlo.js';
import { propagateLinear } from '../../src/study/propagate.js';
import { uncertaintyModel } from '../../src/study/uncertainInputs.js';
import { TWO_GROUP_FILE } from './fixtures.js';

const raw = JSON.parse(readFileSync(TWO_GROUP_FILE, 'utf8')) as Record<string, unknown>;
const tolerances = [
  { path: 'bank[*].capacitance', uniform: '1 %' },
  { path: 'bank[*].voltage', normal: '0.3 %', common: true },
  { path: 'rails.inductanceGradient', normal: '0.5 %' },
  { path: 'armature.mass', uniform: '0.05 g' },
];

describe('Monte Carlo', () => {
  it('standard deviations of 1,000 shots match the linear σ for small spreads (GUM S1 §5.9), on 2 worker threads', async () => {
    const scenario = scenarioFromRaw({ ...raw, tolerances });
    const model = uncertaintyModel(scenario)!;
    expect(model.inputs.map((input) => input.name)).toEqual(['bank[0].capacitance', 'bank[1].capacitance', 'bank[*].voltage', 'rails.inductanceGradient', 'armature.mass']);
    const linear = propagateLinear(scenario, runShot)!;
    expect(linear.warnings).toEqual([]);
    const shots = 1000;
    const mc = await monteCarlo(scenario, model, { shots, seed: 7, jobs: 2, validate: (s) => validateScenario(s), targetVelocity: linear.nominal.muzzleVelocity! });
    expect(mc.ran).toBe(shots);
    expect(mc.outcomes).toEqual({ exited: shots });
    const samplingError = 1 / Math.sqrt(2 * (shots - 1));
    for (const key of ['muzzleVelocity', 'exitTime', 'peakCurrent', 'efficiency', 'actionIntegral'] as const) {
      const sigma = linear.standardUncertainty[key]!;
      const distribution = mc.results[key]!;
      expect(Math.abs(distribution.standardDeviation / sigma - 1), key).toBeLessThan(4.5 * samplingError);
      // the mean of a linear response is the nominal value, within the standard error of a mean
      expect(Math.abs(distribution.mean - linear.nominal[key]!), key).toBeLessThan((4.5 * sigma) / Math.sqrt(shots));
    }
    // the target at the nominal velocity is met by about half the shots (binomial standard error)
    expect(Math.abs(mc.target!.probability - 0.5)).toBeLessThan(4.5 * 0.5 / Math.sqrt(shots));
  }, 120_000);

  it('the draws of a shot depend on the seed and its index only: the same samples on 1 worker as on the in-process runner', async () => {
    const scenario = scenarioFromRaw({ ...raw, tolerances });
    const model = uncertaintyModel(scenario)!;
    const options = { shots: 60, seed: 3 };
    const threads = await monteCarlo(scenario, model, { ...options, jobs: 1 });
    const inProcess = await monteCarlo(scenario, model, { ...options, makeRunner: (context) => makeInProcessRunner(context, runShot) });
    expect(inProcess.samples).toEqual(threads.samples);
    const other = await monteCarlo(scenario, model, { ...options, seed: 4, makeRunner: (context) => makeInProcessRunner(context, runShot) });
    expect(other.samples.muzzleVelocity).not.toEqual(threads.samples.muzzleVelocity);
  }, 60_000);

  it('draws follow their distributions: uniform within ±√3 with variance 1, normal with variance 1, calibrated pairs with their correlation', () => {
    const scenario = scenarioFromRaw({ ...raw, tolerances });
    const s = structuredClone(scenario);
    s.calibration = {
      parameters: [{ path: 'feed.inductance', follows: [] }, { path: 'feed.resistance', follows: [] }],
      values: [s.feed.inductance, s.feed.resistance],
      covariance: [[1e-16, -0.6 * 1e-8 * 1e-5], [-0.6 * 1e-8 * 1e-5, 1e-10]],
      record: 'x.csv', recordSha256: 'a'.repeat(64), date: '2026-01-01', onBound: [],
    };
    const model = uncertaintyModel(s)!;
    const draw = makeDrawer(model, 11);
    const n = 20000;
    const draws = Array.from({ length: n }, (_, i) => draw(i));
    const column = (j: number) => draws.map((u) => u[j]!);
    const variance = (x: number[]) => x.reduce((a, b) => a + b * b, 0) / x.length;
    const uniform = column(0);
    expect(Math.max(...uniform.map(Math.abs))).toBeLessThanOrEqual(Math.sqrt(3));
    expect(Math.abs(variance(uniform) - 1)).toBeLessThan(0.04);
    expect(Math.abs(variance(column(3)) - 1)).toBeLessThan(0.04);
    const [a, b] = [column(5), column(6)];
    const r = a.reduce((sum, x, i) => sum + x * b[i]!, 0) / n;
    expect(Math.abs(r + 0.6)).toBeLessThan(0.03);
    // the normal draws' 97.5th percentile is 1.96 (tables of the normal distribution)
    expect(Math.abs(percentile(column(3).sort((x, y) => x - y), 97.5) - 1.96)).toBeLessThan(0.06);
  });
});
