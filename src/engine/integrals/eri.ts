/**
 * Electron-repulsion integrals (ab|cd) = ∫∫ φa(1) φb(1) r12⁻¹ φc(2) φd(2) over contracted
 * shells of any angular momentum, by the Head-Gordon–Pople scheme:
 *  1. per primitive quartet: Boys function (boys.ts) and the Obara–Saika vertical recurrence
 *     to [e0|f0] (eri-class.ts has the recurrences and their sources);
 *  2. contraction over primitives, sharing each primitive quartet between all functions of a
 *     general contraction (cc-pVXZ s and p shells);
 *  3. horizontal recurrence on the contracted [e0|f0] to (ab|cd), bra then ket;
 *  4. Cartesian → shell functions (spherical.ts).
 * No allocation per quartet or primitive: every buffer is preallocated per engine.
 *
 * Block layout returned by compute(P, Q) (or written at dst[dstOff …] when a destination is
 * given): out[((fa·nb + fb)·nc + fc)·nd + fd] where a, b are
 * P.a, P.b and c, d are Q.a, Q.b (pairs in their stored orientation), and a shell's function
 * index is row · ncomp + component.
 */
import { boys } from "./boys.ts";
import { cumStart, ncart } from "./cartesian.ts";
import { type EriClass, eriClass, type HrrStep } from "./eri-class.ts";
import { type Contraction, generateContraction } from "./eri-codegen.ts";
import { type Finish, generateFinish } from "./eri-finish.ts";
import { makeShellPair, type ShellPair } from "./shell-pairs.ts";
import { mergeSharedExponents, type PreparedBasis, type PreparedShell } from "./shells.ts";
import { componentTransform } from "./spherical.ts";

interface SparseTransform {
  /** the unit matrix (s functions, and p functions which keep their Cartesian form) */
  identity: boolean;
  nout: number;
  nin: number;
  start: Int32Array;
  idx: Int32Array;
  val: Float64Array;
}

function sparseTransform(l: number, pure: boolean): SparseTransform {
  const t = componentTransform(l, pure);
  const start = [0];
  const idx: number[] = [];
  const val: number[] = [];
  for (let o = 0; o < t.ncomp; o++) {
    for (let i = 0; i < t.ncart; i++) {
      const v = t.matrix[o * t.ncart + i];
      if (v !== 0) {
        idx.push(i);
        val.push(v);
      }
    }
    start.push(idx.length);
  }
  const identity = t.diagonal && t.matrix.every((v, k) => (k % (t.ncart + 1) === 0 ? v === 1 : v === 0));
  return { identity, nout: t.ncomp, nin: t.ncart, start: Int32Array.from(start), idx: Int32Array.from(idx), val: Float64Array.from(val) };
}

/**
 * Quartets of a class computed through the tables (in this process) before its generated code
 * is made and used. Generated code costs compilation and runs slowly until the JIT has
 * optimized it: measured on water/cc-pVTZ (about a hundred classes, few quartets each),
 * generating from the first quartet made the whole RHF run take 2.3 s instead of 0.8 s; a
 * class with many quartets soon repays it. Counted per process, like the generated code: a
 * count per engine sent 12% of the quartets of every new benzene/cc-pVDZ engine through the
 * tables and cost it a third more time.
 */
export const WARM_CALLS = 64;

/** Quartets computed per class in this process. */
const classUse = new WeakMap<EriClass, { calls: number }>();

interface ClassEntry {
  cls: EriClass;
  /** unrolled contraction per (bra segmented, ket segmented), index 2·bra + ket; null: tables */
  con: (Contraction | null | undefined)[];
  /** quartets of the class computed so far in this process (shared between engines) */
  use: { calls: number };
  /** unrolled finish per kind combination and row purity, index 16 · (braKind · nKetKinds + ketKind) + purity bits */
  fin: (Finish | null | undefined)[];
}

