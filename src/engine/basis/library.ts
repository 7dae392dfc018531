/**
 * The bundled basis-set library.
 *
 * ## Data format "fieldbook-basis/1" (our own; one JSON file per set in ./data/)
 * ```
 * {
 *   "format": "fieldbook-basis/1",
 *   "name": "cc-pVDZ",                      // display name, as published
 *   "family": "dunning",                    // "pople" | "dunning" | "karlsruhe" | "user" (informational)
 *   "role": "orbital",                      // "orbital" | "fitting" (density-fitting auxiliary set)
 *   "harmonics": "spherical",               // summary of the l >= 2 shells' pure flags:
 *                                           //   "cartesian" | "spherical" | "mixed" (informational)
 *   "description": "...", "source": "...",  // optional: description, where the numbers come from
 *   "references": { "dunning1989a": "Authors\nTitle\nJournal volume, pages (year)\nDOI" },
 *   "elements": {                           // keyed by symbol (H–Kr), in order of atomic number
 *     "C": {
 *       "references": ["dunning1989a"],     // keys into "references"
 *       "shells": [                         // in the published order
 *         { "l": 0, "pure": false, "exponents": [6665, 1000, ...], "coefficients": [[...], [...], [...]] },
 *         ...
 *       ]
 *     }
 *   }
 * }
 * ```
 * - every shell has one angular momentum l (0..6); published combined shells (sp, spd) are
 *   split into one shell per l with the same exponents, in l order, at the same position;
 * - `exponents` in bohr^-2; `coefficients` one row per contracted function (general
 *   contractions keep several rows sharing the exponents), each row as long as `exponents`,
 *   referring to normalized primitives, exactly as published (not renormalized here);
 * - `pure`: the published convention of the shell for l >= 2 (true spherical, false
 *   Cartesian); always false for s and p, where it makes no difference;
 * - numbers are JSON numbers that parse to the same doubles as the published decimal strings.
 *
 * Bundled data: the Basis Set Exchange open dataset (MolSSI, BSD-3-Clause), converted once by
 * scripts/import-basis.mjs; test/engine/basis/conformance.test.ts checks every number against it.
 *
 * ## Names
 * Lookup is case-insensitive and ignores spaces, "-" and "_"; "(d)" = "*", "(d,p)" = "**"
 * (6-31G(d) = 6-31G*, 6-311G(d,p) = 6-311G**); fitting sets also answer to the suffixes
 * "-RI", "/C" (def2-SVP/C = def2-SVP-RIFIT).
 */
import { InputError } from "../errors.ts";
import type { BasisSetData, BasisRole, BasisHarmonics } from "./format.ts";
import { atomicNumberOf } from "./symbols.ts";

import sto3g from "./data/sto-3g.json" with { type: "json" };
import b321g from "./data/3-21g.json" with { type: "json" };
import b631g from "./data/6-31g.json" with { type: "json" };
import b631gd from "./data/6-31g-d.json" with { type: "json" };
import b631gdp from "./data/6-31g-dp.json" with { type: "json" };
import b631pgd from "./data/6-31pg-d.json" with { type: "json" };
import b631ppgdp from "./data/6-31ppg-dp.json" with { type: "json" };
import b6311gdp from "./data/6-311g-dp.json" with { type: "json" };
import ccpvdz from "./data/cc-pvdz.json" with { type: "json" };
import ccpvtz from "./data/cc-pvtz.json" with { type: "json" };
import ccpvqz from "./data/cc-pvqz.json" with { type: "json" };
import augccpvdz from "./data/aug-cc-pvdz.json" with { type: "json" };
import augccpvtz from "./data/aug-cc-pvtz.json" with { type: "json" };
import def2svp from "./data/def2-svp.json" with { type: "json" };
import def2tzvp from "./data/def2-tzvp.json" with { type: "json" };
import ccpvdzri from "./data/cc-pvdz-rifit.json" with { type: "json" };
import ccpvtzri from "./data/cc-pvtz-rifit.json" with { type: "json" };
import def2svpri from "./data/def2-svp-rifit.json" with { type: "json" };
import def2tzvpri from "./data/def2-tzvp-rifit.json" with { type: "json" };

