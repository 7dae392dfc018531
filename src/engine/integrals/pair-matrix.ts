/**
 * The shared skeleton of one-electron integrals: loop over shell pairs (a ≥ b), primitive
 * pairs, contraction rows and Cartesian→function transforms, filling symmetric (or, for
 * operators that are antisymmetric, caller-handled) nbf × nbf matrices.
 */
import { ncart } from "./cartesian.ts";
import type { PreparedBasis, PreparedShell } from "./shells.ts";
import { componentTransform } from "./spherical.ts";

/**
 * Fills out[op * ncart(la) * ncart(lb) + ca * ncart(lb) + cb] with the integrals of one
 * primitive pair (no contraction coefficients), for `nops` operators at once.
 */
export type PrimitivePairKernel = (
  a: number,
  sa: PreparedShell,
  b: number,
  sb: PreparedShell,
  out: Float64Array,
) => void;

/** Row-major nbf × nbf matrices, one per operator, filled from a primitive kernel. */
export function pairMatrices(basis: PreparedBasis, nops: number, kernel: PrimitivePairKernel): Float64Array[] {
  const n = basis.nbf;
  const mats = Array.from({ length: nops }, () => new Float64Array(n * n));
  const maxc = ncart(basis.maxL);
  const prim = new Float64Array(nops * maxc * maxc);
  const contracted = new Float64Array(nops * maxc * maxc * 64);
  const half = new Float64Array(maxc * maxc);
  const full = new Float64Array(maxc * maxc);
  const shells = basis.shells;
  for (let i = 0; i < shells.length; i++) {
    const sa = shells[i];
    for (let j = 0; j <= i; j++) {
      const sb = shells[j];
      const na = ncart(sa.l);
      const nb = ncart(sb.l);
      const blk = na * nb;
      const nrows = sa.ncontr * sb.ncontr;
      const need = nops * nrows * blk;
      const acc = need <= contracted.length ? contracted : new Float64Array(need);
      acc.fill(0, 0, need);
      for (let pa = 0; pa < sa.nprim; pa++) {
        for (let pb = 0; pb < sb.nprim; pb++) {
          kernel(sa.exps[pa], sa, sb.exps[pb], sb, prim);
          for (let ra = 0; ra < sa.ncontr; ra++) {
            const ca = sa.coef[ra * sa.nprim + pa];
            if (ca === 0) continue;
            for (let rb = 0; rb < sb.ncontr; rb++) {
              const c = ca * sb.coef[rb * sb.nprim + pb];
              if (c === 0) continue;
              const base = (ra * sb.ncontr + rb) * blk;
              for (let op = 0; op < nops; op++) {
                const o = op * nrows * blk + base;
                const s = op * blk;
                for (let k = 0; k < blk; k++) acc[o + k] += c * prim[s + k];
              }
            }
          }
        }
      }
      const ta = componentTransform(sa.l, sa.pure);
      const tb = componentTransform(sb.l, sb.pure);
      for (let op = 0; op < nops; op++) {
        const m = mats[op];
        for (let ra = 0; ra < sa.ncontr; ra++) {
          for (let rb = 0; rb < sb.ncontr; rb++) {
            const src = op * nrows * blk + (ra * sb.ncontr + rb) * blk;
            // half[ca][fb] = Σ_cb acc[ca][cb] tb[fb][cb]
            for (let ca = 0; ca < na; ca++)
              for (let fb = 0; fb < tb.ncomp; fb++) {
                let s = 0;
                for (let cb = 0; cb < nb; cb++) s += acc[src + ca * nb + cb] * tb.matrix[fb * nb + cb];
                half[ca * tb.ncomp + fb] = s;
              }
            for (let fa = 0; fa < ta.ncomp; fa++)
              for (let fb = 0; fb < tb.ncomp; fb++) {
                let s = 0;
                for (let ca = 0; ca < na; ca++) s += ta.matrix[fa * na + ca] * half[ca * tb.ncomp + fb];
                full[fa * tb.ncomp + fb] = s;
              }
            const ia0 = sa.offset + ra * ta.ncomp;
            const ib0 = sb.offset + rb * tb.ncomp;
            for (let fa = 0; fa < ta.ncomp; fa++)
              for (let fb = 0; fb < tb.ncomp; fb++) {
                const v = full[fa * tb.ncomp + fb];
                m[(ia0 + fa) * n + ib0 + fb] = v;
                m[(ib0 + fb) * n + ia0 + fa] = v;
              }
          }
        }
      }
    }
  }
  return mats;
}
