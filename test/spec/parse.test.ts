import { describe, expect, it } from "vitest";
import { BOHR_RADIUS_ANGSTROM } from "../../src/engine/constants.ts";
import { formatSpecError } from "../../src/spec/errors.ts";
import { defaultSpecId, parseSpec } from "../../src/spec/parse.ts";
import { checkRepoPath } from "../../src/spec/paths.ts";
import type { NormalizedSpec } from "../../src/spec/types.ts";
import { edit, readRepo, WATER } from "./fixtures.ts";

const PATH = "calculations/water/monomer.yaml";
const ok = (text: string, path = PATH): NormalizedSpec => {
  const r = parseSpec(text, { path, readFile: readRepo });
  expect(r.errors.map(formatSpecError)).toEqual([]);
  return r.spec!;
};

describe("parseSpec: valid specs", () => {
  it("fills in every default", () => {
    const spec = ok(WATER);
    const a = (x: number) => x / BOHR_RADIUS_ANGSTROM;
    expect(spec).toEqual({
      fieldbook: 1,
      id: "water/monomer",
      title: "Water monomer",
      summary: null,
      authors: [],
      tags: [],
      molecule: {
        charge: 0,
        multiplicity: 1,
        units: "angstrom",
        geometry: {
          kind: "xyz",
          file: null,
          text: "O   0.000000   0.000000   0.117300\nH   0.000000   0.757200  -0.469200\nH   0.000000  -0.757200  -0.469200\n",
        },
        atoms: [
          { symbol: "O", z: 8, xyz: [0, 0, a(0.1173)] },
          { symbol: "H", z: 1, xyz: [0, a(0.7572), a(-0.4692)] },
          { symbol: "H", z: 1, xyz: [0, a(-0.7572), a(-0.4692)] },
        ],
      },
      model: {
        reference: "rhf",
        correlation: "none",
        basis: "STO-3G",
        harmonics: "auto",
        frozen_core: true,
        density_fitting: false,
        fitting_basis: null,
      },
      convergence: { energy: 1e-10, density: 1e-8, max_iterations: 128, accelerator: "diis", guess: "sad", level_shift: 0, damping: 0 },
      checks: [],
      notes: null,
    } satisfies NormalizedSpec);
  });

  it("round-trips through JSON", () => {
    const spec = ok(WATER);
    expect(JSON.parse(JSON.stringify(spec))).toEqual(spec);
  });

  it("keeps everything written, in the normalized form", () => {
    const text = `fieldbook: 1
id: water/dimer-mp2
title: Water, MP2
summary: A short summary.
authors: [R. Okafor, "M. Ilunga"]
tags:
  - water
  - benchmark
molecule:
  charge: 0
  multiplicity: 1
  units: bohr
  zmatrix: |
    O
    H 1 r
    H 1 r 2 a
    variables:
    r = 1.8
    a = 104.5
model:
  reference: rhf
  correlation: scs-mp2
  basis:
    default: CC-PVDZ
    elements: { h: sto-3g }
  frozen_core: false
  harmonics: cartesian
convergence:
  energy: 1.0e-9
  density: 1.0e-7
  max_iterations: 50
  accelerator: none
  guess: core
  level_shift: 0.25
  damping: 0.3
checks:
  - quantity: nuclear_repulsion
    expected: 9.0
    tolerance: 0.5
    unit: hartree
    source: "rough value for the test"
notes: |
  Some *Markdown*.
`;
    const spec = ok(text);
    expect(spec.id).toBe("water/dimer-mp2");
    expect(spec.authors).toEqual(["R. Okafor", "M. Ilunga"]);
    expect(spec.molecule.geometry.kind).toBe("zmatrix");
    expect(spec.molecule.atoms[1].xyz[2]).toBeCloseTo(1.8, 12); // atom 2 on +z, bohr as written
    expect(spec.model.basis).toEqual({ default: "cc-pVDZ", elements: { H: "STO-3G" } });
    expect(spec.convergence).toEqual({ energy: 1e-9, density: 1e-7, max_iterations: 50, accelerator: "none", guess: "core", level_shift: 0.25, damping: 0.3 });
    expect(spec.checks).toEqual([{ quantity: "nuclear_repulsion", expected: 9, tolerance: 0.5, unit: "hartree", source: "rough value for the test" }]);
    expect(spec.notes).toBe("Some *Markdown*.\n");
  });

  it("reads a geometry file and a user basis file", () => {
    const text = "fieldbook: 1\ntitle: H2\nmolecule:\n  file: geometries/h2.xyz\nmodel:\n  basis:\n    file: basis/h-only.json\n";
    const spec = ok(text);
    expect(spec.molecule.geometry).toEqual({ kind: "xyz", file: "geometries/h2.xyz", text: readRepo("geometries/h2.xyz") });
    expect(spec.molecule.atoms).toHaveLength(2);
    expect(spec.model.basis).toEqual({ file: "basis/h-only.json" });
  });

  it("fills in the default fitting basis when density fitting is on", () => {
    const spec = ok(edit(WATER, "  basis: sto-3g", "  basis: cc-pvdz\n  correlation: mp2\n  density_fitting: true"));
    expect(spec.model.fitting_basis).toBe("cc-pVDZ-RIFIT");
  });

  it("accepts aliases within the limit and CRLF line ends", () => {
    const text = "fieldbook: 1\r\ntitle: &t H2\r\nsummary: *t\r\nmolecule:\r\n  xyz: |\r\n    H 0 0 0\r\n    H 0 0 0.74\r\nmodel:\r\n  basis: sto-3g\r\n";
    const spec = ok(text);
    expect(spec.summary).toBe("H2");
    const bad = text.replace("H 0 0 0.74", "H 0 0 zero");
    const r = parseSpec(bad, { path: PATH });
    expect(r.errors.map((e) => [e.code, e.line, e.column])).toEqual([["xyz-coordinate-invalid", 7, 11]]);
  });

  it("takes the default id from the path", () => {
    expect(defaultSpecId("calculations/water/monomer.yaml")).toBe("water/monomer");
    expect(defaultSpecId("calculations/a/b.c.yml")).toBe("a/b.c");
    expect(defaultSpecId("elsewhere/x.yaml")).toBe("elsewhere/x");
    expect(ok(WATER, "calculations/h2o.yaml").id).toBe("h2o");
  });
});

