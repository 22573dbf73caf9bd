/**
 * Refinement to convergence with Richardson extrapolation, for a discretisation whose error behaves as
 * C·h^p (h = 1/elements). The order p is observed, not assumed: from three levels with mesh sizes
 * h0 > h1 > h2 it solves (h0^p − h1^p)/(h1^p − h2^p) = (L0 − L1)/(L1 − L2) for p (bisection on 0.5…6),
 * using the real element counts, since rounding element counts up makes the refinement ratio uneven and
 * an assumed ratio would bias the extrapolation. Then L* = L2 − (L1 − L2)·h2^p/(h1^p − h2^p).
 */

export interface Level {
  value: number;
  elements: number;
}

export interface Converged {
  value: number;
  /** estimated relative error of `value` */
  error: number;
  elements: number;
  levels: number;
}

/** Extrapolated limit of three levels, or undefined when they do not converge monotonically. */
export function extrapolate(a: Level, b: Level, c: Level): number | undefined {
  const first = a.value - b.value;
  const second = b.value - c.value;
  if (second === 0) return c.value;
  const target = first / second;
  if (!(target > 1)) return undefined; // not monotone, or not converging
  const [h0, h1, h2] = [1 / a.elements, 1 / b.elements, 1 / c.elements];
  const mismatch = (p: number) => (h0 ** p - h1 ** p) / (h1 ** p - h2 ** p) - target;
  let low = 0.5;
  let high = 6;
  if (mismatch(low) > 0 || mismatch(high) < 0) return undefined; // order outside the plausible range
  for (let k = 0; k < 60; k++) {
    const mid = 0.5 * (low + high);
    if (mismatch(mid) < 0) low = mid;
    else high = mid;
  }
  const p = 0.5 * (low + high);
  return c.value - (second * h2 ** p) / (h1 ** p - h2 ** p);
}

/**
 * Solve at resolutions growing by `ratio` until two successive extrapolated values agree to `tolerance`
 * (relative) twice in a row; the larger of those two changes is the error estimate of the last
 * extrapolated value, which is returned. If the sequence does not behave, or the element budget runs
 * out, the finest raw value is returned with the last raw change as its error.
 */
export function refineToConvergence(
  solveAt: (resolution: number) => Level,
  options: { start: number; ratio: number; tolerance: number; maxElements: number },
): Converged {
  const levels: Level[] = [];
  const extrapolated: Array<number | undefined> = [];
  for (let resolution = options.start; ; resolution *= options.ratio) {
    const level = solveAt(resolution);
    levels.push(level);
    const n = levels.length;
    if (n < 3) continue;
    extrapolated.push(extrapolate(levels[n - 3]!, levels[n - 2]!, level));
    const [e0, e1, e2] = extrapolated.slice(-3);
    if (e0 !== undefined && e1 !== undefined && e2 !== undefined && extrapolated.length >= 3) {
      const change = Math.max(Math.abs((e2 - e1) / e2), Math.abs((e1 - e0) / e2));
      if (change < options.tolerance) return { value: e2, error: Math.max(change, 1e-12), elements: level.elements, levels: n };
    }
    const rawChange = Math.abs((level.value - levels[n - 2]!.value) / level.value);
    if (rawChange < options.tolerance || level.elements * options.ratio > options.maxElements)
      return { value: level.value, error: Math.max(rawChange, 1e-12), elements: level.elements, levels: n };
  }
}
