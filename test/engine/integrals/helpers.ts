/**
 * Test-only helpers for the integral suite: seeded randomness, shell construction, small dense
 * linear algebra (Jacobi eigenvalues), and independent special functions (erf, Gauss–Legendre
 * nodes) written without any engine code, so that they can serve as cross-checks.
 */
import type { Shell } from "../../../src/engine/basis/types.ts";

/** Deterministic PRNG (mulberry32, common practice, no source); returns floats in [0, 1). */
export function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export type Vec3 = [number, number, number];

/** A Shell as stored by buildBasis: coefficients refer to normalized primitives. */
export function shell(l: number, center: Vec3, exponents: number[], coefficients: number[][], pure = false, atom = 0): Shell {
  return {
    l,
    pure,
    atom,
    center: [center[0], center[1], center[2]],
    exponents: Float64Array.from(exponents),
    coefficients: coefficients.map((r) => Float64Array.from(r)),
  };
}

/** One primitive, coefficient 1. */
export function primShell(l: number, center: Vec3, exponent: number, pure = false, atom = 0): Shell {
  return shell(l, center, [exponent], [[1]], pure, atom);
}

/**
 * A random shell: exponents log-uniform in [0.15, 6] (spread so the contraction rows are
 * linearly independent), coefficients uniform in [−1, 1] with the first row's leading
 * coefficient kept away from zero. nrows > 1 gives a general contraction.
 */
export function randomShell(r: () => number, l: number, center: Vec3, nprim: number, nrows: number, pure: boolean, atom = 0): Shell {
  const exps: number[] = [];
  for (let i = 0; i < nprim; i++) exps.push(0.15 * Math.exp(Math.log(40) * ((i + r()) / nprim)));
  const rows: number[][] = [];
  for (let k = 0; k < nrows; k++) {
    const row: number[] = [];
    for (let i = 0; i < nprim; i++) row.push(i === k ? 1 + r() : 2 * r() - 1);
    rows.push(row);
  }
  return shell(l, center, exps, rows, pure, atom);
}

export function randomPoint(r: () => number, scale = 1.5): Vec3 {
  return [scale * (2 * r() - 1), scale * (2 * r() - 1), scale * (2 * r() - 1)];
}

/** max |a − b| / max |b| (b the reference). */
export function relMaxDiff(a: ArrayLike<number>, b: ArrayLike<number>, n = b.length): number {
  let d = 0;
  let m = 0;
  for (let i = 0; i < n; i++) {
    d = Math.max(d, Math.abs(a[i] - b[i]));
    m = Math.max(m, Math.abs(b[i]));
  }
  return m === 0 ? d : d / m;
}

/** Eigenvalues (ascending) of a symmetric n×n row-major matrix by cyclic Jacobi rotations. */
export function symmetricEigenvalues(m: ArrayLike<number>, n: number): number[] {
  const a = Float64Array.from({ length: n * n }, (_, k) => m[k]);
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += a[i * n + i] ** 2;
      for (let j = i + 1; j < n; j++) off += a[i * n + j] ** 2;
    }
    if (off <= 1e-32 * diag) break;
    for (let p = 0; p < n; p++)
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        const theta = (a[q * n + q] - a[p * n + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
      }
  }
  const ev: number[] = [];
  for (let i = 0; i < n; i++) ev.push(a[i * n + i]);
  return ev.sort((x, y) => x - y);
}

/** C = A B for row-major A (n×k), B (k×m). */
export function matmul(A: ArrayLike<number>, B: ArrayLike<number>, n: number, k: number, m: number): Float64Array {
  const C = new Float64Array(n * m);
  for (let i = 0; i < n; i++)
    for (let l = 0; l < k; l++) {
      const a = A[i * k + l];
      if (a === 0) continue;
      for (let j = 0; j < m; j++) C[i * m + j] += a * B[l * m + j];
    }
  return C;
}

export function transpose(A: ArrayLike<number>, n: number, m: number): Float64Array {
  const T = new Float64Array(n * m);
  for (let i = 0; i < n; i++) for (let j = 0; j < m; j++) T[j * n + i] = A[i * m + j];
  return T;
}

/**
 * erf(x) for x ≥ 0, independent of the engine, accurate to a few ulps:
 *  - x < 3: erf(x) = 2/√π e^{−x²} Σ_n 2^n x^{2n+1} / (1·3·…·(2n+1))  (Abramowitz & Stegun 7.1.6;
 *    all terms positive, no cancellation);
 *  - x ≥ 3: erfc(x) by the continued fraction erfc(x) = e^{−x²}/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + …)))))
 *    (A&S 7.1.14), evaluated bottom-up with enough terms; then erf = 1 − erfc.
 */
export function erf(x: number): number {
  if (x < 0) return -erf(-x);
  if (x < 3) {
    const x2 = x * x;
    const e = expNegSquare(x);
    let term = x;
    let sum = x;
    for (let n = 1; n < 500; n++) {
      term *= (2 * x2) / (2 * n + 1);
      sum += term;
      if (term < 1e-18 * sum) break;
    }
    return (2 / Math.sqrt(Math.PI)) * e * sum;
  }
  return 1 - erfc(x);
}

export function erfc(x: number): number {
  if (x < 3) return 1 - erf(x);
  let f = x;
  for (let k = 200; k >= 1; k--) f = x + k / 2 / f;
  return expNegSquare(x) / Math.sqrt(Math.PI) / f;
}