export class EriEngine {
  readonly basis: PreparedBasis;
  /** class and unrolled loops per (bra type, ket type), looked up by small indices */
  private typeIds = new Map<number, number>();
  private table: (ClassEntry | undefined)[] = new Array(64 * 64).fill(undefined);
  private overflow = new Map<number, ClassEntry>();

  private tidOf(P: ShellPair): number {
    if (P.tid < 0) {
      let t = this.typeIds.get(P.lkey);
      if (t === undefined) {
        t = this.typeIds.size;
        this.typeIds.set(P.lkey, t);
      }
      P.tid = t;
    }
    return P.tid;
  }

  private entry(bra: ShellPair, ket: ShellPair): ClassEntry {
    const tb = this.tidOf(bra), tk = this.tidOf(ket);
    // a dense table while the types are few (they are: a handful per basis), a map beyond
    const dense = tb < 64 && tk < 64;
    const k = dense ? tb * 64 + tk : tb * 65536 + tk;
    let e = dense ? this.table[k] : this.overflow.get(k);
    if (e === undefined) {
      const cls = eriClass(bra.a.l, bra.b.l, ket.a.l, ket.b.l, bra.a.lmin, bra.b.lmin, ket.a.lmin, ket.b.lmin);
      this.ensure(cls);
      let use = classUse.get(cls);
      if (use === undefined) classUse.set(cls, (use = { calls: 0 }));
      e = { cls, use, con: [undefined, undefined, undefined, undefined], fin: new Array(16 * cls.braKinds.length * cls.ketKinds.length).fill(undefined) };
      if (dense) this.table[k] = e;
      else this.overflow.set(k, e);
    }
    return e;
  }

  /** the shells integrals are computed over (basis shells, sp halves merged) */
  readonly shells: PreparedShell[];
  /** all pairs i ≥ j of those shells, index i(i+1)/2 + j */
  readonly pairs: ShellPair[];
  private w: Float64Array;
  private fm: Float64Array;
  private pb: Float64Array;
  private tmp: Float64Array;
  private acc: Float64Array;
  private h1: Float64Array;
  private h2: Float64Array;
  private out: Float64Array;
  private transforms: SparseTransform[][];
  private maxRows: number;
  private sized = new Set<EriClass>();
  private bp = new Float64Array(12);
  /**
   * Skip a quartet's primitive quartets whose estimated share (shell-pairs.ts `bound`) is below
   * this divided by their number, so what is skipped adds up to less than about this in any
   * integral. 0 (the default) computes every primitive quartet; the SCF sets it a tenth of its
   * quartet threshold.
   */
  primitiveCutoff = 0;
  /** where compute() writes its block in the destination array */
  private outOff = 0;
  private par = new Float64Array(17);

  private strides = new Int32Array(4);

  /** Grow the scratch buffers to what a class needs (once per class). */
  private ensure(cls: EriClass): void {
    if (this.sized.has(cls)) return;
    this.sized.add(cls);
    const blk = cls.nE * cls.nF;
    const r2 = this.maxRows * this.maxRows;
    if (this.w.length < cls.wsize) this.w = new Float64Array(cls.wsize);
    if (this.pb.length < blk) this.pb = new Float64Array(blk);
    if (this.tmp.length < r2 * blk) this.tmp = new Float64Array(r2 * blk);
    if (this.acc.length < r2 * r2 * blk) this.acc = new Float64Array(r2 * r2 * blk);
    if (this.h1.length < cls.scratch) {
      this.h1 = new Float64Array(cls.scratch);
      this.h2 = new Float64Array(cls.scratch);
    }
  }

  /** quartets per class through the tables before generated code (WARM_CALLS) */
  private readonly warmCalls: number;

