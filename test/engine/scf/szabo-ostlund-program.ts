/**
 * An independent re-implementation, for the tests, of the minimal-basis two-electron SCF
 * program of A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (Macmillan 1982; Dover 1996),
 * Appendix B ("Two-electron self-consistent-field program"), which produces the HeH+ (§3.5.3)
 * and H2 (§3.5.2) STO-3G numbers quoted in the book. It shares no code with the engine.
 *
 * What the book's program does, as reproduced here (from memory of the listing, confirmed by
 * reproducing its printed electronic energy to all printed digits, see published.test.ts):
 *  - two s-type contracted functions, one per centre, each a 3-term fit to a 1s Slater
 *    function: exponents α_k(ζ=1)·ζ², coefficients d_k of normalized primitives (§3.5.1);
 *  - closed-form integrals over s Gaussians (Appendix A): overlap, kinetic, nuclear
 *    attraction, two-electron; F0(t) = ½√(π/t) erf(√t), and F0 = 1 − t/3 for t < 1e-6;
 *  - the error function by the rational approximation of M. Abramowitz, I. A. Stegun,
 *    Handbook of Mathematical Functions (1964), eq. 7.1.26, |error| ≤ 1.5e-7;
 *  - S11 = S22 = 1 taken as given (the contraction is NOT renormalized) and canonical
 *    orthogonalization X = [[1/√(2(1+S12)), 1/√(2(1−S12))], [same, −same]];
 *  - core-Hamiltonian start (P = 0), iterations until √(Σ ΔP²/4) < 1e-4; the energy printed
 *    is ½ Σ P(H + F) of the last density before the final update.
 * Options switch the two approximations off (exact erf; contraction renormalized to unit
 * norm, as the engine does), so the same code also gives the exact answer for this basis.
 */

/** M. Abramowitz, I. A. Stegun (1964), eq. 7.1.26: p and a1…a5 (from memory, standard values). */
export function erfAbramowitzStegun(x: number): number {
  if (x < 0) return -erfAbramowitzStegun(-x);
  const t = 1 / (1 + 0.3275911 * x);
  const a = [0.254829592, -0.284496736, 1.421413741, -1.453152027, 1.061405429];
  let poly = a[4];
  for (let i = 3; i >= 0; i--) poly = poly * t + a[i];
  return 1 - poly * t * Math.exp(-x * x);
}

export interface SzaboFunction {
  /** position on the z axis, bohr */
  z: number;
  /** Slater exponent of the fitted 1s function */
  zeta: number;
}

export interface SzaboOptions {
  erf: (x: number) => number;
  /** true: scale each contraction to unit norm (exact treatment); false: as the book */
  renormalize: boolean;
  /** density convergence criterion, √(Σ ΔP²/4) (the book: 1e-4) */
  crit: number;
}

export interface SzaboResult {
  electronic: number;
  total: number;
  orbitalEnergies: [number, number];
  /** ⟨φ|φ⟩ of the contraction as printed (1 + δ) for each function */
  contractionNorms: [number, number];
  iterations: number;
}

/**
 * Closed-shell two-electron SCF in two s functions on nuclei `charges` at the functions'
 * positions, with the ζ = 1 STO-3G fit `alpha1`, `d` (exponents, coefficients).
 */
