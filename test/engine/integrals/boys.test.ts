import { describe, expect, it } from "vitest";
import { boys, boys0, BOYS_MAX_ORDER } from "../../../src/engine/integrals/boys.ts";
import { erf, gaussLegendre, twoProduct } from "./helpers.ts";

/** F_0(t) = ½ √(π/t) erf(√t) (exact analytic result), with the independent erf of helpers.ts. */
function f0Closed(t: number): number {
  if (t === 0) return 1;
  return 0.5 * Math.sqrt(Math.PI / t) * erf(Math.sqrt(t));
}

/** e^{−T t²} with T t² carried in double-double, so that only exp's own ulp error is left. */
function expMinusTt2(T: number, t: number): number {
  const [s, sl] = twoProduct(t, t);
  const [p, pl] = twoProduct(T, s);
  const d = pl + T * sl; // tiny correction to the argument
  return Math.exp(-p) * (1 - d + 0.5 * d * d);
}

/**
 * F_m(T) = ∫_0^1 t^{2m} e^{−T t²} dt by composite Gauss–Legendre quadrature (nodes from helpers.ts),
 * `panels` equal panels of `nodes` points, Neumaier-compensated summation (positive terms).
 * `panels` must be a power of two: then the panel width and ends are exact, and no rounding
 * error common to all nodes (which t^{2m} would amplify 2m-fold) enters.
 */
function boysQuadrature(m: number, T: number, panels: number, nodes: number): number {
  const { x, xp, xm, w } = gaussLegendre(nodes);
  let sum = 0;
  let comp = 0;
  const h = 1 / panels;
  for (let k = 0; k < panels; k++) {
    const a = k * h;
    for (let i = 0; i < nodes; i++) {
      // t from the nearer panel end, with 1 ± x accurate
      const t = x[i] < 0 ? a + 0.5 * h * xp[i] : a + h - 0.5 * h * xm[i];
      const v = 0.5 * h * w[i] * t ** (2 * m) * expMinusTt2(T, t);
      const s = sum + v;
      comp += Math.abs(sum) >= Math.abs(v) ? sum - s + v : v - s + sum;
      sum = s;
    }
  }
  return sum + comp;
}

function logGrid(lo: number, hi: number, n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(lo * (hi / lo) ** (i / (n - 1)));
  return out;
}

/** arguments spanning the Taylor table (T < 64), its edge, and the asymptotic branch */
const EDGE = [63.9, 63.95, 63.99, 63.999999, 64 - 1e-12, 64, 64 + 1e-12, 64.000001, 64.01, 64.05, 64.1];

describe("the independent references used by the Boys-function tests", () => {
  it("gives erf values that agree with high-precision ones to 3e-16", () => {
    // 30-digit values from mpmath.erf / mpmath.erfc (mpmath 1.x, mp.dps = 30), computed by the
    // test author while writing this test; the series/continued fraction here is a few ulps.
    const cases: [number, number][] = [
      [0.5, 0.520499877813046537682746653892],
      [1, 0.842700792949714869341220635083],
      [2, 0.995322265018952734162069256367],
      [2.9, 0.999958902121900541142004123158],
    ];
    for (const [x, v] of cases) expect(Math.abs(erf(x) - v) / v).toBeLessThanOrEqual(3e-16);
    // erfc(3.5) = 7.43098372341412741...e-7 (same mpmath evaluation): the continued-fraction branch
    expect(Math.abs(1 - erf(3.5) - 7.430983723414127e-7) / 7.430983723414127e-7).toBeLessThan(1e-9);
  });

  it("has a Gauss–Legendre rule that integrates x^{2k}, k < n, exactly up to the rounding of its nodes", () => {
    // exact analytic result: ∫_{−1}^{1} x^{2k} dx = 2/(2k+1), exact for the n-point rule when
    // 2k ≤ 2n−1. Allowed: (2k + 4)·2^-53 relative — each node is rounded to 2^-53 relative and
    // x^{2k} multiplies that 2k-fold; the rest is the rounding of the weights and the sum.
    for (const n of [5, 24, 40]) {
      const { x, w } = gaussLegendre(n);
      for (let k = 0; k < n; k++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += w[i] * x[i] ** (2 * k);
        expect(Math.abs((s * (2 * k + 1)) / 2 - 1)).toBeLessThanOrEqual((2 * k + 4) * 2 ** -53);
      }
    }
  });

  it("computes F_0 by quadrature and by the erf closed form alike to 1e-15", () => {
    let worst = 0;
    for (const T of [1e-6, 0.3, 2.5, 17, 63.95, 120, 200]) {
      const q = boysQuadrature(0, T, 32, 24);
      worst = Math.max(worst, Math.abs(q - f0Closed(T)) / f0Closed(T));
    }
    expect(worst).toBeLessThanOrEqual(1e-15);
  });

  it("has a converged Gauss–Legendre quadrature: doubling the panels changes no F_m (m ≤ 40, T ≤ 200) by more than 1e-15", () => {
    let worst = 0;
    for (const T of [0, 0.7, 9.3, 41, 64, 150, 200])
      for (const m of [0, 1, 7, 20, 33, 40]) {
        const a = boysQuadrature(m, T, 32, 24);
        const b = boysQuadrature(m, T, 64, 24);
        worst = Math.max(worst, Math.abs(a - b) / b);
      }
    expect(worst).toBeLessThanOrEqual(1e-15);
  });
});