  /**
   * `mergeShells: false` keeps sp halves apart (for tests: the merged path must agree).
   * `warmCalls` overrides WARM_CALLS (tests: 0 uses generated code from the first quartet,
   * Infinity never).
   * `lazyPairs: true` makes shell pairs only when pair(i, j) first asks for them (for callers
   * that need a few of many possible pairs); `pairs` is then sparse.
   */
  constructor(basis: PreparedBasis, options: { mergeShells?: boolean; lazyPairs?: boolean; warmCalls?: number } = {}) {
    this.basis = basis;
    this.warmCalls = options.warmCalls ?? WARM_CALLS;
    const sh = options.mergeShells === false ? basis.shells.slice() : mergeSharedExponents(basis.shells);
    this.shells = sh;
    const pairs: ShellPair[] = [];
    if (!options.lazyPairs)
      for (let i = 0; i < sh.length; i++) for (let j = 0; j <= i; j++) pairs.push(makeShellPair(sh[i], i, sh[j], j));
    this.pairs = pairs;
    const lmax = basis.maxL;
    let maxRows = 1;
    let maxFunc = 1;
    for (const s of sh) {
      maxRows = Math.max(maxRows, s.ncontr);
      maxFunc = Math.max(maxFunc, s.nfunc);
    }
    this.maxRows = maxRows;
    this.w = new Float64Array(0);
    this.fm = new Float64Array(4 * lmax + 2);
    this.pb = new Float64Array(0);
    this.tmp = new Float64Array(0);
    this.acc = new Float64Array(0);
    this.h1 = new Float64Array(0);
    this.h2 = new Float64Array(0);
    this.out = new Float64Array(maxFunc ** 4);
    this.transforms = [];
    for (let l = 0; l <= lmax; l++) this.transforms.push([sparseTransform(l, false), sparseTransform(l, true)]);
  }

  /** The pair of shells i and j (made on first use with lazyPairs). */
  pair(i: number, j: number): ShellPair {
    const k = this.pairIndex(i, j);
    let p = this.pairs[k];
    if (p === undefined) {
      p = i >= j ? makeShellPair(this.shells[i], i, this.shells[j], j) : makeShellPair(this.shells[j], j, this.shells[i], i);
      this.pairs[k] = p;
    }
    return p;
  }

  pairIndex(i: number, j: number): number {
    return i >= j ? (i * (i + 1)) / 2 + j : (j * (j + 1)) / 2 + i;
  }

