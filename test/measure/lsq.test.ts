import { describe, expect, it } from 'vitest';
import { leastSquares } from '../../src/measure/lsq.js';
import { mean, seededNormal, standardDeviation } from './random.js';

// NIST Statistical Reference Datasets, nonlinear regression, Misra1a (lower difficulty), 14 observations:
// https://www.itl.nist.gov/div898/strd/nls/data/misra1a.shtml — data checked against public copies of the file.
const MISRA1A_X = [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0];
const MISRA1A_Y = [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.4, 75.47, 81.78];
const misra1a = (p: number[]): number[] => MISRA1A_X.map((x, i) => p[0]! * (1 - Math.exp(-p[1]! * x)) - MISRA1A_Y[i]!);
const CERTIFIED = { b1: 2.3894212918e2, b2: 5.5015643181e-4, se1: 2.707007524e0, se2: 7.2668688436e-6, rss: 1.2455138894e-1 };

const relative = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('leastSquares on published reference problems', () => {
  for (const [label, start] of [
    ['start 1', [500, 1e-4]],
    ['start 2', [250, 5e-4]],
  ] as const) {
    it(`NIST StRD Misra1a from ${label} reaches the certified values and standard errors`, () => {
      const fit = leastSquares({ residuals: misra1a, p0: [...start] });
      expect(fit.converged).toBe(true);
      expect(relative(fit.p[0]!, CERTIFIED.b1)).toBeLessThan(1e-8);
      expect(relative(fit.p[1]!, CERTIFIED.b2)).toBeLessThan(1e-8);
      expect(relative(fit.residualNorm ** 2, CERTIFIED.rss)).toBeLessThan(1e-9);
      expect(relative(fit.standardErrors[0]!, CERTIFIED.se1)).toBeLessThan(1e-6);
      expect(relative(fit.standardErrors[1]!, CERTIFIED.se2)).toBeLessThan(1e-6);
      expect(fit.degreesOfFreedom).toBe(12);
    });
  }

  it('Rosenbrock function as least squares reaches (1, 1) from (−1.2, 1) (Moré, Garbow & Hillstrom 1981, problem 1)', () => {
    const fit = leastSquares({ residuals: (p) => [10 * (p[1]! - p[0]! ** 2), 1 - p[0]!], p0: [-1.2, 1], typicalSize: [1, 1] });
    expect(fit.converged).toBe(true);
    expect(Math.abs(fit.p[0]! - 1)).toBeLessThan(1e-9);
    expect(Math.abs(fit.p[1]! - 1)).toBeLessThan(1e-9);
  });

  it('Misra1a with b1 held below its optimum stops on the bound with ∂RSS/∂b2 = 0 there (KKT conditions)', () => {
    const fit = leastSquares({ residuals: misra1a, p0: [150, 5e-4], upper: [200, 1] });
    expect(fit.p[0]).toBe(200);
    expect(fit.atBound).toEqual([true, false]);
    expect(Number.isNaN(fit.standardErrors[0]!)).toBe(true);
    const rss = (b2: number): number => misra1a([200, b2]).reduce((s, r) => s + r * r, 0);
    const h = fit.p[1]! * 1e-6;
    const slope = (rss(fit.p[1]! + h) - rss(fit.p[1]! - h)) / (2 * h);
    const curvature = (rss(fit.p[1]! + h) - 2 * rss(fit.p[1]!) + rss(fit.p[1]! - h)) / (h * h);
    expect(Math.abs(slope / curvature)).toBeLessThan(1e-9 * fit.p[1]!); // Newton step to the 1-D optimum is negligible
    // and RSS rises when b1 leaves the bound inwards: the bound really is active
    expect(rss(fit.p[1]!)).toBeLessThan(misra1a([199, fit.p[1]!]).reduce((s, r) => s + r * r, 0));
  });
});

