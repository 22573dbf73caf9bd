/**
 * Gauss–Legendre quadrature on [0, 1], used to integrate the loss channels, ∫I²dt and the impulse over each
 * integrator step on its dense output: after each accepted step the interpolant over that step is integrated by
 * quadrature, so the ledger needs no extra ODE states and costs no extra right-hand-side evaluations.
 */

export interface QuadratureRule {
  /** abscissae in (0, 1), ascending */
  nodes: Float64Array;
  /** weights summing to 1 */
  weights: Float64Array;
}

/**
 * The m-point Gauss–Legendre rule (exact for polynomials of degree 2m − 1; Abramowitz & Stegun 25.4.29).
 * Nodes are the roots of P_m, found by Newton's method from the Chebyshev-like first guess cos(π(k − ¼)/(m + ½)).
 */
export function gaussLegendre(m: number): QuadratureRule {
  const nodes = new Float64Array(m);
  const weights = new Float64Array(m);
  for (let k = 1; k <= m; k++) {
    let z = Math.cos((Math.PI * (k - 0.25)) / (m + 0.5));
    for (let iteration = 0; iteration < 100; iteration++) {
      const { value, slope } = legendre(m, z);
      const dz = value / slope;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    const { slope } = legendre(m, z);
    // map [−1, 1] → [0, 1]; k = 1 is the largest root, so fill from the right end
    nodes[m - k] = 0.5 * (1 + z);
    weights[m - k] = 1 / ((1 - z * z) * slope * slope);
  }
  return { nodes, weights };
}

/** P_m(z) and P_m′(z) by the three-term recurrence (Abramowitz & Stegun 22.7.10) and its derivative (22.8.5). */
function legendre(m: number, z: number): { value: number; slope: number } {
  if (m === 0) return { value: 1, slope: 0 };
  let previous = 1;
  let value = z;
  for (let j = 2; j <= m; j++) {
    const next = ((2 * j - 1) * z * value - (j - 1) * previous) / j;
    previous = value;
    value = next;
  }
  return { value, slope: (m * (z * value - previous)) / (z * z - 1) };
}