  /**
   * (P|Q) for two shell pairs; returns an internal buffer (valid until the next call) whose
   * first nfunc(P.a)·nfunc(P.b)·nfunc(Q.a)·nfunc(Q.b) entries hold the block laid out as
   * described in the module comment.
   */
  compute(P: ShellPair, Q: ShellPair, dst?: Float64Array, dstOff = 0): Float64Array {
    const swap = Q.a.l + Q.b.l > P.a.l + P.b.l;
    const bra = swap ? Q : P;
    const ket = swap ? P : Q;
    const entry = this.entry(bra, ket);
    const cls = entry.cls;
    const blk = cls.nE * cls.nF;
    const nrab = bra.nrows;
    const nrcd = ket.nrows;
    this.acc.fill(0, 0, nrab * nrcd * blk);
    this.contractPrimitives(entry, bra, ket, blk);
    // strides of the computed (a b | c d) inside the caller's (P|Q) block
    const nfPa = P.a.nfunc, nfPb = P.b.nfunc, nfQa = Q.a.nfunc, nfQb = Q.b.nfunc;
    const sQb = 1, sQa = nfQb, sPb = nfQa * nfQb, sPa = nfPb * sPb;
    const strides = this.strides;
    if (swap) {
      strides[0] = sQa; strides[1] = sQb; strides[2] = sPa; strides[3] = sPb;
    } else {
      strides[0] = sPa; strides[1] = sPb; strides[2] = sQa; strides[3] = sQb;
    }
    const total = nfPa * nfPb * nfQa * nfQb;
    const out = dst ?? (this.out.length >= total ? this.out : (this.out = new Float64Array(total)));
    this.outOff = dst ? dstOff : 0;
    // the class's first quartets go through the generic finish; its generated code after
    const generated = entry.use.calls > this.warmCalls;
    const nrb = bra.b.ncontr, nrd = ket.b.ncontr, nkk = cls.ketKinds.length;
    for (let rab = 0; rab < nrab; rab++) {
      const ra = (rab / nrb) | 0, rb = rab - ra * nrb;
      for (let rcd = 0; rcd < nrcd; rcd++) {
        const off = (rab * nrcd + rcd) * blk;
        if (generated) {
          const rc = (rcd / nrd) | 0, rd = rcd - rc * nrd;
          const k = bra.rowKind[rab] * nkk + ket.rowKind[rcd];
          const pure = (bra.a.rowPure[ra] << 3) | (bra.b.rowPure[rb] << 2) | (ket.a.rowPure[rc] << 1) | ket.b.rowPure[rd];
          let fin = entry.fin[16 * k + pure];
          if (fin === undefined) entry.fin[16 * k + pure] = fin = generateFinish(cls, bra.rowKind[rab], ket.rowKind[rcd], pure);
          if (fin !== null) {
            const sa = strides[0], sb = strides[1], sc = strides[2], sd = strides[3];
            const base = this.outOff + bra.a.rowOff[ra] * sa + bra.b.rowOff[rb] * sb + ket.a.rowOff[rc] * sc + ket.b.rowOff[rd] * sd;
            fin(this.acc, off, out, base, sa, sb, sc, sd, bra.ab, ket.ab);
            continue;
          }
        }
        this.finishRows(entry, bra, ket, off, rab, rcd, strides, out);
      }
    }
    return out;
  }

  /**
   * Steps 1–2: contracted [e0|f0] blocks. acc[(rab·nrcd + rcd)·blk …] holds, for each row
   * combination, only its kinds' slice [e of its bra kind][f of its ket kind]; tmp[rcd·blk …]
   * holds the per-bra-primitive partial sums [all e][f of the ket kind].
   */
  private contractPrimitives(entry: ClassEntry, bra: ShellPair, ket: ShellPair, blk: number): void {
    const v = (bra.segmented ? 2 : 0) + (ket.segmented ? 1 : 0);
    let con = entry.use.calls++ < this.warmCalls ? null : entry.con[v];
    if (con === undefined) {
      con = generateContraction(entry.cls, bra.segmented, ket.segmented);
      entry.con[v] = con;
    }
    // shared out over the primitive quartets, so that together they stay below the cutoff
    const cut = this.primitiveCutoff / (bra.nprim * ket.nprim);
    if (con === null) this.contractTables(entry.cls, bra, ket, blk, cut);
    else con(bra, ket, cut, this.acc, this.tmp);
  }

