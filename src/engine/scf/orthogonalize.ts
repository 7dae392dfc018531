/**
 * An orthonormalizing transformation X with Xᵀ S X = 1 (P.-O. Löwdin, J. Chem. Phys. 18, 365
 * (1950); A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), §3.4.5):
 *  - symmetric, X = S^{-1/2}, when every eigenvalue of S is at least the threshold;
 *  - canonical, X = U s^{-1/2} over the eigenvectors with s ≥ threshold, otherwise; the
 *    eigenvectors below it (near-linear dependencies) are dropped and counted.
 */
import { symmetricEigen } from "../linalg/dense.ts";

export interface Orthogonalizer {
  kind: "symmetric" | "canonical";
  /** nbf × nmo, row-major */
  X: Float64Array;
  nbf: number;
  /** number of orthonormal functions kept */
  nmo: number;
  dropped: number;
  minEigenvalue: number;
  threshold: number;
}

export function orthogonalizer(S: Float64Array, n: number, threshold = 1e-7): Orthogonalizer {
  const { values, vectors } = symmetricEigen(S, n);
  const min = values[0];
  // a clearly negative eigenvalue means broken integrals, not a near-dependent basis
  if (!(values[n - 1] > 0) || min < -1e-8 * values[n - 1]) throw new Error(`overlap matrix is not positive semi-definite (lowest eigenvalue ${min})`);
  if (min >= threshold) {
    const X = new Float64Array(n * n);
    for (let k = 0; k < n; k++) {
      const f = 1 / Math.sqrt(values[k]);
      for (let i = 0; i < n; i++) {
        const uik = vectors[i * n + k] * f;
        if (uik === 0) continue;
        for (let j = 0; j < n; j++) X[i * n + j] += uik * vectors[j * n + k];
      }
    }
    return { kind: "symmetric", X, nbf: n, nmo: n, dropped: 0, minEigenvalue: min, threshold };
  }
  const keep: number[] = [];
  for (let k = 0; k < n; k++) if (values[k] >= threshold) keep.push(k);
  const m = keep.length;
  const X = new Float64Array(n * m);
  keep.forEach((k, c) => {
    const f = 1 / Math.sqrt(values[k]);
    for (let i = 0; i < n; i++) X[i * m + c] = vectors[i * n + k] * f;
  });
  return { kind: "canonical", X, nbf: n, nmo: m, dropped: n - m, minEigenvalue: min, threshold };
}
