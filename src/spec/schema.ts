/**
 * The spec format, defined once.
 *
 * A small schema language of our own (strings, integers, numbers, booleans, enums, constants,
 * lists, objects with known keys, maps with checked keys, unions), and the fieldbook spec
 * (format 1) written in it. This one definition drives
 *   - validation and defaults (./validate.ts walks the YAML nodes against it),
 *   - the TypeScript types: `Infer<typeof SPEC_SCHEMA>` is checked at compile time against the
 *     hand-written mirror in ./types.ts (see ./types-sync.ts), so the two cannot drift apart,
 *   - the JSON Schema for editors (`toJsonSchema()`, written to public/schemas/ by
 *     scripts/write-spec-schema.ts).
 *
 * Rules of the language:
 *   - every field has a description (shown in editors and in the JSON Schema);
 *   - an object key is required, has a default, or is `nullable` (absent → null in the
 *     normalized spec); so a normalized spec always has every key, and a reader sees every
 *     setting that produced a number;
 *   - YAML null (`key:` with nothing after it) is accepted only where `nullable` is set;
 *   - unknown keys are always errors.
 */
import { BASIS_SYMBOLS, canonicalSymbol, listBasisSets } from "../engine/basis/index.ts";
import { didYouMean } from "../engine/suggest.ts";

export interface Common {
  description: string;
  /** must be written (objects: the key must be present) */
  required?: boolean;
  /** null allowed; an absent key normalizes to null */
  nullable?: boolean;
}

export interface StringSchema extends Common {
  type: "string";
  default?: string;
  /** refuse "" and whitespace-only text */
  nonEmpty?: boolean;
  /** the value must match; `code`, `expected` and `hint` make the error message */
  pattern?: { regex: RegExp; code: string; expected: string; hint: string };
  /** multi-line text (geometry, Markdown); informational, for editors */
  multiline?: boolean;
  examples?: readonly string[];
}

export interface IntegerSchema extends Common {
  type: "integer";
  default?: number;
  min?: number;
  max?: number;
}

export interface NumberSchema extends Common {
  type: "number";
  default?: number;
  min?: number;
  max?: number;
  exclusiveMin?: number;
  exclusiveMax?: number;
  /** unit of the number, for descriptions */
  unit?: string;
}

export interface BooleanSchema extends Common {
  type: "boolean";
  default?: boolean;
}

export interface EnumSchema<V extends string = string> extends Common {
  type: "enum";
  values: readonly V[];
  default?: NoInfer<V>;
  /** what each value means, for editors */
  meanings?: Partial<Record<NoInfer<V>, string>>;
}

export interface ConstSchema<V extends number | string = number | string> extends Common {
  type: "const";
  value: V;
  /** error code when the value differs */
  code: string;
  hint: string;
}

export interface ListSchema<I extends Schema = Schema> extends Common {
  type: "list";
  items: I;
  /** absent → [] */
  defaultEmpty?: boolean;
}

export interface ObjectSchema<P extends Record<string, Schema> = Record<string, Schema>> extends Common {
  type: "object";
  properties: P;
  /** exactly one of these keys must be present (they are then neither required nor defaulted) */
  exactlyOne?: readonly (keyof P & string)[];
  /** what `exactlyOne` chooses between, for messages ("a geometry") */
  exactlyOneWhat?: string;
}

export interface MapSchema<V extends Schema = Schema> extends Common {
  type: "map";
  /** JSON-Schema pattern of the keys (the validator calls `checkKey` for friendlier errors) */
  keyPattern: RegExp;
  keyDescription: string;
  /** null if the key is fine, else the error (code, message, hint) */
  checkKey?: (key: string) => { code: string; message: string; hint?: string } | null;
  values: V;
  /** absent → {} */
  defaultEmpty?: boolean;
}

export interface UnionSchema<Vs extends readonly Schema[] = readonly Schema[]> extends Common {
  type: "union";
  /** a scalar is checked against the first scalar variant; a mapping against the object variant sharing most keys */
  variants: Vs;
}

export type Schema =
  | StringSchema
  | IntegerSchema
  | NumberSchema
  | BooleanSchema
  | EnumSchema
  | ConstSchema
  | ListSchema
  | ObjectSchema
  | MapSchema
  | UnionSchema;

