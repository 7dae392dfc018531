/**
 * The calculation spec after validation and normalization: every default filled in, so a
 * reader (and the input hash) sees every setting that produced a number. Field names follow
 * ../shared/design/spec-format.md.
 */
import type { Atom } from "../engine/molecule.ts";

export type SpecReference = "rhf" | "uhf" | "rohf";
export type SpecCorrelation = "none" | "mp2" | "scs-mp2";
export type SpecHarmonics = "auto" | "spherical" | "cartesian";
export type CheckQuantity =
  | "scf_energy" | "total_energy" | "mp2_correlation" | "nuclear_repulsion" | "dipole_magnitude"
  | "homo" | "lumo" | "s_squared";
export type CheckUnit = "hartree" | "kcal/mol" | "kJ/mol" | "eV" | "debye" | "au";

/** A basis as written: a bundled name, per-element names, or a file inside the repository. */
export type SpecBasis = string | { default: string; elements: Record<string, string> } | { file: string };

export interface SpecCheck {
  quantity: CheckQuantity;
  expected: number;
  tolerance: number;
  unit: CheckUnit;
  source: string;
}

export interface NormalizedSpec {
  fieldbook: 1;
  /** calculation id: from `id:` or the path under calculations/ without extension */
  id: string;
  title: string;
  summary: string | null;
  authors: string[];
  tags: string[];
  molecule: {
    charge: number;
    multiplicity: number;
    units: "angstrom" | "bohr";
    /** where the geometry came from: inline xyz, inline zmatrix, or a repository file */
    geometry: { kind: "xyz" | "zmatrix"; file: string | null; text: string };
    /** the parsed atoms, bohr, full precision */
    atoms: Atom[];
  };
  model: {
    reference: SpecReference;
    correlation: SpecCorrelation;
    basis: SpecBasis;
    harmonics: SpecHarmonics;
    frozen_core: boolean;
    density_fitting: boolean;
    /** fitting basis for density fitting; null = the default for the orbital basis */
    fitting_basis: string | null;
  };
  convergence: {
    energy: number;
    density: number;
    max_iterations: number;
    accelerator: "diis" | "none";
    guess: "sad" | "core";
    level_shift: number;
    damping: number;
  };
  checks: SpecCheck[];
  notes: string | null;
}
