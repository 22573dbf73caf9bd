/**
 * Geometric mean distances of rectangles, for the uniform-current (DC) inductance gradient
 * L′_DC = (μ0/π)·ln(GMD_between / GMR_self) of two identical parallel bars.
 *
 * ln GMD of two areas is the mean of ln r over all point pairs. For axis-aligned rectangles the fourfold
 * integral is exact through a fourth antiderivative G of ln r = ½ ln(x² + y²) (∂⁴G/∂x²∂y² = ln r):
 *   G(x, y) = −(x⁴ − 6x²y² + y⁴)/48 · ln(x² + y²) + (x³y/6)·atan(y/x) + (xy³/6)·atan(x/y) − 25x²y²/48
 * (derived here by integrating ln r four times; terms linear in x or y, which the differences cancel,
 * dropped; G is even in x and y, so it serves every quadrant).
 */
import { gaussLegendre } from '../core/quadrature.js';

function fourthAntiderivative(x: number, y: number): number {
  const x2 = x * x;
  const y2 = y * y;
  const r2 = x2 + y2;
  if (r2 === 0) return 0;
  const logTerm = (-(x2 * x2 - 6 * x2 * y2 + y2 * y2) / 48) * Math.log(r2);
  const atanX = x === 0 ? 0 : ((x2 * x * y) / 6) * Math.atan(y / x);
  const atanY = y === 0 ? 0 : ((x * y2 * y) / 6) * Math.atan(x / y);
  return logTerm + atanX + atanY - (25 * x2 * y2) / 48;
}

interface Interval {
  low: number;
  high: number;
}

/** The four signed differences of two intervals at which the double antiderivative is evaluated. */
function differenceTerms(a: Interval, b: Interval): Array<[number, number]> {
  return [
    [a.high - b.low, 1],
    [a.high - b.high, -1],
    [a.low - b.low, -1],
    [a.low - b.high, 1],
  ];
}

export interface Rectangle {
  x: Interval;
  y: Interval;
}

/** ln of the geometric mean distance between two axis-aligned rectangles (or of one from itself). */
export function logGeometricMeanDistance(a: Rectangle, b: Rectangle): number {
  let sum = 0;
  for (const [dx, sx] of differenceTerms(a.x, b.x)) {
    for (const [dy, sy] of differenceTerms(a.y, b.y)) sum += sx * sy * fourthAntiderivative(dx, dy);
  }
  const areaA = (a.x.high - a.x.low) * (a.y.high - a.y.low);
  const areaB = (b.x.high - b.x.low) * (b.y.high - b.y.low);
  return sum / (areaA * areaB);
}

/**
 * ln GMD by Gauss–Legendre quadrature of ln r over both rectangles. Used when the bars are far apart
 * compared with their size, where the closed form loses digits to cancellation (its terms grow as
 * distance⁴ while the result is of order size²·size²); there ln r is smooth and the quadrature is exact
 * to rounding.
 */
export function logGeometricMeanDistanceByQuadrature(a: Rectangle, b: Rectangle, order = 16): number {
  // the rule on [0, 1] mapped to [−1, 1]
  const rule = gaussLegendre(order);
  const nodes = Array.from(rule.nodes, (u) => 2 * u - 1);
  const weights = Array.from(rule.weights, (w) => 2 * w);
  const map = (iv: Interval) =>
    nodes.map((t) => 0.5 * (iv.low + iv.high) + 0.5 * (iv.high - iv.low) * t);
  const ax = map(a.x);
  const ay = map(a.y);
  const bx = map(b.x);
  const by = map(b.y);
  let sum = 0;
  for (let i = 0; i < order; i++)
    for (let j = 0; j < order; j++)
      for (let k = 0; k < order; k++) {
        const dx = ax[i]! - bx[k]!;
        const wik = weights[i]! * weights[k]! * weights[j]!;
        for (let l = 0; l < order; l++) {
          const dy = ay[j]! - by[l]!;
          sum += wik * weights[l]! * 0.5 * Math.log(dx * dx + dy * dy);
        }
      }
  return sum / 16; // the weights sum to 2 on [−1, 1] in each of the four dimensions
}


/**
 * ln(GMD_between / GMR_self) for two identical bars of height h (y) and width w (x) with inner faces a
 * gap s apart. L′_DC = (μ0/π) times this.
 */
export function logDistanceRatioOfBars(height: number, width: number, separation: number): number {
  const right: Rectangle = {
    x: { low: separation / 2, high: separation / 2 + width },
    y: { low: -height / 2, high: height / 2 },
  };
  const left: Rectangle = {
    x: { low: -separation / 2 - width, high: -separation / 2 },
    y: { low: -height / 2, high: height / 2 },
  };
  const selfLog = logGeometricMeanDistance(right, right);
  const wellSeparated = separation >= Math.max(height, width);
  const betweenLog = wellSeparated
    ? logGeometricMeanDistanceByQuadrature(right, left)
    : logGeometricMeanDistance(right, left);
  return betweenLog - selfLog;
}
