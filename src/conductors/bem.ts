/**
 * A 2-D boundary-element solver for the electrostatic analogue of a two-rail line, used for the
 * high-frequency (perfect-conductor, surface-current) inductance gradient via L′·C′ = μ0·ε0.
 *
 * Method: piecewise-constant surface charge on straight panels, collocation at panel midpoints, exact
 * integrals of the logarithmic kernel over each panel. The line is symmetric about the plane between the
 * rails (x = 0) and about the rails' mid-plane (y = 0), so only the panels of the upper half of the right
 * rail (x > 0) are unknowns; the other three quarters are images: (x, −y) carries the same charge,
 * (−x, ±y) the opposite charge. The right rail is held at +1, the left at −1 (difference 2).
 *
 * With q = σ/(2π ε0), the potential of the panels is φ(P) = −Σ q_j ∫ ln|P − r′| dl′ (image terms added),
 * the charge per metre of the right rail is Q = 2·2π ε0 Σ q_j ℓ_j (both halves), C′ = Q / 2, and
 * L′ = μ0 ε0 / C′ = μ0 / (2π Σ q_j ℓ_j): ε0 cancels, and with it any choice of length unit, because the
 * antisymmetric kernel ln(|P − r′_x||P − r′_xy| / (|P − r′||P − r′_y|)) is scale-free.
 */

const MU0 = 4e-7 * Math.PI; // the 1e-9 difference from the 2019 SI value is far below the solver tolerance

export interface Panel {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/**
 * ∫ ln|P − r′| dl′ over the straight panel, exactly: with u the projection of P along the panel from its
 * start and h the distance from the panel's line, the integral is F(ℓ − u) − F(−u) with
 * F(s) = ½ s ln(s² + h²) − s + h·atan(s/h).
 */
export function panelLogIntegral(px: number, py: number, panel: Panel): number {
  const dx = panel.x1 - panel.x0;
  const dy = panel.y1 - panel.y0;
  const length = Math.hypot(dx, dy);
  return logIntegral(px - panel.x0, py - panel.y0, dx / length, dy / length, length);
}

/** The same integral from P's offset (rx, ry) to the panel's start, the panel's unit tangent and its length. */
function logIntegral(rx: number, ry: number, tx: number, ty: number, length: number): number {
  const u = rx * tx + ry * ty;
  const h = Math.abs(rx * ty - ry * tx);
  return antiderivative(length - u, h) - antiderivative(-u, h);
}

function antiderivative(s: number, h: number): number {
  const r2 = s * s + h * h;
  const logPart = r2 > 0 ? 0.5 * s * Math.log(r2) : 0;
  const atanPart = h > 0 ? h * Math.atan(s / h) : 0;
  return logPart - s + atanPart;
}

/**
 * Solve for the panel charges and return L′ (H/m) of the two-rail line whose upper-right quarter is
 * described by `panels` (all with y ≥ 0 and x > 0).
 */
export function loopInductanceFromPanels(panels: readonly Panel[]): number {
  const charges = panelCharges(panels);
  let weighted = 0;
  for (let j = 0; j < panels.length; j++) {
    const p = panels[j]!;
    weighted += charges[j]! * Math.hypot(p.x1 - p.x0, p.y1 - p.y0);
  }
  return MU0 / (2 * Math.PI * weighted);
}

/**
 * Width of the uniform surface current with the same Joule loss per unit surface resistance as the
 * perfect-conductor (high-frequency) distribution of one rail: (∮K dl)² / ∮K² dl, K ∝ the panel charge of the
 * electrostatic analogue. With a skin depth δ much thinner than the rail, the rail's resistance per metre is
 * ρ/(δ·this width) [derived: surface resistance ρ/δ times ∮K² dl / I²]. In the panels' length unit.
 */
export function equivalentCurrentWidth(panels: readonly Panel[]): number {
  const charges = panelCharges(panels);
  let first = 0;
  let second = 0;
  for (let j = 0; j < panels.length; j++) {
    const p = panels[j]!;
    const length = Math.hypot(p.x1 - p.x0, p.y1 - p.y0);
    first += charges[j]! * length;
    second += charges[j]! * charges[j]! * length;
  }
  // the panels are the upper half of the rail; its lower half is their mirror image: (2·first)² / (2·second)
  return (2 * first * first) / second;
}

/** The panel charges q_j (per unit length, up to a common factor) of the upper-right quarter. */
function panelCharges(panels: readonly Panel[]): Float64Array {
  const n = panels.length;
  // each source panel's start, unit tangent and length, computed once (as panelLogIntegral computes them)
  const x0 = new Float64Array(n);
  const y0 = new Float64Array(n);
  const tx = new Float64Array(n);
  const ty = new Float64Array(n);
  const length = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const p = panels[j]!;
    const dx = p.x1 - p.x0;
    const dy = p.y1 - p.y0;
    const l = Math.hypot(dx, dy);
    x0[j] = p.x0;
    y0[j] = p.y0;
    tx[j] = dx / l;
    ty[j] = dy / l;
    length[j] = l;
  }
  /** panelLogIntegral(px, py, panels[j]) on the precomputed panel */
  const integral = (px: number, py: number, j: number): number => logIntegral(px - x0[j]!, py - y0[j]!, tx[j]!, ty[j]!, length[j]!);
  const matrix = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const p = panels[i]!;
    const cx = 0.5 * (p.x0 + p.x1);
    const cy = 0.5 * (p.y0 + p.y1);
    for (let j = 0; j < n; j++) {
      // Images are applied to the collocation point instead of the source panel: same integral.
      const direct = integral(cx, cy, j) + integral(cx, -cy, j);
      const opposite = integral(-cx, cy, j) + integral(-cx, -cy, j);
      matrix[i * n + j] = opposite - direct;
    }
  }
  return solveDense(matrix, new Float64Array(n).fill(1), n);
}

