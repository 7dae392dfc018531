/**
 * Coulomb and exchange matrices from electron-repulsion integrals:
 *   J[D]_μν = Σ_λσ (μν|λσ) D_λσ,    K[D]_μν = Σ_λσ (μλ|νσ) D_λσ
 * for one or more symmetric densities at once (RHF: one; UHF/ROHF: α and β).
 *
 * Integrals come from the unique shell quartets (8-fold symmetry). Small systems keep the
 * computed blocks in memory ("in-core"); when they would not fit in the memory budget, every
 * build recomputes the quartets it needs ("direct"). Either way a quartet is skipped when its
 * Schwarz bound times the largest density element it touches is below the threshold, which
 * makes builds from a density change ΔD (incremental Fock builds) cheap near convergence.
 *
 * Digestion of one block: every element v of the (A B | C D) block carries the scale
 * s = ½[A=B]·½[C=D]·½[AB=CD], which makes the sum over block elements count each distinct
 * integral exactly once per permutation; then J_ab += 2sv D_cd, J_cd += 2sv D_ab,
 * K_ac += sv D_bd, K_ad += sv D_bc, K_bc += sv D_ad, K_bd += sv D_ac, and finally J ← J + Jᵀ,
 * K ← K + Kᵀ.
 */
import { EriEngine } from "../integrals/eri.ts";
import { computeSchwarzFactors } from "../integrals/screening.ts";
import type { ShellPair } from "../integrals/shell-pairs.ts";
import { digestBlock, type GroupData, groupKernel } from "./jk-kernels.ts";
import { MAX_SIMD_D, SIMD_PIECE_DOUBLES, SimdStore, simdJkAvailable } from "./jk-simd.ts";
import type { PreparedBasis } from "../integrals/shells.ts";

export interface JkOptions {
  /** skip quartets whose bound is below this (hartree-scale contribution); default 1e-12 */
  threshold?: number;
  /** largest in-core store in bytes; default 4 GiB */
  memoryBytes?: number;
  /** force a mode instead of choosing by size */
  mode?: "in-core" | "direct";
  /**
   * primitive-quartet cutoff of the integral engine (eri.ts): what it skips stays below this in
   * any integral; default threshold·0.1, an order below what Schwarz screening drops; 0 computes
   * every primitive quartet
   */
  primitiveCutoff?: number;
  /** false: the JavaScript run kernels instead of the SIMD ones (jk-simd.ts; tests) */
  simd?: boolean;
}

export interface JkStats {
  mode: "in-core" | "direct";
  /** bytes held by the in-core store */
  storedBytes: number;
  /** unique shell quartets above the Schwarz threshold */
  quartets: number;
  /** quartets digested (or computed) by the last build */
  lastBuildQuartets: number;
  /** seconds spent computing integrals for the store (in-core) */
  integralSeconds: number;
}

const CHUNK = 1 << 22; // doubles per storage chunk (32 MiB)

export class JkBuilder {
  readonly nbf: number;
  readonly engine: EriEngine;
  readonly stats: JkStats;
  private threshold: number;
  /** surviving quartets as pair indices (bra, ket) */
  private qBra: Int32Array;
  private qKet: Int32Array;
  /** per quartet its Schwarz bound */
  private qBound: Float64Array;
  /** per quartet the four cross pairs (ac, ad, bc, bd) whose density exchange touches */
  private qCross: Int32Array;
  /** runs of one block shape in the quartet lists: run g is groupStart[g] … groupStart[g+1]−1 */
  private groupStart = new Int32Array(1);
  private groupShape: number[][] = [];
  /** the store's data for the run kernels (one allocation only) */
  private groupData: GroupData | null = null;
  /** D, J, K, pair data and the streamed pieces in WebAssembly memory for the SIMD run kernels */
  private simd: SimdStore | null = null;
  /** in-core: chunk index and offset of each quartet's block */
  private qChunk: Int32Array | null = null;
  private qOff: Int32Array | null = null;
  private chunks: Float64Array[] = [];
  /** per shell pair (engine pair index) the largest |D| element, refreshed per build */
  private pairDmax: Float64Array;
  /** per shell pair: first functions and function counts of its shells, ½ when both are one shell */
  private pA0: Int32Array;
  private pB0: Int32Array;
  private pNa: Int32Array;
  private pNb: Int32Array;
  private pHalf: Float64Array;

