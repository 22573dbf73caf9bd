/**
 * Bounded nonlinear least squares: minimise ‖r(p)‖² subject to lower ≤ p ≤ upper.
 *
 * Method: Levenberg–Marquardt with an active set and projection onto the box.
 *  - Each iteration forms the Jacobian by finite differences (central by default), scales its columns to
 *    unit length (Marquardt's diagonal scaling, so the damping is independent of parameter units), and
 *    takes the SVD of the scaled Jacobian of the free parameters (one-sided Jacobi, ./svd.ts). The damped
 *    step for any λ is then  δ = −V diag(1/(σ²+λ)) (JV)ᵀ r  without forming JᵀJ, so trying several λ
 *    costs no new factorisation and a rank-deficient J (σ = 0) is handled.
 *  - A parameter sitting on a bound whose gradient points outwards is frozen for the iteration (the
 *    active set); the step of the others is projected (clipped) onto the box. The gain ratio compares
 *    the actual reduction with the linear model's prediction for the clipped step, so projection can
 *    only make a step look worse, never accept a bad one. This is the "projected LM" family (e.g.
 *    Kanzow, Yamashita & Fukushima, J. Comput. Appl. Math. 172, 2004); chosen over a smooth transform
 *    (sin/tanh mapping) because a transform distorts the covariance and crawls towards an optimum that
 *    lies on a bound, and over trust-region-reflective because it is much shorter to get right.
 *  - λ update after Nielsen (1999): on success λ ·= max(1/3, 1 − (2ρ − 1)³), on failure λ ·= ν, ν ·= 2.
 *
 * Covariance (free parameters only; one on a bound has no linearised uncertainty and gets NaN):
 *  - `noise: 'estimate'` (default): the residuals carry no known noise scale; cov = s²(JᵀJ)⁻¹ with
 *    s² = RSS/(m − n). This is the NIST StRD convention ("approximate standard errors").
 *  - `noise: 'known'`: the caller already divided each residual by its noise σ; cov = (JᵀJ)⁻¹.
 * A near-singular JᵀJ is not regularised away: singular values below 1e-12·σ_max are floored there,
 * so the covariance is dominated by the unidentifiable direction, and the correlations of the parameters
 * in it come out ±1; pairs with |r| > correlationThreshold (0.95) are reported as not separately
 * identifiable, as is a scaled condition number above 1e8.
 */
import { thinSvd } from './svd.js';

export interface LeastSquaresTolerances {
  /** stop when the largest relative parameter change falls below this (default 1e-10) */
  step?: number;
  /** stop when the relative reduction of the sum of squares falls below this (default 1e-12) */
  cost?: number;
  /** stop when every free column is this close to orthogonal to r: |J_iᵀr|/(‖J_i‖‖r‖) (default 1e-10) */
  gradient?: number;
}

export interface LeastSquaresProblem {
  residuals: (p: number[]) => number[];
  p0: number[];
  lower?: number[];
  upper?: number[];
  /** relative finite-difference step (default 1e-5 central, 1e-7 forward) */
  jacobianStep?: number;
  differences?: 'central' | 'forward';
  /** size below which a parameter's step stops shrinking with |p| (default |p0|, or 1 when p0 = 0) */
  typicalSize?: number[];
  maxIterations?: number;
  tolerances?: LeastSquaresTolerances;
  noise?: 'estimate' | 'known';
  correlationThreshold?: number;
}

export interface LeastSquaresResult {
  p: number[];
  /** ‖r‖ at the solution (√RSS) */
  residualNorm: number;
  residuals: number[];
  /** m×n Jacobian at the solution */
  jacobian: number[][];
  covariance: number[][];
  standardErrors: number[];
  correlations: number[][];
  /** σ_max/σ_min of the column-scaled Jacobian of the free parameters */
  conditionNumber: number;
  /** parameters on a bound at the solution */
  atBound: boolean[];
  /** index pairs [i, j, r] with |r| above the threshold */
  correlatedPairs: [number, number, number][];
  degreesOfFreedom: number;
  iterations: number;
  evaluations: number;
  converged: boolean;
  message: string;
}

const SIGMA_FLOOR = 1e-12;
const CONDITION_LIMIT = 1e8;

