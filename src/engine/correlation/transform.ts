/**
 * Four-index transformation to the (ia|jb) integrals MP2 needs, in batches of occupied
 * orbitals i so memory stays bounded:
 *   1. X_i(ν, λσ)   = Σ_μ C_μi (μν|λσ)      over the unique AO integrals, λ ≥ σ packed
 *   2. H_i(ν, j, σ) = Σ_λ C_λj X_i(ν, λσ)   (the ket's occupied index: the smallest next)
 *   3. (ia|jb)      = Σ_νσ C_νa H_i(ν, j, σ) C_σb   per (i, j)
 * Ordering the quarters by dimension (o before v) makes steps 2–3 cost o²n³ + o²n²v + o²nv²
 * instead of o·v·n³/2 for transforming the bra's virtual index second.
 * The AO integrals come from the SCF's in-core store or are recomputed per batch (direct).
 */
import { matmul } from "../linalg/dense.ts";
import type { JkBuilder } from "../scf/jk.ts";

export interface OrbitalBlock {
  /** nbf × ncols coefficients, row-major */
  C: Float64Array;
  ncols: number;
}

export interface TransformStats {
  batches: number;
  batchSize: number;
  /** bytes of the largest batch buffers held at once */
  peakBytes: number;
}

/**
 * Calls visit(i0, count, T) per batch, T[((i − i0)·nv + a)·no2·nv2 + j·nv2 + b] = (ia|jb)
 * with i, a from (occ1, virt1) and j, b from (occ2, virt2).
 */
export function transformIajb(
  jk: JkBuilder, nbf: number, occ1: OrbitalBlock, virt1: OrbitalBlock, occ2: OrbitalBlock, virt2: OrbitalBlock,
  memoryBytes: number, visit: (i0: number, count: number, T: Float64Array) => void,
): TransformStats {
  const n = nbf;
  const npair = (n * (n + 1)) / 2;
  const no = occ1.ncols, nv = virt1.ncols, no2 = occ2.ncols, nv2 = virt2.ncols;
  // per occupied orbital: X (n·npair) + H (n·no2·n) + T (nv·no2·nv2)
  const perOcc = 8 * (n * npair + n * no2 * n + nv * no2 * nv2);
  const batch = Math.max(1, Math.min(no, Math.floor(memoryBytes / perOcc)));
  let peak = 0;
  const Cv1t = new Float64Array(nv * n); // virt1ᵀ
  for (let mu = 0; mu < n; mu++) for (let a = 0; a < nv; a++) Cv1t[a * n + mu] = virt1.C[mu * nv + a];
  const C2ot = new Float64Array(no2 * n);
  for (let mu = 0; mu < n; mu++) for (let j = 0; j < no2; j++) C2ot[j * n + mu] = occ2.C[mu * no2 + j];
  let batches = 0;
  const W = new Float64Array(n * n);
  const Z = new Float64Array(no2 * n);
  const M = new Float64Array(n * n);
  const Av = new Float64Array(nv * n);
  const Tij = new Float64Array(nv * nv2);
  for (let i0 = 0; i0 < no; i0 += batch) {
    const nb = Math.min(batch, no - i0);
    batches++;
    // X[(ν·npair + λσ)·nb + i]: the batch index innermost, so every update is contiguous
    const X = new Float64Array(n * npair * nb);
    const Ci = new Float64Array(n * nb);
    for (let mu = 0; mu < n; mu++) for (let i = 0; i < nb; i++) Ci[mu * nb + i] = occ1.C[mu * no + i0 + i];
    jk.forEachBlock((P, Q, blk, off) => firstQuarter(P, Q, blk, off, n, nb, Ci, X));
    // H[i][ν][j][σ] = Σ_λ C_λj (iν|λσ): the ket's occupied index next (the smallest dimension)
    const H = new Float64Array(nb * n * no2 * n);
    for (let i = 0; i < nb; i++)
      for (let nu = 0; nu < n; nu++) {
        const x = nu * npair * nb + i;
        for (let l = 0, p = 0; l < n; l++)
          for (let s2 = 0; s2 <= l; s2++, p++) {
            const v = X[x + p * nb];
            W[l * n + s2] = v;
            W[s2 * n + l] = v;
          }
        matmul(C2ot, W, no2, n, n, Z);
        H.set(Z, (i * n + nu) * no2 * n);
      }
    // (ia|jb) = Σ_νσ C_νa H[i][ν][j][σ] C_σb, one (i, j) at a time
    const T = new Float64Array(nb * nv * no2 * nv2);
    for (let i = 0; i < nb; i++)
      for (let j = 0; j < no2; j++) {
        for (let nu = 0; nu < n; nu++) {
          const h = ((i * n + nu) * no2 + j) * n;
          for (let sg = 0; sg < n; sg++) M[nu * n + sg] = H[h + sg];
        }
        matmul(Cv1t, M, nv, n, n, Av);
        matmul(Av, virt2.C, nv, n, nv2, Tij);
        for (let a = 0; a < nv; a++) {
          const t = ((i * nv + a) * no2 + j) * nv2;
          for (let b = 0; b < nv2; b++) T[t + b] = Tij[a * nv2 + b];
        }
      }
    peak = Math.max(peak, 8 * (X.length + H.length + T.length + Ci.length));
    visit(i0, nb, T);
  }
  return { batches, batchSize: batch, peakBytes: peak };
}