/**
 * e^{−x²} with x² carried exactly (two-product): plain Math.exp(−x*x) loses up to x²·2^-53
 * relative through the rounding of x*x (≈1e-15 at x = 3).
 */
export function expNegSquare(x: number): number {
  const [s, sl] = twoProduct(x, x);
  return Math.exp(-s) * (1 - sl);
}

// ---- double-double arithmetic (Dekker 1971 / Knuth TwoSum; common practice, no source) ----
type DD = [number, number];
function twoSum(a: number, b: number): DD {
  const s = a + b;
  const bb = s - a;
  return [s, a - (s - bb) + (b - bb)];
}
function split(x: number): DD {
  const c = 134217729 * x; // 2^27 + 1
  const hi = c - (c - x);
  return [hi, x - hi];
}
/** a·b = p + e exactly */
export function twoProduct(a: number, b: number): DD {
  const p = a * b;
  const [ah, al] = split(a);
  const [bh, bl] = split(b);
  return [p, ah * bh - p + ah * bl + al * bh + al * bl];
}
function ddAdd(a: DD, b: DD): DD {
  const [s, e] = twoSum(a[0], b[0]);
  return twoSum(s, e + a[1] + b[1]);
}
function ddMul(a: DD, b: DD): DD {
  const [p, e] = twoProduct(a[0], b[0]);
  return twoSum(p, e + a[0] * b[1] + a[1] * b[0]);
}
function ddScale(a: DD, k: number): DD {
  const [p, e] = twoProduct(a[0], k);
  return twoSum(p, e + a[1] * k);
}
function ddDivNum(a: DD, k: number): DD {
  const q1 = a[0] / k;
  const r = ddAdd(a, ddScale([q1, 0], -k));
  return twoSum(q1, (r[0] + r[1]) / k);
}
function ddDiv(a: DD, b: DD): DD {
  const q1 = a[0] / b[0];
  const r = ddAdd(a, ddScale(b, -q1));
  return twoSum(q1, (r[0] + r[1]) / b[0]);
}

/**
 * Gauss–Legendre rule on [−1, 1] (common practice, no source): Newton iteration on P_n by the
 * three-term recurrence, carried out in double-double arithmetic so that the nodes, 1 ± x and
 * the weights w = 2(1 − x²)/(n P_{n−1}(x))² are correct to the last bit. (In plain doubles the
 * weights near the ends inherit ~1e-14 relative errors from the node's last-bit error and
 * from 1 − x², which is too much for 1e-15 reference values.)
 * Returns the nodes x, 1 + x and 1 − x (each accurately rounded), and the weights.
 */
export function gaussLegendre(n: number): { x: Float64Array; xp: Float64Array; xm: Float64Array; w: Float64Array } {
  const x = new Float64Array(n);
  const xp = new Float64Array(n);
  const xm = new Float64Array(n);
  const w = new Float64Array(n);
  const legendre = (z: DD): [DD, DD] => {
    let p0: DD = [1, 0];
    let p1: DD = z;
    for (let k = 2; k <= n; k++) {
      const p2 = ddDivNum(ddAdd(ddScale(ddMul(z, p1), 2 * k - 1), ddScale(p0, -(k - 1))), k);
      p0 = p1;
      p1 = p2;
    }
    return [p1, p0]; // P_n, P_{n−1}
  };
  for (let i = 0; i < Math.floor(n / 2); i++) {
    let z: DD = [Math.cos((Math.PI * (i + 0.75)) / (n + 0.5)), 0]; // root i of P_n counted from x = 1
    for (let it = 0; it < 60; it++) {
      const [pn, pn1] = legendre(z);
      const zd = z[0];
      const dp = (n * (zd * pn[0] - pn1[0])) / (zd * zd - 1); // P_n'(z), double precision is enough
      const dz = (pn[0] + pn[1]) / dp;
      z = ddAdd(z, [-dz, 0]);
      if (Math.abs(dz) < 1e-30) break;
    }
    const [, pn1] = legendre(z);
    const oneMinus = ddAdd([1, 0], [-z[0], -z[1]]);
    const onePlus = ddAdd([1, 0], z);
    const wdd = ddDiv(ddScale(ddMul(oneMinus, onePlus), 2), ddMul(ddScale(pn1, n), ddScale(pn1, n)));
    const wi = wdd[0] + wdd[1];
    x[n - 1 - i] = z[0] + z[1];
    xp[n - 1 - i] = onePlus[0] + onePlus[1];
    xm[n - 1 - i] = oneMinus[0] + oneMinus[1];
    x[i] = -x[n - 1 - i];
    xp[i] = xm[n - 1 - i];
    xm[i] = xp[n - 1 - i];
    w[i] = w[n - 1 - i] = wi;
  }
  if (n % 2 === 1) {
    // the middle node x = 0: w = 2 / (n P_{n−1}(0))²
    const [, pn1] = legendre([0, 0]);
    const m = (n - 1) / 2;
    const v = n * (pn1[0] + pn1[1]);
    x[m] = 0;
    xp[m] = xm[m] = 1;
    w[m] = 2 / (v * v);
  }
  return { x, xp, xm, w };
}

/** F_0(t) = ½ √(π/t) erf(√t) (exact analytic result), with the independent erf above; F_0(0) = 1. */
export function boysF0(t: number): number {
  if (t === 0) return 1;
  return 0.5 * Math.sqrt(Math.PI / t) * erf(Math.sqrt(t));
}