  constructor(basis: PreparedBasis, options: JkOptions = {}) {
    this.nbf = basis.nbf;
    this.threshold = options.threshold ?? 1e-12;
    this.engine = new EriEngine(basis);
    const pairs = this.engine.pairs;
    computeSchwarzFactors(this.engine);
    // after the Schwarz factors, which must be exact
    this.engine.primitiveCutoff = options.primitiveCutoff ?? this.threshold * 0.1;
    // The quartet lists, made directly in the order of the run kernels: grouped by block shape
    // (bra pair's function counts, ket pair's), within a group by bra then ket pair index. Pairs
    // are listed per code of their (na, nb), so each group is one sweep over two lists with
    // sequential writes; a reordering pass afterwards cost 0.2 s of scattered writes for the
    // 1.6 M quartets of C8H18/6-31G*. Two sweeps: count, then fill.
    const np = pairs.length;
    const sw = Float64Array.from(pairs, (P) => P.schwarz);
    const codes = new Map<number, number>();
    const code = Int32Array.from(pairs, (P) => {
      const key = P.a.nfunc * 4096 + P.b.nfunc;
      let c = codes.get(key);
      if (c === undefined) codes.set(key, (c = codes.size));
      return c;
    });
    const nc = codes.size;
    const byCode: Int32Array[] = [];
    for (let c = 0; c < nc; c++) byCode.push(Int32Array.from(pairs.keys()).filter((p) => code[p] === c));
    const th = this.threshold;
    const sweep = (cb: number, ck: number, visit: (i: number, j: number, bound: number) => void) => {
      const L = byCode[cb], R = byCode[ck];
      for (let x = 0; x < L.length; x++) {
        const i = L[x], si = sw[i];
        for (let y = 0; y < R.length; y++) {
          const j = R[y];
          if (j > i) break;
          const bound = si * sw[j];
          if (bound >= th) visit(i, j, bound);
        }
      }
    };
    const groupCount = new Int32Array(nc * nc);
    let count = 0;
    let doubles = 0;
    for (let cb = 0; cb < nc; cb++)
      for (let ck = 0; ck < nc; ck++) {
        let c = 0;
        sweep(cb, ck, () => c++);
        groupCount[cb * nc + ck] = c;
        const P = pairs[byCode[cb][0]], Q = pairs[byCode[ck][0]];
        count += c;
        doubles += c * P.a.nfunc * P.b.nfunc * Q.a.nfunc * Q.b.nfunc;
      }
    const qBra = new Int32Array(count), qKet = new Int32Array(count), qBound = new Float64Array(count);
    const qCross = new Int32Array(4 * count);
    const ia = Int32Array.from(pairs, (P) => P.ia), ib = Int32Array.from(pairs, (P) => P.ib);
    const pairIndex = (x: number, y: number) => (x >= y ? ((x * (x + 1)) >> 1) + y : ((y * (y + 1)) >> 1) + x);
    const start: number[] = [0];
    const shapes: number[][] = [];
    let q = 0;
    const put = (i: number, j: number, bound: number) => {
      qBra[q] = i;
      qKet[q] = j;
      qBound[q] = bound;
      const ai = ia[i], bi = ib[i], aj = ia[j], bj = ib[j];
      qCross[4 * q] = pairIndex(ai, aj);
      qCross[4 * q + 1] = pairIndex(ai, bj);
      qCross[4 * q + 2] = pairIndex(bi, aj);
      qCross[4 * q + 3] = pairIndex(bi, bj);
      q++;
    };
    for (let cb = 0; cb < nc; cb++)
      for (let ck = 0; ck < nc; ck++) {
        if (groupCount[cb * nc + ck] === 0) continue;
        sweep(cb, ck, put);
        const P = pairs[byCode[cb][0]], Q = pairs[byCode[ck][0]];
        shapes.push([P.a.nfunc, P.b.nfunc, Q.a.nfunc, Q.b.nfunc]);
        start.push(q);
      }
    this.qBra = qBra;
    this.qKet = qKet;
    this.qBound = qBound;
    this.qCross = qCross;
    this.groupStart = Int32Array.from(start);
    this.groupShape = shapes;
    this.pairDmax = new Float64Array(pairs.length);
    this.pA0 = Int32Array.from(pairs, (P) => P.a.offset);
    this.pB0 = Int32Array.from(pairs, (P) => P.b.offset);
    this.pNa = Int32Array.from(pairs, (P) => P.a.nfunc);
    this.pNb = Int32Array.from(pairs, (P) => P.b.nfunc);
    this.pHalf = Float64Array.from(pairs, (P) => (P.ia === P.ib ? 0.5 : 1));
    const budget = options.memoryBytes ?? 4 * 1024 ** 3;
    const mode = options.mode ?? (doubles * 8 <= budget ? "in-core" : "direct");
    this.stats = { mode, storedBytes: 0, quartets: count, lastBuildQuartets: 0, integralSeconds: 0 };
    if (mode === "in-core") {
      this.store(doubles);
      if (options.simd !== false && this.groupData !== null && simdJkAvailable() && this.largestBlock() <= SIMD_PIECE_DOUBLES)
        this.simd = this.simdStore();
    }
  }