export function leastSquares(problem: LeastSquaresProblem): LeastSquaresResult {
  const n = problem.p0.length;
  const lower = problem.lower ?? new Array<number>(n).fill(-Infinity);
  const upper = problem.upper ?? new Array<number>(n).fill(Infinity);
  for (let i = 0; i < n; i++) {
    if (!(lower[i]! <= upper[i]!)) throw new RangeError(`parameter ${i}: lower bound above upper bound`);
  }
  const differences = problem.differences ?? 'central';
  const relStep = problem.jacobianStep ?? (differences === 'central' ? 1e-5 : 1e-7);
  const typical = problem.typicalSize ?? problem.p0.map((x) => (x !== 0 ? Math.abs(x) : 1));
  const maxIterations = problem.maxIterations ?? 100;
  const xtol = problem.tolerances?.step ?? 1e-10;
  const ftol = problem.tolerances?.cost ?? 1e-12;
  const gtol = problem.tolerances?.gradient ?? 1e-10;

  let evaluations = 0;
  const evaluate = (p: number[]): number[] => {
    evaluations++;
    return problem.residuals(p);
  };
  const clip = (p: number[]): number[] => p.map((x, i) => Math.min(upper[i]!, Math.max(lower[i]!, x)));
  const jacobianAt = (p: number[], r: number[]): number[][] =>
    finiteDifferenceJacobian(evaluate, p, r, { lower, upper, relStep, typical, differences });

  let p = clip(problem.p0.slice());
  let r = evaluate(p);
  if (!allFinite(r)) throw new RangeError('the residuals are not finite at the starting point');
  let cost = sumOfSquares(r);
  let lambda = -1;
  let nu = 2;
  let iterations = 0;
  let converged = false;
  let message = 'iteration limit reached';
  let jacobian = jacobianAt(p, r);
  let jacobianIsCurrent = true;

  while (iterations < maxIterations) {
    iterations++;
    if (!jacobianIsCurrent) jacobian = jacobianAt(p, r);
    jacobianIsCurrent = true;
    const gradient = transposeTimes(jacobian, r);
    const norms = columnNorms(jacobian);
    const free: number[] = [];
    for (let i = 0; i < n; i++) {
      const pinnedLow = p[i]! <= lower[i]! && gradient[i]! > 0;
      const pinnedHigh = p[i]! >= upper[i]! && gradient[i]! < 0;
      if (!pinnedLow && !pinnedHigh) free.push(i);
    }
    if (free.length === 0) {
      converged = true;
      message = 'every parameter is held by a bound';
      break;
    }
    const rNorm = Math.sqrt(cost);
    const worstCosine = largest(free.map((i) => (norms[i]! > 0 && rNorm > 0 ? Math.abs(gradient[i]!) / (norms[i]! * rNorm) : 0)));
    if (worstCosine <= gtol) {
      converged = true;
      message = 'gradient is zero to tolerance';
      break;
    }
    const scale = free.map((i) => (norms[i]! > 0 ? norms[i]! : 1));
    const svd = thinSvd(jacobian.map((row) => free.map((i, k) => row[i]! / scale[k]!)));
    const projections = svd.jv[0] ? svd.jv[0].map((_, k) => svd.jv.reduce((sum, row, i) => sum + row[k]! * r[i]!, 0)) : [];
    if (lambda < 0) lambda = 1e-3 * largest(svd.singularValues.map((s) => s * s));

    let accepted = false;
    let stopped = false;
    for (let attempt = 0; attempt < 40 && !accepted; attempt++) {
      const trial = p.slice();
      free.forEach((i, k) => {
        let scaledStep = 0;
        svd.singularValues.forEach((sigma, j) => {
          scaledStep -= (svd.v[k]![j]! * projections[j]!) / (sigma * sigma + lambda);
        });
        trial[i] = p[i]! + scaledStep / scale[k]!;
      });
      const pNew = clip(trial);
      const step = pNew.map((x, i) => x - p[i]!);
      const predictedResidual = r.map((ri, row) => ri + step.reduce((sum, s, i) => sum + jacobian[row]![i]! * s, 0));
      const predicted = cost - sumOfSquares(predictedResidual);
      const relChange = largest(step.map((s, i) => Math.abs(s) / (Math.abs(p[i]!) + typical[i]!)));
      if (relChange <= xtol * 1e-3 || !(predicted > 0)) {
        stopped = true;
        converged = true;
        message = 'no step reduces the sum of squares at working precision';
        break;
      }
      const rNew = evaluate(pNew);
      const costNew = allFinite(rNew) ? sumOfSquares(rNew) : Infinity;
      const rho = (cost - costNew) / predicted;
      if (rho > 1e-4) {
        accepted = true;
        lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
        nu = 2;
        const reduction = cost - costNew;
        p = pNew;
        r = rNew;
        cost = costNew;
        jacobianIsCurrent = false;
        if (reduction <= ftol * costNew || costNew === 0) {
          converged = true;
          message = 'relative reduction of the sum of squares below tolerance';
          stopped = true;
        } else if (relChange <= xtol) {
          converged = true;
          message = 'relative parameter change below tolerance';
          stopped = true;
        }
      } else {
        lambda *= nu;
        nu *= 2;
      }
    }
    if (stopped) break;
    if (!accepted) {
      message = 'no step along the damped Gauss–Newton direction reduces the sum of squares (40 tries)';
      break;
    }
  }
  if (!jacobianIsCurrent) jacobian = jacobianAt(p, r);

  const statistics = covarianceAt(jacobian, r, p, lower, upper, problem.noise ?? 'estimate');
  const threshold = problem.correlationThreshold ?? 0.95;
  const correlatedPairs: [number, number, number][] = [];
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const rij = statistics.correlations[i]![j]!;
      if (Math.abs(rij) > threshold) correlatedPairs.push([i, j, rij]);
    }
  }
  return {
    p,
    residualNorm: Math.sqrt(cost),
    residuals: r,
    jacobian,
    ...statistics,
    correlatedPairs,
    iterations,
    evaluations,
    converged,
    message: statistics.conditionNumber > CONDITION_LIMIT ? `${message}; parameters not separately identifiable (condition number ${statistics.conditionNumber.toExponential(2)})` : message,
  };
}