// ── builders (they keep literal types so that Infer can compute the TS type) ──────────────────

type Opts<S> = Omit<S, "type">;

export const string = <const O extends Opts<StringSchema>>(o: O): O & { type: "string" } => ({ type: "string", ...o });
export const integer = <const O extends Opts<IntegerSchema>>(o: O): O & { type: "integer" } => ({ type: "integer", ...o });
export const number = <const O extends Opts<NumberSchema>>(o: O): O & { type: "number" } => ({ type: "number", ...o });
export const boolean = <const O extends Opts<BooleanSchema>>(o: O): O & { type: "boolean" } => ({ type: "boolean", ...o });
export const oneOf = <const V extends string, const O extends Opts<Omit<EnumSchema<V>, "values">>>(
  values: readonly V[],
  o: O,
): O & { type: "enum"; values: readonly V[] } => ({ type: "enum", values, ...o });
export const constant = <const V extends number | string, const O extends Opts<Omit<ConstSchema<V>, "value">>>(
  value: V,
  o: O,
): O & { type: "const"; value: V } => ({ type: "const", value, ...o });
export const list = <const I extends Schema, const O extends Opts<Omit<ListSchema<I>, "items">>>(
  items: I,
  o: O,
): O & { type: "list"; items: I } => ({ type: "list", items, ...o });
export const object = <const P extends Record<string, Schema>, const O extends Opts<Omit<ObjectSchema<P>, "properties">>>(
  properties: P,
  o: O,
): O & { type: "object"; properties: P } => ({ type: "object", properties, ...o });
export const map = <const V extends Schema, const O extends Opts<Omit<MapSchema<V>, "values">>>(
  values: V,
  o: O,
): O & { type: "map"; values: V } => ({ type: "map", values, ...o });
export const union = <const Vs extends readonly Schema[], const O extends Opts<Omit<UnionSchema<Vs>, "variants">>>(
  variants: Vs,
  o: O,
): O & { type: "union"; variants: Vs } => ({ type: "union", variants, ...o });

// ── the TypeScript type a schema normalizes to ─────────────────────────────────────────────────

type OrNull<S, T> = S extends { nullable: true } ? T | null : T;

export type Infer<S> = S extends { type: "string" }
  ? OrNull<S, string>
  : S extends { type: "integer" | "number" }
    ? OrNull<S, number>
    : S extends { type: "boolean" }
      ? OrNull<S, boolean>
      : S extends { type: "enum"; values: readonly (infer V)[] }
        ? OrNull<S, V>
        : S extends { type: "const"; value: infer V }
          ? V
          : S extends { type: "list"; items: infer I }
            ? Infer<I>[]
            : S extends { type: "object"; properties: infer P }
              ? OrNull<S, { -readonly [K in keyof P]: Infer<P[K]> }>
              : S extends { type: "map"; values: infer V }
                ? OrNull<S, Record<string, Infer<V>>>
                : S extends { type: "union"; variants: readonly (infer V)[] }
                  ? OrNull<S, V extends unknown ? Infer<V> : never>
                  : never;

// ── the spec format, version 1 ─────────────────────────────────────────────────────────────────

/** The spec format version this code reads and writes. */
export const SPEC_FORMAT_VERSION = 1;

/** Calculation ids: lower case, digits, ".", "_", "-", "/" (folders); they name pages and records. */
export const ID_PATTERN = /^[a-z0-9][a-z0-9._/-]*$/;

const QUANTITIES = [
  "scf_energy", "total_energy", "mp2_correlation", "nuclear_repulsion", "dipole_magnitude", "homo", "lumo", "s_squared",
] as const;
const UNITS = ["hartree", "kcal/mol", "kJ/mol", "eV", "debye", "au"] as const;

const BUNDLED_ORBITAL_SETS = listBasisSets("orbital").map((b) => b.name);
const BUNDLED_FITTING_SETS = listBasisSets("fitting").map((b) => b.name);

const ELEMENT_KEY = /^[A-Za-z]{1,2}$/;

