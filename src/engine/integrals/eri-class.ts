/**
 * Per angular-momentum class (la lb | lc ld) with la ≥ lb, lc ≥ ld, la+lb ≥ lc+ld: the index
 * tables ("programs") that drive the recurrences of eri.ts. Built once per class and cached.
 *
 * Vertical recurrence (S. Obara, A. Saika, J. Chem. Phys. 84, 3963 (1986), eq. 39, in the
 * two-step form of M. Head-Gordon, J. A. Pople, J. Chem. Phys. 89, 5777 (1988), eqs. 6 and 7):
 *   [e+1_i,0|00]^(m) = PA_i [e0|00]^(m) + WP_i [e0|00]^(m+1)
 *                     + N_i(e)/(2p) ([e−1_i,0|00]^(m) − ρ/p [e−1_i,0|00]^(m+1))
 *   [e0|f+1_i,0]^(m) = QC_i [e0|f0]^(m) + WQ_i [e0|f0]^(m+1)
 *                     + N_i(f)/(2q) ([e0|f−1_i,0]^(m) − ρ/q [e0|f−1_i,0]^(m+1))
 *                     + N_i(e)/(2(p+q)) [e−1_i,0|f0]^(m+1)
 * Horizontal recurrence on contracted integrals (HGP 1988, eq. 18):
 *   (a, b+1_i| = (a+1_i, b| + AB_i (a, b|        and the same on the ket with CD.
 *
 * Work array layout: W[((f * NE) + e) * M + m], f and e cumulative Cartesian indices,
 * M = L + 1 auxiliary orders. Only the (e, f, m) that some target needs are computed:
 * e ≥ la_min − (Lcd − F) at ket level F, and m ≤ L − E − F.
 *
 * Shells may carry several angular momenta sharing exponents (Pople sp shells, merged by
 * shells.ts): a side of the class then spans la_min … la, and each combination of row
 * angular momenta (a "kind") uses its own slice e ∈ [la_r, la_r + lb_r] of the primitive
 * block, with its own horizontal recurrence.
 */
import { cartIndex, cartTables, cumStart, ncart } from "./cartesian.ts";

/** Ops of one horizontal-recurrence step, vectorised over `inner` trailing values. */
export interface HrrStep {
  /** entries of the step's output buffer */
  size: number;
  dst: Int32Array;
  srcUp: Int32Array;
  src: Int32Array;
  axis: Int32Array;
}

export interface EriClass {
  la: number;
  lb: number;
  lc: number;
  ld: number;
  L: number;
  M: number;
  NE: number;
  /** size of the work array */
  wsize: number;
  /** largest intermediate of the HRR and transform stages */
  scratch: number;
  /** bra VRR ops (f = 0) */
  bDst: Int32Array;
  bS1: Int32Array;
  bS2: Int32Array;
  bN: Float64Array;
  bAx: Int32Array;
  bM: Int32Array;
  /** ket VRR ops */
  kDst: Int32Array;
  kS1: Int32Array;
  kS2: Int32Array;
  kE1: Int32Array;
  kNf: Float64Array;
  kNe: Float64Array;
  kAx: Int32Array;
  kM: Int32Array;
  /** nE × nF primitive block gathered from W (e outer): gather[ei * nF + fi] = W index */
  gather: Int32Array;
  nE: number;
  nF: number;
  /** kinds of the bra (row angular momenta la_r, lb_r) and of the ket */
  braKinds: Kind[];
  ketKinds: Kind[];
  /** HRR programs per kind combination, index braKind · ketKinds.length + ketKind */
  hrr: { bra: HrrStep[]; ket: HrrStep[] }[];
}

/** One combination of row angular momenta of a pair: (l1, l2) and its slice of e (or f). */
export interface Kind {
  l1: number;
  l2: number;
  /** first index of the slice within the class's e (f) range, and its length */
  start: number;
  size: number;
}