  private largestBlock(): number {
    let m = 0;
    for (const [a, b, c, d] of this.groupShape) m = Math.max(m, a * b * c * d);
    return m;
  }

  /** The SIMD kernels' memory with the pair data copied in; null if refused. */
  private simdStore(): SimdStore | null {
    let st: SimdStore;
    try {
      st = new SimdStore(this.engine.pairs.length, this.nbf);
    } catch {
      return null;
    }
    st.i32.set(this.pA0, st.at.pA0 / 4);
    st.i32.set(this.pB0, st.at.pB0 / 4);
    st.f64.set(this.pHalf, st.at.pHalf / 8);
    return st;
  }

  private store(doubles: number): void {
    const t0 = performance.now();
    const n = this.qBra.length;
    const qChunk = new Int32Array(n);
    const qOff = new Int32Array(n);
    const pairs = this.engine.pairs;
    // One allocation of the exact size when the allocator gives it: a single large mapping is
    // the one most likely to be backed by huge pages, and first-touch page faults cost as much
    // as a third of the integral time on a VM. Chunks otherwise.
    let chunk: Float64Array;
    try {
      chunk = new Float64Array(Math.max(doubles, 1));
    } catch {
      chunk = new Float64Array(CHUNK);
    }
    let used = 0;
    let bytes = 0;
    for (let q = 0; q < n; q++) {
      const P = pairs[this.qBra[q]];
      const Q = pairs[this.qKet[q]];
      const size = P.a.nfunc * P.b.nfunc * Q.a.nfunc * Q.b.nfunc;
      if (used + size > chunk.length) {
        this.chunks.push(chunk.subarray(0, used));
        bytes += used * 8;
        chunk = new Float64Array(Math.max(CHUNK, size));
        used = 0;
      }
      this.engine.compute(P, Q, chunk, used);
      qChunk[q] = this.chunks.length;
      qOff[q] = used;
      used += size;
    }
    this.chunks.push(chunk.subarray(0, used));
    bytes += used * 8;
    this.qChunk = qChunk;
    this.qOff = qOff;
    if (this.chunks.length === 1)
      this.groupData = { qBra: this.qBra, qKet: this.qKet, qBound: this.qBound, qCross: this.qCross, qOff,
        pA0: this.pA0, pB0: this.pB0, pHalf: this.pHalf };
    this.stats.storedBytes = bytes;
    this.stats.integralSeconds = (performance.now() - t0) / 1000;
  }

  /**
   * Every surviving unique quartet's block, from the store or recomputed (direct): visit(P, Q,
   * block, offset) with the block's elements at block[offset …] in EriEngine.compute layout.
   */
  forEachBlock(visit: (P: ShellPair, Q: ShellPair, blk: Float64Array, off: number) => void): void {
    for (let q = 0; q < this.qBra.length; q++) this.visitQuartet(q, visit);
  }

