/**
 * Element data for H–Kr (Z = 1–36).
 *
 * Columns and their sources:
 * - symbol, name, Z: IUPAC periodic table (names in IUPAC English spelling: aluminium, sulfur).
 * - atomicWeight: standard atomic weight A_r°(E), IUPAC CIAAW 2021 values, T. Prohaska et al.,
 *   "Standard atomic weights of the elements 2021 (IUPAC Technical Report)",
 *   Pure Appl. Chem. 94, 573 (2022), Table 1. For the elements whose standard atomic weight is
 *   an interval (H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br) the table's conventional value is used,
 *   marked `weightKind: "conventional"`, with the interval alongside. Typed from memory of the
 *   CIAAW table (uncertainties omitted).
 * - covalentRadius (Å): B. Cordero, V. Gómez, A. E. Platero-Prats, M. Revés, J. Echeverría,
 *   E. Cremades, F. Barragán, S. Alvarez, "Covalent radii revisited", Dalton Trans. 2008,
 *   2832–2838, Table 2. Carbon: the sp3 value (0.76); Mn, Fe, Co: the low-spin values
 *   (the table also lists high-spin radii 1.61, 1.52, 1.50). Typed from memory of that table.
 */
import { InputError, type InputLocation } from "./errors.ts";
import { didYouMean } from "./suggest.ts";

export interface Element {
  z: number;
  symbol: string;
  name: string;
  /** standard atomic weight (or conventional value for interval elements), CIAAW 2021 */
  atomicWeight: number;
  /** "single": a single standard value; "conventional": the conventional value of an interval */
  weightKind: "single" | "conventional";
  /** for interval elements, the CIAAW 2021 interval [low, high] */
  weightInterval: [number, number] | null;
  /** single-bond covalent radius in ångström, Cordero et al. 2008 Table 2 */
  covalentRadius: number;
}

type Row = [symbol: string, name: string, weight: number, interval: [number, number] | null, radius: number];

// [symbol, name, atomic weight (CIAAW 2021, from memory), interval (CIAAW 2021, from memory), covalent radius Å (Cordero 2008 Table 2, from memory)]
const ROWS: Row[] = [
  ["H", "hydrogen", 1.008, [1.00784, 1.00811], 0.31],
  ["He", "helium", 4.002602, null, 0.28],
  ["Li", "lithium", 6.94, [6.938, 6.997], 1.28],
  ["Be", "beryllium", 9.0121831, null, 0.96],
  ["B", "boron", 10.81, [10.806, 10.821], 0.84],
  ["C", "carbon", 12.011, [12.0096, 12.0116], 0.76], // radius: sp3 value
  ["N", "nitrogen", 14.007, [14.00643, 14.00728], 0.71],
  ["O", "oxygen", 15.999, [15.99903, 15.99977], 0.66],
  ["F", "fluorine", 18.998403162, null, 0.57],
  ["Ne", "neon", 20.1797, null, 0.58],
  ["Na", "sodium", 22.98976928, null, 1.66],
  ["Mg", "magnesium", 24.305, [24.304, 24.307], 1.41],
  ["Al", "aluminium", 26.9815384, null, 1.21],
  ["Si", "silicon", 28.085, [28.084, 28.086], 1.11],
  ["P", "phosphorus", 30.973761998, null, 1.07],
  ["S", "sulfur", 32.06, [32.059, 32.076], 1.05],
  ["Cl", "chlorine", 35.45, [35.446, 35.457], 1.02],
  ["Ar", "argon", 39.95, [39.792, 39.963], 1.06],
  ["K", "potassium", 39.0983, null, 2.03],
  ["Ca", "calcium", 40.078, null, 1.76],
  ["Sc", "scandium", 44.955907, null, 1.7],
  ["Ti", "titanium", 47.867, null, 1.6],
  ["V", "vanadium", 50.9415, null, 1.53],
  ["Cr", "chromium", 51.9961, null, 1.39],
  ["Mn", "manganese", 54.938043, null, 1.39], // radius: low spin
  ["Fe", "iron", 55.845, null, 1.32], // radius: low spin
  ["Co", "cobalt", 58.933194, null, 1.26], // radius: low spin
  ["Ni", "nickel", 58.6934, null, 1.24],
  ["Cu", "copper", 63.546, null, 1.32],
  ["Zn", "zinc", 65.38, null, 1.22],
  ["Ga", "gallium", 69.723, null, 1.22],
  ["Ge", "germanium", 72.63, null, 1.2],
  ["As", "arsenic", 74.921595, null, 1.19],
  ["Se", "selenium", 78.971, null, 1.2],
  ["Br", "bromine", 79.904, [79.901, 79.907], 1.2],
  ["Kr", "krypton", 83.798, null, 1.16],
];

/** Elements H–Kr, index z − 1. */
export const ELEMENTS: readonly Element[] = ROWS.map(([symbol, name, atomicWeight, interval, covalentRadius], i) =>
  Object.freeze({
    z: i + 1,
    symbol,
    name,
    atomicWeight,
    weightKind: interval ? ("conventional" as const) : ("single" as const),
    weightInterval: interval,
    covalentRadius,
  }),
);

/** Highest atomic number the engine knows. */
export const MAX_Z = ELEMENTS.length;

const BY_SYMBOL = new Map(ELEMENTS.map((e) => [e.symbol.toLowerCase(), e]));
const SYMBOLS = ELEMENTS.map((e) => e.symbol);

/** Element for a symbol (case-insensitive), or undefined. */
export function findElement(symbol: string): Element | undefined {
  return BY_SYMBOL.get(symbol.trim().toLowerCase());
}

/** Element for a symbol (case-insensitive: "cl", "CL" → Cl); unknown → InputError "element-unknown". */
export function elementBySymbol(symbol: string, where: InputLocation = {}): Element {
  const e = findElement(symbol);
  if (e) return e;
  const byName = ELEMENTS.find((x) => x.name === symbol.trim().toLowerCase());
  const suggestion = byName
    ? `did you mean ${JSON.stringify(byName.symbol)}? write the element symbol, not its name`
    : didYouMean(symbol.trim(), SYMBOLS);
  throw new InputError(
    "element-unknown",
    `unknown element ${JSON.stringify(symbol)}; known elements are H–Kr (Z 1–${MAX_Z})`,
    { hint: suggestion ?? `use an element symbol from H to Kr, e.g. "C", "Cl", "Fe"`, where },
  );
}

/** Element for an atomic number; outside 1–36 → InputError "element-unknown". */
export function elementByZ(z: number, where: InputLocation = {}): Element {
  if (Number.isInteger(z) && z >= 1 && z <= MAX_Z) return ELEMENTS[z - 1];
  throw new InputError("element-unknown", `no element with atomic number ${z}; known elements are H–Kr (Z 1–${MAX_Z})`, {
    hint: `use an atomic number from 1 to ${MAX_Z}`,
    where,
  });
}

/**
 * Number of noble-gas core orbitals of an atom that correlated methods freeze
 * (design/conventions.md): 0 for H–He, 1 (1s) for Li–Ne, 5 (1s2s2p) for Na–Ar,
 * 9 (1s2s2p3s3p) for K–Kr.
 */
export function coreOrbitals(z: number): number {
  elementByZ(z);
  if (z <= 2) return 0;
  if (z <= 10) return 1;
  if (z <= 18) return 5;
  return 9;
}
