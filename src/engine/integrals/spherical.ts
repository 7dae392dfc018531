/**
 * From Cartesian components to the functions a shell actually contributes.
 *
 * Integral code works with Cartesian components that all carry the primitive normalization of
 * x^l (see normalize.ts). A shell then contributes either
 *  - Cartesian functions, each scaled to unit norm: factor √((2l−1)!! / ((2i−1)!!(2j−1)!!(2k−1)!!)),
 *  - or real solid harmonics S_lm, m = −l … +l, with the coefficients of
 *    T. Helgaker, P. Jørgensen, J. Olsen, Molecular Electronic-Structure Theory (Wiley, 2000),
 *    eqs. 6.4.47–6.4.50, each row renormalized exactly with the one-centre metric so that
 *    every spherical function has unit norm.
 * s and p shells are returned in Cartesian order (p: x, y, z) either way.
 */
import { cartComponents, cartIndex, doubleFactorial, ncart } from "./cartesian.ts";

/** Row-major (ncomp × ncart(l)) matrix taking Cartesian components to shell functions. */
export interface ComponentTransform {
  l: number;
  pure: boolean;
  ncomp: number;
  ncart: number;
  matrix: Float64Array;
  /** true when the matrix is diagonal (Cartesian shells) */
  diagonal: boolean;
}

function binom(n: number, k: number): number {
  if (k < 0 || k > n) return 0;
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}

/** ⟨x^i y^j z^k | x^i' y^j' z^k'⟩ relative to ⟨x^l|x^l⟩ for one centre, same exponent. */
function oneCentreMetric(a: number[], b: number[], l: number): number {
  let r = 1;
  for (let ax = 0; ax < 3; ax++) {
    const s = a[ax] + b[ax];
    if (s % 2) return 0;
    r *= doubleFactorial(s - 1);
  }
  return r / doubleFactorial(2 * l - 1);
}

/** Unnormalized solid-harmonic coefficients over Cartesian components (MEST eq. 6.4.48). */
function solidHarmonicRow(l: number, m: number): Float64Array {
  const row = new Float64Array(ncart(l));
  const am = Math.abs(m);
  const vm = m < 0 ? 0.5 : 0;
  for (let t = 0; t <= Math.floor((l - am) / 2); t++) {
    for (let u = 0; u <= t; u++) {
      // v runs over vm, vm+1, … up to floor(|m|/2 − vm) + vm
      for (let v = vm; v <= Math.floor(am / 2 - vm) + vm + 1e-9; v += 1) {
        const c =
          (-1) ** (t + v - vm) *
          0.25 ** t *
          binom(l, t) *
          binom(l - t, am + t) *
          binom(t, u) *
          binom(am, Math.round(2 * v));
        const px = 2 * t + am - Math.round(2 * (u + v));
        const py = Math.round(2 * (u + v));
        const pz = l - 2 * t - am;
        row[cartIndex(px, py, pz)] += c;
      }
    }
  }
  return row;
}

const cache = new Map<string, ComponentTransform>();

export function componentTransform(l: number, pure: boolean): ComponentTransform {
  const spherical = pure && l >= 2;
  const key = `${l}:${spherical}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const comps = cartComponents(l);
  const nc = comps.length;
  let t: ComponentTransform;
  if (!spherical) {
    const matrix = new Float64Array(nc * nc);
    comps.forEach((c, i) => {
      matrix[i * nc + i] = 1 / Math.sqrt(oneCentreMetric(c, c, l));
    });
    t = { l, pure: false, ncomp: nc, ncart: nc, matrix, diagonal: true };
  } else {
    const ns = 2 * l + 1;
    const matrix = new Float64Array(ns * nc);
    for (let m = -l; m <= l; m++) {
      const row = solidHarmonicRow(l, m);
      let norm = 0;
      for (let i = 0; i < nc; i++)
        for (let j = 0; j < nc; j++) norm += row[i] * row[j] * oneCentreMetric(comps[i], comps[j], l);
      const s = 1 / Math.sqrt(norm);
      for (let i = 0; i < nc; i++) matrix[(m + l) * nc + i] = row[i] * s;
    }
    t = { l, pure: true, ncomp: ns, ncart: nc, matrix, diagonal: false };
  }
  cache.set(key, t);
  return t;
}
