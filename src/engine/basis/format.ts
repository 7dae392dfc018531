/**
 * The fieldbook basis-set data format, "fieldbook-basis/1" (our own; documented in
 * library.ts and src/engine/basis/data/README.md), and its validation.
 */
import type { ShellData } from "./types.ts";
import { canonicalSymbol } from "./symbols.ts";

export const BASIS_FORMAT = "fieldbook-basis/1";

/** Highest angular momentum accepted in basis data (l = 6, i functions). */
export const MAX_L = 6;

export type BasisRole = "orbital" | "fitting";

/** The set's harmonics as stored in its shells: "mixed" when its l >= 2 shells differ. */
export type BasisHarmonics = "cartesian" | "spherical" | "mixed";

export interface BasisElementData {
  /** citation keys (into BasisSetData.references) for this element's functions */
  references: string[];
  /** shells in the published order, one l each */
  shells: ShellData[];
}

export interface BasisSetData {
  format: typeof BASIS_FORMAT;
  name: string;
  /** "pople" | "dunning" | "karlsruhe" | "user" | ... (informational) */
  family: string;
  role: BasisRole;
  /** summary of the shells' pure flags for l >= 2 (informational; the shells decide) */
  harmonics: BasisHarmonics;
  description?: string;
  /** where the numbers come from */
  source?: string;
  /** citation key -> full citation text (authors, title, journal, DOI on separate lines) */
  references: Record<string, string>;
  /** element symbol (H–Kr, canonical spelling) -> data */
  elements: Record<string, BasisElementData>;
}

/** Path into the JSON document of a basis file, for locating errors. */
export type JsonPath = (string | number)[];

/** Thrown by validateBasisSet; the caller adds the text location. */
export class BasisValidationError extends Error {
  readonly path: JsonPath;
  constructor(message: string, path: JsonPath) {
    super(message);
    this.path = path;
  }
}

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === "object" && v !== null && !Array.isArray(v);

function fail(message: string, path: JsonPath): never {
  throw new BasisValidationError(message, path);
}

function validateNumbers(v: unknown, path: JsonPath, what: string, positive: boolean): number[] {
  if (!Array.isArray(v) || v.length === 0) fail(`${what} must be a non-empty array of numbers`, path);
  v.forEach((x, i) => {
    if (typeof x !== "number" || !Number.isFinite(x)) fail(`${what}[${i}] is not a finite number (${JSON.stringify(x)})`, [...path, i]);
    if (positive && !(x > 0)) fail(`${what}[${i}] must be positive (got ${x})`, [...path, i]);
  });
  return v.slice() as number[];
}

/**
 * Check that `value` (parsed JSON) is a well-formed basis set in our format and return a
 * normalized copy (canonical element symbols, defaults filled in). Throws BasisValidationError.
 * Defaults for user files: family "user", role "orbital", references {}, element references [];
 * a shell's `pure` may be omitted for l < 2 (false) or when the set's `harmonics` is
 * "cartesian"/"spherical".
 */
