/**
 * Molecule: atoms (positions in bohr), total charge and spin multiplicity; the XYZ and Z-matrix
 * readers; nuclear repulsion, Hill formula, electron count, and validation with located,
 * friendly errors. All values are plain JSON-serializable objects.
 */
import { InputError, type InputLocation } from "./errors.ts";
import { elementByZ } from "./elements.ts";
import { bohrToAngstrom } from "./constants.ts";
import type { Atom, Molecule } from "./geometry/types.ts";

export type { Atom, Molecule, LengthUnit, ParsedGeometry, GeometryReadOptions } from "./geometry/types.ts";
export { parseXyz, type XyzGeometry } from "./geometry/xyz.ts";
export { parseZMatrix, type ZMatrixGeometry } from "./geometry/zmatrix.ts";

export type Reference = "rhf" | "uhf" | "rohf";

/** Atoms closer than this (ångström) are rejected by validateMolecule. */
export const MIN_ATOM_DISTANCE_ANGSTROM = 0.1;

export function distance(a: Atom, b: Atom): number {
  const dx = a.xyz[0] - b.xyz[0];
  const dy = a.xyz[1] - b.xyz[1];
  const dz = a.xyz[2] - b.xyz[2];
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/** Angle a–b–c in degrees. */
export function angle(a: Atom, b: Atom, c: Atom): number {
  const u = [a.xyz[0] - b.xyz[0], a.xyz[1] - b.xyz[1], a.xyz[2] - b.xyz[2]];
  const v = [c.xyz[0] - b.xyz[0], c.xyz[1] - b.xyz[1], c.xyz[2] - b.xyz[2]];
  const cos = (u[0] * v[0] + u[1] * v[1] + u[2] * v[2]) / (Math.hypot(u[0], u[1], u[2]) * Math.hypot(v[0], v[1], v[2]));
  return (Math.acos(Math.max(-1, Math.min(1, cos))) * 180) / Math.PI;
}

/** Dihedral a–b–c–d in degrees, (−180, 180], IUPAC sign convention. */
export function dihedral(a: Atom, b: Atom, c: Atom, d: Atom): number {
  const s = (p: Atom, q: Atom) => [q.xyz[0] - p.xyz[0], q.xyz[1] - p.xyz[1], q.xyz[2] - p.xyz[2]];
  const x = (u: number[], v: number[]) => [u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]];
  const dt = (u: number[], v: number[]) => u[0] * v[0] + u[1] * v[1] + u[2] * v[2];
  const b1 = s(a, b);
  const b2 = s(b, c);
  const b3 = s(c, d);
  const n1 = x(b1, b2);
  const n2 = x(b2, b3);
  const y = Math.sqrt(dt(b2, b2)) * dt(b1, n2);
  return (Math.atan2(y, dt(n1, n2)) * 180) / Math.PI;
}

/** Nuclear repulsion energy Σ_{i<j} Z_i Z_j / r_ij in hartree (positions in bohr). */
export function nuclearRepulsion(mol: Pick<Molecule, "atoms">): number {
  const atoms = mol.atoms;
  let e = 0;
  for (let i = 0; i < atoms.length; i++) {
    for (let j = 0; j < i; j++) e += (atoms[i].z * atoms[j].z) / distance(atoms[i], atoms[j]);
  }
  return e;
}

/**
 * Molecular formula in Hill order: with carbon, C first, then H, then the other symbols
 * alphabetically; without carbon, all symbols alphabetically (so HCl is "ClH").
 * Counts of 1 are omitted; the charge is not included.
 */
export function hillFormula(mol: Pick<Molecule, "atoms">): string {
  const counts = new Map<string, number>();
  for (const a of mol.atoms) counts.set(a.symbol, (counts.get(a.symbol) ?? 0) + 1);
  const symbols = [...counts.keys()].sort((p, q) => (p < q ? -1 : p > q ? 1 : 0));
  let order = symbols;
  if (counts.has("C")) {
    order = ["C", ...(counts.has("H") ? ["H"] : []), ...symbols.filter((s) => s !== "C" && s !== "H")];
  }
  return order.map((s) => (counts.get(s) === 1 ? s : `${s}${counts.get(s)}`)).join("");
}

/** Number of electrons: Σ Z − charge. */
export function electronCount(mol: Molecule): number {
  let n = 0;
  for (const a of mol.atoms) n += a.z;
  return n - mol.charge;
}

export interface ValidateOptions {
  reference?: Reference;
  /** name of the text the molecule came from, for error locations */
  source?: string;
  /** 1-based source line of each atom (as returned by the readers) */
  lines?: number[];
}

function signed(q: number): string {
  return q > 0 ? `+${q}` : `${q}`;
}