function checkElementKey(key: string): { code: string; message: string; hint?: string } | null {
  if (canonicalSymbol(key)) return null;
  return {
    code: "element-unknown",
    message: `${JSON.stringify(key)} is not an element symbol (H–Kr)`,
    hint: didYouMean(key, BASIS_SYMBOLS) ?? "write an element symbol such as H, C or Cl",
  };
}

const geometryText = (what: string) =>
  string({
    description: `${what} Write it as a literal block (\`|\`) so that every atom keeps its own line.`,
    nonEmpty: true,
    multiline: true,
    nullable: true,
  });

/** A repository path: relative to the repository root, "/" separators, no "..". */
const repoPath = <const X extends { required?: true; nullable?: true }>(description: string, example: string, extra: X) =>
  string({
    description: `${description} Path from the repository root with "/" separators; absolute paths, backslashes and paths leaving the repository are refused.`,
    nonEmpty: true,
    examples: [example],
    ...extra,
  });

const basisName = <const X extends { required?: true; nullable?: true }>(description: string, extra: X) =>
  string({ description, nonEmpty: true, examples: BUNDLED_ORBITAL_SETS, ...extra });

export const CHECK_SCHEMA = object(
  {
    quantity: oneOf(QUANTITIES, {
      description: "The computed quantity to compare.",
      required: true,
      meanings: {
        scf_energy: "SCF (Hartree–Fock) total energy",
        total_energy: "total energy of the method (SCF + correlation)",
        mp2_correlation: "MP2 (or SCS-MP2) correlation energy",
        nuclear_repulsion: "nuclear repulsion energy",
        dipole_magnitude: "magnitude of the dipole moment",
        homo: "energy of the highest occupied orbital",
        lumo: "energy of the lowest unoccupied orbital",
        s_squared: "expectation value of S² (dimensionless; unit au)",
      },
    }),
    expected: number({ description: "The trusted value, in `unit`.", required: true }),
    tolerance: number({ description: "Largest accepted |computed − expected|, in `unit`.", required: true, exclusiveMin: 0 }),
    unit: oneOf(UNITS, { description: "Unit of `expected` and `tolerance`.", required: true }),
    source: string({
      description: "Where the value comes from: publication, table and edition, or the trusted program run.",
      required: true,
      nonEmpty: true,
    }),
  },
  { description: "A cross-check of a computed quantity against a published or trusted value." },
);

export const MOLECULE_SCHEMA = object(
  {
    charge: integer({ description: "Total charge, in units of the elementary charge.", default: 0 }),
    multiplicity: integer({ description: "Spin multiplicity 2S + 1.", default: 1, min: 1 }),
    units: oneOf(["angstrom", "bohr"], { description: "Length unit of the geometry.", default: "angstrom" }),
    xyz: geometryText("Cartesian geometry: one line per atom, `symbol x y z` (an XYZ file's count and comment lines are also accepted)."),
    zmatrix: geometryText("Z-matrix geometry: one line per atom (`E`, `E i r`, `E i r j a`, `E i r j a k d`), then optional `name = value` variables; angles in degrees."),
    file: repoPath("A geometry file in the repository: `.xyz` (XYZ) or `.zmat` (Z-matrix).", "geometries/water.xyz", { nullable: true }),
  },
  {
    description: "The molecule: charge, multiplicity, and exactly one geometry (`xyz`, `zmatrix` or `file`).",
    required: true,
    exactlyOne: ["xyz", "zmatrix", "file"],
    exactlyOneWhat: "a geometry",
  },
);

export const BASIS_SCHEMA = union(
  [
    basisName("A bundled basis set for all atoms (names are case-insensitive; 6-31G(d) = 6-31G*).", {}),
    object(
      {
        default: basisName("The basis set for elements not listed under `elements`.", { required: true }),
        elements: map(basisName("Basis set for this element.", {}), {
          description: "Per-element basis sets: element symbol → bundled set name.",
          keyPattern: ELEMENT_KEY,
          keyDescription: "element symbol",
          checkKey: checkElementKey,
          defaultEmpty: true,
        }),
      },
      { description: "A default basis set with per-element exceptions." },
    ),
    object(
      { file: repoPath("A basis-set file in the fieldbook-basis/1 JSON format.", "basis/my-set.json", { required: true }) },
      { description: "A basis set read from a file in the repository." },
    ),
  ],
  { description: "The orbital basis set: a bundled name, `{ default, elements }`, or `{ file }`.", required: true },
);