export function szaboMinimalScf(
  fns: [SzaboFunction, SzaboFunction],
  charges: [number, number],
  alpha1: number[],
  d: number[],
  opt: SzaboOptions,
): SzaboResult {
  const F0 = (t: number) => (t < 1e-6 ? 1 - t / 3 : 0.5 * Math.sqrt(Math.PI / t) * opt.erf(Math.sqrt(t)));
  const prims = fns.map((f) => {
    const a = alpha1.map((x) => x * f.zeta * f.zeta);
    return { z: f.z, a, c: d.map((c, k) => c * (2 * a[k] / Math.PI) ** 0.75) };
  });
  const idx = [0, 1] as const;
  const S = [[0, 0], [0, 0]];
  const H = [[0, 0], [0, 0]];
  const G = idx.map(() => idx.map(() => idx.map(() => [0, 0])));
  for (const m of idx)
    for (const n of idx) {
      const A = prims[m], B = prims[n];
      const rab2 = (A.z - B.z) ** 2;
      for (let i = 0; i < 3; i++)
        for (let j = 0; j < 3; j++) {
          const a = A.a[i], b = B.a[j], p = a + b, dd = A.c[i] * B.c[j];
          const K = Math.exp((-a * b / p) * rab2);
          const zp = (a * A.z + b * B.z) / p;
          S[m][n] += dd * (Math.PI / p) ** 1.5 * K;
          H[m][n] += dd * (a * b / p) * (3 - (2 * a * b / p) * rab2) * (Math.PI / p) ** 1.5 * K;
          for (const c of idx) H[m][n] -= dd * charges[c] * (2 * Math.PI / p) * K * F0(p * (zp - fns[c].z) ** 2);
        }
      for (const k of idx)
        for (const l of idx) {
          const C = prims[k], D = prims[l];
          const rcd2 = (C.z - D.z) ** 2;
          let g = 0;
          for (let i = 0; i < 3; i++)
            for (let j = 0; j < 3; j++)
              for (let u = 0; u < 3; u++)
                for (let v = 0; v < 3; v++) {
                  const a = A.a[i], b = B.a[j], c = C.a[u], e = D.a[v];
                  const p = a + b, q = c + e;
                  const zp = (a * A.z + b * B.z) / p, zq = (c * C.z + e * D.z) / q;
                  g += A.c[i] * B.c[j] * C.c[u] * D.c[v] * (2 * Math.PI ** 2.5 / (p * q * Math.sqrt(p + q))) *
                    Math.exp((-a * b / p) * rab2 - (c * e / q) * rcd2) * F0((p * q / (p + q)) * (zp - zq) ** 2);
                }
          G[m][n][k][l] = g;
        }
    }
  const contractionNorms: [number, number] = [S[0][0], S[1][1]];
  if (opt.renormalize) {
    const s = [Math.sqrt(S[0][0]), Math.sqrt(S[1][1])];
    for (const m of idx)
      for (const n of idx) {
        S[m][n] /= s[m] * s[n];
        H[m][n] /= s[m] * s[n];
        for (const k of idx) for (const l of idx) G[m][n][k][l] /= s[m] * s[n] * s[k] * s[l];
      }
  }
  // the book: S11 = S22 = 1 assumed, X from S12 alone
  const s12 = S[0][1];
  const x1 = 1 / Math.sqrt(2 * (1 + s12)), x2 = 1 / Math.sqrt(2 * (1 - s12));
  const X = [[x1, x2], [x1, -x2]];
  let P = [[0, 0], [0, 0]];
  let electronic = 0;
  let eps: [number, number] = [0, 0];
  let it = 0;
  for (it = 1; it <= 100; it++) {
    const F = [[0, 0], [0, 0]];
    for (const m of idx)
      for (const n of idx) {
        F[m][n] = H[m][n];
        for (const k of idx) for (const l of idx) F[m][n] += P[k][l] * (G[m][n][k][l] - 0.5 * G[m][l][k][n]);
      }
    electronic = 0;
    for (const m of idx) for (const n of idx) electronic += 0.5 * P[m][n] * (H[m][n] + F[m][n]);
    const Fp = [[0, 0], [0, 0]];
    for (const i of idx) for (const j of idx) for (const m of idx) for (const n of idx) Fp[i][j] += X[m][i] * F[m][n] * X[n][j];
    // 2 × 2 symmetric eigenproblem by one Jacobi rotation
    const th = Fp[0][0] === Fp[1][1] ? Math.PI / 4 : 0.5 * Math.atan((2 * Fp[0][1]) / (Fp[0][0] - Fp[1][1]));
    const V = [[Math.cos(th), Math.sin(th)], [Math.sin(th), -Math.cos(th)]];
    const e = idx.map((k) => Fp[0][0] * V[0][k] ** 2 + 2 * Fp[0][1] * V[0][k] * V[1][k] + Fp[1][1] * V[1][k] ** 2);
    const lo = e[0] <= e[1] ? 0 : 1;
    eps = [e[lo], e[1 - lo]];
    const c = [X[0][0] * V[0][lo] + X[0][1] * V[1][lo], X[1][0] * V[0][lo] + X[1][1] * V[1][lo]];
    const Pn = [[2 * c[0] * c[0], 2 * c[0] * c[1]], [2 * c[1] * c[0], 2 * c[1] * c[1]]];
    let delta = 0;
    for (const m of idx) for (const n of idx) delta += (Pn[m][n] - P[m][n]) ** 2;
    P = Pn;
    if (Math.sqrt(delta / 4) < opt.crit) break;
  }
  const vnn = (charges[0] * charges[1]) / Math.abs(fns[0].z - fns[1].z);
  return { electronic, total: electronic + vnn, orbitalEnergies: eps, contractionNorms, iterations: it };
}
