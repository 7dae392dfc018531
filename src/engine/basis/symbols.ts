/**
 * Element symbols H–Kr (Z = 1–36), the range the bundled basis library covers.
 * A small local table so the basis module stands alone; the full element data
 * (weights, radii, their sources) lives in src/engine/elements.ts.
 * Symbols as fixed by IUPAC (Nomenclature of Inorganic Chemistry, 2005).
 */
export const BASIS_SYMBOLS: readonly string[] = [
  "H", "He",
  "Li", "Be", "B", "C", "N", "O", "F", "Ne",
  "Na", "Mg", "Al", "Si", "P", "S", "Cl", "Ar",
  "K", "Ca", "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn",
  "Ga", "Ge", "As", "Se", "Br", "Kr",
];

const BY_LOWER = new Map(BASIS_SYMBOLS.map((s, i) => [s.toLowerCase(), i + 1]));

/** Canonical spelling ("cl" -> "Cl") of a symbol in H–Kr, or undefined. */
export function canonicalSymbol(symbol: string): string | undefined {
  const z = BY_LOWER.get(symbol.trim().toLowerCase());
  return z === undefined ? undefined : BASIS_SYMBOLS[z - 1];
}

/** Atomic number of a symbol in H–Kr (case-insensitive), or undefined. */
export function atomicNumberOf(symbol: string): number | undefined {
  return BY_LOWER.get(symbol.trim().toLowerCase());
}
