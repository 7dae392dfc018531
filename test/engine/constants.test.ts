import { describe, expect, it } from "vitest";
import {
  AU_DIPOLE_COULOMB_METRE,
  AU_PER_DEBYE,
  AVOGADRO,
  BOHR_RADIUS_ANGSTROM,
  CONSTANTS_EDITION,
  DEBYE_PER_AU,
  ELEMENTARY_CHARGE,
  ENERGY_UNITS,
  HARTREE_EV,
  HARTREE_INVERSE_CM,
  HARTREE_JOULE,
  HARTREE_KCAL_PER_MOL,
  HARTREE_KJ_PER_MOL,
  PLANCK,
  SPEED_OF_LIGHT,
  angstromToBohr,
  auToDebye,
  bohrToAngstrom,
  debyeToAu,
  hartreeTo,
  toHartree,
} from "../../src/engine/constants.ts";

// Source for every published value below: CODATA 2018 recommended values,
// Tiesinga, Mohr, Newell, Taylor, Rev. Mod. Phys. 93, 025010 (2021) /
// J. Phys. Chem. Ref. Data 50, 033105 (2021) (values typed from memory).

/** relative difference */
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("constants", () => {
  it("names the CODATA 2018 edition", () => {
    expect(CONSTANTS_EDITION).toContain("CODATA 2018");
    expect(CONSTANTS_EDITION).toContain("Rev. Mod. Phys. 93, 025010");
  });

  it("uses the CODATA 2018 values for the bohr radius and the hartree", () => {
    expect(BOHR_RADIUS_ANGSTROM).toBe(0.529177210903); // CODATA 2018, a0 (Å)
    expect(HARTREE_EV).toBe(27.211386245988); // CODATA 2018, hartree-electron volt relationship
    expect(HARTREE_KJ_PER_MOL).toBe(2625.4996394799); // E_h N_A, as in design/conventions.md (CODATA 2018)
    expect(HARTREE_INVERSE_CM).toBe(219474.6313632); // CODATA 2018, hartree-inverse meter relationship /100
    expect(ELEMENTARY_CHARGE).toBe(1.602176634e-19); // CODATA 2018 (exact)
    expect(AVOGADRO).toBe(6.02214076e23); // CODATA 2018 (exact)
    expect(SPEED_OF_LIGHT).toBe(299792458); // CODATA 2018 (exact)
  });

  it("keeps the hartree in eV, kJ/mol and cm-1 consistent with E_h in joule to 1e-12 relative", () => {
    // E_h = 4.3597447222071e-18 J (CODATA 2018); h = 6.62607015e-34 J s (exact)
    expect(HARTREE_JOULE).toBe(4.3597447222071e-18);
    expect(rel(HARTREE_JOULE / ELEMENTARY_CHARGE, HARTREE_EV)).toBeLessThan(1e-12);
    expect(rel((HARTREE_JOULE * AVOGADRO) / 1000, HARTREE_KJ_PER_MOL)).toBeLessThan(1e-12);
    expect(rel(HARTREE_JOULE / (PLANCK * SPEED_OF_LIGHT) / 100, HARTREE_INVERSE_CM)).toBeLessThan(1e-12);
  });

  it("derives kcal/mol from kJ/mol with the thermochemical calorie of 4.184 J", () => {
    expect(HARTREE_KCAL_PER_MOL).toBe(HARTREE_KJ_PER_MOL / 4.184);
    expect(HARTREE_KCAL_PER_MOL).toBeCloseTo(627.509474, 6); // derived from CODATA 2018 2625.4996394799 / 4.184
  });

  it("derives the debye per atomic unit of dipole moment as about 2.541746", () => {
    // atomic unit of electric dipole moment e a0 = 8.4783536255e-30 C m (CODATA 2018)
    expect(rel(AU_DIPOLE_COULOMB_METRE, 8.4783536255e-30)).toBeLessThan(1e-10);
    // 2.541746 D per e a0: CODATA 2018-derived (e a0 / (1e-21/c)), rounded to 7 figures
    expect(Math.abs(DEBYE_PER_AU - 2.541746)).toBeLessThan(1e-6);
    // 1 D = 0.393430 e a0 (design/conventions.md, CODATA 2018-derived)
    expect(Math.abs(AU_PER_DEBYE - 0.39343)).toBeLessThan(1e-6);
  });

  it("converts lengths, dipoles and energies in both directions", () => {
    expect(angstromToBohr(BOHR_RADIUS_ANGSTROM)).toBe(1);
    expect(bohrToAngstrom(1)).toBe(BOHR_RADIUS_ANGSTROM);
    expect(Math.abs(bohrToAngstrom(angstromToBohr(1.2345)) - 1.2345)).toBeLessThan(1e-15);
    expect(Math.abs(debyeToAu(auToDebye(0.7)) - 0.7)).toBeLessThan(1e-15);
    expect(hartreeTo("hartree")).toBe(1);
    expect(hartreeTo("eV")).toBe(HARTREE_EV);
    expect(hartreeTo("kJ/mol", 2)).toBe(2 * HARTREE_KJ_PER_MOL);
    expect(hartreeTo("cm-1")).toBe(HARTREE_INVERSE_CM);
    for (const u of ENERGY_UNITS) expect(rel(toHartree(u, hartreeTo(u, -76.5)), -76.5)).toBeLessThan(1e-15);
  });
});
