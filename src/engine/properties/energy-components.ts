/**
 * Hartree–Fock energy split into its parts, from the converged matrices (atomic units):
 *   one_electron = tr(Dt H),  kinetic = tr(Dt T),  nuclear_attraction = one_electron − kinetic,
 *   coulomb = ½ tr(Dt J[Dt]),  exchange = −½ [tr(Dα K[Dα]) + tr(Dβ K[Dβ])],
 *   two_electron = coulomb + exchange,  total = one_electron + two_electron + E_nuc,
 *   potential = total − kinetic (electron–nucleus, electron–electron and nucleus–nucleus),
 * with Dt = Dα + Dβ. For RHF the SCF stores D = [Dα, Dα] (half the total density each) and
 * K = [K[Dα], K[Dα]], so the same formulas apply to every reference.
 * Virial ratio −V/T (exactly 2 for the exact wavefunction at a stationary geometry).
 */
import { traceProduct } from "../linalg/dense.ts";
import type { ScfMatrices } from "../scf/scf.ts";

export interface EnergyComponents {
  one_electron: number;
  kinetic: number;
  nuclear_attraction: number;
  coulomb: number;
  exchange: number;
  two_electron: number;
  nuclear_repulsion: number;
  potential: number;
  total: number;
}

export function energyComponents(m: Pick<ScfMatrices, "D" | "H" | "T" | "J" | "K">, nuclearRepulsion: number, nbf: number): EnergyComponents {
  const [Da, Db] = m.D;
  const Dt = Da.map((x, k) => x + Db[k]);
  const one = traceProduct(Dt, m.H, nbf);
  const kinetic = traceProduct(Dt, m.T, nbf);
  const coulomb = 0.5 * traceProduct(Dt, m.J, nbf);
  const exchange = -0.5 * (traceProduct(Da, m.K[0], nbf) + traceProduct(Db, m.K[1], nbf));
  const two = coulomb + exchange;
  const total = one + two + nuclearRepulsion;
  return {
    one_electron: one,
    kinetic,
    nuclear_attraction: one - kinetic,
    coulomb,
    exchange,
    two_electron: two,
    nuclear_repulsion: nuclearRepulsion,
    potential: total - kinetic,
    total,
  };
}

/** −V/T; NaN when there is no kinetic energy (no electrons). */
export function virialRatio(e: EnergyComponents): number {
  return e.kinetic === 0 ? NaN : -e.potential / e.kinetic;
}
