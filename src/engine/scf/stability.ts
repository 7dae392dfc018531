/**
 * Internal stability of a UHF solution with respect to real orbital rotations (R. Seeger,
 * J. A. Pople, J. Chem. Phys. 66, 3045 (1977)). The stationary point is a minimum when the
 * real orbital Hessian (A + B) has no negative eigenvalue, with, for occupied i, j and virtual
 * a, b of spins σ, τ:
 *   (A+B)_{iaσ,jbσ} = δ_ij δ_ab (ε_a − ε_i) + 2(ia|jb) − (ij|ab) − (ib|ja)
 *   (A+B)_{iaσ,jbτ} = 2(ia|jb)   (σ ≠ τ)
 * The product with a trial vector x needs one Coulomb/exchange build with the symmetric
 * densities D^σ = Σ_ia x_ia (C_i C_aᵀ + C_a C_iᵀ):
 *   ((A+B)x)_{iaσ} = (ε_a − ε_i) x_ia + [C_iᵀ (J[D^α + D^β] − K[D^σ]) C_a]
 * The lowest eigenvalue comes from a Davidson iteration (E. R. Davidson, J. Comput. Phys. 17,
 * 87 (1975)) with the diagonal (ε_a − ε_i) as preconditioner.
 */
import { matmul, symmetricEigen } from "../linalg/dense.ts";
import type { JkBuilder } from "./jk.ts";

export interface StabilityResult {
  lowestEigenvalue: number;
  /** eigenvector over [α (i, a) pairs, β (i, a) pairs], unit length */
  vector: Float64Array;
  iterations: number;
  converged: boolean;
}

interface Spin {
  C: Float64Array;
  eps: ArrayLike<number>;
  nocc: number;
}

/** Lowest eigenvalue of the real UHF orbital Hessian (A + B). nbf × nmo coefficients. */
export function uhfStability(jk: JkBuilder, nbf: number, nmo: number, alpha: Spin, beta: Spin): StabilityResult {
  const spins = [alpha, beta];
  const sizes = spins.map((s) => s.nocc * (nmo - s.nocc));
  const dim = sizes[0] + sizes[1];
  if (dim === 0) return { lowestEigenvalue: Infinity, vector: new Float64Array(0), iterations: 0, converged: true };
  const diag = new Float64Array(dim);
  let p = 0;
  for (const s of spins) for (let i = 0; i < s.nocc; i++) for (let a = s.nocc; a < nmo; a++) diag[p++] = s.eps[a] - s.eps[i];

  const apply = (x: Float64Array): Float64Array => {
    const dens = spins.map((s, si) => {
      const D = new Float64Array(nbf * nbf);
      const nv = nmo - s.nocc;
      const base = si === 0 ? 0 : sizes[0];
      for (let i = 0; i < s.nocc; i++)
        for (let a = 0; a < nv; a++) {
          const v = x[base + i * nv + a];
          if (v === 0) continue;
          const ca = s.nocc + a;
          for (let mu = 0; mu < nbf; mu++) {
            const ci = s.C[mu * nmo + i] * v;
            const cA = s.C[mu * nmo + ca] * v;
            for (let nu = 0; nu < nbf; nu++) D[mu * nbf + nu] += ci * s.C[nu * nmo + ca] + cA * s.C[nu * nmo + i];
          }
        }
      return D;
    });
    const { J, K } = jk.build(dens);
    const out = new Float64Array(dim);
    spins.forEach((s, si) => {
      const nv = nmo - s.nocc;
      const base = si === 0 ? 0 : sizes[0];
      const G = J.map((j, k) => j - K[si][k]);
      // C_iᵀ G C_a
      const GC = matmul(G, s.C, nbf, nbf, nmo);
      for (let i = 0; i < s.nocc; i++)
        for (let a = 0; a < nv; a++) {
          let v = 0;
          for (let mu = 0; mu < nbf; mu++) v += s.C[mu * nmo + i] * GC[mu * nmo + s.nocc + a];
          out[base + i * nv + a] = v + diag[base + i * nv + a] * x[base + i * nv + a];
        }
    });
    return out;
  };

  // Davidson for the lowest root
  const V: Float64Array[] = [];
  const AV: Float64Array[] = [];
  const start = new Float64Array(dim);
  let kmin = 0;
  for (let k = 1; k < dim; k++) if (diag[k] < diag[kmin]) kmin = k;
  start[kmin] = 1;
  const maxIter = Math.min(dim, 60);
  let theta = Infinity;
  let vec = start;
  let converged = false;
  let it = 0;
  const addVector = (v: Float64Array) => {
    for (const u of V) {
      let d = 0;
      for (let k = 0; k < dim; k++) d += u[k] * v[k];
      for (let k = 0; k < dim; k++) v[k] -= d * u[k];
    }
    let nrm = 0;
    for (let k = 0; k < dim; k++) nrm += v[k] * v[k];
    nrm = Math.sqrt(nrm);
    if (nrm < 1e-10) return false;
    for (let k = 0; k < dim; k++) v[k] /= nrm;
    V.push(v);
    AV.push(apply(v));
    return true;
  };
  addVector(start);
  for (it = 1; it <= maxIter; it++) {
    const m = V.length;
    const small = new Float64Array(m * m);
    for (let i = 0; i < m; i++)
      for (let j = 0; j < m; j++) {
        let s = 0;
        for (let k = 0; k < dim; k++) s += V[i][k] * AV[j][k];
        small[i * m + j] = s;
      }
    const { values, vectors } = symmetricEigen(small, m);
    theta = values[0];
    vec = new Float64Array(dim);
    const res = new Float64Array(dim);
    for (let j = 0; j < m; j++) {
      const c = vectors[j * m];
      for (let k = 0; k < dim; k++) {
        vec[k] += c * V[j][k];
        res[k] += c * AV[j][k];
      }
    }
    let rn = 0;
    for (let k = 0; k < dim; k++) {
      res[k] -= theta * vec[k];
      rn += res[k] * res[k];
    }
    if (Math.sqrt(rn) < 1e-6) {
      converged = true;
      break;
    }
    if (V.length >= dim) break;
    const corr = res.map((r, k) => {
      const d = diag[k] - theta;
      return -r / (Math.abs(d) > 1e-4 ? d : 1e-4 * Math.sign(d || 1));
    });
    if (!addVector(corr)) {
      converged = true;
      break;
    }
  }
  return { lowestEigenvalue: theta, vector: vec, iterations: it, converged };
}

