import { describe, expect, it } from "vitest";
import { ELEMENTS, MAX_Z, coreOrbitals, elementBySymbol, elementByZ, findElement } from "../../src/engine/elements.ts";
import { InputError } from "../../src/engine/errors.ts";

function thrown(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error("expected an InputError");
}

describe("elements", () => {
  it("covers H to Kr in order of atomic number", () => {
    expect(MAX_Z).toBe(36);
    expect(ELEMENTS.map((e) => e.z)).toEqual(Array.from({ length: 36 }, (_, i) => i + 1));
    expect(ELEMENTS[0].symbol).toBe("H");
    expect(ELEMENTS[35].symbol).toBe("Kr");
    expect(new Set(ELEMENTS.map((e) => e.symbol)).size).toBe(36);
  });

  it("has the IUPAC 2021 standard atomic weights, with conventional values for interval elements", () => {
    // Prohaska et al., Standard atomic weights of the elements 2021 (IUPAC Technical Report),
    // Pure Appl. Chem. 94, 573 (2022), Table 1 (from memory)
    expect(elementBySymbol("H").atomicWeight).toBe(1.008); // conventional value of [1.00784, 1.00811]
    expect(elementBySymbol("H").weightKind).toBe("conventional");
    expect(elementBySymbol("H").weightInterval).toEqual([1.00784, 1.00811]);
    expect(elementBySymbol("C").atomicWeight).toBe(12.011); // conventional value of [12.0096, 12.0116]
    expect(elementBySymbol("O").atomicWeight).toBe(15.999); // conventional value of [15.99903, 15.99977]
    expect(elementBySymbol("Cl").atomicWeight).toBe(35.45); // conventional value of [35.446, 35.457]
    expect(elementBySymbol("He").atomicWeight).toBe(4.002602); // 4.002602(2)
    expect(elementBySymbol("He").weightKind).toBe("single");
    expect(elementBySymbol("F").atomicWeight).toBe(18.998403162); // 18.998403162(5)
    expect(elementBySymbol("Fe").atomicWeight).toBe(55.845); // 55.845(2)
    expect(elementBySymbol("Kr").atomicWeight).toBe(83.798); // 83.798(2)
  });

  it("has the Cordero covalent radii, with the sp3 radius for carbon", () => {
    // Cordero et al., "Covalent radii revisited", Dalton Trans. 2008, 2832–2838, Table 2 (from memory)
    expect(elementBySymbol("H").covalentRadius).toBe(0.31);
    expect(elementBySymbol("C").covalentRadius).toBe(0.76); // sp3
    expect(elementBySymbol("O").covalentRadius).toBe(0.66);
    expect(elementBySymbol("Fe").covalentRadius).toBe(1.32); // low spin
    expect(elementBySymbol("K").covalentRadius).toBe(2.03);
    expect(elementBySymbol("Kr").covalentRadius).toBe(1.16);
  });

  it("looks symbols up regardless of letter case", () => {
    expect(elementBySymbol("cl").z).toBe(17);
    expect(elementBySymbol("CL").symbol).toBe("Cl");
    expect(elementBySymbol(" fe ").z).toBe(26);
    expect(findElement("Xx")).toBeUndefined();
  });

  it("looks elements up by atomic number", () => {
    expect(elementByZ(8).symbol).toBe("O");
    expect(elementByZ(36).name).toBe("krypton");
  });

  it("rejects an unknown symbol with element-unknown and a did-you-mean hint", () => {
    const e = thrown(() => elementBySymbol("Cll", { source: "spec.yaml", line: 4, column: 3 }));
    expect(e.code).toBe("element-unknown");
    expect(e.hint).toContain('"Cl"');
    expect(e.where).toEqual({ source: "spec.yaml", line: 4, column: 3 });
    expect(thrown(() => elementBySymbol("oxygen")).hint).toContain('"O"');
    expect(thrown(() => elementBySymbol("Xe")).code).toBe("element-unknown");
  });

  it("rejects atomic numbers outside 1 to 36 with element-unknown", () => {
    expect(thrown(() => elementByZ(0)).code).toBe("element-unknown");
    expect(thrown(() => elementByZ(37)).code).toBe("element-unknown");
    expect(thrown(() => elementByZ(1.5)).code).toBe("element-unknown");
  });

  it("freezes the noble-gas core: 0 for H–He, 1 for Li–Ne, 5 for Na–Ar, 9 for K–Kr", () => {
    expect([1, 2].map(coreOrbitals)).toEqual([0, 0]);
    expect([3, 10].map(coreOrbitals)).toEqual([1, 1]);
    expect([11, 18].map(coreOrbitals)).toEqual([5, 5]);
    expect([19, 36].map(coreOrbitals)).toEqual([9, 9]);
  });
});
