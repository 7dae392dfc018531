/**
 * Density-fitted (resolution-of-the-identity) MP2: the (ia|jb) integrals are approximated with
 * an auxiliary fitting basis {P} in the Coulomb metric (M. Feyereisen, G. Fitzgerald,
 * A. Komornicki, Chem. Phys. Lett. 208, 359 (1993); F. Weigend, M. Häser, Theor. Chem. Acc.
 * 97, 331 (1997)):
 *   (ia|jb) ≈ Σ_Q B^Q_ia B^Q_jb,   B = L⁻¹ (P|ia),   (P|Q) = L Lᵀ (Cholesky)
 * then the same energy expressions as mp2.ts. Three-centre (μν|P) and two-centre (P|Q)
 * integrals come from the ordinary ERI engine with a unit s function (exponent 0) as the
 * fourth shell.
 */
import { matmulABt } from "../linalg/dense.ts";
import { EriEngine } from "../integrals/eri.ts";
import type { ShellPair } from "../integrals/shell-pairs.ts";
import type { PreparedBasis, PreparedShell } from "../integrals/shells.ts";
import type { ScfResult } from "../scf/scf.ts";
import { type Mp2Energies, mp2Summary } from "./mp2.ts";

export interface RiMp2Options {
  frozen: number;
  /** the prepared fitting basis (same atoms as the orbital basis) */
  fitting: PreparedBasis;
}

export interface RiMp2Energies extends Omit<Mp2Energies, "transform"> {
  fitting_functions: number;
  /** bytes of the largest arrays held (3-index integrals and fitted factors) */
  peak_bytes: number;
}

/** Three-centre integrals with a Schwarz bound below this are left out (as in the SCF). */
const SCREEN = 1e-12;

function unitShell(offset: number): PreparedShell {
  return {
    l: 0, pure: false, atom: -1, x: 0, y: 0, z: 0, nprim: 1, exps: Float64Array.of(0), ncontr: 1,
    coef: Float64Array.of(1), ncomp: 1, nfunc: 1, offset, lmin: 0,
    rowL: Int32Array.of(0), rowOff: Int32Array.of(0), rowPure: Uint8Array.of(0),
  };
}

/** Lower Cholesky factor of a symmetric positive-definite matrix (row-major), in place copy. */
function cholesky(A: Float64Array, n: number): Float64Array {
  const L = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      let s = A[i * n + j];
      for (let k = 0; k < j; k++) s -= L[i * n + k] * L[j * n + k];
      if (i === j) {
        if (!(s > 0)) throw new Error(`the fitting metric is not positive definite (pivot ${s} at ${i})`);
        L[i * n + i] = Math.sqrt(s);
      } else L[i * n + j] = s / L[j * n + j];
    }
  return L;
}

/** One spin's orbitals as the transformation reads them: Cᵀ over active occupied, C over virtual. */
interface SpinBlock {
  no: number;
  nv: number;
  /** Cot[i · n + μ] = C_μ,i0+i */
  Cot: Float64Array;
  /** Cvt[a · n + μ] = C_μ,a0+a */
  Cvt: Float64Array;
  /** I[P · no·nv + i · nv + a] = (ia|P), then the fitted B (before the transpose) */
  I: Float64Array;
}

function spinBlock(C: Float64Array, n: number, m: number, i0: number, i1: number, a0: number, naux: number): SpinBlock {
  const no = i1 - i0, nv = m - a0;
  const Cot = new Float64Array(no * n);
  const Cvt = new Float64Array(nv * n);
  for (let mu = 0; mu < n; mu++) {
    for (let i = 0; i < no; i++) Cot[i * n + mu] = C[mu * m + i0 + i];
    for (let a = 0; a < nv; a++) Cvt[a * n + mu] = C[mu * m + a0 + a];
  }
  return { no, nv, Cot, Cvt, I: new Float64Array(naux * no * nv) };
}