  /** The same with the table-driven recurrences, for classes too large to unroll. */
  private contractTables(cls: EriClass, bra: ShellPair, ket: ShellPair, blk: number, cut: number): void {
    const w = this.w;
    const fm = this.fm;
    const pb = this.pb;
    const tmp = this.tmp;
    const L = cls.L;
    const nE = cls.nE, nF = cls.nF;
    const bothSegmented = bra.segmented && ket.segmented;
    const gather = cls.gather;
    const qcx0 = ket.a.x, qcy0 = ket.a.y, qcz0 = ket.a.z;
    const kp = ket.p, kpc = ket.pc, kk = ket.k, nk = ket.nprim;
    const kStart = ket.comboStart, kRow = ket.comboRow, kCoef = ket.comboCoef;
    const target = bothSegmented ? this.acc : tmp;
    const par = this.par;
    const kb = ket.bound;
    for (let i = 0; i < bra.nprim; i++) {
      const p = bra.p[i];
      const kab = bra.k[i];
      const lim = cut / bra.bound[i];
      const Px = bra.pc[3 * i], Py = bra.pc[3 * i + 1], Pz = bra.pc[3 * i + 2];
      const pax = bra.pa[3 * i], pay = bra.pa[3 * i + 1], paz = bra.pa[3 * i + 2];
      if (!bothSegmented) tmp.fill(0, 0, ket.nrows * blk);
      for (let j = 0; j < nk; j++) {
        const q = kp[j];
        const Qx = kpc[3 * j], Qy = kpc[3 * j + 1], Qz = kpc[3 * j + 2];
        const pq = p + q;
        const ipq = 1 / pq;
        if (kb[j] * Math.sqrt(ipq) < lim) continue;
        const rho = p * q * ipq;
        const dx = Px - Qx, dy = Py - Qy, dz = Pz - Qz;
        const pref = kab * kk[j] * Math.sqrt(ipq);
        boys(L, rho * (dx * dx + dy * dy + dz * dz), fm);
        const Wx = (p * Px + q * Qx) * ipq, Wy = (p * Py + q * Qy) * ipq, Wz = (p * Pz + q * Qz) * ipq;
        for (let m = 0; m <= L; m++) w[m] = pref * fm[m];
        par[0] = pax; par[1] = pay; par[2] = paz;
        par[3] = Wx - Px; par[4] = Wy - Py; par[5] = Wz - Pz;
        par[6] = Qx - qcx0; par[7] = Qy - qcy0; par[8] = Qz - qcz0;
        par[9] = Wx - Qx; par[10] = Wy - Qy; par[11] = Wz - Qz;
        par[12] = 0.5 / p; par[13] = rho / p; par[14] = 0.5 / q; par[15] = rho / q; par[16] = 0.5 * ipq;
        vrr(cls, w, par);
        for (let k = 0; k < blk; k++) pb[k] = w[gather[k]];
        if (ket.segmented) {
          for (let k = 0; k < blk; k++) target[k] += pb[k];
        } else {
          for (let c = kStart[j]; c < kStart[j + 1]; c++) {
            const coef = kCoef[c];
            const r = kRow[c];
            const kind = cls.ketKinds[ket.rowKind[r]];
            const f0 = kind.start, fs = kind.size;
            const o = r * blk;
            for (let e = 0; e < nE; e++)
              for (let f = 0; f < fs; f++) tmp[o + e * fs + f] += coef * pb[e * nF + f0 + f];
          }
        }
      }
      if (!bothSegmented) this.braCombos(cls, bra, ket, i, blk);
    }
  }

  /** acc[rab][rcd] += c · (bra kind's e slice of tmp[rcd]) for the bra combos of primitive pair i. */
  private braCombos(cls: EriClass, bra: ShellPair, ket: ShellPair, i: number, blk: number): void {
    const acc = this.acc;
    const tmp = this.tmp;
    const nrcd = ket.nrows;
    const c0 = bra.segmented ? 0 : bra.comboStart[i];
    const c1 = bra.segmented ? 1 : bra.comboStart[i + 1];
    for (let c = c0; c < c1; c++) {
      const coef = bra.segmented ? 1 : bra.comboCoef[c];
      const rab = bra.segmented ? 0 : bra.comboRow[c];
      const kb = cls.braKinds[bra.rowKind[rab]];
      for (let rcd = 0; rcd < nrcd; rcd++) {
        const fs = cls.ketKinds[ket.rowKind[rcd]].size;
        const src = rcd * blk + kb.start * fs;
        const dst = (rab * nrcd + rcd) * blk;
        const n = kb.size * fs;
        for (let k = 0; k < n; k++) acc[dst + k] += coef * tmp[src + k];
      }
    }
  }