interface JacobianSettings {
  lower: number[];
  upper: number[];
  relStep: number;
  typical: number[];
  differences: 'central' | 'forward';
}

/** Finite-difference Jacobian with steps scaled to each parameter and kept inside the bounds. */
export function finiteDifferenceJacobian(
  evaluate: (p: number[]) => number[],
  p: number[],
  r: number[],
  settings: JacobianSettings,
): number[][] {
  const m = r.length;
  const jacobian: number[][] = Array.from({ length: m }, () => new Array<number>(p.length).fill(0));
  p.forEach((x, i) => {
    const h = settings.relStep * Math.max(Math.abs(x), settings.typical[i]!);
    const roomUp = settings.upper[i]! - x;
    const roomDown = x - settings.lower[i]!;
    const setColumn = (values: number[]): void => values.forEach((value, row) => (jacobian[row]![i] = value));
    if (settings.differences === 'central' && roomUp >= h && roomDown >= h) {
      const up = x + h;
      const down = x - h;
      const rUp = evaluate(withEntry(p, i, up));
      const rDown = evaluate(withEntry(p, i, down));
      setColumn(rUp.map((value, row) => (value - rDown[row]!) / (up - down)));
      return;
    }
    // one-sided, towards the side with room (a parameter on its upper bound steps down)
    const target = roomUp >= h || roomUp >= roomDown ? x + Math.min(h, roomUp) : x - Math.min(h, roomDown);
    const delta = target - x;
    if (delta === 0) return; // lower == upper: a fixed parameter has a zero column
    const rStep = evaluate(withEntry(p, i, target));
    setColumn(rStep.map((value, row) => (value - r[row]!) / delta));
  });
  return jacobian;
}

function covarianceAt(jacobian: number[][], r: number[], p: number[], lower: number[], upper: number[], noise: 'estimate' | 'known') {
  const n = p.length;
  const m = r.length;
  const atBound = p.map((x, i) => x <= lower[i]! || x >= upper[i]!);
  const free = p.map((_, i) => i).filter((i) => !atBound[i]);
  const norms = columnNorms(jacobian);
  const scale = free.map((i) => (norms[i]! > 0 ? norms[i]! : 1));
  const covariance: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const degreesOfFreedom = m - free.length;
  const variance = noise === 'known' ? 1 : degreesOfFreedom > 0 ? sumOfSquares(r) / degreesOfFreedom : NaN;
  let conditionNumber = 1;
  if (free.length > 0) {
    const svd = thinSvd(jacobian.map((row) => free.map((i, k) => row[i]! / scale[k]!)));
    const sigmaMax = largest(svd.singularValues);
    const sigmaMin = -largest(svd.singularValues.map((s) => -s));
    conditionNumber = sigmaMin > 0 ? sigmaMax / sigmaMin : Infinity;
    const floored = svd.singularValues.map((s) => Math.max(s, SIGMA_FLOOR * sigmaMax));
    free.forEach((i, a) => {
      free.forEach((j, b) => {
        let sum = 0;
        floored.forEach((sigma, k) => (sum += (svd.v[a]![k]! * svd.v[b]![k]!) / (sigma * sigma)));
        covariance[i]![j] = (variance * sum) / (scale[a]! * scale[b]!);
      });
    });
  }
  const standardErrors = p.map((_, i) => (atBound[i] ? NaN : Math.sqrt(covariance[i]![i]!)));
  const correlations = covariance.map((row, i) =>
    row.map((c, j) => (i === j ? (atBound[i] ? NaN : 1) : atBound[i] || atBound[j] ? NaN : c / (standardErrors[i]! * standardErrors[j]!))),
  );
  return { covariance, standardErrors, correlations, conditionNumber, atBound, degreesOfFreedom };
}

/** Largest of a list (a loop: no argument spreading). */
function largest(values: readonly number[]): number {
  let max = -Infinity;
  for (const value of values) if (value > max) max = value;
  return max;
}

function withEntry(p: number[], i: number, value: number): number[] {
  const copy = p.slice();
  copy[i] = value;
  return copy;
}

function sumOfSquares(values: number[]): number {
  let sum = 0;
  for (const x of values) sum += x * x;
  return sum;
}

function allFinite(values: number[]): boolean {
  return values.every((x) => Number.isFinite(x));
}

function transposeTimes(matrix: number[][], vector: number[]): number[] {
  const n = matrix[0]?.length ?? 0;
  const out = new Array<number>(n).fill(0);
  matrix.forEach((row, i) => row.forEach((value, j) => (out[j]! += value * vector[i]!)));
  return out;
}

function columnNorms(matrix: number[][]): number[] {
  const n = matrix[0]?.length ?? 0;
  const sums = new Array<number>(n).fill(0);
  for (const row of matrix) row.forEach((value, j) => (sums[j]! += value * value));
  return sums.map(Math.sqrt);
}
