import { describe, expect, it } from "vitest";
import { buildBasis, validateBasisSet } from "../../../src/engine/basis/index.ts";
import { evenTemperedBasisSet, evenTemperedShells } from "../../../src/engine/basis/even-tempered.ts";

describe("even-tempered shells", () => {
  it("have exponents α·β^k for k = 0 … count − 1, one primitive of coefficient 1 each", () => {
    // exact: 0.5·2^k is exact in binary floating point
    const shells = evenTemperedShells(0, 0.5, 2, 4);
    expect(shells.map((s) => s.exponents)).toEqual([[0.5], [1], [2], [4]]);
    expect(shells.every((s) => s.l === 0 && s.coefficients.length === 1 && s.coefficients[0][0] === 1)).toBe(true);
  });

  it("keep the requested spherical or Cartesian convention for l ≥ 2 and Cartesian for s and p", () => {
    expect(evenTemperedShells(2, 1, 3, 2).every((s) => s.pure)).toBe(true);
    expect(evenTemperedShells(2, 1, 3, 2, false).every((s) => !s.pure)).toBe(true);
    expect(evenTemperedShells(1, 1, 3, 2, true).every((s) => !s.pure)).toBe(true);
  });

  it("reject a non-positive α, a ratio β ≤ 1, a bad count or l, and overflowing exponents", () => {
    expect(() => evenTemperedShells(0, 0, 2, 3)).toThrow(RangeError);
    expect(() => evenTemperedShells(0, 1, 1, 3)).toThrow(RangeError);
    expect(() => evenTemperedShells(0, 1, 2, 0)).toThrow(RangeError);
    expect(() => evenTemperedShells(0, 1, 2, 2.5)).toThrow(RangeError);
    expect(() => evenTemperedShells(7, 1, 2, 2)).toThrow(RangeError);
    expect(() => evenTemperedShells(-1, 1, 2, 2)).toThrow(RangeError);
    expect(() => evenTemperedShells(0, 1e300, 1e10, 3)).toThrow(RangeError);
  });
});

describe("even-tempered basis sets", () => {
  const set = evenTemperedBasisSet("ne", [
    { l: 2, alpha: 0.8, beta: 2.5, count: 2 },
    { l: 0, alpha: 0.1, beta: 3, count: 5 },
  ]);

  it("are valid sets in our format (validateBasisSet returns them unchanged) with canonical element symbols", () => {
    expect(validateBasisSet(structuredClone(set))).toEqual(set);
    expect(Object.keys(set.elements)).toEqual(["Ne"]);
    expect(set.harmonics).toBe("spherical");
  });

  it("order the shells by angular momentum, then by increasing exponent", () => {
    const shells = set.elements.Ne.shells;
    expect(shells.map((s) => s.l)).toEqual([0, 0, 0, 0, 0, 2, 2]);
    const s = shells.slice(0, 5).map((x) => x.exponents[0]);
    for (let k = 1; k < 5; k++) expect(s[k]).toBeGreaterThan(s[k - 1]);
  });

  it("go through buildBasis with 5 s and 2 × 5 spherical d functions (15), or 2 × 6 Cartesian d (17)", () => {
    const atoms = [{ symbol: "Ne", xyz: [0, 0, 0] as [number, number, number] }];
    expect(buildBasis(atoms, set, "auto").nbf).toBe(15);
    expect(buildBasis(atoms, set, "cartesian").nbf).toBe(17);
    const cart = evenTemperedBasisSet("Ne", [{ l: 2, alpha: 1, beta: 2, count: 2, pure: false }, { l: 0, alpha: 0.1, beta: 3, count: 3 }]);
    expect(buildBasis(atoms, cart, "auto").nbf).toBe(3 + 12);
  });

  it("refuse an empty list of series", () => {
    expect(() => evenTemperedBasisSet("He", [])).toThrow(RangeError);
  });
});
