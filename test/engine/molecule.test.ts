import { describe, expect, it } from "vitest";
import { InputError } from "../../src/engine/errors.ts";
import { BOHR_RADIUS_ANGSTROM } from "../../src/engine/constants.ts";
import {
  angle,
  dihedral,
  distance,
  electronCount,
  hillFormula,
  nuclearRepulsion,
  parseXyz,
  parseZMatrix,
  validateMolecule,
  type Atom,
  type Molecule,
} from "../../src/engine/molecule.ts";

function thrown(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error("expected an InputError");
}

// Geometry (bohr) and nuclear repulsion energy: published worked example of a public SCF
// programming tutorial (water STO-3G), nuclear repulsion energy.
const WATER_XYZ = `3
water, bohr
O   0.000000000000  -0.143225816552   0.000000000000
H   1.638036840407   1.136548822547  -0.000000000000
H  -1.638036840407   1.136548822547  -0.000000000000
`;
const WATER_ENUC = 8.00236706181045; // published worked example of a public SCF programming tutorial (water STO-3G), nuclear repulsion energy

const atom = (symbol: string, z: number, xyz: [number, number, number]): Atom => ({ symbol, z, xyz });
const mol = (atoms: Atom[], charge = 0, multiplicity = 1): Molecule => ({ atoms, charge, multiplicity });

describe("parseXyz", () => {
  it("reads a standard XYZ file with count and comment lines", () => {
    const g = parseXyz(WATER_XYZ, { units: "bohr" });
    expect(g.atoms.map((a) => a.symbol)).toEqual(["O", "H", "H"]);
    expect(g.atoms[1].xyz).toEqual([1.638036840407, 1.136548822547, 0]);
    expect(g.lines).toEqual([3, 4, 5]);
    expect(g.comment).toBe("water, bohr");
  });

  it("gives the published nuclear repulsion energy of water to 1e-12 Eh", () => {
    const g = parseXyz(WATER_XYZ, { units: "bohr" });
    expect(Math.abs(nuclearRepulsion({ atoms: g.atoms }) - WATER_ENUC)).toBeLessThan(1e-12);
  });

  it("reads a bare list of atom lines with any letter case and atomic numbers", () => {
    const g = parseXyz("\n  o 0 0 0\n\nh 0 0 0.96\n1 0.93 0 -0.24\n", { units: "angstrom" });
    expect(g.atoms.map((a) => [a.symbol, a.z])).toEqual([["O", 8], ["H", 1], ["H", 1]]);
    expect(g.lines).toEqual([2, 4, 5]);
    expect(g.comment).toBeNull();
  });

  it("converts ångström to bohr with the CODATA 2018 bohr radius", () => {
    const g = parseXyz("H 0 0 0\nH 0 0 0.74", { units: "angstrom" });
    expect(g.atoms[1].xyz[2]).toBe(0.74 / BOHR_RADIUS_ANGSTROM);
  });

  it("returns plain JSON-serializable data", () => {
    const g = parseXyz(WATER_XYZ, { units: "bohr" });
    expect(JSON.parse(JSON.stringify(g))).toEqual(g);
  });

  it("rejects an atom line with too few fields at the end of the line", () => {
    const e = thrown(() => parseXyz("O 0 0 0\nH 0 0.96", { units: "angstrom", source: "w.xyz" }));
    expect([e.code, e.where]).toEqual(["xyz-field-count", { source: "w.xyz", line: 2, column: 9 }]);
  });

  it("rejects an atom line with too many fields at the first extra field", () => {
    const e = thrown(() => parseXyz("O 0 0 0 0.5", { units: "angstrom" }));
    expect([e.code, e.where.line, e.where.column]).toEqual(["xyz-field-count", 1, 9]);
  });

  it("rejects a non-numeric coordinate at its column", () => {
    const e = thrown(() => parseXyz("O 0 0 0\nH 0 abc 0.96", { units: "angstrom" }));
    expect([e.code, e.where.line, e.where.column]).toEqual(["xyz-coordinate-invalid", 2, 5]);
    expect(e.hint).toBeTruthy();
  });

  it("rejects NaN and Infinity coordinates at their columns", () => {
    const a = thrown(() => parseXyz("O 0 0 NaN", { units: "bohr" }));
    expect([a.code, a.where.line, a.where.column]).toEqual(["xyz-coordinate-not-finite", 1, 7]);
    const b = thrown(() => parseXyz("O 0 0 0\nH -Infinity 0 0", { units: "bohr" }));
    expect([b.code, b.where.line, b.where.column]).toEqual(["xyz-coordinate-not-finite", 2, 3]);
    const c = thrown(() => parseXyz("O 1e999 0 0", { units: "bohr" }));
    expect([c.code, c.where.column]).toEqual(["xyz-coordinate-not-finite", 3]);
  });

  it("rejects a count line that disagrees with the number of atom lines", () => {
    const e = thrown(() => parseXyz("4\ncomment\nO 0 0 0\nH 0 0 1\nH 0 1 0\n", { units: "angstrom" }));
    expect([e.code, e.where.line, e.where.column]).toEqual(["xyz-count-mismatch", 1, 1]);
    expect(e.message).toContain("4 atoms");
    expect(e.hint).toContain("3");
  });

  it("rejects an unknown element with its line, column and a did-you-mean hint", () => {
    const e = thrown(() => parseXyz("O 0 0 0\n  Hx 0 0 1", { units: "angstrom" }));
    expect([e.code, e.where.line, e.where.column]).toEqual(["element-unknown", 2, 3]);
    expect(e.hint).toMatch(/did you mean/);
  });

  it("rejects empty text and unknown units", () => {
    expect(thrown(() => parseXyz("  \n", { units: "bohr" })).code).toBe("xyz-empty");
    expect(thrown(() => parseXyz("H 0 0 0", { units: "nm" as never })).code).toBe("units-unknown");
  });
});