export function validateBasisSet(value: unknown): BasisSetData {
  if (!isObject(value)) fail("a basis file must be a JSON object", []);
  if (value.format !== BASIS_FORMAT) {
    fail(`"format" must be "${BASIS_FORMAT}" (got ${JSON.stringify(value.format)})`, ["format"]);
  }
  if (typeof value.name !== "string" || !value.name.trim()) fail(`"name" must be a non-empty string`, ["name"]);
  const role = value.role ?? "orbital";
  if (role !== "orbital" && role !== "fitting") fail(`"role" must be "orbital" or "fitting" (got ${JSON.stringify(role)})`, ["role"]);
  const family = value.family ?? "user";
  if (typeof family !== "string") fail(`"family" must be a string`, ["family"]);
  const declared = value.harmonics;
  if (declared !== undefined && declared !== "cartesian" && declared !== "spherical" && declared !== "mixed") {
    fail(`"harmonics" must be "cartesian", "spherical" or "mixed" (got ${JSON.stringify(declared)})`, ["harmonics"]);
  }
  for (const k of ["description", "source"] as const) {
    if (value[k] !== undefined && typeof value[k] !== "string") fail(`"${k}" must be a string`, [k]);
  }
  const refsIn = value.references ?? {};
  if (!isObject(refsIn)) fail(`"references" must be an object of citation key -> text`, ["references"]);
  const references: Record<string, string> = {};
  for (const [k, t] of Object.entries(refsIn)) {
    if (typeof t !== "string") fail(`reference "${k}" must be a string`, ["references", k]);
    references[k] = t;
  }
  if (!isObject(value.elements) || Object.keys(value.elements).length === 0) {
    fail(`"elements" must be a non-empty object keyed by element symbol`, ["elements"]);
  }
  const elements: Record<string, BasisElementData> = {};
  let nCart = 0;
  let nSph = 0;
  for (const [key, el] of Object.entries(value.elements)) {
    const ep: JsonPath = ["elements", key];
    const sym = canonicalSymbol(key);
    if (!sym) fail(`"${key}" is not an element symbol in H–Kr`, ep);
    if (elements[sym]) fail(`element ${sym} is given twice`, ep);
    if (!isObject(el)) fail(`element ${sym} must be an object with "shells"`, ep);
    const elRefs = el.references ?? [];
    if (!Array.isArray(elRefs) || elRefs.some((r) => typeof r !== "string")) fail(`element ${sym}: "references" must be an array of citation keys`, [...ep, "references"]);
    (elRefs as string[]).forEach((r, i) => {
      if (!(r in references)) fail(`element ${sym}: reference "${r}" is not defined in "references"`, [...ep, "references", i]);
    });
    if (!Array.isArray(el.shells) || el.shells.length === 0) fail(`element ${sym}: "shells" must be a non-empty array`, [...ep, "shells"]);
    const shells: ShellData[] = [];
    el.shells.forEach((sh: unknown, i: number) => {
      const sp: JsonPath = [...ep, "shells", i];
      const what = `element ${sym}, shell ${i}`;
      if (!isObject(sh)) fail(`${what}: must be an object with l, exponents, coefficients`, sp);
      const l = sh.l;
      if (typeof l !== "number" || !Number.isInteger(l) || l < 0 || l > MAX_L) {
        fail(`${what}: "l" must be an integer from 0 to ${MAX_L} (got ${JSON.stringify(l)})`, [...sp, "l"]);
      }
      let pure = sh.pure;
      if (pure === undefined) {
        if (l < 2) pure = false;
        else if (declared === "cartesian" || declared === "spherical") pure = declared === "spherical";
        else fail(`${what}: "pure" (true spherical, false Cartesian) is required for l >= 2`, sp);
      }
      if (typeof pure !== "boolean") fail(`${what}: "pure" must be true or false`, [...sp, "pure"]);
      const exponents = validateNumbers(sh.exponents, [...sp, "exponents"], `${what}: exponents`, true);
      if (!Array.isArray(sh.coefficients) || sh.coefficients.length === 0) {
        fail(`${what}: "coefficients" must be a non-empty array of rows`, [...sp, "coefficients"]);
      }
      const coefficients = sh.coefficients.map((row: unknown, r: number) => {
        const rp: JsonPath = [...sp, "coefficients", r];
        const nums = validateNumbers(row, rp, `${what}: coefficients[${r}]`, false);
        if (nums.length !== exponents.length) {
          fail(`${what}: coefficient row ${r} has ${nums.length} values but there are ${exponents.length} exponents`, rp);
        }
        if (nums.every((c) => c === 0)) fail(`${what}: coefficient row ${r} is all zeros`, rp);
        return nums;
      });
      if (l >= 2) pure ? nSph++ : nCart++;
      shells.push({ l, pure: l >= 2 ? pure : false, exponents, coefficients });
    });
    elements[sym] = { references: (elRefs as string[]).slice(), shells };
  }
  const harmonics: BasisHarmonics = nCart && nSph ? "mixed" : nSph ? "spherical" : "cartesian";
  const out: BasisSetData = { format: BASIS_FORMAT, name: value.name.trim(), family, role, harmonics, references, elements };
  if (typeof value.description === "string") out.description = value.description;
  if (typeof value.source === "string") out.source = value.source;
  return out;
}