/** Gaussian elimination with partial pivoting (the matrix is small and dense; it is consumed). */
function solveDense(a: Float64Array, b: Float64Array, n: number): Float64Array {
  for (let k = 0; k < n; k++) {
    let pivotRow = k;
    let pivotSize = Math.abs(a[k * n + k]!);
    for (let r = k + 1; r < n; r++) {
      const size = Math.abs(a[r * n + k]!);
      if (size > pivotSize) {
        pivotSize = size;
        pivotRow = r;
      }
    }
    if (pivotSize === 0) throw new Error('boundary-element matrix is singular');
    if (pivotRow !== k) {
      for (let c = 0; c < n; c++) {
        const t = a[k * n + c]!;
        a[k * n + c] = a[pivotRow * n + c]!;
        a[pivotRow * n + c] = t;
      }
      const t = b[k]!;
      b[k] = b[pivotRow]!;
      b[pivotRow] = t;
    }
    const pivot = a[k * n + k]!;
    for (let r = k + 1; r < n; r++) {
      const factor = a[r * n + k]! / pivot;
      if (factor === 0) continue;
      const rowR = r * n;
      const rowK = k * n;
      for (let c = k + 1; c < n; c++) a[rowR + c]! -= factor * a[rowK + c]!;
      b[r]! -= factor * b[k]!;
    }
  }
  const x = new Float64Array(n);
  for (let r = n - 1; r >= 0; r--) {
    let sum = b[r]!;
    for (let c = r + 1; c < n; c++) sum -= a[r * n + c]! * x[c]!;
    x[r] = sum / a[r * n + r]!;
  }
  return x;
}

/**
 * Panels along the straight segment from (ax, ay) to (bx, by), graded toward the start point:
 * node k sits at fraction (k/count)^grading, so panels shrink toward a corner where the surface charge
 * is singular (∝ r^(−1/3) at a right-angled conducting edge).
 */
export function gradedSegment(ax: number, ay: number, bx: number, by: number, count: number, grading: number): Panel[] {
  const panels: Panel[] = [];
  let previous = 0;
  for (let k = 1; k <= count; k++) {
    const f = Math.pow(k / count, grading);
    panels.push({
      x0: ax + (bx - ax) * previous,
      y0: ay + (by - ay) * previous,
      x1: ax + (bx - ax) * f,
      y1: ay + (by - ay) * f,
    });
    previous = f;
  }
  return panels;
}
