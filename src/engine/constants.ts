/**
 * Physical constants and unit conversions: the one source of truth for the engine.
 *
 * Edition: CODATA 2018 recommended values of the fundamental physical constants,
 * E. Tiesinga, P. J. Mohr, D. B. Newell, B. N. Taylor, "CODATA recommended values of the
 * fundamental physical constants: 2018", Rev. Mod. Phys. 93, 025010 (2021) and
 * J. Phys. Chem. Ref. Data 50, 033105 (2021). Values typed from memory of that table
 * (cross-checked against each other in test/engine/constants.test.ts).
 *
 * Internally the engine works in atomic units (bohr, hartree, elementary charge, e·bohr).
 * Everything here converts between those and the units shown to people.
 */

export const CONSTANTS_EDITION =
  "CODATA 2018 (Tiesinga, Mohr, Newell, Taylor, Rev. Mod. Phys. 93, 025010 (2021); J. Phys. Chem. Ref. Data 50, 033105 (2021))";

// ---- exact SI defining constants (SI 2019; listed as exact in CODATA 2018) ----

/** speed of light in vacuum c, m/s (exact; CODATA 2018, from memory) */
export const SPEED_OF_LIGHT = 299792458;
/** elementary charge e, C (exact; CODATA 2018, from memory) */
export const ELEMENTARY_CHARGE = 1.602176634e-19;
/** Avogadro constant N_A, 1/mol (exact; CODATA 2018, from memory) */
export const AVOGADRO = 6.02214076e23;
/** Planck constant h, J s (exact; CODATA 2018, from memory) */
export const PLANCK = 6.62607015e-34;

// ---- measured constants (CODATA 2018 recommended values, from memory) ----

/** Bohr radius a0 in ångström (CODATA 2018: 0.529 177 210 903(80) × 10^-10 m) */
export const BOHR_RADIUS_ANGSTROM = 0.529177210903;
/** Bohr radius a0 in metre (same CODATA 2018 value) */
export const BOHR_RADIUS_METRE = 0.529177210903e-10;
/** Hartree energy E_h in joule (CODATA 2018: 4.359 744 722 2071(85) × 10^-18 J) */
export const HARTREE_JOULE = 4.3597447222071e-18;
/** Hartree energy in electronvolt (CODATA 2018 "hartree-electron volt relationship": 27.211 386 245 988(53) eV) */
export const HARTREE_EV = 27.211386245988;
/** Hartree energy per mole in kJ/mol (E_h·N_A; CODATA 2018 value as given in design/conventions.md: 2625.499 639 4799) */
export const HARTREE_KJ_PER_MOL = 2625.4996394799;
/** Hartree in wavenumbers, cm^-1 (CODATA 2018 "hartree-inverse meter relationship": 2.194 746 313 6320(43) × 10^7 m^-1) */
export const HARTREE_INVERSE_CM = 219474.6313632;

// ---- conventions and derived values ----

/** thermochemical calorie in joule (exact by definition, 4.184 J) */
export const THERMOCHEMICAL_CALORIE_JOULE = 4.184;
/** Hartree per mole in kcal/mol with the thermochemical calorie (derived: kJ/mol ÷ 4.184) */
export const HARTREE_KCAL_PER_MOL = HARTREE_KJ_PER_MOL / THERMOCHEMICAL_CALORIE_JOULE;
/** ångström per bohr is a0; bohr per ångström (derived) */
export const BOHR_PER_ANGSTROM = 1 / BOHR_RADIUS_ANGSTROM;
/** 1 debye in C·m: 10^-21 / c (definition of the debye, 10^-18 statC·cm) */
export const DEBYE_COULOMB_METRE = 1e-21 / SPEED_OF_LIGHT;
/** atomic unit of electric dipole moment e·a0 in C·m (derived from e and a0) */
export const AU_DIPOLE_COULOMB_METRE = ELEMENTARY_CHARGE * BOHR_RADIUS_METRE;
/** debye per atomic unit of dipole moment (derived: e·a0 / D ≈ 2.541746) */
export const DEBYE_PER_AU = AU_DIPOLE_COULOMB_METRE / DEBYE_COULOMB_METRE;
/** atomic units of dipole moment per debye (derived ≈ 0.393430) */
export const AU_PER_DEBYE = 1 / DEBYE_PER_AU;

// ---- conversions ----

export type EnergyUnit = "hartree" | "eV" | "kJ/mol" | "kcal/mol" | "cm-1";

export const ENERGY_UNITS: readonly EnergyUnit[] = ["hartree", "eV", "kJ/mol", "kcal/mol", "cm-1"];

const PER_HARTREE: Record<EnergyUnit, number> = {
  hartree: 1,
  eV: HARTREE_EV,
  "kJ/mol": HARTREE_KJ_PER_MOL,
  "kcal/mol": HARTREE_KCAL_PER_MOL,
  "cm-1": HARTREE_INVERSE_CM,
};

/** The value of `energy` hartree (default 1) expressed in `unit`. */
export function hartreeTo(unit: EnergyUnit, energy = 1): number {
  const f = PER_HARTREE[unit];
  if (f === undefined) throw new Error(`unknown energy unit ${JSON.stringify(unit)}`);
  return energy * f;
}

/** The value of `energy` given in `unit`, expressed in hartree. */
export function toHartree(unit: EnergyUnit, energy: number): number {
  const f = PER_HARTREE[unit];
  if (f === undefined) throw new Error(`unknown energy unit ${JSON.stringify(unit)}`);
  return energy / f;
}

export function angstromToBohr(x: number): number {
  return x / BOHR_RADIUS_ANGSTROM;
}

export function bohrToAngstrom(x: number): number {
  return x * BOHR_RADIUS_ANGSTROM;
}

/** dipole moment: atomic units (e·a0) → debye */
export function auToDebye(x: number): number {
  return x * DEBYE_PER_AU;
}

/** dipole moment: debye → atomic units (e·a0) */
export function debyeToAu(x: number): number {
  return x / DEBYE_PER_AU;
}
