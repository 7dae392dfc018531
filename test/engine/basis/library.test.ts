import { describe, it, expect } from "vitest";
import {
  listBasisSets,
  getBasisSet,
  findBasisSet,
  basisSetsWithElement,
} from "../../../src/engine/basis/library.ts";
import { buildBasis, componentLabels } from "../../../src/engine/basis/assign.ts";
import type { BasisAtom } from "../../../src/engine/basis/assign.ts";
import { parseBasisText } from "../../../src/engine/basis/user-basis.ts";
import { findJsonSyntaxError } from "../../../src/engine/basis/json-locate.ts";
import { InputError } from "../../../src/engine/errors.ts";
import { ncomp } from "../../../src/engine/basis/types.ts";

// geometries only need the right atoms; positions in bohr, values illustrative
const water: BasisAtom[] = [
  { symbol: "O", xyz: [0, 0, 0.2214] },
  { symbol: "H", xyz: [0, 1.4309, -0.8857] },
  { symbol: "H", xyz: [0, -1.4309, -0.8857] },
];
const benzene: BasisAtom[] = [];
for (let k = 0; k < 6; k++) {
  const t = (k * Math.PI) / 3;
  benzene.push({ symbol: "C", xyz: [2.64 * Math.cos(t), 2.64 * Math.sin(t), 0] });
  benzene.push({ symbol: "H", xyz: [4.69 * Math.cos(t), 4.69 * Math.sin(t), 0] });
}

function catchInputError(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error("expected an InputError");
}

describe("basis-set lookup", () => {
  it("lists the fifteen orbital sets and the four fitting sets", () => {
    expect(listBasisSets("orbital").map((s) => s.name)).toEqual([
      "STO-3G", "3-21G", "6-31G", "6-31G*", "6-31G**", "6-31+G*", "6-31++G**", "6-311G**",
      "cc-pVDZ", "cc-pVTZ", "cc-pVQZ", "aug-cc-pVDZ", "aug-cc-pVTZ", "def2-SVP", "def2-TZVP",
    ]);
    expect(listBasisSets("fitting").map((s) => s.name)).toEqual([
      "cc-pVDZ-RIFIT", "cc-pVTZ-RIFIT", "def2-SVP-RIFIT", "def2-TZVP-RIFIT",
    ]);
    expect(listBasisSets()).toHaveLength(19);
  });

  it("finds sets case-insensitively and under common spellings", () => {
    const cases: [string, string][] = [
      ["CC-PVDZ", "cc-pVDZ"],
      ["ccpvdz", "cc-pVDZ"],
      ["cc-pvdz ", "cc-pVDZ"],
      ["6-31g(d)", "6-31G*"],
      ["6-31G(D,P)", "6-31G**"],
      ["6-31+g(d)", "6-31+G*"],
      ["6-31++g(d,p)", "6-31++G**"],
      ["6-311g(d,p)", "6-311G**"],
      ["sto3g", "STO-3G"],
      ["def2svp", "def2-SVP"],
      ["def2-svp/c", "def2-SVP-RIFIT"],
      ["cc-pvtz-ri", "cc-pVTZ-RIFIT"],
      ["AUG-cc-pVTZ", "aug-cc-pVTZ"],
    ];
    for (const [spelling, name] of cases) expect(getBasisSet(spelling).name, spelling).toBe(name);
  });

  it("keeps 6-31G and 6-311G** apart, and 6-31G* apart from 6-31G**", () => {
    expect(getBasisSet("6-31g").name).toBe("6-31G");
    expect(getBasisSet("6-311g**").name).toBe("6-311G**");
    expect(getBasisSet("6-31g*").name).toBe("6-31G*");
    expect(findBasisSet("6-311g")).toBeUndefined();
  });

  it("rejects an unknown name with the closest names as a hint", () => {
    const e = catchInputError(() => getBasisSet("6-31gx"));
    expect(e.code).toBe("basis-unknown");
    expect(e.message).toContain("6-31gx");
    expect(e.hint).toMatch(/Did you mean 6-31G, /);
    const e2 = catchInputError(() => getBasisSet("cc-pvdzz"));
    expect(e2.hint).toMatch(/^Did you mean cc-pVDZ,/);
    const e3 = catchInputError(() => getBasisSet("def2-tzvpp"));
    expect(e3.hint).toMatch(/^Did you mean def2-TZVP,/);
  });

  it("knows which sets define an element", () => {
    // from the published data: no K in the cc-pVnZ sets, no K–Kr in the 6-31+G* set
    expect(basisSetsWithElement("K", "orbital")).toEqual(["STO-3G", "3-21G", "6-31G", "6-31G*", "6-31G**", "6-311G**", "def2-SVP", "def2-TZVP"]);
  });
});

