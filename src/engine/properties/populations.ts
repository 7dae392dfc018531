/**
 * Atomic charges from the AO density (nbf × nbf, row-major):
 *  - Mulliken (R. S. Mulliken, J. Chem. Phys. 23, 1833 (1955)):
 *      q_A = Z_A − Σ_{μ∈A} (P S)_μμ
 *  - Löwdin (P.-O. Löwdin, J. Chem. Phys. 18, 365 (1950)), in the symmetrically
 *    orthogonalized basis:  q_A = Z_A − Σ_{μ∈A} (S^½ P S^½)_μμ
 * Spin populations use the same partition with Pα − Pβ and no nuclear term.
 * Both partitions conserve the electron count: Σ_μ (P S)_μμ = tr(P S) = tr(S^½ P S^½).
 */
import { matmul, symmetricEigen } from "../linalg/dense.ts";

/** S^½ from the eigen-decomposition S = U s Uᵀ (eigenvalues clamped at 0 against round-off). */
export function overlapSqrt(S: Float64Array, n: number): Float64Array {
  const { values, vectors } = symmetricEigen(S, n);
  const out = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    const r = Math.sqrt(Math.max(values[k], 0));
    for (let i = 0; i < n; i++) {
      const u = vectors[i * n + k] * r;
      if (u === 0) continue;
      for (let j = 0; j < n; j++) out[i * n + j] += u * vectors[j * n + k];
    }
  }
  return out;
}

/** Σ_{μ∈A} (P S)_μμ per atom. */
export function mullikenPopulations(P: Float64Array, S: Float64Array, atomOf: Int32Array, natoms: number): number[] {
  const n = atomOf.length;
  const pop = new Array<number>(natoms).fill(0);
  for (let mu = 0; mu < n; mu++) {
    let d = 0;
    for (let nu = 0; nu < n; nu++) d += P[mu * n + nu] * S[nu * n + mu];
    pop[atomOf[mu]] += d;
  }
  return pop;
}

/** Σ_{μ∈A} (S^½ P S^½)_μμ per atom, with S^½ given. */
export function lowdinPopulations(P: Float64Array, Shalf: Float64Array, atomOf: Int32Array, natoms: number): number[] {
  const n = atomOf.length;
  const PS = matmul(P, Shalf, n, n, n);
  const pop = new Array<number>(natoms).fill(0);
  for (let mu = 0; mu < n; mu++) {
    let d = 0;
    for (let nu = 0; nu < n; nu++) d += Shalf[mu * n + nu] * PS[nu * n + mu];
    pop[atomOf[mu]] += d;
  }
  return pop;
}

/** Z_A minus the population. */
export function charges(nuclearCharges: readonly number[], populations: readonly number[]): number[] {
  return populations.map((p, a) => nuclearCharges[a] - p);
}