describe("boys", () => {
  it("supports orders up to 40", () => {
    expect(BOYS_MAX_ORDER).toBeGreaterThanOrEqual(40);
  });

  it("gives F_0(0) = 1 exactly and F_m(0) = 1/(2m+1) to 1e-15", () => {
    // exact analytic result: F_m(0) = ∫_0^1 t^{2m} dt = 1/(2m+1)
    const out = new Float64Array(BOYS_MAX_ORDER + 1);
    boys(BOYS_MAX_ORDER, 0, out);
    expect(boys0(0)).toBe(1);
    expect(out[0]).toBe(1);
    for (let m = 0; m <= BOYS_MAX_ORDER; m++) expect(Math.abs(out[m] * (2 * m + 1) - 1)).toBeLessThanOrEqual(1e-15);
  });

  it("matches the closed form F_0(t) = ½√(π/t) erf(√t) to 1e-14 relative for t in [1e-12, 1e3] and across the table edge", () => {
    const ts = [...logGrid(1e-12, 1e3, 3001), ...EDGE, 0.05, 0.1, 0.15, 6.35, 31.95];
    const out = new Float64Array(BOYS_MAX_ORDER + 1);
    let worst0 = 0;
    let worstAll = 0;
    for (const t of ts) {
      const ref = f0Closed(t);
      worst0 = Math.max(worst0, Math.abs(boys0(t) - ref) / ref);
      // F_0 as the bottom of the recursion from several top orders
      for (const mmax of [0, 1, 4, 12, BOYS_MAX_ORDER]) {
        boys(mmax, t, out);
        worstAll = Math.max(worstAll, Math.abs(out[0] - ref) / ref);
      }
    }
    expect(worst0).toBeLessThanOrEqual(1e-14);
    expect(worstAll).toBeLessThanOrEqual(1e-14);
  });

  it("matches Gauss–Legendre quadrature of ∫_0^1 t^{2m} e^{−T t²} dt to 1e-14 relative for every m ≤ 40 and T in [0, 200]", () => {
    const Ts = [0, 1e-9, 1e-3, 0.049, 0.05, 0.051, ...logGrid(0.1, 200, 60), ...EDGE];
    const out = new Float64Array(BOYS_MAX_ORDER + 1);
    let worst = 0;
    let where = "";
    for (const T of Ts) {
      boys(BOYS_MAX_ORDER, T, out);
      for (let m = 0; m <= BOYS_MAX_ORDER; m++) {
        const ref = boysQuadrature(m, T, 32, 24);
        const e = Math.abs(out[m] - ref) / ref;
        if (e > worst) {
          worst = e;
          where = `m=${m} T=${T}`;
        }
      }
    }
    expect(worst, where).toBeLessThanOrEqual(1e-14);
  });

  it("gives the same F_m whatever the highest order requested, to 1e-14 relative", () => {
    // boys(mmax) starts its Taylor expansion at order mmax, so different mmax take different paths
    const full = new Float64Array(BOYS_MAX_ORDER + 1);
    const part = new Float64Array(BOYS_MAX_ORDER + 1);
    let worst = 0;
    for (const T of [...logGrid(1e-6, 300, 80), ...EDGE]) {
      boys(BOYS_MAX_ORDER, T, full);
      for (let mmax = 0; mmax <= BOYS_MAX_ORDER; mmax++) {
        boys(mmax, T, part);
        for (let m = 0; m <= mmax; m++) worst = Math.max(worst, Math.abs(part[m] - full[m]) / full[m]);
      }
    }
    expect(worst).toBeLessThanOrEqual(1e-14);
  });

  it("writes at the given offset without touching the rest of the buffer", () => {
    const ref = new Float64Array(6);
    boys(5, 3.7, ref);
    const out = new Float64Array(10).fill(-7);
    boys(5, 3.7, out, 3);
    expect(Array.from(out.subarray(0, 3))).toEqual([-7, -7, -7]);
    expect(Array.from(out.subarray(3, 9))).toEqual(Array.from(ref));
    expect(out[9]).toBe(-7);
  });

  it("satisfies the downward recursion F_m = (2T F_{m+1} + e^{−T})/(2m+1) to 1e-14 relative", () => {
    // exact analytic identity (integration by parts of ∫ t^{2m} e^{−T t²} dt)
    const out = new Float64Array(BOYS_MAX_ORDER + 1);
    let worst = 0;
    for (const T of [...logGrid(1e-8, 1e3, 200), ...EDGE]) {
      boys(BOYS_MAX_ORDER, T, out);
      const e = Math.exp(-T);
      for (let m = 0; m < BOYS_MAX_ORDER; m++) {
        const rhs = (2 * T * out[m + 1] + e) / (2 * m + 1);
        worst = Math.max(worst, Math.abs(out[m] - rhs) / out[m]);
      }
    }
    expect(worst).toBeLessThanOrEqual(1e-14);
  });

  it("approaches the large-argument limit (2m−1)!!/2^{m+1} √(π/T^{2m+1}) to 1e-14 relative for T ≥ 300", () => {
    // exact analytic result: F_m(T) = Γ(m+½)/(2T^{m+½}) − Γ(m+½, T)/(2T^{m+½}); for T ≥ 300 and
    // m ≤ 40 the incomplete-gamma part is below 1e-70 of the first term.
    const out = new Float64Array(BOYS_MAX_ORDER + 1);
    let worst = 0;
    for (const T of [300, 437.5, 1000, 1e4, 1e6]) {
      boys(BOYS_MAX_ORDER, T, out);
      // (2m−1)!!/2^{m+1} √π / T^{m+½}, built as a product to avoid overflow
      let lim = 0.5 * Math.sqrt(Math.PI / T);
      for (let m = 0; m <= BOYS_MAX_ORDER; m++) {
        worst = Math.max(worst, Math.abs(out[m] - lim) / lim);
        lim *= (2 * m + 1) / (2 * T);
      }
    }
    expect(worst).toBeLessThanOrEqual(1e-14);
  });

  it("is continuous across every Taylor-grid midpoint (t = 0.05 + 0.1k) to 1e-14 relative", () => {
    // the expansion point jumps at the midpoints; F_m is smooth, so the values on either side
    // (a few ulps apart in t) must agree to within the method's error once the exact change
    // dF_m/dt = −F_{m+1} (exact analytic identity) over that step is taken out
    const lo = new Float64Array(BOYS_MAX_ORDER + 1);
    const hi = new Float64Array(BOYS_MAX_ORDER + 1);
    let worst = 0;
    for (let k = 0; k < 640; k++) {
      const t = 0.05 + 0.1 * k;
      const tl = t * (1 - 4e-16);
      const th = t * (1 + 4e-16);
      boys(BOYS_MAX_ORDER, tl, lo);
      boys(BOYS_MAX_ORDER, th, hi);
      expect(Math.round(tl / 0.1)).not.toBe(Math.round(th / 0.1)); // the two sides really use different grid points
      for (let m = 0; m < BOYS_MAX_ORDER; m++) {
        const predicted = lo[m] - (th - tl) * lo[m + 1];
        worst = Math.max(worst, Math.abs(hi[m] - predicted) / hi[m]);
      }
    }
    expect(worst).toBeLessThanOrEqual(1e-14);
  });
});