export const MODEL_SCHEMA = object(
  {
    reference: oneOf(["rhf", "uhf", "rohf"], {
      description: "The Hartree–Fock reference.",
      default: "rhf",
      meanings: { rhf: "restricted, closed shells", uhf: "unrestricted", rohf: "restricted open-shell" },
    }),
    correlation: oneOf(["none", "mp2", "scs-mp2"], {
      description: "Correlation treatment on top of the reference.",
      default: "none",
      meanings: { none: "SCF only", mp2: "second-order Møller–Plesset", "scs-mp2": "spin-component-scaled MP2" },
    }),
    basis: BASIS_SCHEMA,
    harmonics: oneOf(["auto", "spherical", "cartesian"], {
      description: "Spherical or Cartesian d, f, … functions; `auto` follows the basis set's own convention.",
      default: "auto",
    }),
    frozen_core: boolean({ description: "Freeze the noble-gas core of each atom in the correlation treatment.", default: true }),
    density_fitting: boolean({ description: "Density-fitted (RI) integrals for MP2.", default: false }),
    fitting_basis: string({
      description: "Fitting basis set for density fitting; absent: the set made for the orbital basis.",
      nonEmpty: true,
      nullable: true,
      examples: BUNDLED_FITTING_SETS,
    }),
  },
  { description: "The method: reference, correlation, basis set.", required: true },
);

export const CONVERGENCE_SCHEMA = object(
  {
    energy: number({ description: "Converged when the energy changes by less than this between iterations.", unit: "hartree", default: 1e-10, exclusiveMin: 0, max: 1 }),
    density: number({ description: "Converged when the RMS change of the density matrix is below this.", default: 1e-8, exclusiveMin: 0, max: 1 }),
    max_iterations: integer({ description: "Give up (not converged) after this many iterations.", default: 128, min: 1, max: 10000 }),
    accelerator: oneOf(["diis", "none"], { description: "Convergence acceleration.", default: "diis" }),
    guess: oneOf(["sad", "core"], {
      description: "Initial guess.",
      default: "sad",
      meanings: { sad: "superposition of atomic densities", core: "core Hamiltonian" },
    }),
    level_shift: number({ description: "Shift added to the virtual orbital energies.", unit: "hartree", default: 0, min: 0, max: 10 }),
    damping: number({ description: "Fraction of the previous density mixed into the new one.", default: 0, min: 0, exclusiveMax: 1 }),
  },
  { description: "SCF convergence settings (defaults apply when absent)." },
);

export const SPEC_SCHEMA = object(
  {
    fieldbook: constant(SPEC_FORMAT_VERSION, {
      description: "Spec format version.",
      required: true,
      code: "version-unsupported",
      hint: `this fieldbook reads spec format ${SPEC_FORMAT_VERSION}; write \`fieldbook: ${SPEC_FORMAT_VERSION}\``,
    }),
    id: string({
      description: "Calculation id; absent: the path under calculations/ without the extension.",
      nullable: true,
      pattern: {
        regex: ID_PATTERN,
        code: "id-invalid",
        expected: "lower-case letters, digits, '.', '_', '-' and '/', starting with a letter or digit",
        hint: "e.g. water/monomer-mp2",
      },
    }),
    title: string({ description: "Title of the calculation's page.", required: true, nonEmpty: true }),
    summary: string({ description: "One or two sentences shown in lists and search results.", nullable: true, nonEmpty: true }),
    authors: list(string({ description: "An author.", nonEmpty: true }), { description: "Who set up the calculation.", defaultEmpty: true }),
    tags: list(string({ description: "A tag.", nonEmpty: true }), { description: "Tags for search and grouping.", defaultEmpty: true }),
    molecule: MOLECULE_SCHEMA,
    model: MODEL_SCHEMA,
    convergence: CONVERGENCE_SCHEMA,
    checks: list(CHECK_SCHEMA, { description: "Cross-checks against published or trusted values.", defaultEmpty: true }),
    notes: string({ description: "Markdown shown on the page (rendered safely: no raw HTML).", nullable: true, multiline: true }),
  },
  { description: "A fieldbook calculation spec.", required: true },
);