/** Scratch of the per-fitting-function transformation, allocated once. */
interface TransformScratch {
  M: Float64Array<ArrayBuffer>;
  Z: Float64Array<ArrayBuffer>;
  R: Float64Array<ArrayBuffer>;
}

/**
 * (ia|P) = Σ_μν C_μi (μν|P) C_νa for one fitting function P, from its packed (μν|P) (μ ≥ ν,
 * packed[μ(μ+1)/2 + ν]), into every spin's I. Both products are row-by-row dot products
 * (matmulABt; M is symmetric, so Cᵀ_occ M = Cᵀ_occ Mᵀ), the faster of the two kernels.
 */
function transformFunction(packed: Float64Array, pOff: number, P: number, n: number, spins: SpinBlock[], w: TransformScratch): void {
  const M = w.M;
  for (let l = 0, p = pOff; l < n; l++)
    for (let s = 0; s <= l; s++, p++) {
      const v = packed[p];
      M[l * n + s] = v;
      M[s * n + l] = v;
    }
  for (const sb of spins) {
    matmulABt(sb.Cot, 0, M, 0, sb.no, n, n, w.Z);
    matmulABt(w.Z, 0, sb.Cvt, 0, sb.no, n, sb.nv, w.R);
    sb.I.set(w.R.subarray(0, sb.no * sb.nv), P * sb.no * sb.nv);
  }
}

/**
 * In place B = L⁻¹ I by forward substitution over the fitting index, then the transpose to
 * B[i][a][Q] (occupied-major), which the pair energies read.
 */
function fitAndTranspose(I: Float64Array, L: Float64Array, naux: number, ov: number): Float64Array {
  for (let P = 0; P < naux; P++) {
    const row = P * ov;
    // four earlier rows per pass: one load and store of row P serves four multiply-adds
    let Q = 0;
    for (; Q + 4 <= P; Q += 4) {
      const l0 = L[P * naux + Q], l1 = L[P * naux + Q + 1], l2 = L[P * naux + Q + 2], l3 = L[P * naux + Q + 3];
      const q0 = Q * ov, q1 = q0 + ov, q2 = q1 + ov, q3 = q2 + ov;
      for (let k = 0; k < ov; k++) I[row + k] -= l0 * I[q0 + k] + l1 * I[q1 + k] + l2 * I[q2 + k] + l3 * I[q3 + k];
    }
    for (; Q < P; Q++) {
      const l = L[P * naux + Q];
      const rq = Q * ov;
      for (let k = 0; k < ov; k++) I[row + k] -= l * I[rq + k];
    }
    const d = 1 / L[P * naux + P];
    for (let k = 0; k < ov; k++) I[row + k] *= d;
  }
  const B = new Float64Array(ov * naux);
  for (let Q = 0; Q < naux; Q++) for (let k = 0; k < ov; k++) B[k * naux + Q] = I[Q * ov + k];
  return B;
}

/**
 * One fitting shell's (μν|P) over the surviving orbital pairs, packed per fitting function:
 * buf[f · npair + μ(μ+1)/2 + ν] for its functions f (zero where screened out).
 */
function threeCentreShell(
  engine: EriEngine, orb: ShellPair[], orbBound: Float64Array, Q: ShellPair, qBound: number, npair: number, buf: Float64Array,
): void {
  const nf = Q.a.nfunc;
  buf.fill(0, 0, nf * npair);
  for (let x = 0; x < orb.length; x++) {
    if (orbBound[x] * qBound < SCREEN) continue;
    const PP = orb[x];
    const blk = engine.compute(PP, Q);
    const A = PP.a, B = PP.b;
    const na = A.nfunc, nb = B.nfunc;
    for (let a = 0, t = 0; a < na; a++) {
      const mu = A.offset + a;
      for (let b = 0; b < nb; b++) {
        const nu = B.offset + b;
        const pk = mu >= nu ? (mu * (mu + 1)) / 2 + nu : (nu * (nu + 1)) / 2 + mu;
        for (let f = 0; f < nf; f++, t++) buf[f * npair + pk] = blk[t];
      }
    }
  }
}

