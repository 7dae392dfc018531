/**
 * Properties of a finished SCF: energy components and virial ratio, dipole moment, Mulliken
 * and Löwdin charges (and spin populations for open shells), ⟨S²⟩, frontier orbitals with
 * Koopmans' ionization energy, and the built-in consistency checks. The result is plain,
 * JSON-serializable data (no typed arrays, no NaN).
 */
import type { PreparedBasis, PreparedShell } from "../integrals/shells.ts";
import type { ScfResult } from "../scf/scf.ts";
import { consistencyChecks, type ConsistencyCheck } from "./consistency.ts";
import { dipoleMoment, type Dipole, type Vec3 } from "./dipole.ts";
import { energyComponents, virialRatio, type EnergyComponents } from "./energy-components.ts";
import { functionAtoms } from "./function-atoms.ts";
import { frontierOrbitals, type FrontierOrbitals } from "./orbitals.ts";
import { charges, lowdinPopulations, mullikenPopulations, overlapSqrt } from "./populations.ts";
import { sSquared, type SSquared } from "./spin.ts";

export { energyComponents, virialRatio, type EnergyComponents } from "./energy-components.ts";
export { functionAtoms } from "./function-atoms.ts";
export { charges, lowdinPopulations, mullikenPopulations, overlapSqrt } from "./populations.ts";
export { centreOfMass, dipoleMoment, type Dipole, type DipoleAtom, type DipoleOrigin, type Vec3 } from "./dipole.ts";
export { sSquared, type SSquared } from "./spin.ts";
export { frontier, frontierOrbitals, type Frontier, type FrontierOrbitals } from "./orbitals.ts";
export { consistencyChecks, type ConsistencyCheck } from "./consistency.ts";

export interface PropertiesContext {
  /** the prepared basis shells (atom, offset, nfunc of each) */
  basisShells: PreparedShell[];
  basis: PreparedBasis;
  /** positions in bohr */
  atoms: { symbol: string; z: number; xyz: Vec3 }[];
  nuclearRepulsion: number;
  /** total molecular charge */
  charge: number;
  /** dipole origin in bohr; default the centre of mass */
  origin?: Vec3;
}

export interface Properties {
  energy_components: EnergyComponents;
  /** −V/T; null without electrons */
  virial_ratio: number | null;
  dipole: Dipole;
  mulliken: number[];
  lowdin: number[];
  /** α − β populations per atom; null for RHF */
  spin_populations: { mulliken: number[]; lowdin: number[] } | null;
  /** null for RHF (exactly 0 there) */
  s_squared: SSquared | null;
  orbitals: FrontierOrbitals;
  consistency: ConsistencyCheck[];
}

export function computeProperties(scf: ScfResult, context: PropertiesContext): Properties {
  const { basis, atoms } = context;
  const n = basis.nbf;
  const m = scf.matrices;
  const [Pa, Pb] = m.D;
  const P = Pa.map((x, k) => x + Pb[k]);
  const Z = atoms.map((a) => a.z);
  const atomOf = functionAtoms(context.basisShells, n);
  const Shalf = overlapSqrt(m.S, n);

  const energy = energyComponents(m, context.nuclearRepulsion, n);
  const virial = virialRatio(energy);
  const mulliken = charges(Z, mullikenPopulations(P, m.S, atomOf, atoms.length));
  const lowdin = charges(Z, lowdinPopulations(P, Shalf, atomOf, atoms.length));
  let spin: Properties["spin_populations"] = null;
  if (scf.reference !== "rhf") {
    const Ps = Pa.map((x, k) => x - Pb[k]);
    spin = { mulliken: mullikenPopulations(Ps, m.S, atomOf, atoms.length), lowdin: lowdinPopulations(Ps, Shalf, atomOf, atoms.length) };
  }
  const s2 = scf.reference === "rhf" ? null : sSquared(Pa, Pb, m.S, n, scf.nalpha, scf.nbeta);

  const consistency = consistencyChecks(scf, energy, s2);
  // the atoms, the electron count and the stated charge must agree (integers, exact)
  const zsum = Z.reduce((s, z) => s + z, 0);
  const chargeError = Math.abs(zsum - scf.nalpha - scf.nbeta - context.charge);
  consistency.push({
    name: "molecular charge, |Σ Z − N − charge|",
    value: chargeError,
    tolerance: 0,
    status: chargeError === 0 ? "pass" : "fail",
    source: "exact (integer arithmetic)",
  });

  return {
    energy_components: energy,
    virial_ratio: Number.isFinite(virial) ? virial : null,
    dipole: dipoleMoment(basis, P, atoms, context.origin),
    mulliken,
    lowdin,
    spin_populations: spin,
    s_squared: s2,
    orbitals: frontierOrbitals(scf.orbitals),
    consistency,
  };
}