describe("building a basis on atoms", () => {
  it("gives water 24 spherical functions in cc-pVDZ", () => {
    // from the set's definition (Dunning 1989): O [3s2p1d] = 14, H [2s1p] = 5 each
    const b = buildBasis(water, "cc-pVDZ", "auto");
    expect(b.nbf).toBe(24);
    expect(b.shells.every((s) => s.l < 2 || s.pure)).toBe(true);
  });

  it("gives water 19 Cartesian functions in 6-31G* (6D)", () => {
    // from the set's definition (Hariharan & Pople 1973): O [3s2p] + 6 Cartesian d = 15, H [2s] = 2 each
    expect(buildBasis(water, "6-31G*", "auto").nbf).toBe(19);
  });

  it("gives benzene 114 functions in cc-pVDZ and 102 in 6-31G*", () => {
    // the project's native reference README; follows from the sets' definitions:
    // 6 x (14 + 5) = 114; 6 x (15 + 2) = 102
    expect(buildBasis(benzene, "cc-pVDZ").nbf).toBe(114);
    expect(buildBasis(benzene, "6-31G*").nbf).toBe(102);
  });

  it("forces spherical or Cartesian harmonics for l >= 2 when asked", () => {
    // from the sets' definitions: one d shell on O; 6 Cartesian vs 5 spherical components
    expect(buildBasis(water, "6-31G*", "spherical").nbf).toBe(18);
    expect(buildBasis(water, "cc-pVDZ", "cartesian").nbf).toBe(25);
    expect(buildBasis(water, "6-31G**", "auto").nbf).toBe(25); // + 3 p on each H
    expect(buildBasis(water, "cc-pVTZ", "auto").nbf).toBe(58); // O [4s3p2d1f] 30, H [3s2p1d] 14 each
  });

  it("follows each shell's own published flag under auto, also in the mixed 6-311G** set", () => {
    // from the published data: 6-311G** has spherical d on C but Cartesian d on S
    const b = buildBasis(
      [
        { symbol: "C", xyz: [0, 0, 0] },
        { symbol: "S", xyz: [0, 0, 3.4] },
      ],
      "6-311G**",
    );
    const d = b.shells.filter((s) => s.l === 2);
    expect(d.map((s) => [s.atom, s.pure])).toEqual([[0, true], [1, false]]);
    const forced = buildBasis([{ symbol: "S", xyz: [0, 0, 0] }], "6-311G**", "spherical");
    expect(forced.shells.filter((s) => s.l === 2).every((s) => s.pure)).toBe(true);
  });

  it("keeps general contractions: the cc-pVDZ carbon s shell has 9 exponents and 3 rows", () => {
    // from the set's definition (Dunning 1989): (9s4p1d)/[3s2p1d], generally contracted
    const b = buildBasis([{ symbol: "C", xyz: [0, 0, 0] }], "cc-pVDZ");
    expect(b.shells[0].exponents).toHaveLength(9);
    expect(b.shells[0].coefficients).toHaveLength(3);
    expect(b.shells[0].exponents).toBeInstanceOf(Float64Array);
    expect(b.nbf).toBe(14);
  });

  it("splits combined sp shells into an s shell followed by a p shell with the same exponents", () => {
    const b = buildBasis([{ symbol: "C", xyz: [0, 0, 0] }], "6-31G");
    expect(b.shells.map((s) => s.l)).toEqual([0, 0, 1, 0, 1]);
    expect(Array.from(b.shells[1].exponents)).toEqual(Array.from(b.shells[2].exponents));
  });

  it("lays out offsets, atoms and labels row-major, shell by shell", () => {
    const b = buildBasis(water, "cc-pVDZ");
    let n = 0;
    b.shells.forEach((s, i) => {
      expect(b.shellOffsets[i]).toBe(n);
      n += s.coefficients.length * ncomp(s.l, s.pure);
    });
    expect(n).toBe(b.nbf);
    expect(b.functionLabels).toHaveLength(b.nbf);
    expect(Array.from(b.functionAtom)).toEqual([...Array(14).fill(0), ...Array(5).fill(1), ...Array(5).fill(2)]);
    expect(b.functionLabels.slice(0, 14)).toEqual([
      "O1 1s", "O1 2s", "O1 3s", "O1 2px", "O1 2py", "O1 2pz", "O1 3px", "O1 3py", "O1 3pz",
      "O1 3d-2", "O1 3d-1", "O1 3d0", "O1 3d+1", "O1 3d+2",
    ]);
    expect(b.functionLabels[14]).toBe("H2 1s");
    expect(componentLabels(2, false)).toEqual(["dxx", "dxy", "dxz", "dyy", "dyz", "dzz"]);
    expect(componentLabels(3, false)).toHaveLength(10);
  });

  it("reports the set used per element and the references of the elements used", () => {
    const b = buildBasis(water, "cc-pVDZ");
    expect(b.setNames).toEqual({ O: "cc-pVDZ", H: "cc-pVDZ" });
    expect(Object.keys(b.references)).toEqual(["dunning1989a"]);
    expect(b.references.dunning1989a).toContain("10.1063/1.456153");
  });

  it("assigns sets per element, with a default for the rest", () => {
    // from the sets' definitions: O cc-pVDZ 14, H STO-3G 1 each
    const b = buildBasis(water, { default: "cc-pVDZ", elements: { H: "STO-3G" } });
    expect(b.nbf).toBe(16);
    expect(b.setNames).toEqual({ O: "cc-pVDZ", H: "STO-3G" });
    expect(Object.keys(b.references).sort()).toEqual(["dunning1989a", "hehre1969a"]);
  });

  it("names the set and the element when the set lacks it, and suggests sets that have it", () => {
    const e = catchInputError(() => buildBasis([{ symbol: "K", xyz: [0, 0, 0] }, ...water], "cc-pVDZ"));
    expect(e.code).toBe("basis-missing-element");
    expect(e.message).toBe("Basis set cc-pVDZ has no functions for K (atom 1).");
    expect(e.hint).toContain("def2-SVP");
    expect(e.hint).not.toContain("cc-pVTZ");
    const ok = buildBasis([{ symbol: "K", xyz: [0, 0, 0] }, ...water], { default: "cc-pVDZ", elements: { K: "def2-SVP" } });
    expect(ok.setNames.K).toBe("def2-SVP");
  });

  it("rejects element symbols outside H–Kr", () => {
    expect(catchInputError(() => buildBasis([{ symbol: "Xx", xyz: [0, 0, 0] }], "STO-3G")).code).toBe("element-unknown");
    expect(buildBasis([{ symbol: "o", xyz: [0, 0, 0] }], "STO-3G").nbf).toBe(5);
  });

  it("builds fitting sets the same way", () => {
    // from the set's definition (Weigend, Köhn & Hättig 2002): O (7s5p4d2f) = 56, H (3s2p1d) = 14 each
    const b = buildBasis(water, "cc-pVDZ-RIFIT");
    expect(b.nbf).toBe(84);
  });
});