  /** Steps 3–4 for one row combination: HRR, transforms, scatter into out. */
  private finishRows(
    entry: ClassEntry, bra: ShellPair, ket: ShellPair, off: number,
    rab: number, rcd: number, strides: Int32Array, out: Float64Array,
  ): void {
    const cls = entry.cls;
    const kb = cls.braKinds[bra.rowKind[rab]];
    const kk = cls.ketKinds[ket.rowKind[rcd]];
    const la = kb.l1, lb = kb.l2, lc = kk.l1, ld = kk.l2;
    const nrb = bra.b.ncontr, nrd = ket.b.ncontr;
    const ra = (rab / nrb) | 0, rb = rab - ra * nrb;
    const rc = (rcd / nrd) | 0, rd = rcd - rc * nrd;
    const sa = strides[0], sb = strides[1], sc = strides[2], sd = strides[3];
    const oa = bra.a.rowOff[ra], ob = bra.b.rowOff[rb], oc = ket.a.rowOff[rc], od = ket.b.rowOff[rd];
    const acc = this.acc;
    const na = ncart(la), nb = ncart(lb), nc = ncart(lc), nd = ncart(ld);
    if (lb === 0 && ld === 0 && la <= 1 && lc <= 1) {
      // (a0|c0) with s or Cartesian-order p: the contracted block is already the answer
      const base = this.outOff + oa * sa + ob * sb + oc * sc + od * sd;
      for (let a = 0; a < na; a++) for (let c = 0; c < nc; c++) out[base + a * sa + c * sc] = acc[off + a * nc + c];
      return;
    }
    const nF = kk.size;
    const h = cls.hrr[bra.rowKind[rab] * cls.ketKinds.length + ket.rowKind[rcd]];
    let h1 = this.h1;
    let h2 = this.h2;
    // bra HRR: [e][f] → [a][b][f]
    let cur = acc;
    let curOff = off;
    for (let i = 0; i < h.bra.length; i++) {
      hrrStep(h.bra[i], cur, curOff, h1, nF, bra.ab);
      cur = h1;
      curOff = 0;
      const t = h1; h1 = h2; h2 = t;
    }
    const nab = na * nb;
    // with d an s function the data are already [a][b][c][d]; otherwise transpose to [f][ab]
    // and run the ket HRR, which leaves [c][d][a][b]
    const ketFirst = ld > 0;
    if (ketFirst) {
      for (let ab = 0; ab < nab; ab++) for (let f = 0; f < nF; f++) h1[f * nab + ab] = cur[curOff + ab * nF + f];
      cur = h1;
      curOff = 0;
      { const t = h1; h1 = h2; h2 = t; }
      for (let i = 0; i < h.ket.length; i++) {
        hrrStep(h.ket[i], cur, 0, h1, nab, ket.ab);
        cur = h1;
        const t = h1; h1 = h2; h2 = t;
      }
    }
    // transform the last index and rotate it to the front, four times: the order comes back
    const T = this.transforms;
    const tb = T[lb][bra.b.rowPure[rb]], ta = T[la][bra.a.rowPure[ra]];
    const td = T[ld][ket.b.rowPure[rd]], tc = T[lc][ket.a.rowPure[rc]];
    let n = nc * nd * na * nb;
    for (let step = 0; step < 4; step++) {
      const tr = ketFirst
        ? (step === 0 ? tb : step === 1 ? ta : step === 2 ? td : tc)
        : (step === 0 ? td : step === 1 ? tc : step === 2 ? tb : ta);
      if (tr.identity && tr.nin === 1) continue; // an s index: nothing to transform or rotate
      const x = n / tr.nin;
      applyLast(tr, cur, h1, x, curOff);
      curOff = 0;
      n = x * tr.nout;
      cur = h1;
      const t = h1; h1 = h2; h2 = t;
    }
    // scatter
    let k = curOff;
    if (ketFirst) {
      for (let c = 0; c < tc.nout; c++)
        for (let d = 0; d < td.nout; d++) {
          const base = this.outOff + (oc + c) * sc + (od + d) * sd;
          for (let a = 0; a < ta.nout; a++) {
            const base2 = base + (oa + a) * sa + ob * sb;
            for (let b = 0; b < tb.nout; b++) out[base2 + b * sb] = cur[k++];
          }
        }
    } else {
      for (let a = 0; a < ta.nout; a++)
        for (let b = 0; b < tb.nout; b++) {
          const base = this.outOff + (oa + a) * sa + (ob + b) * sb + od * sd;
          for (let c = 0; c < tc.nout; c++) out[base + (oc + c) * sc] = cur[k++];
        }
    }
  }
}

