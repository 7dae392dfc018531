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
import { dotWorkspace, type DotWorkspace } from "../linalg/simd.ts";
import { regions } from "../linalg/wasm.ts";
import { EriEngine } from "../integrals/eri.ts";
import { schwarzFactor } from "../integrals/screening.ts";
import type { ShellPair } from "../integrals/shell-pairs.ts";
import type { PreparedBasis, PreparedShell } from "../integrals/shells.ts";
import type { ScfResult } from "../scf/scf.ts";
import { type Mp2Energies, mp2Summary } from "./mp2.ts";

export interface RiMp2Options {
  frozen: number;
  /** the prepared fitting basis (same atoms as the orbital basis) */
  fitting: PreparedBasis;
  /** false: the JavaScript dot kernel instead of the SIMD one (linalg/simd.ts; tests) */
  simd?: boolean;
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

/**
 * One spin's orbitals as the transformation reads them, at offsets (in doubles) of the dot
 * workspace: Cᵀ over the active occupied, Cᵀ over the virtual orbitals.
 */
interface SpinBlock {
  no: number;
  nv: number;
  /** ws[cot + i · n + μ] = C_μ,i0+i */
  cot: number;
  /** ws[cvt + a · n + μ] = C_μ,a0+a */
  cvt: number;
  /** (ia|Q), then in place the fitted factors B[i][a][Q]: ws[b + (i · nv + a) · naux + Q] */
  b: number;
}

/**
 * The workspace layout: per spin its C blocks and factors, then one pair block T, the metric's
 * Cholesky factor L, one fitting shell's (μν|P) as full n × n matrices (sq), the
 * transformation's Z (occupied × n) and R (occupied × virtual), and the fitting's panel.
 */
interface Layout {
  spins: SpinBlock[];
  t: number;
  l: number;
  sq: number;
  z: number;
  r: number;
  panel: number;
  doubles: number;
}

/** Columns of the fitting per panel (fit): wide enough for the kernel, narrow for the solve. */
const PANEL = 32;

function layout(n: number, m: number, naux: number, fc: number, nocc: number[], maxNf: number): Layout {
  const mem = regions();
  const take = mem.take;
  const spins = nocc.map((no1) => {
    const no = no1 - fc, nv = m - no1;
    return { no, nv, cot: take(no * n), cvt: take(nv * n), b: take(no * nv * naux) };
  });
  const maxNo = Math.max(...spins.map((x) => x.no)), maxNv = Math.max(...spins.map((x) => x.nv));
  return {
    spins, t: take(maxNv * maxNv), l: take(naux * naux), sq: take(maxNf * n * n), z: take(maxNo * n), r: take(maxNo * maxNv),
    panel: take(maxNo * maxNv * PANEL), doubles: mem.size,
  };
}

function fillOrbitals(ws: DotWorkspace, sb: SpinBlock, C: Float64Array, n: number, m: number, i0: number, a0: number): void {
  const f = ws.f64;
  for (let mu = 0; mu < n; mu++) {
    for (let i = 0; i < sb.no; i++) f[sb.cot + i * n + mu] = C[mu * m + i0 + i];
    for (let a = 0; a < sb.nv; a++) f[sb.cvt + a * n + mu] = C[mu * m + a0 + a];
  }
}

/**
 * (ia|P) = Σ_μν C_μi (μν|P) C_νa for one fitting function P from its full (μν|P) matrix at
 * ws[mat …], into column P of every spin's factors. Both products are row-by-row dot products
 * (the matrix is symmetric, so Cᵀ_occ M = Cᵀ_occ Mᵀ), which the SIMD kernel does.
 */
function transformFunction(mat: number, P: number, n: number, naux: number, ws: DotWorkspace, lay: Layout): void {
  const f = ws.f64, r = lay.r;
  for (const sb of lay.spins) {
    ws.abt(sb.cot, mat, sb.no, n, n, lay.z);
    ws.abt(lay.z, sb.cvt, sb.no, n, sb.nv, r);
    const ov = sb.no * sb.nv;
    for (let k = 0, at = sb.b + P; k < ov; k++, at += naux) f[at] = f[r + k];
  }
}

/**
 * In place, row by row of the factors X (ov rows of naux): X ← X L⁻ᵀ, i.e. L x = (ia|·) for
 * each ia, by forward substitution in panels of PANEL columns: what earlier panels contribute
 * is one kernel product per panel, and only the small triangle inside a panel is solved here.
 */
function fit(ws: DotWorkspace, lay: Layout, x: number, ov: number, naux: number): void {
  const f = ws.f64, L = lay.l, pan = lay.panel;
  for (let p0 = 0; p0 < naux; p0 += PANEL) {
    const w = Math.min(PANEL, naux - p0);
    if (p0 > 0) {
      // panel[k][q] = Σ_{P<p0} X[k][P] L[p0+q][P]
      ws.abt(x, L + p0 * naux, ov, p0, w, pan, naux, naux, w);
      for (let k = 0; k < ov; k++) {
        const row = x + k * naux + p0, pr = pan + k * w;
        for (let q = 0; q < w; q++) f[row + q] -= f[pr + q];
      }
    }
    for (let k = 0; k < ov; k++) {
      const row = x + k * naux;
      for (let P = p0; P < p0 + w; P++) {
        let v = f[row + P];
        const lr = L + P * naux;
        for (let Q = p0; Q < P; Q++) v -= f[lr + Q] * f[row + Q];
        f[row + P] = v / f[lr + P];
      }
    }
  }
}

/**
 * One fitting shell's (μν|P) over the surviving orbital pairs as full symmetric n × n matrices,
 * one per fitting function f: ws[sq + f · n² + μ · n + ν] (zero where screened out).
 */
function threeCentreShell(
  engine: EriEngine, orb: ShellPair[], orbBound: Float64Array, Q: ShellPair, qBound: number, n: number, ws: DotWorkspace, sq: number,
): void {
  const nf = Q.a.nfunc, nn = n * n;
  const W = ws.f64;
  W.fill(0, sq, sq + nf * nn);
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
        const u = sq + mu * n + nu, v = sq + nu * n + mu;
        for (let f = 0; f < nf; f++, t++) {
          W[u + f * nn] = blk[t];
          W[v + f * nn] = blk[t];
        }
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
  // Cauchy–Schwarz bounds: √(μν|μν) per orbital pair, √(P|P) per fitting shell
  const bound = (P: ShellPair) => schwarzFactor(engine, P);
  const auxPairs = auxIdx.map((k) => engine.pair(k, unit));
  const auxBound = auxPairs.map(bound);
  const auxMax = Math.max(...auxBound);
  // the orbital pairs any fitting shell can reach, with their bounds: the SCF's own when its
  // engine has the same shells (it computed them exactly), else computed here
  const scfEngine = scf.matrices.jk.engine;
  const same = scfEngine.shells.length === orbIdx.length && orbIdx.every((k, i) => {
    const a = es[k], b = scfEngine.shells[i];
    return a.offset === b.offset && a.nfunc === b.nfunc && a.l === b.l && a.atom === b.atom;
  });
  const orb: { P: ShellPair; b: number }[] = [];
  for (let x = 0; x < orbIdx.length; x++)
    for (let y = 0; y <= x; y++) {
      const PP = engine.pair(orbIdx[x], orbIdx[y]);
      const known = same ? scfEngine.pairs[scfEngine.pairIndex(x, y)]?.schwarz : undefined;
      const pb = known !== undefined && Number.isFinite(known) ? known : bound(PP);
      if (pb * auxMax < SCREEN) continue;
      orb.push({ P: PP, b: pb });
    }
  // pairs of one type together, so that consecutive quartets share their integral class
  orb.sort((u, v) => u.P.lkey - v.P.lkey || u.P.nprim - v.P.nprim);
  const orbPairs = orb.map((o) => o.P);
  const orbBound = Float64Array.from(orb, (o) => o.b);
  const nocc = [scf.nalpha, scf.nbeta];
  const eps = [scf.orbitals.alpha.energies, (scf.orbitals.beta ?? scf.orbitals.alpha).energies];
  const spins = scf.reference === "rhf" ? 1 : 2;
  const maxNf = Math.max(...auxPairs.map((Q) => Q.a.nfunc));
  const lay = layout(n, m, naux, fc, nocc.slice(0, spins), maxNf);
  const ws = dotWorkspace(lay.doubles, { simd: options.simd });
  lay.spins.forEach((sb, s) => fillOrbitals(ws, sb, scf.matrices.C[s], n, m, fc, nocc[s]));
  // (μν|P) one fitting shell at a time, transformed at once: the three-index AO integrals are
  // never held whole
  for (let kk = 0; kk < auxPairs.length; kk++) {
    const Q = auxPairs[kk];
    threeCentreShell(engine, orbPairs, orbBound, Q, auxBound[kk], n, ws, lay.sq);
    for (let f = 0; f < Q.a.nfunc; f++) transformFunction(lay.sq + f * n * n, Q.a.offset - A0 + f, n, naux, ws, lay);
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
  ws.f64.set(cholesky(V, naux), lay.l);
  const peak = 8 * (2 * V.length + lay.doubles);
  for (const sb of lay.spins) fit(ws, lay, sb.b, sb.no * sb.nv, naux);

  // pair energies from (ia|jb) = Σ_Q B_ia^Q B_jb^Q, one v × v block per (i, j):
  // T[a][b] = ws[t + a · nvj + b] = Σ_Q B[i][a][Q] B[j][b][Q]
  const W = ws.f64, t0 = lay.t;
  const pairBlock = (si: number, i: number, sj: number, j: number) => {
    const x = lay.spins[si], y = lay.spins[sj];
    ws.abt(x.b + i * x.nv * naux, y.b + j * y.nv * naux, x.nv, naux, y.nv, t0);
  };
  let os = 0, ss = 0;
  if (spins === 1) {
    const e = eps[0];
    const no = nocc[0] - fc, nv = m - nocc[0];
    for (let i = 0; i < no; i++)
      for (let j = 0; j <= i; j++) {
        pairBlock(0, i, 0, j);
        const f = i === j ? 1 : 2;
        const eij = e[fc + i] + e[fc + j];
        for (let a = 0; a < nv; a++)
          for (let b = 0; b < nv; b++) {
            const t = W[t0 + a * nv + b], u = W[t0 + b * nv + a];
            const d = eij - e[nocc[0] + a] - e[nocc[0] + b];
            os += (f * t * t) / d;
            ss += (f * t * (t - u)) / d;
          }
      }
  } else {
    for (let s = 0; s < 2; s++) {
      const e = eps[s];
      const no = nocc[s] - fc, nv = m - nocc[s];
      for (let i = 0; i < no; i++)
        for (let j = 0; j < i; j++) {
          pairBlock(s, i, s, j);
          const eij = e[fc + i] + e[fc + j];
          // ¼ Σ_ijab over all i, j = ½ Σ_{i>j} Σ_ab
          for (let a = 0; a < nv; a++)
            for (let b = 0; b < nv; b++) {
              const t = W[t0 + a * nv + b] - W[t0 + b * nv + a];
              ss += (0.5 * t * t) / (eij - e[nocc[s] + a] - e[nocc[s] + b]);
            }
        }
    }
    const noa = nocc[0] - fc, nob = nocc[1] - fc, nva = m - nocc[0], nvb = m - nocc[1];
    for (let i = 0; i < noa; i++)
      for (let j = 0; j < nob; j++) {
        pairBlock(0, i, 1, j);
        const eij = eps[0][fc + i] + eps[1][fc + j];
        for (let a = 0; a < nva; a++)
          for (let b = 0; b < nvb; b++) {
            const t = W[t0 + a * nvb + b];
            os += (t * t) / (eij - eps[0][nocc[0] + a] - eps[1][nocc[1] + b]);
          }
      }
  }
  return { ...mp2Summary(scf, fc, os, ss), fitting_functions: naux, peak_bytes: peak };
}