export function riMp2Energy(scf: ScfResult, options: RiMp2Options): RiMp2Energies {
  if (scf.reference === "rohf") throw new Error("MP2 from ROHF is not implemented");
  if (!scf.converged) throw new Error("MP2 needs a converged reference");
  const orbital = scf.matrices.jk.engine.basis;
  const n = orbital.nbf;
  const m = scf.orthogonalization.nmo;
  const aux = options.fitting;
  const naux = aux.nbf;
  const fc = options.frozen;
  // one engine over orbital shells, the unit function, then the fitting shells; the unit
  // function between them keeps the engine from merging an orbital shell with a fitting shell
  const A0 = n + 1; // first fitting function
  const shells: PreparedShell[] = [
    ...orbital.shells,
    unitShell(n),
    ...aux.shells.map((s) => ({ ...s, offset: s.offset + A0 })),
  ];
  const engine = new EriEngine({ shells, nbf: n + naux + 1, maxL: Math.max(orbital.maxL, aux.maxL) }, { lazyPairs: true });
  const es = engine.shells;
  const unit = es.findIndex((s) => s.offset === n && s.atom === -1);
  const orbIdx: number[] = [], auxIdx: number[] = [];
  es.forEach((s, k) => {
    if (k !== unit) (s.offset < n ? orbIdx : auxIdx).push(k);
  });
  const npair = (n * (n + 1)) / 2;
  // Cauchy–Schwarz bounds: √(μν|μν) per orbital pair, √(P|P) per fitting shell
  const bound = (P: ShellPair) => {
    const blk = engine.compute(P, P);
    const nf = P.a.nfunc * P.b.nfunc;
    let mx = 0;
    for (let i = 0; i < nf; i++) mx = Math.max(mx, Math.abs(blk[i * nf + i]));
    return Math.sqrt(mx);
  };
  const auxPairs = auxIdx.map((k) => engine.pair(k, unit));
  const auxBound = auxPairs.map(bound);
  const auxMax = Math.max(...auxBound);
  // the orbital pairs any fitting shell can reach, with their bounds
  const orb: ShellPair[] = [];
  const orbB: number[] = [];
  for (let x = 0; x < orbIdx.length; x++)
    for (let y = 0; y <= x; y++) {
      const PP = engine.pair(orbIdx[x], orbIdx[y]);
      const pb = bound(PP);
      if (pb * auxMax < SCREEN) continue;
      orb.push(PP);
      orbB.push(pb);
    }
  const orbBound = Float64Array.from(orbB);
  const nocc = [scf.nalpha, scf.nbeta];
  const eps = [scf.orbitals.alpha.energies, (scf.orbitals.beta ?? scf.orbitals.alpha).energies];
  const spins = scf.reference === "rhf" ? 1 : 2;
  const sbs: SpinBlock[] = [];
  for (let s = 0; s < spins; s++) sbs.push(spinBlock(scf.matrices.C[s], n, m, fc, nocc[s], nocc[s], naux));
  // (μν|P) one fitting shell at a time, transformed at once: the three-index AO integrals are
  // never held whole, and the batch buffer stays in cache
  const maxNf = Math.max(...auxPairs.map((Q) => Q.a.nfunc));
  const buf = new Float64Array(maxNf * npair);
  const maxNo = Math.max(...sbs.map((sb) => sb.no)), maxNv = Math.max(...sbs.map((sb) => sb.nv));
  const scratch: TransformScratch = { M: new Float64Array(n * n), Z: new Float64Array(maxNo * n), R: new Float64Array(maxNo * maxNv) };
  for (let kk = 0; kk < auxPairs.length; kk++) {
    const Q = auxPairs[kk];
    threeCentreShell(engine, orb, orbBound, Q, auxBound[kk], npair, buf);
    for (let f = 0; f < Q.a.nfunc; f++) transformFunction(buf, f * npair, Q.a.offset - A0 + f, n, sbs, scratch);
  }
  // metric (P|Q)
  const V = new Float64Array(naux * naux);
  for (let x = 0; x < auxIdx.length; x++)
    for (let y = 0; y <= x; y++) {
      const P = auxPairs[x];
      const Q = auxPairs[y];
      const blk = engine.compute(P, Q);
      for (let a = 0; a < P.a.nfunc; a++)
        for (let c = 0; c < Q.a.nfunc; c++) {
          const i = P.a.offset - A0 + a, j = Q.a.offset - A0 + c;
          V[i * naux + j] = blk[a * Q.a.nfunc + c];
          V[j * naux + i] = blk[a * Q.a.nfunc + c];
        }
    }
  const L = cholesky(V, naux);
  let peak = 8 * (buf.length + V.length + L.length);
  for (const sb of sbs) peak += 8 * (sb.I.length + sb.Cot.length + sb.Cvt.length);
  const Bs = sbs.map((sb) => fitAndTranspose(sb.I, L, naux, sb.no * sb.nv));
  for (const B of Bs) peak += 8 * B.length;

  // pair energies from (ia|jb) = Σ_Q B_ia^Q B_jb^Q, one v × v block per (i, j)
  const maxv = Math.max(m - nocc[0], m - nocc[1]);
  const Tbuf = new Float64Array(maxv * maxv);
  // T[a][b] = (ia|jb) = Σ_Q B[i][a][Q] B[j][b][Q]
  const pairBlock = (Bi: Float64Array, i: number, Bj: Float64Array, j: number, nvi: number, nvj: number) =>
    matmulABt(Bi, i * nvi * naux, Bj, j * nvj * naux, nvi, naux, nvj, Tbuf);
  let os = 0, ss = 0;
  if (spins === 1) {
    const B = Bs[0], e = eps[0];
    const no = nocc[0] - fc, nv = m - nocc[0];
    for (let i = 0; i < no; i++)
      for (let j = 0; j <= i; j++) {
        const T = pairBlock(B, i, B, j, nv, nv);
        const f = i === j ? 1 : 2;
        const eij = e[fc + i] + e[fc + j];
        for (let a = 0; a < nv; a++)
          for (let b = 0; b < nv; b++) {
            const t = T[a * nv + b], u = T[b * nv + a];
            const d = eij - e[nocc[0] + a] - e[nocc[0] + b];
            os += (f * t * t) / d;
            ss += (f * t * (t - u)) / d;
          }
      }
  } else {
    for (let s = 0; s < 2; s++) {
      const B = Bs[s], e = eps[s];
      const no = nocc[s] - fc, nv = m - nocc[s];
      for (let i = 0; i < no; i++)
        for (let j = 0; j < i; j++) {
          const T = pairBlock(B, i, B, j, nv, nv);
          const eij = e[fc + i] + e[fc + j];
          // ¼ Σ_ijab over all i, j = ½ Σ_{i>j} Σ_ab
          for (let a = 0; a < nv; a++)
            for (let b = 0; b < nv; b++) {
              const t = T[a * nv + b] - T[b * nv + a];
              ss += (0.5 * t * t) / (eij - e[nocc[s] + a] - e[nocc[s] + b]);
            }
        }
    }
    const noa = nocc[0] - fc, nob = nocc[1] - fc, nva = m - nocc[0], nvb = m - nocc[1];
    for (let i = 0; i < noa; i++)
      for (let j = 0; j < nob; j++) {
        const T = pairBlock(Bs[0], i, Bs[1], j, nva, nvb);
        const eij = eps[0][fc + i] + eps[1][fc + j];
        for (let a = 0; a < nva; a++)
          for (let b = 0; b < nvb; b++) {
            const t = T[a * nvb + b];
            os += (t * t) / (eij - eps[0][nocc[0] + a] - eps[1][nocc[1] + b]);
          }
      }
  }
  return { ...mp2Summary(scf, fc, os, ss), fitting_functions: naux, peak_bytes: peak };
}
