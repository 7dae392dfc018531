/**
 * Frontier orbitals and Koopmans' ionization energy (T. Koopmans, Physica 1, 104 (1934)):
 * IE ≈ −ε_HOMO, the energy of removing an electron from the HOMO with frozen orbitals.
 *  - RHF: one set; HOMO the highest doubly occupied orbital.
 *  - ROHF: one set; HOMO the highest occupied (singly or doubly) orbital. ROHF orbital energies
 *    depend on the canonicalization chosen in scf.ts, so their Koopmans value does too.
 *  - UHF: homo/lumo/gap are the α values, homo_beta/lumo_beta/gap_beta the β ones; the
 *    Koopmans IE uses the higher of the two HOMOs (the cheaper electron to remove).
 * Energies in hartree; null where a set has no occupied or no virtual orbital.
 */
import { HARTREE_EV } from "../constants.ts";
import type { OrbitalSet, ScfResult } from "../scf/scf.ts";

export interface Frontier {
  homo: number | null;
  lumo: number | null;
  gap: number | null;
}

export interface FrontierOrbitals extends Frontier {
  homo_beta?: number | null;
  lumo_beta?: number | null;
  gap_beta?: number | null;
  koopmans_ie_hartree: number | null;
  koopmans_ie_ev: number | null;
}

export function frontier(set: OrbitalSet): Frontier {
  let homo: number | null = null;
  let lumo: number | null = null;
  for (let k = 0; k < set.energies.length; k++) {
    const e = set.energies[k];
    if (set.occupations[k] > 0) homo = homo === null ? e : Math.max(homo, e);
    else lumo = lumo === null ? e : Math.min(lumo, e);
  }
  const gap = homo !== null && lumo !== null ? lumo - homo : null;
  return { homo, lumo, gap };
}

export function frontierOrbitals(orbitals: ScfResult["orbitals"]): FrontierOrbitals {
  const a = frontier(orbitals.alpha);
  let top = a.homo;
  const out: FrontierOrbitals = { ...a, koopmans_ie_hartree: null, koopmans_ie_ev: null };
  if (orbitals.beta) {
    const b = frontier(orbitals.beta);
    out.homo_beta = b.homo;
    out.lumo_beta = b.lumo;
    out.gap_beta = b.gap;
    if (b.homo !== null && (top === null || b.homo > top)) top = b.homo;
  }
  // ROHF (singly occupied orbitals in one set): orbital energies depend on the chosen
  // canonicalization, so −ε_HOMO is no Koopmans ionization energy there
  const rohf = !orbitals.beta && orbitals.alpha.occupations.some((o) => o === 1);
  if (top !== null && !rohf) {
    out.koopmans_ie_hartree = -top;
    out.koopmans_ie_ev = -top * HARTREE_EV;
  }
  return out;
}
