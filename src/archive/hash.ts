/**
 * The input hash: the identity of one version of a calculation.
 *
 * It is SHA-256 over the canonical JSON (canonical.ts) of an object holding everything that
 * can change a computed number, and nothing else:
 *
 *   {
 *     molecule: { charge, multiplicity, atoms: [{ symbol, z, xyz }] },  // xyz in bohr, full precision
 *     model: spec.model,              // every field: reference, correlation, basis (as written:
 *                                     // name, per-element names or { file }), harmonics,
 *                                     // frozen_core, density_fitting, fitting_basis
 *     convergence: spec.convergence,  // every field: energy, density, max_iterations,
 *                                     // accelerator, guess, level_shift, damping
 *     basis: basisData,               // the basis data actually used (basisHashData below):
 *                                     // per element, every shell's l, pure flag (after the
 *                                     // harmonics choice), exponents and coefficients; and the
 *                                     // fitting set's data when density fitting is used
 *     numerics                        // NUMERICS_VERSION: integral cut-offs, engine defaults
 *                                     // not in the spec (DIIS size, orthogonalization threshold,
 *                                     // stability options, dipole origin), constants, weights
 *   }
 *
 * Left out on purpose (they never change a number): id, title, summary, authors, tags, notes,
 * checks (they compare numbers, they do not make them; a changed check is re-evaluated on the
 * stored result), the geometry's original text, units and kind (xyz/zmatrix/file: only the
 * parsed atoms in bohr count, so the same atoms written in ångström or in bohr hash the same),
 * YAML comments and key order (canonical JSON sorts keys). model and convergence are copied
 * whole, so a field added to them later is covered without touching this file (a false
 * recompute is cheap; a false reuse would publish a wrong number).
 */
import { createHash } from "node:crypto";
import {
  type BasisAssignment, type BasisSource, type BuiltBasis, buildBasis, canonicalSymbol, type Harmonics,
} from "../engine/basis/index.ts";
import { InputError } from "../engine/errors.ts";
import { FITTING_DEFAULTS } from "../engine/run.ts";
import type { NormalizedSpec } from "../spec/types.ts";
import { canonicalJson } from "./canonical.ts";

/** One shell of the data that went into a calculation. */
export interface HashShell {
  l: number;
  /** after the harmonics choice (always false for l < 2) */
  pure: boolean;
  exponents: number[];
  /** one row per contracted function */
  coefficients: number[][];
}

/** element symbol -> its shells, in the order the engine uses them */
export type HashBasisSet = Record<string, HashShell[]>;

export interface BasisHashData {
  orbital: HashBasisSet;
  /** the RI fitting set's data when density-fitted MP2 is run, else null */
  fitting: HashBasisSet | null;
}

/** Per-element shell data of a built basis (the first atom of each element; all atoms of an element share it). */
export function hashBasisSetFromBuilt(built: Pick<BuiltBasis, "shells">, symbols: readonly string[]): HashBasisSet {
  const out: HashBasisSet = {};
  const firstAtom = new Map<string, number>();
  symbols.forEach((s, i) => {
    const sym = canonicalSymbol(s) ?? s;
    if (!firstAtom.has(sym)) firstAtom.set(sym, i);
  });
  for (const [sym, atom] of firstAtom) {
    out[sym] = built.shells.filter((sh) => sh.atom === atom).map((sh) => ({
      l: sh.l,
      pure: sh.pure,
      exponents: Array.from(sh.exponents),
      coefficients: sh.coefficients.map((row) => Array.from(row)),
    }));
  }
  return out;
}

/** What the spec's basis resolves to, when the spec alone cannot say (a `{ file }` basis). */
export interface ResolvedBasis {
  /** the orbital basis as the engine gets it; required when spec.model.basis is { file } */
  orbital?: BasisAssignment;
  /** the fitting set as the engine gets it; default spec.model.fitting_basis or the published default */
  fitting?: BasisSource;
}

/** The orbital assignment a spec asks for (names resolve in the bundled library). */
export function specBasisAssignment(spec: NormalizedSpec, resolved: ResolvedBasis = {}): BasisAssignment {
  if (resolved.orbital !== undefined) return resolved.orbital;
  const b = spec.model.basis;
  if (typeof b === "string") return b;
  if ("file" in b) throw new Error(`basis file ${b.file}: pass its parsed data as resolved.orbital`);
  return { default: b.default, elements: { ...b.elements } };
}

/**
 * The basis data a spec's calculation uses, for inputHash: built exactly as run() builds it
 * (same assignment, same harmonics, fitting set with "auto" harmonics). Throws the engine's
 * InputErrors (unknown set, missing element, no default fitting set).
 */
export function basisHashData(spec: NormalizedSpec, resolved: ResolvedBasis = {}): BasisHashData {
  const atoms = spec.molecule.atoms.map((a) => ({ symbol: a.symbol, xyz: a.xyz }));
  const symbols = atoms.map((a) => a.symbol);
  const built = buildBasis(atoms, specBasisAssignment(spec, resolved), spec.model.harmonics as Harmonics);
  const orbital = hashBasisSetFromBuilt(built, symbols);
  let fitting: HashBasisSet | null = null;
  if (spec.model.density_fitting && spec.model.correlation !== "none") {
    const names = [...new Set(Object.values(built.setNames))];
    const fit = resolved.fitting ?? spec.model.fitting_basis ?? (names.length === 1 ? FITTING_DEFAULTS[names[0]] : undefined);
    if (fit === undefined) {
      throw new InputError("fitting-basis-needed", `no default fitting basis for ${names.join(" + ")}`, {
        hint: `name one (bundled: ${Object.values(FITTING_DEFAULTS).join(", ")})`,
      });
    }
    fitting = hashBasisSetFromBuilt(buildBasis(atoms, fit, "auto"), symbols);
  }
  return { orbital, fitting };
}

/** The object the input hash is taken over (exported for inspection and tests). */
export function hashedInput(spec: NormalizedSpec, basisData: unknown, numerics: number): Record<string, unknown> {
  return {
    molecule: {
      charge: spec.molecule.charge,
      multiplicity: spec.molecule.multiplicity,
      atoms: spec.molecule.atoms.map((a) => ({ symbol: a.symbol, z: a.z, xyz: [a.xyz[0], a.xyz[1], a.xyz[2]] })),
    },
    model: { ...spec.model },
    convergence: { ...spec.convergence },
    basis: basisData,
    numerics,
  };
}

/** "sha256:<64 hex>" over canonicalJson(hashedInput(...)); see the module comment for what is covered. */
export function inputHash(spec: NormalizedSpec, basisData: unknown, numerics: number): string {
  const text = canonicalJson(hashedInput(spec, basisData, numerics));
  return `sha256:${createHash("sha256").update(text, "utf8").digest("hex")}`;
}

export const INPUT_HASH_PATTERN = /^sha256:[0-9a-f]{64}$/;

/** The hex part of "sha256:<hex>" (also accepts the bare hex). Throws on anything else. */
export function hashHex(hash: string): string {
  const hex = hash.startsWith("sha256:") ? hash.slice(7) : hash;
  if (!/^[0-9a-f]{64}$/.test(hex)) throw new Error(`not an input hash: ${JSON.stringify(hash)}`);
  return hex;
}