  /** Quartet q's block, stored or recomputed, to visit. */
  private visitQuartet(q: number, visit: (P: ShellPair, Q: ShellPair, blk: Float64Array, off: number) => void): void {
    const P = this.engine.pairs[this.qBra[q]];
    const Q = this.engine.pairs[this.qKet[q]];
    if (this.qChunk !== null) visit(P, Q, this.chunks[this.qChunk[q]], this.qOff![q]);
    else visit(P, Q, this.engine.compute(P, Q), 0);
  }

  /** per shell pair, the quartets it is part of (CSR over pair indices; made on first use) */
  private byPair: { start: Int32Array; q: Int32Array } | null = null;

  /**
   * Every surviving unique quartet that has shell pair `pair` (engine pair index) as its bra or
   * its ket, as forEachBlock gives them; `visit` sees the stored orientation (P ≥ Q), so the
   * pair is P, Q or both. Direct mode recomputes each block, so a sweep over all pairs computes
   * every quartet twice.
   */
  forEachBlockOfPair(pair: number, visit: (P: ShellPair, Q: ShellPair, blk: Float64Array, off: number) => void): void {
    const idx = this.byPair ?? (this.byPair = this.pairIndexOfQuartets());
    for (let t = idx.start[pair]; t < idx.start[pair + 1]; t++) this.visitQuartet(idx.q[t], visit);
  }

  private pairIndexOfQuartets(): { start: Int32Array; q: Int32Array } {
    const np = this.engine.pairs.length, nq = this.qBra.length;
    const start = new Int32Array(np + 1);
    for (let q = 0; q < nq; q++) {
      start[this.qBra[q] + 1]++;
      if (this.qKet[q] !== this.qBra[q]) start[this.qKet[q] + 1]++;
    }
    for (let p = 0; p < np; p++) start[p + 1] += start[p];
    const next = start.slice(0, np);
    const list = new Int32Array(start[np]);
    for (let q = 0; q < nq; q++) {
      list[next[this.qBra[q]]++] = q;
      if (this.qKet[q] !== this.qBra[q]) list[next[this.qKet[q]]++] = q;
    }
    return { start, q: list };
  }

