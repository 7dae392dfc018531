/** Test helper: build a basis, run the SCF and the properties for a small molecule. */
import { buildBasis } from "../../../src/engine/basis/index.ts";
import { prepareShells } from "../../../src/engine/integrals/shells.ts";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { nuclearRepulsion, parseXyz, type Atom } from "../../../src/engine/molecule.ts";
import { computeProperties, type Properties } from "../../../src/engine/properties/index.ts";
import { runScf, type Reference, type ScfResult } from "../../../src/engine/scf/scf.ts";
import type { PreparedBasis } from "../../../src/engine/integrals/shells.ts";

export interface Calculation {
  atoms: Atom[];
  basis: PreparedBasis;
  scf: ScfResult;
  props: Properties;
  nuclearRepulsion: number;
  charge: number;
}

export function calculate(atoms: Atom[], basisName: string, charge: number, multiplicity: number, reference: Reference, origin?: [number, number, number]): Calculation {
  const built = buildBasis(atoms.map((a) => ({ symbol: a.symbol, xyz: a.xyz })), basisName);
  const basis = prepareShells(built.shells);
  const electrons = atoms.reduce((s, a) => s + a.z, 0) - charge;
  const unpaired = multiplicity - 1;
  if ((electrons - unpaired) % 2 !== 0) throw new Error("electron count and multiplicity do not match");
  const nbeta = (electrons - unpaired) / 2;
  const nalpha = nbeta + unpaired;
  const enuc = nuclearRepulsion({ atoms });
  const scf = runScf({
    basis,
    nuclei: atoms.map((a) => ({ charge: a.z, x: a.xyz[0], y: a.xyz[1], z: a.xyz[2] })),
    nuclearRepulsion: enuc,
    nalpha,
    nbeta,
    reference,
  });
  const props = computeProperties(scf, { basisShells: basis.shells, basis, atoms, nuclearRepulsion: enuc, charge, origin });
  return { atoms, basis, scf, props, nuclearRepulsion: enuc, charge };
}

export const sum = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0);

// Geometry (bohr): published worked example of a public SCF programming tutorial (water STO-3G)
export const WATER: Atom[] = [
  { symbol: "O", z: 8, xyz: [0, -0.143225816552, 0] },
  { symbol: "H", z: 1, xyz: [1.638036840407, 1.136548822547, 0] },
  { symbol: "H", z: 1, xyz: [-1.638036840407, 1.136548822547, 0] },
];

/** test/bench/geometries/oh_radical.xyz (r(OH) = 0.9697 Å, in ångström). */
export function ohAtoms(): Atom[] {
  const text = readFileSync(fileURLToPath(new URL("../../bench/geometries/oh_radical.xyz", import.meta.url)), "utf8");
  return parseXyz(text, { units: "angstrom", source: "oh_radical.xyz" }).atoms;
}

// Tetrahedral NH4+ with r(NH) = 1.93 bohr (a plausible bond length; common practice, no source —
// the tests using it check exact identities only, not values that depend on the geometry)
const A = 1.93 / Math.sqrt(3);
export const AMMONIUM: Atom[] = [
  { symbol: "N", z: 7, xyz: [0, 0, 0] },
  { symbol: "H", z: 1, xyz: [A, A, A] },
  { symbol: "H", z: 1, xyz: [-A, -A, A] },
  { symbol: "H", z: 1, xyz: [-A, A, -A] },
  { symbol: "H", z: 1, xyz: [A, -A, -A] },
];
