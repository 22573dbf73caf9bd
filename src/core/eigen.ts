/**
 * Eigenvalues and eigenvectors of a small real symmetric matrix by the cyclic Jacobi method (Golub & Van Loan,
 * Matrix Computations, §8.5): plane rotations that zero the off-diagonal entries one at a time until they are
 * negligible. Exact to rounding for the few-by-few covariance matrices of a calibration, and it shows a negative
 * eigenvalue plainly (a matrix that is not positive semi-definite). Pure.
 */

export interface SymmetricEigen {
  /** eigenvalues, descending */
  values: number[];
  /** vectors[i][k]: component i of the eigenvector of values[k] (columns are the eigenvectors) */
  vectors: number[][];
}

/** The eigen-decomposition of the symmetric part of `matrix` (n × n). */
export function symmetricEigen(matrix: readonly (readonly number[])[]): SymmetricEigen {
  const n = matrix.length;
  const a = matrix.map((row, i) => row.map((_, j) => 0.5 * (matrix[i]![j]! + matrix[j]![i]!)));
  const v: number[][] = a.map((row, i) => row.map((_, j) => (i === j ? 1 : 0)));
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    let scale = 0;
    for (let i = 0; i < n; i++) {
      scale += a[i]![i]! ** 2;
      for (let j = i + 1; j < n; j++) off += a[i]![j]! ** 2;
    }
    if (off <= 1e-30 * scale || off === 0) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p]![q]!;
        if (apq === 0) continue;
        // the rotation angle that zeroes a[p][q] (the smaller of the two solutions, for stability)
        const theta = (a[q]![q]! - a[p]![p]!) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k]![p]!;
          const akq = a[k]![q]!;
          a[k]![p] = c * akp - s * akq;
          a[k]![q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p]![k]!;
          const aqk = a[q]![k]!;
          a[p]![k] = c * apk - s * aqk;
          a[q]![k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k]![p]!;
          const vkq = v[k]![q]!;
          v[k]![p] = c * vkp - s * vkq;
          v[k]![q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = a.map((_, k) => k).sort((x, y) => a[y]![y]! - a[x]![x]!);
  return { values: order.map((k) => a[k]![k]!), vectors: v.map((row) => order.map((k) => row[k]!)) };
}

/**
 * A square root F of a positive semi-definite matrix C (F Fᵀ = C), from its eigen-decomposition, so that F z has
 * covariance C for independent unit normals z. Eigenvalues within rounding of zero (or below) count as zero.
 */
export function covarianceFactor(covariance: readonly (readonly number[])[]): number[][] {
  const { values, vectors } = symmetricEigen(covariance);
  const largest = Math.max(0, ...values);
  const roots = values.map((lambda) => (lambda > 1e-14 * largest ? Math.sqrt(lambda) : 0));
  return vectors.map((row) => row.map((component, k) => component * roots[k]!));
}