  /**
   * J (of the sum of the densities) and K (of each density) for symmetric densities.
   * `wantK` false skips exchange. Results are new nbf × nbf arrays.
   */
  build(densities: Float64Array[], wantK = true, threshold = this.threshold): { J: Float64Array; K: Float64Array[] } {
    const n = this.nbf;
    const nd = densities.length;
    const J = new Float64Array(n * n);
    const K = densities.map(() => new Float64Array(n * n));
    if (nd === 2 && wantK && this.groupData !== null && this.simd !== null) {
      // two densities (UHF, ROHF) with the SIMD kernels: one pass per density, each screened
      // by its own density; J is the sum of the two passes' J. Faster than one JavaScript pass
      // that digests both densities at once.
      const Jb = new Float64Array(n * n);
      let most = 0;
      densities.forEach((D, x) => {
        this.updatePairDmax([D]);
        const pdx = this.pairDmax;
        most = Math.max(most, this.digestRuns(D, pdx, maxOf(pdx), threshold, x === 0 ? J : Jb, K[x]));
      });
      for (let k = 0; k < n * n; k++) J[k] += Jb[k];
      // the larger pass's count: quartets digested at least once
      this.stats.lastBuildQuartets = most;
      finishSymmetric(J, n);
      for (const k of K) finishSymmetric(k, n);
      return { J, K };
    }
    const Dt = new Float64Array(n * n);
    for (const D of densities) for (let k = 0; k < n * n; k++) Dt[k] += D[k];
    this.updatePairDmax(nd === 1 ? densities : [...densities, Dt]);
    const pairs = this.engine.pairs;
    const pd = this.pairDmax;
    const cross = this.qCross;
    const th = threshold;
    let built = 0;
    const qBra = this.qBra, qKet = this.qKet, qBound = this.qBound;
    const one = nd === 1 && wantK;
    const D1 = densities[0], K1 = K[0];
    if (nd > 2) throw new Error("J/K builds take one or two densities");
    const pdAll = maxOf(pd);
    if (one && this.groupData !== null) {
      // the RHF path through the store: one kernel call per run of one block shape
      built = this.digestRuns(D1, pd, pdAll, th, J, K1);
      this.stats.lastBuildQuartets = built;
      finishSymmetric(J, n);
      finishSymmetric(K1, n);
      return { J, K };
    }
    const chunks = this.chunks, qChunk = this.qChunk, qOff = this.qOff;
    const pA0 = this.pA0, pB0 = this.pB0, pNa = this.pNa, pNb = this.pNb, pHalf = this.pHalf;
    for (let q = 0; q < qBra.length; q++) {
      const bound = qBound[q];
      if (bound * pdAll < th) continue;
      const b = qBra[q], k = qKet[q];
      // density screening: the largest density element any of J or K would multiply
      let dmax = pd[b] > pd[k] ? pd[b] : pd[k];
      const c0 = pd[cross[4 * q]], c1 = pd[cross[4 * q + 1]], c2 = pd[cross[4 * q + 2]], c3 = pd[cross[4 * q + 3]];
      if (c0 > dmax) dmax = c0;
      if (c1 > dmax) dmax = c1;
      if (c2 > dmax) dmax = c2;
      if (c3 > dmax) dmax = c3;
      if (bound * dmax < th) continue;
      built++;
      let blk: Float64Array;
      let off = 0;
      if (qChunk !== null) {
        blk = chunks[qChunk[q]];
        off = qOff![q];
      } else blk = this.engine.compute(pairs[b], pairs[k]);
      if (one) {
        // the RHF path: shell data from typed arrays, no shell objects
        const sc = pHalf[b] * pHalf[k] * (b === k ? 0.5 : 1);
        digestBlock(blk, off, n, pA0[b], pB0[b], pA0[k], pB0[k], pNa[b], pNb[b], pNa[k], pNb[k], sc, D1, J, K1);
      } else this.digest(pairs[b], pairs[k], blk, off, densities, Dt, J, K, nd, wantK);
    }
    this.stats.lastBuildQuartets = built;
    finishSymmetric(J, n);
    for (const k of K) finishSymmetric(k, n);
    return { J, K };
  }

  /**
   * J and K (before M ← M + Mᵀ) of one density from the store, run by run: the SIMD kernels
   * where they run and have the run's last-shell size, the JavaScript ones otherwise. pd: per
   * pair the largest |D| element, pdAll its maximum. Returns the quartets digested.
   */
  private digestRuns(D1: Float64Array, pd: Float64Array, pdAll: number, th: number, J: Float64Array, K1: Float64Array): number {
    const n = this.nbf;
    const gd = this.groupData!, blk = this.chunks[0], st = this.simd;
    let built = 0;
    if (st !== null) {
      st.f64.set(D1, st.at.D / 8);
      st.f64.set(pd, st.at.pd / 8);
      st.f64.fill(0, st.at.J / 8, st.at.J / 8 + n * n);
      st.f64.fill(0, st.at.K / 8, st.at.K / 8 + n * n);
    }
    for (let g = 0; g < this.groupShape.length; g++) {
      const [na, nb, nc, ndd] = this.groupShape[g];
      const q0 = this.groupStart[g], q1 = this.groupStart[g + 1];
      if (st !== null && ndd <= MAX_SIMD_D && st.kernel(ndd) !== null) built += st.digestRun(gd, blk, ndd, q0, q1, na, nb, nc, n, pdAll, th);
      else built += groupKernel(ndd)(gd, q0, q1, na, nb, nc, blk, pd, pdAll, th, n, D1, J, K1);
    }
    if (st !== null) {
      const j0 = st.at.J / 8, k0 = st.at.K / 8;
      for (let k = 0; k < n * n; k++) {
        J[k] += st.f64[j0 + k];
        K1[k] += st.f64[k0 + k];
      }
    }
    return built;
  }