describe("parseZMatrix", () => {
  const WATER_Z = `O
H 1 r
H 1 r 2 a

r = 0.9572
a = 104.52
`;

  it("places the first atom at the origin, the second on +z and the third in the xz plane", () => {
    const g = parseZMatrix(WATER_Z, { units: "angstrom" });
    const [o, h1, h2] = g.atoms;
    expect(o.xyz).toEqual([0, 0, 0]);
    expect(h1.xyz[0]).toBe(0);
    expect(h1.xyz[1]).toBe(0);
    expect(h1.xyz[2]).toBeGreaterThan(0);
    expect(h2.xyz[1]).toBe(0);
    expect(h2.xyz[0]).toBeGreaterThan(0);
    expect(Math.abs(distance(o, h2) - 0.9572 / BOHR_RADIUS_ANGSTROM)).toBeLessThan(1e-14);
    expect(Math.abs(angle(h1, o, h2) - 104.52)).toBeLessThan(1e-12);
    expect(g.lines).toEqual([1, 2, 3]);
    expect(g.variables).toEqual({ r: 0.9572, a: 104.52 });
  });

  it("gives the same nuclear repulsion as the equivalent XYZ geometry of water to 1e-12 Eh", () => {
    const x = parseXyz(WATER_XYZ, { units: "bohr" }).atoms;
    // computed from the XYZ geometry: an exact identity, not a published value
    const r1 = distance(x[0], x[1]);
    const r2 = distance(x[0], x[2]);
    const a = angle(x[1], x[0], x[2]);
    const z = parseZMatrix(`O\nH 1 ${r1}\nH 1 ${r2} 2 ${a}`, { units: "bohr" }).atoms;
    expect(Math.abs(nuclearRepulsion({ atoms: z }) - nuclearRepulsion({ atoms: x }))).toBeLessThan(1e-12);
    expect(Math.abs(nuclearRepulsion({ atoms: z }) - WATER_ENUC)).toBeLessThan(1e-12);
  });

  it("builds dihedrals with the IUPAC sign and accepts negated variables", () => {
    const g = parseZMatrix(
      `C
C1 1 rcc
H3 1 rch 2 hcc
H4 2 rch 1 hcc 3 phi
H5 2 rch 1 hcc 3 -phi
variables:
rcc = 1.54
rch = 1.09
hcc = 110
phi = 60`,
      { units: "angstrom" },
    );
    const [c1, c2, h3, h4, h5] = g.atoms;
    expect(Math.abs(dihedral(h4, c2, c1, h3) - 60)).toBeLessThan(1e-10);
    expect(Math.abs(dihedral(h5, c2, c1, h3) + 60)).toBeLessThan(1e-10);
    expect(Math.abs(angle(h4, c2, c1) - 110)).toBeLessThan(1e-10);
    expect(g.labels).toEqual(["C", "C1", "H3", "H4", "H5"]);
  });

  it("resolves references by index, by the user's labels and by symbol plus index", () => {
    const byIndex = parseZMatrix("O\nH 1 0.96\nH 1 0.96 2 104.5", { units: "angstrom" }).atoms;
    const byImplicit = parseZMatrix("O\nH O1 0.96\nH o1 0.96 H2 104.5", { units: "angstrom" }).atoms;
    const byLabel = parseZMatrix("O_w\nH_a O_w 0.96\nH_b o_W 0.96 h_a 104.5", { units: "angstrom" }).atoms;
    expect(byImplicit).toEqual(byIndex);
    expect(byLabel).toEqual(byIndex);
    // user labels take precedence: here "H2" is the user's second hydrogen (atom 3), not atom 2
    const labelled = parseZMatrix("O1\nH1 O1 1\nH2 O1 1 H1 90\nH3 O1 1 H2 90 H1 180", { units: "angstrom" }).atoms;
    expect(Math.abs(angle(labelled[3], labelled[0], labelled[2]) - 90)).toBeLessThan(1e-12);
  });

  it("reads variables that follow the atom lines without a separator", () => {
    const g = parseZMatrix("H\nH 1 d\nd = 1.4", { units: "bohr" });
    expect(g.atoms[1].xyz).toEqual([0, 0, 1.4]);
  });

  it("rejects an unknown variable with its line, column and a did-you-mean hint", () => {
    const e = thrown(() => parseZMatrix("O\nH 1 r\nH 1 r 2 angel\n\nr = 0.96\nangle = 104.5", { units: "angstrom", source: "w.zmat" }));
    expect([e.code, e.where]).toEqual(["zmatrix-variable-unknown", { source: "w.zmat", line: 3, column: 9 }]);
    expect(e.hint).toBe('did you mean "angle"?');
  });

  it("rejects a reference to an atom not yet defined", () => {
    const a = thrown(() => parseZMatrix("O\nH 1 0.96\nH 3 0.96 1 104.5", { units: "angstrom" }));
    expect([a.code, a.where.line, a.where.column]).toEqual(["zmatrix-reference-undefined", 3, 3]);
    const b = thrown(() => parseZMatrix("O\nH H3 0.96\nH 1 0.96 2 104.5", { units: "angstrom" }));
    expect([b.code, b.where.line, b.where.column]).toEqual(["zmatrix-reference-undefined", 2, 3]);
  });

  it("rejects a reference that names no atom", () => {
    const e = thrown(() => parseZMatrix("O\nH 1 0.96\nH 1 0.96 N2 104.5", { units: "angstrom" }));
    expect([e.code, e.where.line, e.where.column]).toEqual(["zmatrix-reference-unknown", 3, 10]);
  });

  it("rejects collinear reference atoms for a dihedral at the dihedral reference", () => {
    // atom 4 is built onto the z axis at (0, 0, -1) bohr, so atoms 4, 1 and 2 lie on one line
    const zm = "H\nH 1 1\nH 1 1 2 90\nH 3 1.4142135623730951 1 45 2 180\nH 4 1 1 90 2 0";
    const e = thrown(() => parseZMatrix(zm, { units: "bohr" }));
    expect([e.code, e.where.line, e.where.column]).toEqual(["zmatrix-collinear", 5, 12]);
  });

  it("rejects an angle outside (0, 180) at its column", () => {
    const a = thrown(() => parseZMatrix("O\nH 1 0.96\nH 1 0.96 2 180", { units: "angstrom" }));
    expect([a.code, a.where.line, a.where.column]).toEqual(["zmatrix-angle-range", 3, 12]);
    const b = thrown(() => parseZMatrix("O\nH 1 0.96\nH 1 0.96 2 a\na = 0", { units: "angstrom" }));
    expect([b.code, b.where.line, b.where.column]).toEqual(["zmatrix-angle-range", 3, 12]);
    expect(b.message).toContain("variable a");
  });

  it("rejects a wrong number of fields, a bad distance and malformed variables", () => {
    const a = thrown(() => parseZMatrix("O\nH 1\n", { units: "angstrom" }));
    expect([a.code, a.where.line, a.where.column]).toEqual(["zmatrix-field-count", 2, 4]);
    const b = thrown(() => parseZMatrix("O 1 0.9\n", { units: "angstrom" }));
    expect([b.code, b.where.line, b.where.column]).toEqual(["zmatrix-field-count", 1, 3]);
    const c = thrown(() => parseZMatrix("O\nH 1 -0.96", { units: "angstrom" }));
    expect([c.code, c.where.line, c.where.column]).toEqual(["zmatrix-distance-invalid", 2, 5]);
    const d = thrown(() => parseZMatrix("O\nH 1 r\n\nr 0.96", { units: "angstrom" }));
    expect([d.code, d.where.line, d.where.column]).toEqual(["zmatrix-variable-syntax", 4, 1]);
    const e = thrown(() => parseZMatrix("O\nH 1 r\n\nr = 0.96\nr = 0.97", { units: "angstrom" }));
    expect([e.code, e.where.line, e.where.column]).toEqual(["zmatrix-variable-duplicate", 5, 1]);
    const f = thrown(() => parseZMatrix("O\nH 1 r\n\nr = abc", { units: "angstrom" }));
    expect([f.code, f.where.line, f.where.column]).toEqual(["zmatrix-value-invalid", 4, 5]);
    const g = thrown(() => parseZMatrix("O\nH 1 0.96\nH 1 0.96 1 104.5", { units: "angstrom" }));
    expect([g.code, g.where.line, g.where.column]).toEqual(["zmatrix-reference-repeated", 3, 10]);
  });
});