describe("parseSpec: errors are collected", () => {
  it("reports three independent errors as three", () => {
    const text = [
      "fieldbook: 1",
      "title: Water",
      "molecule:",
      "  charge: zero", //                 type-invalid, 4:11
      "  xyz: |",
      "    O   0.000000   0.000000   0.117300",
      "    H   0.000000   0.757200  -0.469200",
      "    H   0.000000  -0.757200  -0.469200",
      "model:",
      "  basis: sto-3g",
      "  harmonic: auto", //               key-unknown, 11:3
      "convergence:",
      "  max_iterations: 0", //           number-out-of-range, 13:19
      "",
    ].join("\n");
    const r = parseSpec(text, { path: PATH });
    expect(r.spec).toBeNull();
    expect(r.errors.map((e) => [e.code, e.line, e.column])).toEqual([
      ["type-invalid", 4, 11],
      ["key-unknown", 11, 3],
      ["number-out-of-range", 13, 19],
    ]);
    expect(r.errors[1].hint).toBe('did you mean "harmonics"?');
  });

  it("reports every bad atom line of an xyz block", () => {
    const text = edit(edit(WATER, "    H   0.000000   0.757200  -0.469200", "    H   0.000000   0.757200"), "    H   0.000000  -0.757200  -0.469200", "    Hq  0.000000  -0.757200  -0.469200");
    const r = parseSpec(text, { path: PATH });
    expect(r.errors.map((e) => [e.code, e.line, e.column])).toEqual([
      ["xyz-field-count", 6, 28],
      ["element-unknown", 7, 5],
    ]);
  });

  it("still checks charge and multiplicity when atoms are too close", () => {
    const text = edit(edit(WATER, "    H   0.000000  -0.757200  -0.469200", "    H   0.000000   0.757200  -0.469200"), "  xyz: |", "  multiplicity: 2\n  xyz: |");
    const r = parseSpec(text, { path: PATH });
    expect(r.errors.map((e) => [e.code, e.line])).toEqual([
      ["multiplicity-parity", 4],
      ["atoms-too-close", 8],
    ]);
  });

  it("prints errors as file:line:column with the hint, and points at molecule: when the setting is a default", () => {
    const r = parseSpec("fieldbook: 1\ntitle: T\nmolecule:\n  xyz: H 0 0 0\nmodel:\n  basis: sto-3g\n", { path: PATH });
    expect(r.errors.map(formatSpecError)).toEqual([
      `${PATH}:3:1: multiplicity 1 needs an even electron count, but H with charge 0 has 1 electron [multiplicity-parity]\n  hint: use multiplicity 2 or change the charge`,
    ]);
  });

  it("refuses a mp2_correlation check without correlation and density fitting without MP2", () => {
    const text = WATER + "  density_fitting: true\nchecks:\n  - quantity: mp2_correlation\n    expected: -0.2\n    tolerance: 1.0e-3\n    unit: hartree\n    source: made up\n";
    const r = parseSpec(text, { path: PATH });
    expect(r.errors.map((e) => [e.code, e.line, e.column])).toEqual([
      ["density-fitting-unused", 10, 20],
      ["check-quantity-unavailable", 12, 15],
    ]);
  });
});

describe("repository paths", () => {
  it.each([
    ["geometries/water.xyz", "geometries/water.xyz"],
    ["./geometries/./water.xyz", "geometries/water.xyz"],
    ["a/../geometries/water.xyz", "geometries/water.xyz"],
  ])("accepts %s", (p, want) => expect(checkRepoPath(p)).toEqual({ ok: true, path: want }));
  it.each([
    ["../x.xyz", "path-escapes"],
    ["a/../../x.xyz", "path-escapes"],
    ["/etc/x.xyz", "path-absolute"],
    ["C:/x.xyz", "path-absolute"],
    ["~/x.xyz", "path-absolute"],
    ["file:///x.xyz", "path-absolute"],
    ["a\\x.xyz", "path-backslash"],
    ["a//x.xyz", "path-invalid"],
    ["geometries/", "path-invalid"],
    [".", "path-invalid"],
  ])("refuses %s", (p, code) => expect(checkRepoPath(p)).toMatchObject({ ok: false, code }));
});
