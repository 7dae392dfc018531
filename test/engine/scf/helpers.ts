/** Shared set-up for the SCF tests: problems from atoms and a basis, ⟨S²⟩, xyz files. */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { buildBasis, type BasisAssignment } from "../../../src/engine/basis/index.ts";
import { prepareShells } from "../../../src/engine/integrals/shells.ts";
import { nuclearRepulsion, parseXyz, type Atom } from "../../../src/engine/molecule.ts";
import type { Reference, ScfProblem, ScfResult } from "../../../src/engine/scf/scf.ts";
import { elementBySymbol } from "../../../src/engine/elements.ts";

/** Atoms from symbols and positions in bohr. */
export function atomsBohr(list: [string, number, number, number][]): Atom[] {
  return list.map(([symbol, x, y, z]) => ({ symbol, z: elementBySymbol(symbol).z, xyz: [x, y, z] }));
}

/** A molecule from test/bench/geometries/<name>.xyz (comment line gives charge, multiplicity, units). */
export function benchGeometry(name: string): { atoms: Atom[]; charge: number; multiplicity: number } {
  const path = fileURLToPath(new URL(`../../bench/geometries/${name}.xyz`, import.meta.url));
  const text = readFileSync(path, "utf8");
  const comment = text.split(/\r?\n/)[1] ?? "";
  const get = (k: string) => new RegExp(`(?:^|\\s)${k}=(\\S+)`).exec(comment)?.[1];
  const units = get("units") === "bohr" ? "bohr" : "angstrom";
  const { atoms } = parseXyz(text, { units, source: `${name}.xyz` });
  return { atoms, charge: Number(get("charge") ?? 0), multiplicity: Number(get("multiplicity") ?? 1) };
}

/** The SCF problem for `atoms` in `basis` (harmonics as the set stores them). */
export function scfProblem(
  atoms: Atom[], basis: BasisAssignment, reference: Reference, opts: { charge?: number; multiplicity?: number } = {},
): ScfProblem {
  const built = buildBasis(atoms.map((a) => ({ symbol: a.symbol, xyz: a.xyz })), basis, "auto");
  const nel = atoms.reduce((t, a) => t + a.z, 0) - (opts.charge ?? 0);
  const unpaired = (opts.multiplicity ?? 1) - 1;
  return {
    basis: prepareShells(built.shells),
    nuclei: atoms.map((a) => ({ charge: a.z, x: a.xyz[0], y: a.xyz[1], z: a.xyz[2] })),
    nuclearRepulsion: nuclearRepulsion({ atoms }),
    nalpha: (nel + unpaired) / 2,
    nbeta: (nel - unpaired) / 2,
    reference,
  };
}

function matmul(A: Float64Array, B: Float64Array, n: number): Float64Array {
  const C = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let k = 0; k < n; k++) {
      const a = A[i * n + k];
      if (a === 0) continue;
      for (let j = 0; j < n; j++) C[i * n + j] += a * B[k * n + j];
    }
  return C;
}

/**
 * ⟨S²⟩ of the single determinant: S_z(S_z + 1) + N_β − tr(Pα S Pβ S), Pσ the AO density of
 * spin σ: the ⟨S²⟩ of a UHF determinant, S_z(S_z+1) + N_β − Σ_ij |S^{αβ}_ij|² over occupied
 * α and β orbitals (A. Szabo, N. S. Ostlund, Modern Quantum Chemistry (1989), §3.8 on UHF;
 * section from memory), written with AO densities; exact for one determinant.
 */
export function spinSquared(r: ScfResult): number {
  const n = r.matrices.S.length ** 0.5;
  const S = r.matrices.S;
  const [Pa, Pb] = r.matrices.D;
  const sz = (r.nalpha - r.nbeta) / 2;
  const PaS = matmul(Pa, S, n);
  const PbS = matmul(Pb, S, n);
  // tr(Pα S Pβ S) = Σ_ij (Pα S)_ij (Pβ S)_ji
  let t = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) t += PaS[i * n + j] * PbS[j * n + i];
  return sz * (sz + 1) + r.nbeta - t;
}