describe("molecule properties", () => {
  it("writes Hill formulas: C first, H second, then alphabetical; without C all alphabetical", () => {
    const f = (symbols: string[]) => hillFormula({ atoms: symbols.map((s) => atom(s, 1, [0, 0, 0])) });
    expect(f(["C", "C", "C", "C", "C", "C", "H", "H", "H", "H", "H", "H"])).toBe("C6H6");
    expect(f(["O", "H", "H"])).toBe("H2O");
    expect(f(["H", "C", "H", "H", "H"])).toBe("CH4");
    expect(f(["H", "Cl"])).toBe("ClH");
    expect(f(["Cl", "C", "H", "Br", "H"])).toBe("CH2BrCl");
    expect(f(["Na", "Cl"])).toBe("ClNa");
  });

  it("counts electrons from the nuclear charges and the total charge", () => {
    const water = parseXyz(WATER_XYZ, { units: "bohr" }).atoms;
    expect(electronCount(mol(water))).toBe(10);
    expect(electronCount(mol(water, 1, 2))).toBe(9);
    expect(electronCount(mol(water, -2, 1))).toBe(12);
  });
});

describe("validateMolecule", () => {
  const water = () => parseXyz(WATER_XYZ, { units: "bohr" });

  it("accepts closed- and open-shell molecules that are consistent", () => {
    expect(() => validateMolecule(mol(water().atoms), { reference: "rhf" })).not.toThrow();
    expect(() => validateMolecule(mol(water().atoms, 1, 2), { reference: "uhf" })).not.toThrow();
    expect(() => validateMolecule(mol([atom("O", 8, [0, 0, 0]), atom("O", 8, [0, 0, 2.28])], 0, 3), { reference: "rohf" })).not.toThrow();
  });

  it("rejects atoms closer than 0.1 Å, naming both atoms and their lines", () => {
    const g = parseXyz("O 0 0 0\nH 0 0 0.96\nH 0 0 0.99", { units: "angstrom" });
    const e = thrown(() => validateMolecule(mol(g.atoms), { lines: g.lines, source: "w.xyz" }));
    expect(e.code).toBe("atoms-too-close");
    expect(e.message).toContain("atom 2 (H, line 2)");
    expect(e.message).toContain("atom 3 (H, line 3)");
    expect(e.where).toEqual({ source: "w.xyz", line: 3 });
  });

  it("rejects non-finite coordinates", () => {
    const e = thrown(() => validateMolecule(mol([atom("H", 1, [0, 0, 0]), atom("H", 1, [0, 0, Number.NaN])], 0, 1), { lines: [7, 8] }));
    expect([e.code, e.where.line]).toEqual(["coordinate-not-finite", 8]);
  });

  it("rejects a charge that leaves a negative number of electrons", () => {
    expect(thrown(() => validateMolecule(mol([atom("H", 1, [0, 0, 0])], 2, 1))).code).toBe("electron-count-negative");
  });

  it("rejects a multiplicity below 1 or not an integer", () => {
    expect(thrown(() => validateMolecule(mol(water().atoms, 0, 0))).code).toBe("multiplicity-invalid");
    expect(thrown(() => validateMolecule(mol(water().atoms, 0, 1.5))).code).toBe("multiplicity-invalid");
  });

  it("rejects a multiplicity whose parity does not match the electron count, saying what to do", () => {
    const e = thrown(() => validateMolecule(mol(water().atoms, 1, 1)));
    expect(e.code).toBe("multiplicity-parity");
    expect(e.message).toBe("multiplicity 1 needs an even electron count, but H2O with charge +1 has 9 electrons");
    expect(e.hint).toBe("use multiplicity 2 or change the charge");
  });

  it("rejects a multiplicity larger than the number of electrons plus one", () => {
    const e = thrown(() => validateMolecule(mol([atom("H", 1, [0, 0, 0]), atom("H", 1, [0, 0, 1.4])], 0, 5)));
    expect(e.code).toBe("multiplicity-too-large");
  });

  it("rejects RHF for an open-shell molecule and points to UHF or ROHF", () => {
    const e = thrown(() => validateMolecule(mol(water().atoms, 1, 2), { reference: "rhf" }));
    expect(e.code).toBe("rhf-open-shell");
    expect(e.hint).toMatch(/uhf or rohf/);
  });

  it("rejects an atom whose symbol disagrees with its atomic number", () => {
    expect(thrown(() => validateMolecule(mol([atom("H", 2, [0, 0, 0])], 0, 1))).code).toBe("atom-symbol-mismatch");
  });
});