/**
 * Kinds of a pair side with shells spanning l1min … l1 and l2min … l2, index
 * (l1_r − l1min)·(l2 − l2min + 1) + (l2_r − l2min) (see shell-pairs.ts rowKind).
 */
function kinds(l1min: number, l1: number, l2min: number, l2: number): Kind[] {
  const out: Kind[] = [];
  const base = cumStart(l1min);
  for (let a = l1min; a <= l1; a++)
    for (let b = l2min; b <= l2; b++)
      out.push({ l1: a, l2: b, start: cumStart(a) - base, size: cumStart(a + b + 1) - cumStart(a) });
  return out;
}

const hrrCache = new Map<number, HrrStep[]>();

/** hrrProgram, cached (keyed by l1, l2 and the inner length). */
export function hrrFor(l1: number, l2: number, inner: number): HrrStep[] {
  const key = (inner * 16 + l1) * 16 + l2;
  let h = hrrCache.get(key);
  if (!h) {
    h = hrrProgram(l1, l2, inner);
    hrrCache.set(key, h);
  }
  return h;
}

/** Steps turning [e = la … la+lb] × inner into [a (level la)][b (level lb)] × inner. */
export function hrrProgram(la: number, lb: number, inner: number): HrrStep[] {
  const tab = cartTables(la + lb + 1);
  const base = cumStart(la);
  const steps: HrrStep[] = [];
  for (let B = 1; B <= lb; B++) {
    const nA = cumStart(la + lb - B + 1) - base;
    const nb = ncart(B);
    const nbPrev = ncart(B - 1);
    const dst: number[] = [];
    const srcUp: number[] = [];
    const src: number[] = [];
    const axis: number[] = [];
    for (let ar = 0; ar < nA; ar++) {
      const acum = base + ar;
      for (let bi = 0; bi < nb; bi++) {
        const bcum = cumStart(B) + bi;
        const ax = tab.buildAxis[bcum];
        const bs = tab.down[3 * bcum + ax] - cumStart(B - 1);
        const aup = tab.up[3 * acum + ax] - base;
        dst.push((ar * nb + bi) * inner);
        srcUp.push((aup * nbPrev + bs) * inner);
        src.push((ar * nbPrev + bs) * inner);
        axis.push(ax);
      }
    }
    steps.push({
      size: nA * nb * inner,
      dst: Int32Array.from(dst),
      srcUp: Int32Array.from(srcUp),
      src: Int32Array.from(src),
      axis: Int32Array.from(axis),
    });
  }
  return steps;
}

const cache = new Map<number, EriClass>();

/**
 * The class of a bra with shells spanning lamin … la and lbmin … lb and a ket with lcmin … lc
 * and ldmin … ld (ordinary shells: lmin = l). Requires la ≥ lb, lc ≥ ld, la+lb ≥ lc+ld.
 */
