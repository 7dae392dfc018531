/**
 * Precomputed shell-pair data for two-electron integrals: everything that depends on one pair
 * of shells only, computed once per basis and reused by every quartet that pair enters.
 *
 * Orientation: a pair is stored with la ≥ lb (the horizontal recurrence moves angular
 * momentum from A to B, cheapest that way), and for equal l with the tighter shell (larger
 * largest exponent) as A: building a tight B from a diffuse A by the horizontal recurrence
 * loses digits (measured: 1e-12 relative on (gg|gg) blocks, 2e-15 the other way round).
 * `swapped` says the pair's A is the caller's second shell.
 */
import type { PreparedShell } from "./shells.ts";

/** Primitive pairs whose weighted overlap falls below this are numerically zero. */
export const PRIMITIVE_PAIR_CUTOFF = 1e-20;
/** √2 π^{5/4}: with K = this·exp(−μR²)/p per pair, (ss|ss) = K_ab K_cd F_0(T) / √(p+q). */
const PAIR_PREFACTOR = Math.SQRT2 * Math.PI ** 1.25;

export interface ShellPair {
  a: PreparedShell;
  b: PreparedShell;
  /** indices of a and b in the basis */
  ia: number;
  ib: number;
  swapped: boolean;
  /** surviving primitive pairs */
  nprim: number;
  p: Float64Array;
  /** P − A per primitive pair, xyz interleaved */
  pa: Float64Array;
  /** P per primitive pair, xyz interleaved */
  pc: Float64Array;
  /** √2 π^{5/4} exp(−μ R_AB²) / p, times the contraction coefficients when `segmented` */
  k: Float64Array;
  /**
   * Size estimate of each primitive pair's share: |k| times the largest contraction
   * coefficient product times (|PA| + 1/√p)^la (|PB| + 1/√p)^lb (at least 1 each), the reach
   * of the polynomial factors. A primitive quartet contributes about bound_ab · bound_cd /
   * √(p+q) at most ([00|00] with F_0 ≤ 1 is exactly that without the polynomial factors).
   */
  bound: Float64Array;
  /** the largest bound and the smallest p over the primitive pairs */
  maxBound: number;
  minP: number;
  /** A − B (a typed array, so passing it on boxes no number) */
  ab: Float64Array;
  /** rows of the pair = a.ncontr × b.ncontr, row index ra·b.ncontr + rb */
  nrows: number;
  /** kind of each row (its pair of row angular momenta; see eri-class.ts kinds) */
  rowKind: Int32Array;
  /** one contracted function on each side: coefficients folded into k */
  segmented: boolean;
  /** general contractions: combos of primitive pair q are comboRow/comboCoef[comboStart[q] … comboStart[q+1]) */
  comboStart: Int32Array;
  comboRow: Int32Array;
  comboCoef: Float64Array;
  /** Cauchy–Schwarz factor √max|(ab|ab)|, filled by the screening pass */
  schwarz: number;
  /** the pair's angular-momentum type, ((la·8 + la_min)·8 + lb)·8 + lb_min */
  lkey: number;
  /** small per-engine index of lkey (−1 until an engine assigns it) */
  tid: number;
}

function maxExponent(s: PreparedShell): number {
  let m = 0;
  for (let i = 0; i < s.nprim; i++) if (s.exps[i] > m) m = s.exps[i];
  return m;
}

export function makeShellPair(s1: PreparedShell, i1: number, s2: PreparedShell, i2: number): ShellPair {
  const swapped = s2.l > s1.l || (s2.l === s1.l && maxExponent(s2) > maxExponent(s1));
  const a = swapped ? s2 : s1;
  const b = swapped ? s1 : s2;
  const abx = a.x - b.x;
  const aby = a.y - b.y;
  const abz = a.z - b.z;
  const r2 = abx * abx + aby * aby + abz * abz;
  const nrows = a.ncontr * b.ncontr;
  const rowKind = new Int32Array(nrows);
  for (let ra = 0; ra < a.ncontr; ra++)
    for (let rb = 0; rb < b.ncontr; rb++)
      rowKind[ra * b.ncontr + rb] = (a.rowL[ra] - a.lmin) * (b.l - b.lmin + 1) + (b.rowL[rb] - b.lmin);
  const segmented = nrows === 1;
  const p: number[] = [];
  const pa: number[] = [];
  const pc: number[] = [];
  const k: number[] = [];
  const bound: number[] = [];
  const comboStart: number[] = [0];
  const comboRow: number[] = [];
  const comboCoef: number[] = [];
  for (let i = 0; i < a.nprim; i++) {
    const ea = a.exps[i];
    for (let j = 0; j < b.nprim; j++) {
      const eb = b.exps[j];
      const pp = ea + eb;
      const ex = Math.exp(-((ea * eb) / pp) * r2);
      // weighted overlap of the two primitives (normalized-primitive scale) bounds their share
      let cmax = 0;
      for (let ra = 0; ra < a.ncontr; ra++)
        for (let rb = 0; rb < b.ncontr; rb++)
          cmax = Math.max(cmax, Math.abs(a.coef[ra * a.nprim + i] * b.coef[rb * b.nprim + j]));
      const size = cmax * ex * (Math.PI / pp) ** 1.5;
      if (!(size > PRIMITIVE_PAIR_CUTOFF)) continue;
      const Px = (ea * a.x + eb * b.x) / pp;
      const Py = (ea * a.y + eb * b.y) / pp;
      const Pz = (ea * a.z + eb * b.z) / pp;
      p.push(pp);
      pa.push(Px - a.x, Py - a.y, Pz - a.z);
      pc.push(Px, Py, Pz);
      let kk = (PAIR_PREFACTOR * ex) / pp;
      // the polynomial parts x_A^la x_B^lb over a Gaussian of width 1/√p centred at P
      const w = 1 / Math.sqrt(pp);
      const fa = Math.max(1, (Math.hypot(Px - a.x, Py - a.y, Pz - a.z) + w) ** a.l);
      const fb = Math.max(1, (Math.hypot(Px - b.x, Py - b.y, Pz - b.z) + w) ** b.l);
      bound.push(Math.abs(kk) * cmax * fa * fb);
      if (segmented) kk *= a.coef[i] * b.coef[j];
      else {
        for (let ra = 0; ra < a.ncontr; ra++) {
          const ca = a.coef[ra * a.nprim + i];
          if (ca === 0) continue;
          for (let rb = 0; rb < b.ncontr; rb++) {
            const c = ca * b.coef[rb * b.nprim + j];
            if (c === 0) continue;
            comboRow.push(ra * b.ncontr + rb);
            comboCoef.push(c);
          }
        }
        comboStart.push(comboRow.length);
      }
      k.push(kk);
    }
  }
  return {
    a,
    b,
    ia: swapped ? i2 : i1,
    ib: swapped ? i1 : i2,
    swapped,
    nprim: p.length,
    p: Float64Array.from(p),
    pa: Float64Array.from(pa),
    pc: Float64Array.from(pc),
    k: Float64Array.from(k),
    bound: Float64Array.from(bound),
    maxBound: bound.reduce((m, x) => Math.max(m, x), 0),
    minP: p.reduce((m, x) => Math.min(m, x), Infinity),
    ab: Float64Array.of(abx, aby, abz),
    nrows,
    rowKind,
    segmented,
    comboStart: Int32Array.from(comboStart),
    comboRow: Int32Array.from(comboRow),
    comboCoef: Float64Array.from(comboCoef),
    schwarz: Infinity,
    lkey: ((a.l * 8 + a.lmin) * 8 + b.l) * 8 + b.lmin,
    tid: -1,
  };
}