describe("user-supplied basis files", () => {
  const good = {
    format: "fieldbook-basis/1",
    name: "my-set",
    references: { me2024: "Me, A.\nMy set" },
    elements: {
      H: {
        references: ["me2024"],
        shells: [
          { l: 0, pure: false, exponents: [3.42525091, 0.62391373, 0.1688554], coefficients: [[0.15432897, 0.53532814, 0.44463454]] },
          { l: 1, exponents: [1.0], coefficients: [[1.0]] },
        ],
      },
    },
  };

  it("accepts a well-formed file and builds with it", () => {
    const set = parseBasisText(JSON.stringify(good, null, 2), "my.json");
    expect(set.role).toBe("orbital");
    expect(set.elements.H.shells[1].pure).toBe(false);
    const b = buildBasis([{ symbol: "H", xyz: [0, 0, 0] }], set);
    expect(b.nbf).toBe(4);
    expect(b.setNames.H).toBe("my-set");
    expect(b.references).toEqual({ me2024: "Me, A.\nMy set" });
  });

  it("reads a bundled set back unchanged through the user-file path", () => {
    const set = getBasisSet("def2-SVP");
    expect(parseBasisText(JSON.stringify(set), "copy.json")).toEqual(set);
  });

  it("reports text that is not JSON with the file name, line and column", () => {
    const e = catchInputError(() => parseBasisText('{\n  "format": "fieldbook-basis/1",\n  "name": x\n}', "bad.json"));
    expect(e.code).toBe("basis-file-syntax");
    expect(e.where.source).toBe("bad.json");
    expect(e.where).toEqual({ source: "bad.json", line: 3, column: 11 });
    expect(e.message).toBe('bad.json: not valid JSON: unexpected "x"');
    const cut = catchInputError(() => parseBasisText('{"format": "fieldbook-basis/1",\n"name": "a"', "cut.json"));
    expect(cut.where).toEqual({ source: "cut.json", line: 2, column: 12 });
  });

  it("finds no syntax error in valid JSON, bundled sets included", () => {
    expect(findJsonSyntaxError(JSON.stringify(getBasisSet("cc-pVQZ")))).toBeUndefined();
    expect(findJsonSyntaxError('{"a": [1, -2.5e-3, true, null, "x\\u00e9"]}')).toBeUndefined();
    expect(findJsonSyntaxError("[1, 2,]")?.offset).toBe(6);
  });

  function withShell(shell: unknown) {
    return JSON.stringify({ ...good, elements: { H: { ...good.elements.H, shells: [good.elements.H.shells[0], shell] } } }, null, 2);
  }

  it("rejects a negative exponent, naming element, shell and line", () => {
    const text = withShell({ l: 1, exponents: [-1.0], coefficients: [[1.0]] });
    const e = catchInputError(() => parseBasisText(text, "neg.json"));
    expect(e.code).toBe("basis-file-invalid");
    expect(e.message).toBe("neg.json: element H, shell 1: exponents[0] must be positive (got -1)");
    const line = text.split("\n").findIndex((s) => s.includes("-1")) + 1;
    expect(e.where).toMatchObject({ source: "neg.json", line });
  });

  it("rejects a coefficient row whose length differs from the exponents", () => {
    const e = catchInputError(() => parseBasisText(withShell({ l: 1, exponents: [1.0, 0.3], coefficients: [[1.0]] }), "len.json"));
    expect(e.message).toContain("element H, shell 1: coefficient row 0 has 1 values but there are 2 exponents");
    expect(e.where.line).toBeGreaterThan(1);
  });

  it("rejects an angular momentum above 6 or not an integer", () => {
    for (const l of [7, 1.5, -1, "p"]) {
      const e = catchInputError(() => parseBasisText(withShell({ l, exponents: [1.0], coefficients: [[1.0]] }), "l.json"));
      expect(e.message).toContain('element H, shell 1: "l" must be an integer from 0 to 6');
    }
  });

  it("rejects non-numbers, missing pure flags for d shells, unknown elements and undefined references", () => {
    const nan = catchInputError(() => parseBasisText(withShell({ l: 1, exponents: ["NaN"], coefficients: [[1.0]] }), "x.json"));
    expect(nan.message).toContain("exponents[0] is not a finite number");
    const pure = catchInputError(() => parseBasisText(withShell({ l: 2, exponents: [1.0], coefficients: [[1.0]] }), "x.json"));
    expect(pure.message).toContain('"pure"');
    const el = catchInputError(() => parseBasisText(JSON.stringify({ ...good, elements: { Qq: good.elements.H } }), "x.json"));
    expect(el.message).toContain('"Qq" is not an element symbol');
    const ref = catchInputError(() => parseBasisText(JSON.stringify({ ...good, references: {} }), "x.json"));
    expect(ref.message).toContain('reference "me2024" is not defined');
    const fmt = catchInputError(() => parseBasisText(JSON.stringify({ ...good, format: "other" }), "x.json"));
    expect(fmt.message).toContain('"format" must be "fieldbook-basis/1"');
  });
});
