/**
 * McMurchie–Davidson Hermite machinery (L. E. McMurchie, E. R. Davidson, J. Comput. Phys. 26,
 * 218 (1978); recurrences as in T. Helgaker, P. Jørgensen, J. Olsen, Molecular
 * Electronic-Structure Theory (2000), eqs. 9.5.6–9.5.7 and 9.9.18–9.9.20):
 *   E^{i+1,j}_t = E^{ij}_{t−1}/(2p) + X_PA E^{ij}_t + (t+1) E^{ij}_{t+1},   E^{00}_0 = exp(−μ X_AB²)
 *   E^{i,j+1}_t = E^{ij}_{t−1}/(2p) + X_PB E^{ij}_t + (t+1) E^{ij}_{t+1}
 *   R^n_{000} = (−2p)^n F_n(p R_PC²),  R^n_{t+1,u,v} = t R^{n+1}_{t−1,u,v} + X_PC R^{n+1}_{tuv}
 */
import { boys } from "./boys.ts";

export class HermiteWork {
  readonly lmax: number;
  ex: Float64Array;
  ey: Float64Array;
  ez: Float64Array;
  /** R^n_{tuv} for all n: rn[((n * N + t) * N + u) * N + v], N = lmax + 1 */
  rn: Float64Array;
  f: Float64Array;
  constructor(lmax: number) {
    this.lmax = lmax;
    const n = lmax + 1;
    const h = lmax; // each shell up to lmax/2 is enough, but keep it simple
    this.ex = new Float64Array((h + 1) * (h + 1) * (n + 1));
    this.ey = new Float64Array(this.ex.length);
    this.ez = new Float64Array(this.ex.length);
    this.rn = new Float64Array(n * n * n * n);
    this.f = new Float64Array(n + 1);
  }
}

/**
 * E^{ij}_t for i ≤ la, j ≤ lb, t ≤ i+j into out[i*(lb+1)*(la+lb+1) + j*(la+lb+1) + t].
 * xab = A_x − B_x.
 */
export function hermiteE(la: number, lb: number, a: number, b: number, xab: number, out: Float64Array): Float64Array {
  const p = a + b;
  const nt = la + lb + 1;
  const js = (lb + 1) * nt;
  const xpa = (-b / p) * xab;
  const xpb = (a / p) * xab;
  const h = 0.5 / p;
  out.fill(0, 0, (la + 1) * js);
  out[0] = Math.exp(-((a * b) / p) * xab * xab);
  for (let i = 0; i <= la; i++) {
    for (let j = 0; j <= lb; j++) {
      if (i === 0 && j === 0) continue;
      // build from (i−1, j) when i > 0, else from (i, j−1)
      const src = i > 0 ? (i - 1) * js + j * nt : i * js + (j - 1) * nt;
      const x = i > 0 ? xpa : xpb;
      const dst = i * js + j * nt;
      const tmax = i + j;
      for (let t = 0; t <= tmax; t++) {
        let v = x * out[src + t];
        if (t > 0) v += h * out[src + t - 1];
        if (t + 1 <= tmax - 1) v += (t + 1) * out[src + t + 1];
        out[dst + t] = v;
      }
    }
  }
  return out;
}

/**
 * R^0_{tuv}(p, PC) for t+u+v ≤ L; returns w.rn, which holds it at [(t*N + u)*N + v],
 * N = w.lmax + 1 (the n = 0 block; entries beyond it are intermediates).
 */
export function hermiteR(L: number, p: number, xpc: number, ypc: number, zpc: number, w: HermiteWork): Float64Array {
  const N = w.lmax + 1;
  const rn = w.rn;
  const T = p * (xpc * xpc + ypc * ypc + zpc * zpc);
  boys(L, T, w.f);
  let fac = 1;
  for (let n = 0; n <= L; n++) {
    rn[n * N * N * N] = fac * w.f[n];
    fac *= -2 * p;
  }
  // build by total order k = t+u+v, for n ≤ L − k
  for (let k = 1; k <= L; k++) {
    for (let n = 0; n <= L - k; n++) {
      const base = n * N * N * N;
      const up = (n + 1) * N * N * N;
      for (let t = 0; t <= k; t++) {
        for (let u = 0; u <= k - t; u++) {
          const v = k - t - u;
          let val: number;
          if (t > 0) {
            val = xpc * rn[up + ((t - 1) * N + u) * N + v];
            if (t > 1) val += (t - 1) * rn[up + ((t - 2) * N + u) * N + v];
          } else if (u > 0) {
            val = ypc * rn[up + (t * N + u - 1) * N + v];
            if (u > 1) val += (u - 1) * rn[up + (t * N + u - 2) * N + v];
          } else {
            val = zpc * rn[up + (t * N + u) * N + v - 1];
            if (v > 1) val += (v - 1) * rn[up + (t * N + u) * N + v - 2];
          }
          rn[base + (t * N + u) * N + v] = val;
        }
      }
    }
  }
  return rn; // its n = 0 block comes first
}