/**
 * Rotate occupied and virtual orbitals of each spin by exp(κ), κ_ai = −κ_ia = step · x_ia
 * (x the Hessian eigenvector), returning new nbf × nmo coefficient matrices.
 */
export function rotateAlong(C: Float64Array[], noccs: number[], nbf: number, nmo: number, x: Float64Array, step: number): Float64Array[] {
  let base = 0;
  return C.map((Cs, si) => {
    const nocc = noccs[si];
    const nv = nmo - nocc;
    const Kap = new Float64Array(nmo * nmo);
    for (let i = 0; i < nocc; i++)
      for (let a = 0; a < nv; a++) {
        const v = step * x[base + i * nv + a];
        Kap[(nocc + a) * nmo + i] = v;
        Kap[i * nmo + nocc + a] = -v;
      }
    base += nocc * nv;
    const U = expAntisymmetric(Kap, nmo);
    return matmul(Cs, U, nbf, nmo, nmo);
  });
}

/** exp(K) for antisymmetric K by scaling and squaring with a Taylor series (orthogonal result). */
function expAntisymmetric(K: Float64Array, n: number): Float64Array {
  let norm = 0;
  for (let k = 0; k < K.length; k++) norm = Math.max(norm, Math.abs(K[k]));
  let sq = 0;
  while (norm * n > 0.5 && sq < 30) {
    norm /= 2;
    sq++;
  }
  const A = K.map((v) => v / 2 ** sq);
  let E: Float64Array = new Float64Array(n * n);
  let term: Float64Array = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    E[i * n + i] = 1;
    term[i * n + i] = 1;
  }
  for (let k = 1; k <= 16; k++) {
    term = matmul(term, A, n, n, n).map((v) => v / k);
    for (let q = 0; q < E.length; q++) E[q] += term[q];
  }
  for (let s = 0; s < sq; s++) E = matmul(E, E, n, n, n);
  return E;
}

export interface StabilityRecord {
  checked: boolean;
  /** lowest eigenvalue of (A+B) at the final solution (hartree) */
  lowestEigenvalue: number | null;
  stable: boolean | null;
  /** how many times the SCF was restarted along an unstable mode */
  restarts: number;
  /** SCF energy of each solution visited, first to last */
  energies: number[];
}