/**
 * The two vertical recurrences for one primitive quartet, in place on w (table-driven).
 * par: PA(xyz), WP(xyz), QC(xyz), WQ(xyz), 1/(2p), ρ/p, 1/(2q), ρ/q, 1/(2(p+q)).
 */
function vrr(cls: EriClass, w: Float64Array, par: Float64Array): void {
  const h2p = par[12];
  const rp = par[13];
  const bDst = cls.bDst, bS1 = cls.bS1, bS2 = cls.bS2, bN = cls.bN, bAx = cls.bAx, bM = cls.bM;
  for (let o = 0; o < bDst.length; o++) {
    const ax = bAx[o];
    const c1 = par[ax];
    const c2 = par[3 + ax];
    const c3 = bN[o] * h2p;
    const c4 = c3 * rp;
    const d = bDst[o], s = bS1[o], t = bS2[o], mc = bM[o];
    for (let m = 0; m < mc; m++) w[d + m] = c1 * w[s + m] + c2 * w[s + m + 1] + c3 * w[t + m] - c4 * w[t + m + 1];
  }
  const kDst = cls.kDst;
  const h2q = par[14];
  const rq = par[15];
  const h2pq = par[16];
  const kS1 = cls.kS1, kS2 = cls.kS2, kE1 = cls.kE1, kNf = cls.kNf, kNe = cls.kNe, kAx = cls.kAx, kM = cls.kM;
  for (let o = 0; o < kDst.length; o++) {
    const ax = kAx[o];
    const c1 = par[6 + ax];
    const c2 = par[9 + ax];
    const c3 = kNf[o] * h2q;
    const c4 = c3 * rq;
    const c5 = kNe[o] * h2pq;
    const d = kDst[o], s = kS1[o], t = kS2[o], u = kE1[o] + 1, mc = kM[o];
    for (let m = 0; m < mc; m++)
      w[d + m] = c1 * w[s + m] + c2 * w[s + m + 1] + c3 * w[t + m] - c4 * w[t + m + 1] + c5 * w[u + m];
  }
}

function hrrStep(st: HrrStep, src: Float64Array, srcOff: number, dst: Float64Array, inner: number,
  ab: Float64Array): void {
  const D = st.dst, U = st.srcUp, S = st.src, A = st.axis;
  for (let o = 0; o < D.length; o++) {
    const c = ab[A[o]];
    const d = D[o], u = U[o] + srcOff, s = S[o] + srcOff;
    for (let i = 0; i < inner; i++) dst[d + i] = src[u + i] + c * src[s + i];
  }
}

/** out[o * x + r] = Σ_i T[o][i] in[off + r * nin + i]  (transform last index, move it first). */
function applyLast(tr: SparseTransform, src: Float64Array, dst: Float64Array, x: number, off: number): void {
  const nin = tr.nin;
  for (let o = 0; o < tr.nout; o++) {
    const k0 = tr.start[o], k1 = tr.start[o + 1];
    const ob = o * x;
    if (k1 - k0 === 1) {
      const i0 = off + tr.idx[k0], v0 = tr.val[k0];
      for (let r = 0; r < x; r++) dst[ob + r] = v0 * src[r * nin + i0];
    } else {
      for (let r = 0; r < x; r++) {
        let s = 0;
        const rb = off + r * nin;
        for (let k = k0; k < k1; k++) s += tr.val[k] * src[rb + tr.idx[k]];
        dst[ob + r] = s;
      }
    }
  }
}
