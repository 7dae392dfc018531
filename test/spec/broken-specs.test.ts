/**
 * A table of broken specs: each must fail with the exact code, file, line and column (1-based),
 * and, where it matters, a hint that says how to fix it. Unless `count` says otherwise, the
 * listed error must be the only one (no follow-on noise).
 */
import { describe, expect, it } from "vitest";
import { parseSpec } from "../../src/spec/parse.ts";
import { readRepo } from "./fixtures.ts";

interface Case {
  name: string;
  text: string;
  code: string;
  line: number;
  column: number;
  /** default: the spec itself */
  file?: string;
  hint?: RegExp;
  message?: RegExp;
  /** total number of errors expected; default 1 */
  count?: number;
  /** no readFile */
  noFiles?: boolean;
}

const PATH = "calculations/test/case.yaml";

/** fieldbook + title + molecule block + model block, so line numbers are easy to count. */
const spec = (molecule: string, model = "  basis: sto-3g", extra = "") =>
  `fieldbook: 1\ntitle: T\nmolecule:\n${molecule}\nmodel:\n${model}\n${extra}`;
// line 1 fieldbook, 2 title, 3 molecule:, 4.. molecule lines, then model: and its lines, then `extra`
// (with H2: 4 xyz: |, 5-6 atoms, 7 model:, 8 basis, 9 the first extra or model line)

const H2 = "  xyz: |\n    H 0 0 0\n    H 0 0 0.74";
const WATER = "  xyz: |\n    O   0.000000   0.000000   0.117300\n    H   0.000000   0.757200  -0.469200\n    H   0.000000  -0.757200  -0.469200";

const BOMB = [
  'a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]',
  "b: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]",
  "c: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]",
  "d: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c]",
  "e: &e [*d,*d,*d,*d,*d,*d,*d,*d,*d]",
  "f: &f [*e,*e,*e,*e,*e,*e,*e,*e,*e]",
  "g: &g [*f,*f,*f,*f,*f,*f,*f,*f,*f]",
  "h: &h [*g,*g,*g,*g,*g,*g,*g,*g,*g]",
  "i: &i [*h,*h,*h,*h,*h,*h,*h,*h,*h]",
  "fieldbook: 1",
  "",
].join("\n");