describe('leastSquares: linearised statistics (closed forms)', () => {
  it('straight line with an upper bound on the slope: slope on the bound, intercept = mean(y − b·x) (convex QP, closed form)', () => {
    const x = [0, 1, 2, 3, 4, 5, 6];
    const y = x.map((xi) => 1 + 2 * xi + 0.1 * Math.sin(7 * xi));
    const fit = leastSquares({ residuals: (p) => x.map((xi, i) => p[0]! + p[1]! * xi - y[i]!), p0: [0, 1], upper: [Infinity, 1.5] });
    expect(fit.p[1]).toBe(1.5);
    const intercept = mean(y.map((yi, i) => yi - 1.5 * x[i]!));
    expect(Math.abs(fit.p[0]! - intercept)).toBeLessThan(1e-9);
  });

  it('exponential decay with known noise: covariance equals σ²(JᵀJ)⁻¹ in closed form and matches the spread of 300 seeded draws', () => {
    const amplitude = 5;
    const rate = 0.7;
    const sigma = 0.05;
    const t = Array.from({ length: 40 }, (_, i) => i * 0.1);
    const normal = seededNormal(12345);
    const fits: number[][] = [];
    let lastCovariance: number[][] = [];
    let lastParameters: number[] = [];
    for (let draw = 0; draw < 300; draw++) {
      const y = t.map((ti) => amplitude * Math.exp(-rate * ti) + sigma * normal());
      const fit = leastSquares({ residuals: (p) => t.map((ti, i) => (p[0]! * Math.exp(-p[1]! * ti) - y[i]!) / sigma), p0: [4, 1], noise: 'known' });
      expect(fit.converged).toBe(true);
      fits.push(fit.p);
      lastCovariance = fit.covariance;
      lastParameters = fit.p;
    }
    // Closed form: J columns e^(−kt) and −A t e^(−kt), divided by σ; invert the 2×2 JᵀJ by hand.
    const [A, k] = lastParameters as [number, number];
    const e2 = t.map((ti) => Math.exp(-2 * k * ti));
    const s00 = e2.reduce((s, v) => s + v, 0) / sigma ** 2;
    const s01 = (-A * e2.reduce((s, v, i) => s + v * t[i]!, 0)) / sigma ** 2;
    const s11 = (A * A * e2.reduce((s, v, i) => s + v * t[i]! ** 2, 0)) / sigma ** 2;
    const det = s00 * s11 - s01 * s01;
    const exact = [
      [s11 / det, -s01 / det],
      [-s01 / det, s00 / det],
    ];
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) expect(relative(lastCovariance[i]![j]!, exact[i]![j]!)).toBeLessThan(1e-6);
    // the spread over draws agrees with the linearised standard error (300 draws: ±4 % sampling error at 1σ)
    const spreadA = standardDeviation(fits.map((p) => p[0]!));
    const spreadK = standardDeviation(fits.map((p) => p[1]!));
    expect(spreadA / Math.sqrt(exact[0]![0]!)).toBeGreaterThan(0.85);
    expect(spreadA / Math.sqrt(exact[0]![0]!)).toBeLessThan(1.15);
    expect(spreadK / Math.sqrt(exact[1]![1]!)).toBeGreaterThan(0.85);
    expect(spreadK / Math.sqrt(exact[1]![1]!)).toBeLessThan(1.15);
    expect(Math.abs(mean(fits.map((p) => p[0]!)) - amplitude)).toBeLessThan(3 * spreadA / Math.sqrt(300) + 1e-3 * amplitude);
  });

  it('two parameters that only appear as a sum are reported as not separately identifiable (r ≈ −1)', () => {
    const x = [1, 2, 3, 4, 5];
    const y = x.map((xi) => 3 * xi + 0.01 * Math.cos(xi));
    const fit = leastSquares({ residuals: (p) => x.map((xi, i) => (p[0]! + p[1]!) * xi - y[i]!), p0: [1, 1] });
    expect(Math.abs(fit.p[0]! + fit.p[1]! - 3)).toBeLessThan(0.01);
    expect(fit.correlatedPairs.length).toBe(1);
    expect(fit.correlatedPairs[0]![2]).toBeLessThan(-0.95);
    expect(fit.message).toMatch(/not separately identifiable/);
  });

  it('a model that returns NaN for part of the space is steered away from it, not stopped (robustness)', () => {
    const x = [0.5, 1, 1.5, 2];
    const y = x.map((xi) => Math.sqrt(2) * xi);
    const fit = leastSquares({ residuals: (p) => x.map((xi, i) => Math.sqrt(p[0]!) * xi - y[i]!), p0: [0.01] });
    expect(Math.abs(fit.p[0]! - 2)).toBeLessThan(1e-8);
  });
});
