/**
 * Electric dipole moment of nuclei plus electrons about an origin O (atomic units, e·bohr):
 *   μ = Σ_A Z_A (R_A − O) − tr(P M(O)),   M_x(O)_μν = ⟨μ| x − O_x |ν⟩,
 * with P the total AO density. For a neutral molecule μ does not depend on O (the shift is
 * −(Σ Z_A − N) ΔO = −q ΔO); for an ion it does, which is why the origin is part of the result.
 * Default origin: the centre of mass with standard atomic weights (elements.ts).
 */
import { DEBYE_PER_AU } from "../constants.ts";
import { elementByZ } from "../elements.ts";
import { multipoleMatrices } from "../integrals/one-electron.ts";
import type { PreparedBasis } from "../integrals/shells.ts";
import { traceProduct } from "../linalg/dense.ts";

export type Vec3 = [number, number, number];

export interface DipoleAtom {
  z: number;
  xyz: Vec3;
}

export type DipoleOrigin = { kind: "centre-of-mass"; bohr: Vec3 } | { kind: "given"; bohr: Vec3 };

export interface Dipole {
  au: Vec3;
  magnitude_au: number;
  debye: number;
  origin: DipoleOrigin;
}

/** Centre of mass (bohr) with the standard atomic weights of elements.ts. */
export function centreOfMass(atoms: readonly DipoleAtom[]): Vec3 {
  const c: Vec3 = [0, 0, 0];
  let mass = 0;
  for (const a of atoms) {
    const w = elementByZ(a.z).atomicWeight;
    mass += w;
    for (let k = 0; k < 3; k++) c[k] += w * a.xyz[k];
  }
  if (!(mass > 0)) throw new Error("centre of mass of an empty molecule");
  return [c[0] / mass, c[1] / mass, c[2] / mass];
}

export function dipoleMoment(basis: PreparedBasis, P: Float64Array, atoms: readonly DipoleAtom[], origin?: Vec3): Dipole {
  const O: DipoleOrigin = origin ? { kind: "given", bohr: [origin[0], origin[1], origin[2]] } : { kind: "centre-of-mass", bohr: centreOfMass(atoms) };
  const o = O.bohr;
  const M = multipoleMatrices(basis, o, 1);
  const mu: Vec3 = [0, 0, 0];
  for (let k = 0; k < 3; k++) {
    let nuc = 0;
    for (const a of atoms) nuc += a.z * (a.xyz[k] - o[k]);
    mu[k] = nuc - traceProduct(P, M[k], basis.nbf);
  }
  const magnitude = Math.hypot(mu[0], mu[1], mu[2]);
  return { au: mu, magnitude_au: magnitude, debye: magnitude * DEBYE_PER_AU, origin: O };
}
