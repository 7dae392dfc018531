/**
 * Basis-set types shared by the basis library and the integral code.
 *
 * Function ordering (kept everywhere: integrals, properties, downloads):
 * atoms in molecule order; per atom, shells in the order the basis data lists them;
 * per shell, contraction rows (general contraction) in order; per row, the components:
 *   Cartesian: lexicographic x^i y^j z^k with i descending (x, y, z; xx, xy, xz, yy, yz, zz; ...)
 *   spherical (l >= 2): real solid harmonics m = -l ... +l.
 * s and p shells are always in their Cartesian order (p: x, y, z), spherical or not.
 */

/** One shell as stored in a basis set: exponents shared by one or more contracted functions. */
export interface ShellData {
  /** angular momentum l (0 = s, 1 = p, ...) */
  l: number;
  /** primitive exponents, bohr^-2 */
  exponents: number[];
  /** one row per contracted function; coefficients refer to normalized primitives (as published) */
  coefficients: number[][];
  /** the basis set's own convention for this shell: true spherical, false Cartesian */
  pure: boolean;
}

/** A shell placed on an atom, ready for integrals. Coefficients still as published. */
export interface Shell {
  l: number;
  pure: boolean;
  /** index of the atom in the molecule */
  atom: number;
  /** centre in bohr */
  center: [number, number, number];
  exponents: Float64Array;
  /** rows of contraction coefficients (normalized primitives); rows.length contracted functions */
  coefficients: Float64Array[];
}

export type Harmonics = "auto" | "spherical" | "cartesian";

/** Number of Cartesian components of angular momentum l. */
export function ncart(l: number): number {
  return ((l + 1) * (l + 2)) / 2;
}

/** Number of components a shell contributes per contraction row. */
export function ncomp(l: number, pure: boolean): number {
  return pure && l >= 2 ? 2 * l + 1 : ncart(l);
}