const CASES: Case[] = [
  {
    name: "bad YAML: unclosed quote (points at the opening quote)",
    text: 'fieldbook: 1\ntitle: "Water\nmolecule:\n  xyz: |\n    H 0 0 0\n',
    code: "yaml-syntax", line: 2, column: 8, hint: /closing "/,
  },
  {
    name: "bad YAML: a colon inside a plain value",
    text: "fieldbook: 1\ntitle: Water: monomer\n",
    code: "yaml-syntax", line: 2, column: 8, hint: /quotes/,
  },
  {
    name: "bad YAML: tab indentation",
    text: "fieldbook: 1\ntitle: T\nmolecule:\n\txyz: H 0 0 0\n",
    code: "yaml-syntax", line: 4, column: 1, hint: /spaces, not tabs/,
  },
  {
    name: "duplicate key",
    text: spec(H2, "  basis: sto-3g\n  basis: 6-31g"),
    code: "yaml-duplicate-key", line: 9, column: 3, message: /"basis"/,
  },
  {
    name: "unknown key with suggestion",
    text: spec("  multiplicty: 1\n" + H2),
    code: "key-unknown", line: 4, column: 3, hint: /did you mean "multiplicity"\?/,
  },
  {
    name: "known key at the wrong level",
    text: spec(H2, "  basis: sto-3g", "charge: 0\n"),
    code: "key-unknown", line: 9, column: 1, hint: /charge belongs under molecule:/,
  },
  {
    name: "wrong type: text for an integer",
    text: spec("  charge: one\n" + H2),
    code: "type-invalid", line: 4, column: 11, message: /`molecule.charge` must be an integer, but it is the text "one"/,
  },
  {
    name: "wrong type: quoted number",
    text: spec(H2, "  basis: sto-3g", 'convergence:\n  max_iterations: "50"\n'),
    code: "type-invalid", line: 10, column: 19, hint: /remove the quotes/,
  },
  {
    name: "enum typo",
    text: spec(H2, "  basis: sto-3g\n  reference: RHF"),
    code: "value-unknown", line: 9, column: 14, hint: /did you mean "rhf"\?/,
  },
  {
    name: "out of range: damping 1",
    text: spec(H2, "  basis: sto-3g", "convergence:\n  damping: 1\n"),
    code: "number-out-of-range", line: 10, column: 12, message: /≥ 0 and < 1/,
  },
  {
    name: "NaN",
    text: spec(H2, "  basis: sto-3g", "convergence:\n  energy: .nan\n"),
    code: "number-not-finite", line: 10, column: 11,
  },
  {
    name: "missing title",
    text: "fieldbook: 1\nmolecule:\n" + H2 + "\nmodel:\n  basis: sto-3g\n",
    code: "key-missing", line: 1, column: 1, message: /needs `title`/, hint: /title: …/,
  },
  {
    name: "unsupported format version",
    text: spec(H2).replace("fieldbook: 1", "fieldbook: 2"),
    code: "version-unsupported", line: 1, column: 12, hint: /fieldbook: 1/,
  },
  {
    name: "impossible charge/multiplicity (parity)",
    text: spec("  multiplicity: 2\n" + WATER, "  reference: uhf\n  basis: sto-3g"),
    code: "multiplicity-parity", line: 4, column: 17, hint: /multiplicity 1 or 3/,
  },
  {
    name: "RHF on an open shell suggests uhf/rohf",
    text: spec("  charge: 1\n" + WATER, "  reference: rhf\n  basis: sto-3g"),
    code: "multiplicity-parity", line: 4, column: 11, hint: /multiplicity 2/,
  },
  {
    name: "RHF with multiplicity 3",
    text: spec("  multiplicity: 3\n" + WATER, "  reference: rhf\n  basis: sto-3g"),
    code: "rhf-open-shell", line: 10, column: 14, hint: /uhf or rohf/,
  },
  {
    name: "unknown element in an xyz block (line and column in the YAML file)",
    text: spec("  xyz: |\n    H 0 0 0\n    Qx 0 0 0.74"),
    code: "element-unknown", line: 6, column: 5, message: /"Qx"/,
  },
  {
    name: "basis missing an element (points at the basis line)",
    text: spec("  xyz: |\n    K 0 0 0\n    H 0 0 2.2", "  basis: 6-31+G*"),
    code: "basis-missing-element", line: 8, column: 10, message: /6-31\+G\* has no functions for K \(atom 1, line 5\)/, hint: /def2-SVP/,
  },
  {
    name: "per-element basis missing an element (points at that element's line)",
    text: spec("  xyz: |\n    K 0 0 0\n    H 0 0 2.2", "  basis:\n    default: sto-3g\n    elements:\n      K: cc-pVDZ"),
    code: "basis-missing-element", line: 11, column: 10, message: /cc-pVDZ has no functions for K/,
  },
  {
    name: "basis name typo",
    text: spec(H2, "  basis: cc-pdvz"),
    code: "basis-unknown", line: 8, column: 10, hint: /did you mean "cc-pVDZ"\?/,
  },
  {
    name: "fitting set used as orbital basis",
    text: spec(H2, "  basis: cc-pvdz-rifit"),
    code: "basis-role-invalid", line: 8, column: 10, hint: /fitting_basis/,
  },
  {
    name: "escaping path",
    text: spec("  file: ../outside.xyz"),
    code: "path-escapes", line: 4, column: 9, hint: /inside the repository/,
  },
  {
    name: "absolute path",
    text: spec("  file: /etc/water.xyz"),
    code: "path-absolute", line: 4, column: 9,
  },
  {
    name: "backslash path",
    text: spec("  file: geometries\\h2.xyz"),
    code: "path-backslash", line: 4, column: 9, hint: /"\/"/,
  },
  {
    name: "geometry file without file reading",
    text: spec("  file: geometries/h2.xyz"),
    code: "file-reading-unavailable", line: 4, column: 9, message: /file reading not available/, noFiles: true,
  },
  {
    name: "geometry file error (reported in the geometry file)",
    text: spec("  file: geometries/bad.xyz"),
    code: "xyz-coordinate-invalid", file: "geometries/bad.xyz", line: 4, column: 7,
  },
  {
    name: "too-close atoms",
    text: spec("  xyz: |\n    H 0 0 0\n    H 0 0 0.74\n    H 0 0 0.78", "  reference: uhf\n  basis: sto-3g", "").replace("molecule:\n", "molecule:\n  multiplicity: 2\n"),
    code: "atoms-too-close", line: 8, column: 5, message: /atom 2 \(H, line 7\) and atom 3 \(H, line 8\)/,
  },
  {
    name: "zmatrix error inside a block scalar",
    text: spec("  zmatrix: |\n    O\n    H 1 0.96\n    H 1 0.96 3 104.5"),
    code: "zmatrix-reference-undefined", line: 7, column: 14, message: /line 7 \(atom 3\) refers to atom 3/,
  },
  {
    name: "zmatrix with an explicit indentation indicator",
    text: spec("  zmatrix: |2\n      O\n      H 1 r\n\n      r = abc"),
    code: "zmatrix-value-invalid", line: 8, column: 11,
  },
  {
    name: "xyz folded block refused",
    text: spec("  xyz: >\n    H 0 0 0\n    H 0 0 0.74"),
    code: "geometry-style", line: 4, column: 8, hint: /\|/,
  },
  {
    name: "alias bomb fails fast",
    text: BOMB,
    code: "yaml-alias-limit", line: 2, column: 8,
  },
  {
    name: "rohf + mp2",
    text: spec("  multiplicity: 3\n  xyz: |\n    O 0 0 0\n    O 0 0 1.21", "  reference: rohf\n  correlation: mp2\n  basis: sto-3g"),
    code: "mp2-reference-unsupported", line: 10, column: 16, message: /ROHF .* not supported; supported are .*rhf.*uhf/, hint: /reference: uhf/,
  },
  {
    name: "density fitting without a default fitting set",
    text: spec(H2, "  basis: 6-31g*\n  correlation: mp2\n  density_fitting: true"),
    code: "fitting-basis-needed", line: 10, column: 20, hint: /fitting_basis/,
  },
  {
    name: "check in a unit that does not fit the quantity",
    text: spec(H2, "  basis: sto-3g", "checks:\n  - quantity: scf_energy\n    expected: -1.117\n    tolerance: 1.0e-3\n    unit: debye\n    source: test value\n"),
    code: "check-unit-invalid", line: 13, column: 11, message: /checks\[1\]/,
  },
  {
    name: "id not matching the pattern",
    text: spec(H2, "  basis: sto-3g", "id: Water Monomer\n"),
    code: "id-invalid", line: 9, column: 5,
  },
  {
    name: "empty document",
    text: "# nothing here\n",
    code: "spec-not-mapping", line: 1, column: 1,
  },
];

describe("broken specs", () => {
  it.each(CASES.map((c) => [c.name, c] as const))("%s", (_name, c) => {
    const t0 = performance.now();
    const r = parseSpec(c.text, { path: PATH, ...(c.noFiles ? {} : { readFile: readRepo }) });
    expect(performance.now() - t0).toBeLessThan(2000);
    expect(r.spec).toBeNull();
    const found = r.errors.find((e) => e.code === c.code);
    expect(found, JSON.stringify(r.errors, null, 1)).toBeDefined();
    expect({ file: found!.file, line: found!.line, column: found!.column }).toEqual({ file: c.file ?? PATH, line: c.line, column: c.column });
    if (c.hint) expect(found!.hint).toMatch(c.hint);
    if (c.message) expect(found!.message).toMatch(c.message);
    expect(r.errors, JSON.stringify(r.errors, null, 1)).toHaveLength(c.count ?? 1);
    // every error is complete
    for (const e of r.errors) {
      expect(e.message.length).toBeGreaterThan(0);
      expect(e.line).toBeGreaterThanOrEqual(1);
      expect(e.column).toBeGreaterThanOrEqual(1);
    }
  });
});