export function eriClass(
  la: number, lb: number, lc: number, ld: number,
  lamin = la, lbmin = lb, lcmin = lc, ldmin = ld,
): EriClass {
  const key = ((((((la * 8 + lb) * 8 + lc) * 8 + ld) * 8 + lamin) * 8 + lbmin) * 8 + lcmin) * 8 + ldmin;
  const hit = cache.get(key);
  if (hit) return hit;
  const Lab = la + lb;
  const Lcd = lc + ld;
  const L = Lab + Lcd;
  const M = L + 1;
  const tab = cartTables(Math.max(L, 1));
  const NE = cumStart(Lab + 1);
  const NF = cumStart(Lcd + 1);
  const W = (f: number, e: number) => (f * NE + e) * M;
  const levelOf = (c: number) => tab.pow[3 * c] + tab.pow[3 * c + 1] + tab.pow[3 * c + 2];

  // bra VRR at f = 0 for e levels 1 … Lab, m ≤ L − E
  const bDst: number[] = [], bS1: number[] = [], bS2: number[] = [], bN: number[] = [], bAx: number[] = [], bM: number[] = [];
  for (let E = 1; E <= Lab; E++) {
    for (let c = cumStart(E); c < cumStart(E + 1); c++) {
      const ax = tab.buildAxis[c];
      const s1 = tab.down[3 * c + ax];
      const n1 = tab.pow[3 * s1 + ax];
      const s2 = n1 > 0 ? tab.down[3 * s1 + ax] : s1;
      bDst.push(W(0, c));
      bS1.push(W(0, s1));
      bS2.push(W(0, s2));
      bN.push(n1);
      bAx.push(ax);
      bM.push(L - E + 1);
    }
  }
  // ket VRR for f levels 1 … Lcd
  const kDst: number[] = [], kS1: number[] = [], kS2: number[] = [], kE1: number[] = [];
  const kNf: number[] = [], kNe: number[] = [], kAx: number[] = [], kM: number[] = [];
  for (let F = 1; F <= Lcd; F++) {
    const eLo = cumStart(Math.max(0, lamin - (Lcd - F)));
    for (let d = cumStart(F); d < cumStart(F + 1); d++) {
      const ax = tab.buildAxis[d];
      const t1 = tab.down[3 * d + ax];
      const nf = tab.pow[3 * t1 + ax];
      const t2 = nf > 0 ? tab.down[3 * t1 + ax] : t1;
      for (let e = eLo; e < NE; e++) {
        const E = levelOf(e);
        const mc = L - E - F + 1;
        if (mc <= 0) continue;
        const ne = tab.pow[3 * e + ax];
        const e1 = ne > 0 ? tab.down[3 * e + ax] : e;
        kDst.push(W(d, e));
        kS1.push(W(t1, e));
        kS2.push(W(t2, e));
        kE1.push(W(t1, e1));
        kNf.push(nf);
        kNe.push(ne);
        kAx.push(ax);
        kM.push(mc);
      }
    }
  }
  const eLo = cumStart(lamin);
  const fLo = cumStart(lcmin);
  const nE = NE - eLo;
  const nF = NF - fLo;
  const gather = new Int32Array(nE * nF);
  for (let ei = 0; ei < nE; ei++) for (let fi = 0; fi < nF; fi++) gather[ei * nF + fi] = W(fLo + fi, eLo + ei);
  const braKinds = kinds(lamin, la, lbmin, lb);
  const ketKinds = kinds(lcmin, lc, ldmin, ld);
  let scratch = nE * nF;
  const hrr: { bra: HrrStep[]; ket: HrrStep[] }[] = [];
  for (const kb of braKinds)
    for (const kk of ketKinds) {
      const nab = ncart(kb.l1) * ncart(kb.l2);
      scratch = Math.max(scratch, nab * ncart(kk.l1) * ncart(kk.l2));
      const h = { bra: hrrFor(kb.l1, kb.l2, kk.size), ket: hrrFor(kk.l1, kk.l2, nab) };
      for (const st of [...h.bra, ...h.ket]) scratch = Math.max(scratch, st.size);
      hrr.push(h);
    }
  const cls: EriClass = {
    la, lb, lc, ld, L, M, NE,
    wsize: NF * NE * M,
    scratch,
    bDst: Int32Array.from(bDst), bS1: Int32Array.from(bS1), bS2: Int32Array.from(bS2),
    bN: Float64Array.from(bN), bAx: Int32Array.from(bAx), bM: Int32Array.from(bM),
    kDst: Int32Array.from(kDst), kS1: Int32Array.from(kS1), kS2: Int32Array.from(kS2), kE1: Int32Array.from(kE1),
    kNf: Float64Array.from(kNf), kNe: Float64Array.from(kNe), kAx: Int32Array.from(kAx), kM: Int32Array.from(kM),
    gather, nE, nF,
    braKinds,
    ketKinds,
    hrr,
  };
  cache.set(key, cls);
  return cls;
}

export { cartIndex };