/**
 * X[i][ν][λσ] += C_μi (μν|λσ) for one AO block. Only canonical elements of the block are used
 * (a ≥ b when A = B, c ≥ d when C = D, ab ≥ cd when the pairs coincide), each standing for a
 * distinct integral (pq|rs); its permutations give X[q][rs] += C_p v, X[p][rs] += C_q v and,
 * across bra and ket, X[s][pq] += C_r v, X[r][pq] += C_s v.
 */
function firstQuarter(
  P: { a: { offset: number; nfunc: number }; b: { offset: number; nfunc: number }; ia: number; ib: number },
  Q: { a: { offset: number; nfunc: number }; b: { offset: number; nfunc: number }; ia: number; ib: number },
  blk: Float64Array, off: number, n: number, nb: number, Ci: Float64Array, X: Float64Array,
): void {
  const npair = (n * (n + 1)) / 2;
  const A = P.a, B = P.b, C = Q.a, D = Q.b;
  const sameAB = P.ia === P.ib, sameCD = Q.ia === Q.ib, samePQ = P === Q;
  const pk = (x: number, y: number) => (x >= y ? (x * (x + 1)) / 2 + y : (y * (y + 1)) / 2 + x);
  let k = off;
  if (!sameAB && !sameCD && !samePQ) {
    // distinct shells (almost every block): all four permutations, one fused loop
    for (let a = 0; a < A.nfunc; a++) {
      const p = A.offset + a;
      for (let b = 0; b < B.nfunc; b++) {
        const q = B.offset + b;
        const pq = pk(p, q);
        const cp = p * nb, cq = q * nb;
        const xq = q * npair, xp = p * npair;
        for (let c = 0; c < C.nfunc; c++) {
          const r = C.offset + c;
          const cr = r * nb;
          const xr = (r * npair + pq) * nb;
          for (let d = 0; d < D.nfunc; d++, k++) {
            const v = blk[k];
            if (v === 0) continue;
            const s = D.offset + d;
            const rs = pk(r, s);
            const x1 = (xq + rs) * nb, x2 = (xp + rs) * nb, x3 = (s * npair + pq) * nb, cs = s * nb;
            for (let i = 0; i < nb; i++) {
              X[x1 + i] += Ci[cp + i] * v;
              X[x2 + i] += Ci[cq + i] * v;
              X[x3 + i] += Ci[cr + i] * v;
              X[xr + i] += Ci[cs + i] * v;
            }
          }
        }
      }
    }
    return;
  }
  for (let a = 0; a < A.nfunc; a++) {
    const p = A.offset + a;
    for (let b = 0; b < B.nfunc; b++) {
      const q = B.offset + b;
      const pq = pk(p, q);
      for (let c = 0; c < C.nfunc; c++) {
        const r = C.offset + c;
        for (let d = 0; d < D.nfunc; d++, k++) {
          const s = D.offset + d;
          if (sameAB && q > p) continue;
          if (sameCD && s > r) continue;
          const rs = pk(r, s);
          if (samePQ && rs > pq) continue;
          const v = blk[k];
          if (v === 0) continue;
          const x1 = (q * npair + rs) * nb, c1 = p * nb;
          for (let i = 0; i < nb; i++) X[x1 + i] += Ci[c1 + i] * v;
          if (p !== q) {
            const x2 = (p * npair + rs) * nb, c2 = q * nb;
            for (let i = 0; i < nb; i++) X[x2 + i] += Ci[c2 + i] * v;
          }
          if (pq !== rs) {
            const x3 = (s * npair + pq) * nb, c3 = r * nb;
            for (let i = 0; i < nb; i++) X[x3 + i] += Ci[c3 + i] * v;
            if (r !== s) {
              const x4 = (r * npair + pq) * nb, c4 = s * nb;
              for (let i = 0; i < nb; i++) X[x4 + i] += Ci[c4 + i] * v;
            }
          }
        }
      }
    }
  }
}
