/** The basis module: bundled library, user basis files, construction of shells on atoms. */
export {
  listBasisSets,
  getBasisSet,
  findBasisSet,
  basisSetsWithElement,
  closestBasisNames,
  basisLookupKey,
  editDistance,
} from "./library.ts";
export type { BasisSetSummary } from "./library.ts";
export { parseBasisText } from "./user-basis.ts";
export { validateBasisSet, BASIS_FORMAT, MAX_L } from "./format.ts";
export type { BasisSetData, BasisElementData, BasisRole, BasisHarmonics } from "./format.ts";
export { buildBasis, componentLabels } from "./assign.ts";
export type { BasisAtom, BasisSource, BasisAssignment, BuiltBasis } from "./assign.ts";
export { BASIS_SYMBOLS, canonicalSymbol, atomicNumberOf } from "./symbols.ts";
export type { ShellData, Shell, Harmonics } from "./types.ts";
export { ncart, ncomp } from "./types.ts";