  /** pairDmax ← per shell pair the largest |element| of any of the matrices over its block. */
  private updatePairDmax(mats: Float64Array[]): void {
    const n = this.nbf;
    const pairs = this.engine.pairs;
    for (let p = 0; p < pairs.length; p++) {
      const A = pairs[p].a, B = pairs[p].b;
      let m = 0;
      for (let a = A.offset; a < A.offset + A.nfunc; a++)
        for (let b = B.offset; b < B.offset + B.nfunc; b++)
          for (const M of mats) m = Math.max(m, Math.abs(M[a * n + b]));
      this.pairDmax[p] = m;
    }
  }


  /**
   * One block into J only, or into J and the K of two densities (UHF, ROHF, stability), in a
   * single pass; one density with K goes through jk-kernels.ts. The innermost index d runs along rows of every
   * matrix it touches (J_cd, D_cd, D_ad, D_bd, K_ad, K_bd), so accesses are contiguous; the
   * other four updates are hoisted out of the d loop.
   */
  private digest(
    P: ShellPair, Q: ShellPair, blk: Float64Array, off: number,
    Ds: Float64Array[], Dt: Float64Array, J: Float64Array, Ks: Float64Array[], nd: number, wantK: boolean,
  ): void {
    const n = this.nbf;
    const A = P.a, B = P.b, C = Q.a, D = Q.b;
    const na = A.nfunc, nb = B.nfunc, nc = C.nfunc, ndd = D.nfunc;
    const a0 = A.offset, b0 = B.offset, c0 = C.offset, d0 = D.offset;
    let s = 1;
    if (P.ia === P.ib) s *= 0.5;
    if (Q.ia === Q.ib) s *= 0.5;
    if (P === Q) s *= 0.5;
    const s2 = 2 * s;
    const D1 = Ds[0], K1 = Ks[0];
    const two = wantK && nd === 2;
    const D2 = two ? Ds[1] : D1, K2 = two ? Ks[1] : K1;
    let k = off;
    for (let a = 0; a < na; a++) {
      const ia = (a0 + a) * n;
      for (let b = 0; b < nb; b++) {
        const ib = (b0 + b) * n;
        const dab = s2 * Dt[ia + b0 + b];
        let jab = 0;
        for (let c = 0; c < nc; c++) {
          const ic = (c0 + c) * n + d0;
          const iad = ia + d0, ibd = ib + d0;
          if (!wantK) {
            for (let d = 0; d < ndd; d++) {
              const v = blk[k + d];
              jab += v * Dt[ic + d];
              J[ic + d] += v * dab;
            }
          } else {
            const dbc = s * D1[ib + c0 + c], dac = s * D1[ia + c0 + c];
            const ebc = s * D2[ib + c0 + c], eac = s * D2[ia + c0 + c];
            let kac = 0, kbc = 0, lac = 0, lbc = 0;
            for (let d = 0; d < ndd; d++) {
              const v = blk[k + d];
              jab += v * Dt[ic + d];
              J[ic + d] += v * dab;
              kac += v * D1[ibd + d];
              kbc += v * D1[iad + d];
              K1[iad + d] += v * dbc;
              K1[ibd + d] += v * dac;
              lac += v * D2[ibd + d];
              lbc += v * D2[iad + d];
              K2[iad + d] += v * ebc;
              K2[ibd + d] += v * eac;
            }
            K1[ia + c0 + c] += s * kac;
            K1[ib + c0 + c] += s * kbc;
            K2[ia + c0 + c] += s * lac;
            K2[ib + c0 + c] += s * lbc;
          }
          k += ndd;
        }
        J[ia + b0 + b] += s2 * jab;
      }
    }
  }
}

function maxOf(a: Float64Array): number {
  let m = 0;
  for (let k = 0; k < a.length; k++) if (a[k] > m) m = a[k];
  return m;
}

/** M ← M + Mᵀ. */
function finishSymmetric(M: Float64Array, n: number): void {
  for (let i = 0; i < n; i++) {
    M[i * n + i] *= 2;
    for (let j = 0; j < i; j++) {
      const v = M[i * n + j] + M[j * n + i];
      M[i * n + j] = v;
      M[j * n + i] = v;
    }
  }
}
