/**
 * Numerical methods under the uncertainty work, checked against published values and a general-purpose
 * reference library (mathjs: erf, eigs).
 */
import { erf, eigs } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { covarianceFactor, symmetricEigen } from '../../src/core/eigen.js';
import { normalQuantile } from '../../src/core/normal.js';

describe('normal quantile (Wichura, AS 241, Applied Statistics 37, 1988)', () => {
  it('matches the tabulated quantiles z(0.95) = 1.644853627, z(0.975) = 1.959963985, z(0.995) = 2.575829304 (NIST/SEMATECH e-Handbook, normal table)', () => {
    expect(normalQuantile(0.95)).toBeCloseTo(1.644853627, 8);
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963985, 8);
    expect(normalQuantile(0.995)).toBeCloseTo(2.575829304, 8);
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0.05)).toBeCloseTo(-1.644853627, 8);
  });

  it('inverts Φ(x) = ½(1 + erf(x/√2)) from mathjs to 1e-15 (absolute) in all three regions of the algorithm, and is odd about ½', () => {
    for (const p of [1e-12, 1e-9, 1e-6, 1e-4, 0.02, 0.07, 0.3, 0.5, 0.76, 0.93, 0.999, 1 - 1e-9]) {
      const x = normalQuantile(p);
      expect(Math.abs(0.5 * (1 + erf(x / Math.SQRT2)) - p)).toBeLessThan(1e-15);
      // 1 − p is rounded where p is tiny, so the symmetry is checked away from the far tails
      if (p >= 1e-4 && p <= 1 - 1e-4) expect(normalQuantile(1 - p) + x).toBeCloseTo(0, 12);
    }
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(1.5)).toBeNaN();
  });
});

describe('symmetric eigenproblem (cyclic Jacobi, Golub & Van Loan §8.5)', () => {
  const matrix = [
    [4, 1, -2, 0.5],
    [1, 3, 0.3, 0],
    [-2, 0.3, 5, 1],
    [0.5, 0, 1, 2],
  ];

  it('eigenvalues equal those of mathjs eigs, and A v = λ v for every pair', () => {
    const ours = symmetricEigen(matrix);
    const reference = (eigs(matrix).values as number[]).slice().sort((a, b) => b - a);
    ours.values.forEach((value, k) => expect(value).toBeCloseTo(reference[k]!, 12));
    ours.values.forEach((lambda, k) => {
      const v = ours.vectors.map((row) => row[k]!);
      matrix.forEach((row, i) => expect(row.reduce((s, a, j) => s + a * v[j]!, 0)).toBeCloseTo(lambda * v[i]!, 12));
    });
  });

  it('shows a matrix that is not positive semi-definite (a correlation of 1.2) by a negative eigenvalue', () => {
    expect(Math.min(...symmetricEigen([[1, 1.2], [1.2, 1]]).values)).toBeCloseTo(-0.2, 12);
  });

  it('the covariance factor F satisfies F Fᵀ = C, also for a singular C (perfect correlation)', () => {
    for (const c of [matrix, [[4, 6], [6, 9]]]) {
      const f = covarianceFactor(c);
      c.forEach((row, i) => row.forEach((value, j) => expect(f[i]!.reduce((s, x, k) => s + x * f[j]![k]!, 0)).toBeCloseTo(value, 10)));
    }
  });
});
