/**
 * Singular value decomposition of a tall matrix by one-sided Jacobi rotations (Hestenes' method).
 *
 * Why this and not the normal equations: a fit's JᵀJ squares the condition number, so two nearly
 * indistinguishable parameters lose twice the digits. One-sided Jacobi works on J itself, is accurate to
 * full relative precision in the small singular values (Demmel & Veselić, "Jacobi's method is more
 * accurate than QR", SIAM J. Matrix Anal. Appl. 13, 1992), and for the handful of columns a fit has it
 * is short and fast. Pure: no I/O.
 */

export interface ThinSvd {
  /** singular values, same order as the columns of v (not sorted) */
  singularValues: number[];
  /** n×n right singular vectors, v[row][k] */
  v: number[][];
  /** m×n matrix J·V (columns are σ_k·u_k); lets callers form Uᵀr without dividing by σ_k = 0 */
  jv: number[][];
}

const MAX_SWEEPS = 60;

/** SVD of an m×n matrix (rows of length n, m ≥ 1). */
export function thinSvd(matrix: readonly (readonly number[])[]): ThinSvd {
  const m = matrix.length;
  const n = m > 0 ? matrix[0]!.length : 0;
  // Work column-major: columns[k][i]
  const columns: Float64Array[] = [];
  for (let k = 0; k < n; k++) {
    const column = new Float64Array(m);
    for (let i = 0; i < m; i++) column[i] = matrix[i]![k]!;
    columns.push(column);
  }
  const v: number[][] = Array.from({ length: n }, (_, r) => Array.from({ length: n }, (_, c) => (r === c ? 1 : 0)));

  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const a = columns[p]!;
        const b = columns[q]!;
        let alpha = 0;
        let beta = 0;
        let gamma = 0;
        for (let i = 0; i < m; i++) {
          alpha += a[i]! * a[i]!;
          beta += b[i]! * b[i]!;
          gamma += a[i]! * b[i]!;
        }
        if (gamma === 0 || Math.abs(gamma) <= 1e-15 * Math.sqrt(alpha * beta)) continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = Math.sign(zeta || 1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let i = 0; i < m; i++) {
          const ai = a[i]!;
          const bi = b[i]!;
          a[i] = c * ai - s * bi;
          b[i] = s * ai + c * bi;
        }
        for (let r = 0; r < n; r++) {
          const row = v[r]!;
          const vp = row[p]!;
          const vq = row[q]!;
          row[p] = c * vp - s * vq;
          row[q] = s * vp + c * vq;
        }
      }
    }
    if (!rotated) break;
  }

  const singularValues = columns.map((column) => Math.sqrt(column.reduce((sum, x) => sum + x * x, 0)));
  const jv: number[][] = Array.from({ length: m }, (_, i) => columns.map((column) => column[i]!));
  return { singularValues, v, jv };
}
