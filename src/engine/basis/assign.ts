/**
 * Placing basis functions on atoms: per-element assignment of basis sets, harmonics choice,
 * function counting, offsets and labels. Works the same for orbital and fitting sets.
 *
 * Function labels: "<symbol><atom number> <n><l letter><component>", atoms numbered 1.. in
 * molecule order (not per element), e.g. "O1 1s", "O1 2px", "C1 3dxy" (Cartesian),
 * "C1 3d-1" (spherical, m = -l..+l as "d-2", "d-1", "d0", "d+1", "d+2"). n counts the
 * contracted functions of that l on the atom, starting at l + 1 (1s, 2s, ..., 2p, 3p, ...,
 * 3d, ...); it is a counter, not a claim about the atomic orbital.
 */
import { InputError } from "../errors.ts";
import type { Harmonics, Shell } from "./types.ts";
import { ncomp } from "./types.ts";
import type { BasisSetData } from "./format.ts";
import { getBasisSet, basisSetsWithElement } from "./library.ts";
import { canonicalSymbol } from "./symbols.ts";

export interface BasisAtom {
  symbol: string;
  /** position in bohr */
  xyz: [number, number, number];
}

/** A bundled set's name or a set's data (e.g. from parseBasisText). */
export type BasisSource = string | BasisSetData;

/** One set for all atoms, or a default with per-element overrides (keys: element symbols). */
export type BasisAssignment = BasisSource | { default: BasisSource; elements?: Record<string, BasisSource> };

export interface BuiltBasis {
  shells: Shell[];
  /** number of basis functions */
  nbf: number;
  /** index of the first function of each shell; a shell has rows * ncomp(l, pure) functions, row-major */
  shellOffsets: Int32Array;
  /** atom index of each function */
  functionAtom: Int32Array;
  /** label of each function (see the module comment) */
  functionLabels: string[];
  /** the harmonics requested */
  harmonics: Harmonics;
  /** element symbol -> name of the set used for it (elements present in the molecule) */
  setNames: Record<string, string>;
  /** citation key -> text, for the references of every element actually used */
  references: Record<string, string>;
}

const L_LETTERS = "spdfghi";

/** Component labels of one contracted function of angular momentum l. */
export function componentLabels(l: number, pure: boolean): string[] {
  const letter = L_LETTERS[l] ?? `[l=${l}]`;
  if (pure && l >= 2) {
    const out: string[] = [];
    for (let m = -l; m <= l; m++) out.push(`${letter}${m > 0 ? "+" : ""}${m}`);
    return out;
  }
  if (l === 0) return ["s"];
  const out: string[] = [];
  for (let i = l; i >= 0; i--) {
    for (let j = l - i; j >= 0; j--) out.push(letter + "x".repeat(i) + "y".repeat(j) + "z".repeat(l - i - j));
  }
  return out;
}

function resolve(source: BasisSource): BasisSetData {
  return typeof source === "string" ? getBasisSet(source) : source;
}

function unknownElement(symbol: string, what: string): InputError {
  return new InputError("element-unknown", `Unknown element symbol "${symbol}" in ${what}.`, {
    hint: "The basis library covers the elements H–Kr.",
  });
}

/**
 * Shells, offsets and labels for `atoms` with the assigned basis set(s).
 * harmonics: "auto" keeps each shell's stored `pure` flag (the set's own convention);
 * "spherical"/"cartesian" force it for l >= 2.
 * Throws InputError "basis-unknown" (unknown set name), "element-unknown" (symbol outside
 * H–Kr) and "basis-missing-element" (the assigned set lacks an element of the molecule).
 */
export function buildBasis(atoms: BasisAtom[], assignment: BasisAssignment, harmonics: Harmonics = "auto"): BuiltBasis {
  const isPerElement = typeof assignment === "object" && assignment !== null && "default" in assignment;
  const defaultSet = resolve(isPerElement ? assignment.default : (assignment as BasisSource));
  const overrides = new Map<string, BasisSetData>();
  if (isPerElement && assignment.elements) {
    for (const [key, src] of Object.entries(assignment.elements)) {
      const sym = canonicalSymbol(key);
      if (!sym) throw unknownElement(key, "the per-element basis assignment");
      overrides.set(sym, resolve(src));
    }
  }

  const shells: Shell[] = [];
  const offsets: number[] = [];
  const functionAtom: number[] = [];
  const functionLabels: string[] = [];
  const setNames: Record<string, string> = {};
  const references: Record<string, string> = {};
  let nbf = 0;

  atoms.forEach((atom, a) => {
    const sym = canonicalSymbol(atom.symbol);
    if (!sym) throw unknownElement(atom.symbol, `atom ${a + 1}`);
    const set = overrides.get(sym) ?? defaultSet;
    const el = set.elements[sym];
    if (!el) {
      const others = basisSetsWithElement(sym, set.role);
      throw new InputError("basis-missing-element", `Basis set ${set.name} has no functions for ${sym} (atom ${a + 1}).`, {
        hint: others.length
          ? `Bundled ${set.role} sets that define ${sym}: ${others.join(", ")}. Choose one of them, or assign one to ${sym} only (per-element basis).`
          : `No bundled ${set.role} set defines ${sym}; supply a basis file for it.`,
      });
    }
    setNames[sym] = set.name;
    for (const key of el.references) references[key] = set.references[key] ?? key;
    const label = `${sym}${a + 1}`;
    const count: number[] = [];
    for (const sh of el.shells) {
      const pure = sh.l < 2 ? false : harmonics === "auto" ? sh.pure : harmonics === "spherical";
      const comps = componentLabels(sh.l, pure);
      if (comps.length !== ncomp(sh.l, pure)) throw new Error("basis: component count mismatch");
      offsets.push(nbf);
      shells.push({
        l: sh.l,
        pure,
        atom: a,
        center: [atom.xyz[0], atom.xyz[1], atom.xyz[2]],
        exponents: Float64Array.from(sh.exponents),
        coefficients: sh.coefficients.map((row) => Float64Array.from(row)),
      });
      for (let r = 0; r < sh.coefficients.length; r++) {
        count[sh.l] = (count[sh.l] ?? 0) + 1;
        const n = sh.l + count[sh.l];
        for (const c of comps) {
          functionAtom.push(a);
          functionLabels.push(`${label} ${n}${c}`);
        }
        nbf += comps.length;
      }
    }
  });

  return {
    shells,
    nbf,
    shellOffsets: Int32Array.from(offsets),
    functionAtom: Int32Array.from(functionAtom),
    functionLabels,
    harmonics,
    setNames,
    references,
  };
}
