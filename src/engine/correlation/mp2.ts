/**
 * Second-order Møller–Plesset correlation energy (C. Møller, M. S. Plesset, Phys. Rev. 46, 618
 * (1934)), restricted from RHF and unrestricted from UHF, with Δ_ijab = ε_i + ε_j − ε_a − ε_b:
 *   RMP2:  E_os = Σ_ijab (ia|jb)² / Δ,   E_ss = Σ_ijab (ia|jb)[(ia|jb) − (ib|ja)] / Δ
 *   UMP2:  E_ss = Σ_σ ¼ Σ_{ijab∈σ} [(ia|jb) − (ib|ja)]² / Δ,   E_os = Σ_{ia∈α, jb∈β} (ia|jb)² / Δ
 *   E(MP2) = E_os + E_ss;  SCS-MP2 (S. Grimme, J. Chem. Phys. 118, 9095 (2003)):
 *   E(SCS) = 6/5 E_os + 1/3 E_ss.
 * Frozen core: the lowest `frozen` orbitals of each spin are left out of i, j.
 */
import type { ScfResult } from "../scf/scf.ts";
import { type OrbitalBlock, transformIajb, type TransformStats } from "./transform.ts";

export const SCS_OPPOSITE_SPIN = 6 / 5;
export const SCS_SAME_SPIN = 1 / 3;

export interface Mp2Options {
  /** number of lowest orbitals (per spin) not correlated */
  frozen: number;
  /** memory for the transformation batches; default 1 GiB */
  memoryBytes?: number;
  onBatch?: (done: number, total: number) => void;
  /** false: the JavaScript dot kernel instead of the SIMD one (linalg/simd.ts; tests) */
  simd?: boolean;
}

export interface Mp2Energies {
  reference: "rhf" | "uhf";
  frozen_core_orbitals: number;
  active_occupied: [number, number];
  virtual: [number, number];
  correlation: number;
  same_spin: number;
  opposite_spin: number;
  scs: { correlation: number; opposite_spin_scale: number; same_spin_scale: number };
  /** SCF + correlation */
  total: number;
  scs_total: number;
  transform: TransformStats[];
}

function columns(C: Float64Array, n: number, m: number, from: number, to: number): OrbitalBlock {
  const k = to - from;
  const out = new Float64Array(n * k);
  for (let mu = 0; mu < n; mu++) for (let c = 0; c < k; c++) out[mu * k + c] = C[mu * m + from + c];
  return { C: out, ncols: k };
}

export function mp2Energy(scf: ScfResult, options: Mp2Options): Mp2Energies {
  if (scf.reference === "rohf") throw new Error("MP2 from ROHF is not implemented");
  if (!scf.converged) throw new Error("MP2 needs a converged reference");
  const n = Math.round(Math.sqrt(scf.matrices.S.length));
  const m = scf.orthogonalization.nmo;
  const fc = options.frozen;
  const mem = options.memoryBytes ?? 1024 ** 3;
  const kernel = { simd: options.simd };
  const jk = scf.matrices.jk;
  const stats: TransformStats[] = [];
  let os = 0;
  let ss = 0;
  const nocc = [scf.nalpha, scf.nbeta];
  const eps = [scf.orbitals.alpha.energies, (scf.orbitals.beta ?? scf.orbitals.alpha).energies];
  const Cs = scf.matrices.C;
  const occ = (s: number) => columns(Cs[s], n, m, fc, nocc[s]);
  const vir = (s: number) => columns(Cs[s], n, m, nocc[s], m);

  if (scf.reference === "rhf") {
    const o = occ(0), v = vir(0);
    const e = eps[0];
    const no = o.ncols, nv = v.ncols;
    stats.push(transformIajb(jk, n, o, v, o, v, mem, (i0, count, T) => {
      for (let i = 0; i < count; i++) {
        const ei = e[fc + i0 + i];
        for (let a = 0; a < nv; a++) {
          const ea = e[nocc[0] + a];
          for (let j = 0; j < no; j++) {
            const eij = ei + e[fc + j] - ea;
            const row = ((i * nv + a) * no + j) * nv;
            for (let b = 0; b < nv; b++) {
              const t = T[row + b];
              const u = T[((i * nv + b) * no + j) * nv + a];
              const d = eij - e[nocc[0] + b];
              os += (t * t) / d;
              ss += (t * (t - u)) / d;
            }
          }
        }
      }
      options.onBatch?.(i0 + count, no);
    }, kernel));
  } else {
    // same spin, per spin: ¼ Σ (t − u)² / Δ
    for (let s = 0; s < 2; s++) {
      const o = occ(s), v = vir(s);
      const e = eps[s];
      const no = o.ncols, nv = v.ncols;
      if (no === 0 || nv === 0) continue;
      stats.push(transformIajb(jk, n, o, v, o, v, mem, (i0, count, T) => {
        for (let i = 0; i < count; i++) {
          const ei = e[fc + i0 + i];
          for (let a = 0; a < nv; a++)
            for (let j = 0; j < no; j++) {
              const eij = ei + e[fc + j] - e[nocc[s] + a];
              const row = ((i * nv + a) * no + j) * nv;
              for (let b = 0; b < nv; b++) {
                const t = T[row + b] - T[((i * nv + b) * no + j) * nv + a];
                ss += (0.25 * t * t) / (eij - e[nocc[s] + b]);
              }
            }
        }
      }, kernel));
    }
    // opposite spin: i, a of α with j, b of β
    const oa = occ(0), va = vir(0), ob = occ(1), vb = vir(1);
    const noa = oa.ncols, nva = va.ncols, nob = ob.ncols, nvb = vb.ncols;
    if (noa > 0 && nva > 0 && nob > 0 && nvb > 0)
      stats.push(transformIajb(jk, n, oa, va, ob, vb, mem, (i0, count, T) => {
        for (let i = 0; i < count; i++) {
          const ei = eps[0][fc + i0 + i];
          for (let a = 0; a < nva; a++)
            for (let j = 0; j < nob; j++) {
              const eij = ei + eps[1][fc + j] - eps[0][nocc[0] + a];
              const row = ((i * nva + a) * nob + j) * nvb;
              for (let b = 0; b < nvb; b++) {
                const t = T[row + b];
                os += (t * t) / (eij - eps[1][nocc[1] + b]);
              }
            }
        }
        options.onBatch?.(i0 + count, noa);
      }, kernel));
  }
  return { ...mp2Summary(scf, fc, os, ss), transform: stats };
}

/** The reported MP2 numbers from the same-spin and opposite-spin sums (exact or fitted). */
export function mp2Summary(scf: ScfResult, fc: number, os: number, ss: number): Omit<Mp2Energies, "transform"> {
  const m = scf.orthogonalization.nmo;
  const corr = os + ss;
  const scs = SCS_OPPOSITE_SPIN * os + SCS_SAME_SPIN * ss;
  return {
    reference: scf.reference as "rhf" | "uhf",
    frozen_core_orbitals: fc,
    active_occupied: [scf.nalpha - fc, scf.nbeta - fc],
    virtual: [m - scf.nalpha, m - scf.nbeta],
    correlation: corr,
    same_spin: ss,
    opposite_spin: os,
    scs: { correlation: scs, opposite_spin_scale: SCS_OPPOSITE_SPIN, same_spin_scale: SCS_SAME_SPIN },
    total: scf.energy + corr,
    scs_total: scf.energy + scs,
  };
}
