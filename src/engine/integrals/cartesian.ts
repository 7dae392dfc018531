/**
 * Cartesian component bookkeeping shared by all integral code.
 *
 * Components of angular momentum l are x^i y^j z^k with i+j+k = l, in lexicographic order
 * with i descending, then j descending (x, y, z; xx, xy, xz, yy, yz, zz; …).
 * "Cumulative" indices number all components of levels 0, 1, 2, … consecutively:
 * cum(l) = l(l+1)(l+2)/6 is the first index of level l.
 */
import { ncart } from "../basis/types.ts";

export { ncart };

/** First cumulative index of level l. */
export function cumStart(l: number): number {
  return (l * (l + 1) * (l + 2)) / 6;
}

/** Index of (i, j, k) within its level l = i+j+k. */
export function cartIndex(i: number, j: number, k: number): number {
  const l = i + j + k;
  return ((l - i) * (l - i + 1)) / 2 + (l - i - j);
}

/** Exponent triples of level l in component order. */
export function cartComponents(l: number): [number, number, number][] {
  const out: [number, number, number][] = [];
  for (let i = l; i >= 0; i--) for (let j = l - i; j >= 0; j--) out.push([i, j, l - i - j]);
  return out;
}

/** Tables over cumulative indices 0 … cumStart(lmax+1)-1, built once per lmax. */
export interface CartTables {
  lmax: number;
  /** exponents: pow[3*c + axis] */
  pow: Int32Array;
  /** cumulative index of c + 1_axis: up[3*c + axis] (−1 beyond lmax) */
  up: Int32Array;
  /** cumulative index of c − 1_axis: down[3*c + axis] (−1 when the exponent is 0) */
  down: Int32Array;
  /** the axis used to build c from a lower level (first axis with a positive exponent) */
  buildAxis: Int32Array;
}

const tableCache: CartTables[] = [];

export function cartTables(lmax: number): CartTables {
  const hit = tableCache[lmax];
  if (hit) return hit;
  const n = cumStart(lmax + 1);
  const pow = new Int32Array(3 * n);
  const up = new Int32Array(3 * n).fill(-1);
  const down = new Int32Array(3 * n).fill(-1);
  const buildAxis = new Int32Array(n).fill(-1);
  const cum = (p: number[]) => cumStart(p[0] + p[1] + p[2]) + cartIndex(p[0], p[1], p[2]);
  for (let l = 0; l <= lmax; l++) {
    for (const c of cartComponents(l)) {
      const idx = cum(c);
      for (let ax = 0; ax < 3; ax++) {
        pow[3 * idx + ax] = c[ax];
        if (l < lmax) {
          const u = c.slice();
          u[ax]++;
          up[3 * idx + ax] = cum(u);
        }
        if (c[ax] > 0) {
          const d = c.slice();
          d[ax]--;
          down[3 * idx + ax] = cum(d);
        }
      }
      if (l > 0) buildAxis[idx] = c[0] > 0 ? 0 : c[1] > 0 ? 1 : 2;
    }
  }
  const t: CartTables = { lmax, pow, up, down, buildAxis };
  tableCache[lmax] = t;
  return t;
}

/** (2n−1)!! with (−1)!! = 1. */
export function doubleFactorial(n: number): number {
  let r = 1;
  for (let k = n; k > 1; k -= 2) r *= k;
  return r;
}