/** The bundled sets, in display order (orbital sets, then fitting sets). Treat as read-only. */
const BUNDLED: readonly BasisSetData[] = [
  sto3g, b321g, b631g, b631gd, b631gdp, b631pgd, b631ppgdp, b6311gdp,
  ccpvdz, ccpvtz, ccpvqz, augccpvdz, augccpvtz, def2svp, def2tzvp,
  ccpvdzri, ccpvtzri, def2svpri, def2tzvpri,
] as unknown as BasisSetData[];

export interface BasisSetSummary {
  name: string;
  family: string;
  role: BasisRole;
  harmonics: BasisHarmonics;
  description: string;
  /** element symbols the set defines, in order of atomic number */
  elements: string[];
}

/** Normalized lookup key of a basis-set name (see "Names" above). */
export function basisLookupKey(name: string): string {
  let s = name.trim().toLowerCase().replace(/\s+/g, "");
  s = s.replace(/\(d,p\)/g, "**").replace(/\(d\)/g, "*");
  s = s.replace(/(-rifit|-ri|\/c|\/ri)$/, "-rifit");
  return s.replace(/[-_]/g, "");
}

const BY_KEY = new Map<string, BasisSetData>();
for (const set of BUNDLED) {
  const key = basisLookupKey(set.name);
  if (BY_KEY.has(key)) throw new Error(`basis library: names ${set.name} and ${BY_KEY.get(key)!.name} collide`);
  BY_KEY.set(key, set);
}

const byZ = (a: string, b: string) => (atomicNumberOf(a) ?? 99) - (atomicNumberOf(b) ?? 99);

/** Summaries of the bundled sets, optionally only one role. */
export function listBasisSets(role?: BasisRole): BasisSetSummary[] {
  return BUNDLED.filter((s) => role === undefined || s.role === role).map((s) => ({
    name: s.name,
    family: s.family,
    role: s.role,
    harmonics: s.harmonics,
    description: s.description ?? s.name,
    elements: Object.keys(s.elements).sort(byZ),
  }));
}

/** The bundled set of that name (see "Names"), or undefined. */
export function findBasisSet(name: string): BasisSetData | undefined {
  return BY_KEY.get(basisLookupKey(name));
}

/** Levenshtein edit distance. */
export function editDistance(a: string, b: string): number {
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) {
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[b.length];
}

/** Up to `n` bundled set names closest to `name` (by edit distance of lookup keys). */
export function closestBasisNames(name: string, n = 3): string[] {
  const key = basisLookupKey(name);
  return BUNDLED.map((s) => ({ name: s.name, d: editDistance(key, basisLookupKey(s.name)) }))
    .sort((x, y) => x.d - y.d)
    .slice(0, n)
    .map((x) => x.name);
}

/**
 * The bundled set of that name. Unknown names throw InputError "basis-unknown" whose hint
 * suggests the closest names and lists the library.
 */
export function getBasisSet(name: string): BasisSetData {
  const set = findBasisSet(name);
  if (set) return set;
  const close = closestBasisNames(name);
  throw new InputError("basis-unknown", `Unknown basis set "${name}".`, {
    hint:
      `Did you mean ${close.slice(0, -1).join(", ")}${close.length > 1 ? " or " : ""}${close[close.length - 1]}? ` +
      `Bundled sets: ${BUNDLED.map((s) => s.name).join(", ")}. Other sets can be supplied as a basis file.`,
  });
}

/** Names of the bundled sets (of a role, if given) that define an element. */
export function basisSetsWithElement(symbol: string, role?: BasisRole): string[] {
  const z = atomicNumberOf(symbol);
  return BUNDLED.filter(
    (s) => (role === undefined || s.role === role) && Object.keys(s.elements).some((k) => atomicNumberOf(k) === z),
  ).map((s) => s.name);
}

export type { BasisSetData, BasisRole, BasisHarmonics, BasisElementData } from "./format.ts";
