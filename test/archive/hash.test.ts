import { describe, expect, it } from "vitest";
import { canonicalJson } from "../../src/archive/canonical.ts";
import { basisHashData, hashedInput, hashHex, inputHash, INPUT_HASH_PATTERN } from "../../src/archive/hash.ts";
import { getBasisSet } from "../../src/engine/basis/index.ts";
import { BOHR_RADIUS_ANGSTROM } from "../../src/engine/constants.ts";
import { parseXyz } from "../../src/engine/molecule.ts";
import { NUMERICS_VERSION } from "../../src/engine/version.ts";
import type { NormalizedSpec } from "../../src/spec/types.ts";
import { h2Spec, hashOf } from "./fixtures.ts";

/** The same object with its keys in reverse order at every depth. */
function reversedKeys<T>(v: T): T {
  if (Array.isArray(v)) return v.map(reversedKeys) as T;
  if (v && typeof v === "object") {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(v).reverse()) out[k] = reversedKeys((v as Record<string, unknown>)[k]);
    return out as T;
  }
  return v;
}

describe("inputHash", () => {
  const base = h2Spec();
  const h0 = hashOf(base);

  it("is sha256:<64 hex> and deterministic", () => {
    expect(h0).toMatch(INPUT_HASH_PATTERN);
    expect(hashOf(h2Spec())).toBe(h0);
    expect(hashHex(h0)).toBe(h0.slice(7));
  });

  it("does not change for fields that cannot change a number", () => {
    const same: NormalizedSpec[] = [
      h2Spec({ id: "elsewhere/h2" }),
      h2Spec({ title: "another title" }),
      h2Spec({ summary: "a summary" }),
      h2Spec({ authors: ["Somebody Else"] }),
      h2Spec({ tags: ["x", "y"] }),
      h2Spec({ notes: "# notes\nwith *markdown*" }),
      h2Spec({ checks: [] }),
      // the geometry text as written (comments, spacing, trailing zeros) does not count, the atoms do
      h2Spec({ molecule: { geometry: { kind: "xyz", file: null, text: "# H2\nH  0.000 0.000 0.000   # first\nH 0 0 1.400000\n" } } }),
      h2Spec({ molecule: { geometry: { kind: "xyz", file: "geometries/h2.xyz", text: "H 0 0 0\nH 0 0 1.4" } } }),
      reversedKeys(base),
    ];
    for (const s of same) expect(hashOf(s)).toBe(h0);
  });

  it("is the same for a geometry given in ångström and the same atoms given in bohr", () => {
    const ang = "O 0.000000 0.000000 0.117300\nH 0.000000 0.757200 -0.469200\nH 0.000000 -0.757200 -0.469200\n";
    const atomsA = parseXyz(ang, { units: "angstrom" }).atoms;
    // the same positions written in bohr at full precision (String() round-trips)
    const bohr = atomsA.map((a) => `${a.symbol} ${a.xyz.map(String).join(" ")}`).join("\n");
    const atomsB = parseXyz(bohr, { units: "bohr" }).atoms;
    const inA = h2Spec({ molecule: { units: "angstrom", geometry: { kind: "xyz", file: null, text: ang }, atoms: atomsA } });
    const inB = h2Spec({ molecule: { units: "bohr", geometry: { kind: "xyz", file: null, text: bohr }, atoms: atomsB } });
    expect(atomsB).toEqual(atomsA);
    expect(hashOf(inB)).toBe(hashOf(inA));
    expect(atomsA[0].xyz[2]).toBe(0.1173 / BOHR_RADIUS_ANGSTROM);
  });

  it("changes when any number-affecting field changes", () => {
    const atoms = base.molecule.atoms;
    const moved = atoms.map((a, i) => ({ ...a, xyz: [a.xyz[0], a.xyz[1], i === 1 ? 1.4 + 1e-15 : a.xyz[2]] as [number, number, number] }));
    const variants: [string, NormalizedSpec][] = [
      ["charge", h2Spec({ molecule: { charge: 1, multiplicity: 2 } })],
      ["multiplicity", h2Spec({ molecule: { multiplicity: 3 } })],
      ["coordinate by 1e-15 bohr", h2Spec({ molecule: { atoms: moved } })],
      ["atom order", h2Spec({ molecule: { atoms: [atoms[1], atoms[0]] } })],
      ["element", h2Spec({ molecule: { atoms: [atoms[0], { symbol: "He", z: 2, xyz: atoms[1].xyz }] } })],
      ["reference", h2Spec({ model: { reference: "uhf" } })],
      ["correlation", h2Spec({ model: { correlation: "mp2" } })],
      ["basis", h2Spec({ model: { basis: "6-31G" } })],
      ["harmonics", h2Spec({ model: { harmonics: "cartesian" } })],
      ["frozen_core", h2Spec({ model: { frozen_core: false } })],
      ["density_fitting", h2Spec({ model: { basis: "cc-pVDZ", correlation: "mp2", density_fitting: true } })],
      ["fitting_basis", h2Spec({ model: { basis: "cc-pVDZ", correlation: "mp2", density_fitting: true, fitting_basis: "cc-pVTZ-RIFIT" } })],
      ["convergence.energy", h2Spec({ convergence: { energy: 1e-9 } })],
      ["convergence.density", h2Spec({ convergence: { density: 1e-7 } })],
      ["convergence.max_iterations", h2Spec({ convergence: { max_iterations: 50 } })],
      ["convergence.accelerator", h2Spec({ convergence: { accelerator: "none" } })],
      ["convergence.guess", h2Spec({ convergence: { guess: "core" } })],
      ["convergence.level_shift", h2Spec({ convergence: { level_shift: 0.1 } })],
      ["convergence.damping", h2Spec({ convergence: { damping: 0.2 } })],
    ];
    const seen = new Map<string, string>([[h0, "base"]]);
    for (const [what, s] of variants) {
      const h = hashOf(s);
      expect(seen.get(h), `${what} collides with ${seen.get(h)}`).toBeUndefined();
      seen.set(h, what);
    }
    // the numerics version
    expect(inputHash(base, basisHashData(base), NUMERICS_VERSION + 1)).not.toBe(h0);
  });

  it("covers the full basis data: one exponent, one coefficient or one pure flag changes it", () => {
    const sto = getBasisSet("STO-3G");
    const data = basisHashData(base);
    expect(data.fitting).toBeNull();
    expect(data.orbital.H).toEqual(sto.elements.H.shells.map((s) => ({ l: s.l, pure: false, exponents: s.exponents, coefficients: s.coefficients })));
    const tweak = (f: (d: typeof data) => void): string => {
      const d = structuredClone(data);
      f(d);
      return inputHash(base, d, NUMERICS_VERSION);
    };
    expect(tweak(() => {})).toBe(h0);
    expect(tweak((d) => { d.orbital.H[0].exponents[2] *= 1 + 1e-15; })).not.toBe(h0);
    expect(tweak((d) => { d.orbital.H[0].coefficients[0][0] += 1e-12; })).not.toBe(h0);
    expect(tweak((d) => { d.orbital.H[0].pure = true; })).not.toBe(h0);
    // a user basis file with the same data as the bundled set, under another name: the data hash the same
    const user = { ...structuredClone(sto), name: "my-sto3g" };
    expect(basisHashData(base, { orbital: user })).toEqual(data);
  });

  it("includes the pure flags after the harmonics choice, and the fitting basis when density fitting", () => {
    // cc-pVTZ has a d shell on H, stored spherical
    const auto = basisHashData(h2Spec({ model: { basis: "cc-pVTZ" } }));
    const cart = basisHashData(h2Spec({ model: { basis: "cc-pVTZ", harmonics: "cartesian" } }));
    expect(auto.orbital.H.filter((s) => s.l === 2).map((s) => s.pure)).toEqual([true]);
    expect(cart.orbital.H.filter((s) => s.l === 2).map((s) => s.pure)).toEqual([false]);
    expect(auto.orbital.H.filter((s) => s.l < 2).every((s) => !s.pure)).toBe(true);
    const ri = basisHashData(h2Spec({ model: { basis: "cc-pVDZ", correlation: "mp2", density_fitting: true } }));
    const riSet = getBasisSet("cc-pVDZ-RIFIT").elements.H.shells;
    expect(ri.fitting!.H.map((s) => s.exponents)).toEqual(riSet.map((s) => s.exponents));
    // density fitting without correlation fits nothing: no fitting data
    expect(basisHashData(h2Spec({ model: { basis: "cc-pVDZ", density_fitting: true } })).fitting).toBeNull();
    // per-element assignment: only the element's own set counts
    const mixed = basisHashData(h2Spec({ model: { basis: { default: "cc-pVDZ", elements: { H: "STO-3G" } } } }));
    expect(mixed.orbital).toEqual(basisHashData(base).orbital);
  });

  it("hashes exactly the documented object", () => {
    const obj = hashedInput(base, basisHashData(base), NUMERICS_VERSION);
    expect(Object.keys(obj).sort()).toEqual(["basis", "convergence", "model", "molecule", "numerics"]);
    expect(Object.keys(obj.molecule as object).sort()).toEqual(["atoms", "charge", "multiplicity"]);
    const text = canonicalJson(obj);
    for (const absent of ["title", "tags", "notes", "authors", "summary", "units", "geometry", "checks", "test/h2-sto3g", "Szabo"]) {
      expect(text).not.toContain(absent);
    }
  });
});