/** The spec as written, after validation and defaults (molecule still holds xyz/zmatrix/file). */
export type WrittenSpec = Infer<typeof SPEC_SCHEMA>;

// ── JSON Schema (draft 2020-12) ────────────────────────────────────────────────────────────────

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

function describe(s: Schema): { [k: string]: Json } {
  const out: { [k: string]: Json } = { description: s.description };
  return out;
}

function nullable(s: Schema, body: { [k: string]: Json }): { [k: string]: Json } {
  if (!s.nullable) return body;
  const { description, default: dflt, ...rest } = body;
  const out: { [k: string]: Json } = { description: description ?? s.description, anyOf: [rest, { type: "null" }] };
  if (dflt !== undefined) out.default = dflt;
  return out;
}

function convert(s: Schema): { [k: string]: Json } {
  const out = describe(s);
  switch (s.type) {
    case "string":
      out.type = "string";
      if (s.nonEmpty) out.pattern = "\\S";
      if (s.pattern) out.pattern = s.pattern.regex.source;
      if (s.default !== undefined) out.default = s.default;
      if (s.examples) out.examples = [...s.examples];
      if (s.nullable && s.default === undefined) out.default = null;
      return nullable(s, out);
    case "integer":
    case "number":
      out.type = s.type;
      if (s.min !== undefined) out.minimum = s.min;
      if (s.max !== undefined) out.maximum = s.max;
      if (s.type === "number" && s.exclusiveMin !== undefined) out.exclusiveMinimum = s.exclusiveMin;
      if (s.type === "number" && s.exclusiveMax !== undefined) out.exclusiveMaximum = s.exclusiveMax;
      if (s.type === "number" && s.unit) out.description = `${s.description} Unit: ${s.unit}.`;
      if (s.default !== undefined) out.default = s.default;
      return nullable(s, out);
    case "boolean":
      out.type = "boolean";
      if (s.default !== undefined) out.default = s.default;
      return nullable(s, out);
    case "enum": {
      out.enum = [...s.values];
      if (s.default !== undefined) out.default = s.default;
      const meanings = s.meanings as Record<string, string> | undefined;
      if (meanings) out.description = `${s.description} ${s.values.map((v) => (meanings[v] ? `\`${v}\`: ${meanings[v]}` : `\`${v}\``)).join("; ")}.`;
      return nullable(s, out);
    }
    case "const":
      out.const = s.value;
      return out;
    case "list":
      out.type = "array";
      out.items = convert(s.items);
      if (s.defaultEmpty) out.default = [];
      return nullable(s, out);
    case "map":
      out.type = "object";
      out.propertyNames = { pattern: s.keyPattern.source, description: s.keyDescription };
      out.additionalProperties = convert(s.values);
      if (s.defaultEmpty) out.default = {};
      return nullable(s, out);
    case "object": {
      out.type = "object";
      const props: { [k: string]: Json } = {};
      const exclusive: readonly string[] = s.exactlyOne ?? [];
      // an alternative of exactlyOne is absent (null in the normalized spec) or has a value
      for (const [k, v] of Object.entries(s.properties)) props[k] = convert(exclusive.includes(k) ? { ...v, nullable: false } : v);
      out.properties = props;
      const req = Object.entries(s.properties).filter(([k, v]) => v.required && !exclusive.includes(k)).map(([k]) => k);
      if (req.length) out.required = req;
      if (exclusive.length) out.oneOf = exclusive.map((k) => ({ required: [k] }));
      out.additionalProperties = false;
      return nullable(s, out);
    }
    case "union":
      out.oneOf = s.variants.map(convert);
      return nullable(s, out);
  }
}

/** The spec format as a JSON Schema (draft 2020-12), for editors (e.g. YAML language servers). */
export function toJsonSchema(): { [k: string]: Json } {
  const body = convert(SPEC_SCHEMA);
  return {
    $schema: "https://json-schema.org/draft/2020-12/schema",
    title: `fieldbook calculation spec, format ${SPEC_FORMAT_VERSION}`,
    ...body,
  };
}
