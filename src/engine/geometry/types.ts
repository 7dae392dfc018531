/** Molecule types shared by the geometry readers and molecule.ts. Plain, JSON-serializable data. */

export interface Atom {
  /** element symbol in canonical spelling ("Cl") */
  symbol: string;
  /** atomic number (nuclear charge) */
  z: number;
  /** position in bohr */
  xyz: [number, number, number];
}

export interface Molecule {
  atoms: Atom[];
  /** total charge in units of e (integer) */
  charge: number;
  /** spin multiplicity 2S + 1 (integer ≥ 1) */
  multiplicity: number;
}

export type LengthUnit = "angstrom" | "bohr";

/** What a geometry reader returns: the atoms, and the 1-based source line of each atom. */
export interface ParsedGeometry {
  atoms: Atom[];
  /** lines[i] is the 1-based line of atoms[i] in the text */
  lines: number[];
}

export interface GeometryReadOptions {
  /** unit of the lengths in the text */
  units: LengthUnit;
  /** name of the text for error messages (file name, or a label such as "geometry") */
  source?: string;
}