/**
 * Checks that a molecule can be computed; throws InputError otherwise. Codes:
 * molecule-empty, element-unknown, atom-symbol-mismatch, coordinate-not-finite, atoms-too-close,
 * charge-invalid, electron-count-negative, multiplicity-invalid, multiplicity-parity,
 * multiplicity-too-large, rhf-open-shell.
 */
export function validateMolecule(mol: Molecule, options: ValidateOptions = {}): void {
  const { source, lines, reference } = options;
  const whereAtom = (i: number): InputLocation => {
    const w: InputLocation = {};
    if (source !== undefined) w.source = source;
    if (lines && lines[i] !== undefined) w.line = lines[i];
    return w;
  };
  const whereAll: InputLocation = source !== undefined ? { source } : {};
  const atomName = (i: number) => `atom ${i + 1} (${mol.atoms[i].symbol}${lines && lines[i] !== undefined ? `, line ${lines[i]}` : ""})`;

  if (mol.atoms.length === 0) {
    throw new InputError("molecule-empty", "the molecule has no atoms", { hint: "give at least one atom", where: whereAll });
  }
  mol.atoms.forEach((a, i) => {
    const el = elementByZ(a.z, whereAtom(i));
    if (el.symbol !== a.symbol) {
      throw new InputError("atom-symbol-mismatch", `${atomName(i)} has atomic number ${a.z}, which is ${el.symbol}, not ${a.symbol}`, {
        hint: `use symbol ${el.symbol} or atomic number of ${a.symbol}`,
        where: whereAtom(i),
      });
    }
    if (a.xyz.length !== 3 || !a.xyz.every((v) => typeof v === "number" && Number.isFinite(v))) {
      throw new InputError("coordinate-not-finite", `${atomName(i)} has a coordinate that is not a finite number: [${a.xyz.join(", ")}]`, {
        hint: "coordinates must be three finite numbers",
        where: whereAtom(i),
      });
    }
  });
  for (let i = 0; i < mol.atoms.length; i++) {
    for (let j = 0; j < i; j++) {
      const r = bohrToAngstrom(distance(mol.atoms[i], mol.atoms[j]));
      if (r < MIN_ATOM_DISTANCE_ANGSTROM) {
        throw new InputError(
          "atoms-too-close",
          `${atomName(j)} and ${atomName(i)} are ${r.toPrecision(3)} Å apart, closer than ${MIN_ATOM_DISTANCE_ANGSTROM} Å`,
          { hint: "check for a duplicated atom line or a coordinate in the wrong unit", where: whereAtom(i) },
        );
      }
    }
  }

  const formula = hillFormula(mol);
  if (!Number.isInteger(mol.charge)) {
    throw new InputError("charge-invalid", `the charge must be an integer, not ${mol.charge}`, { hint: "use e.g. 0, 1 or -1", where: whereAll });
  }
  const n = electronCount(mol);
  if (n < 0) {
    throw new InputError("electron-count-negative", `${formula} with charge ${signed(mol.charge)} would have ${n} electrons`, {
      hint: `the charge can be at most +${n + mol.charge}`,
      where: whereAll,
    });
  }
  const m = mol.multiplicity;
  if (!Number.isInteger(m) || m < 1) {
    throw new InputError("multiplicity-invalid", `the multiplicity must be a positive integer (2S + 1), not ${m}`, {
      hint: "use 1 for a singlet, 2 for a doublet, 3 for a triplet, …",
      where: whereAll,
    });
  }
  if ((n + m) % 2 === 0) {
    const options = [m - 1, m + 1].filter((k) => k >= 1 && k <= n + 1);
    throw new InputError(
      "multiplicity-parity",
      `multiplicity ${m} needs ${m % 2 === 1 ? "an even" : "an odd"} electron count, but ${formula} with charge ${signed(mol.charge)} has ${n} electron${n === 1 ? "" : "s"}`,
      { hint: `use multiplicity ${options.join(" or ")} or change the charge`, where: whereAll },
    );
  }
  if (m > n + 1) {
    throw new InputError(
      "multiplicity-too-large",
      `multiplicity ${m} needs ${m - 1} unpaired electrons, but ${formula} with charge ${signed(mol.charge)} has only ${n}`,
      { hint: `the largest multiplicity for ${n} electron${n === 1 ? "" : "s"} is ${n + 1}`, where: whereAll },
    );
  }
  if (reference === "rhf" && m !== 1) {
    throw new InputError("rhf-open-shell", `RHF describes closed shells only, but the multiplicity is ${m}`, {
      hint: "use reference uhf or rohf for an open-shell molecule",
      where: whereAll,
    });
  }
}
