/**
 * Boys function F_m(T) = ∫_0^1 t^{2m} exp(-T t²) dt, the radial kernel of every Coulomb-type
 * integral over Gaussians (S. F. Boys, Proc. R. Soc. A 200, 542 (1950)).
 *
 * Method (relative error below 1e-14 over the whole argument range, checked in the tests):
 *  - T < T_TABLE: an 8-term Taylor expansion about the nearest grid point (spacing 0.1) of the
 *    highest order needed, F_m(T0+Δ) = Σ_k F_{m+k}(T0) (-Δ)^k / k!  (|Δ| ≤ 0.05, so the
 *    remainder is below 0.05^8/8! ≈ 1e-15 relative), then the downward recursion
 *    F_{m} = (2T F_{m+1} + e^{-T}) / (2m+1), which is stable.
 *  - T ≥ T_TABLE: F_0 = ½ √(π/T) erf(√T), where erfc(√T) < 1e-29 is below double precision,
 *    then the upward recursion F_{m+1} = ((2m+1) F_m - e^{-T}) / (2T), which is stable for
 *    T ≫ m (here T ≥ 64 and m ≤ M_MAX = 40).
 * The grid values are made once by the convergent series
 * F_m(T) = e^{-T} Σ_k (2T)^k / ((2m+1)(2m+3)…(2m+2k+1)) at the highest order and the same
 * downward recursion: positive terms only, so they are accurate to a few ulps.
 */

/** Highest order supported (L = la+lb+lc+ld up to 40, far past i functions). */
export const BOYS_MAX_ORDER = 40;
const TAYLOR_TERMS = 8;
const GRID_STEP = 0.1;
const T_TABLE = 64;
const N_GRID = Math.round(T_TABLE / GRID_STEP) + 1;
const N_ORDERS = BOYS_MAX_ORDER + TAYLOR_TERMS + 1;

/** grid[g * N_ORDERS + m] = F_m(g * GRID_STEP) */
const grid = new Float64Array(N_GRID * N_ORDERS);
const INV_FACT = new Float64Array(TAYLOR_TERMS);
const HALF_SQRT_PI = 0.5 * Math.sqrt(Math.PI);

/** Reference evaluation by the series above (slow; for tables and tests). */
export function boysSeries(m: number, t: number, out?: Float64Array): Float64Array {
  const res = out ?? new Float64Array(m + 1);
  // sum_k (2T)^k / ((2m+1)(2m+3)...(2m+2k+1)): terms positive, stop when below 1e-17 of the sum
  let term = 1 / (2 * m + 1);
  let sum = term;
  for (let k = 1; k < 100000; k++) {
    term *= (2 * t) / (2 * m + 2 * k + 1);
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  const e = Math.exp(-t);
  res[m] = e * sum;
  for (let j = m - 1; j >= 0; j--) res[j] = (2 * t * res[j + 1] + e) / (2 * j + 1);
  return res;
}

(function buildTable() {
  let f = 1;
  for (let k = 0; k < TAYLOR_TERMS; k++) {
    INV_FACT[k] = 1 / f;
    f *= k + 1;
  }
  const col = new Float64Array(N_ORDERS);
  for (let g = 0; g < N_GRID; g++) {
    boysSeries(N_ORDERS - 1, g * GRID_STEP, col);
    grid.set(col, g * N_ORDERS);
  }
})();

/**
 * Fill out[0..mmax] with F_0(t) … F_mmax(t). Allocation-free; mmax ≤ BOYS_MAX_ORDER.
 * The values are written at out[offset + m].
 */
export function boys(mmax: number, t: number, out: Float64Array, offset = 0): void {
  if (t < T_TABLE) {
    const g = Math.round(t / GRID_STEP);
    const d = g * GRID_STEP - t; // -Δ
    const base = g * N_ORDERS + mmax;
    // Horner in d over the Taylor terms of the top order
    let v = grid[base + TAYLOR_TERMS - 1] * INV_FACT[TAYLOR_TERMS - 1];
    for (let k = TAYLOR_TERMS - 2; k >= 0; k--) v = v * d + grid[base + k] * INV_FACT[k];
    out[offset + mmax] = v;
    if (mmax > 0) {
      const e = Math.exp(-t);
      const t2 = 2 * t;
      for (let m = mmax - 1; m >= 0; m--) {
        v = (t2 * v + e) / (2 * m + 1);
        out[offset + m] = v;
      }
    }
    return;
  }
  let v = HALF_SQRT_PI / Math.sqrt(t);
  out[offset] = v;
  if (mmax > 0) {
    const e = Math.exp(-t);
    const inv2t = 0.5 / t;
    for (let m = 0; m < mmax; m++) {
      v = ((2 * m + 1) * v - e) * inv2t;
      out[offset + m + 1] = v;
    }
  }
}

/** F_0 alone, the (ss|ss) kernel. */
export function boys0(t: number): number {
  if (t < T_TABLE) {
    const g = Math.round(t / GRID_STEP);
    const d = g * GRID_STEP - t;
    const base = g * N_ORDERS;
    let v = grid[base + TAYLOR_TERMS - 1] * INV_FACT[TAYLOR_TERMS - 1];
    for (let k = TAYLOR_TERMS - 2; k >= 0; k--) v = v * d + grid[base + k] * INV_FACT[k];
    return v;
  }
  return HALF_SQRT_PI / Math.sqrt(t);
}

/** The tabulation, for code that inlines the evaluation above (eri-codegen.ts). */
export const BOYS_TABLE = {
  grid,
  orders: N_ORDERS,
  step: GRID_STEP,
  tTable: T_TABLE,
  terms: TAYLOR_TERMS,
  invFact: INV_FACT,
  halfSqrtPi: HALF_SQRT_PI,
} as const;
