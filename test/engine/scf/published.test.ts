/**
 * Hartree–Fock energies against published minimal-basis results: H2, HeH+ and the H atom of
 * Szabo & Ostlund, and the water STO-3G worked example of a public SCF programming tutorial.
 *
 * Book: A. Szabo, N. S. Ostlund, Modern Quantum Chemistry: Introduction to Advanced
 * Electronic Structure Theory (Macmillan 1982; revised Dover edition 1989/1996).
 */
import { describe, expect, it } from "vitest";
import { validateBasisSet, getBasisSet, type BasisSetData } from "../../../src/engine/basis/index.ts";
import { runScf } from "../../../src/engine/scf/scf.ts";
import { erf } from "../integrals/helpers.ts";
import { atomsBohr, scfProblem, spinSquared } from "./helpers.ts";
import { erfAbramowitzStegun, szaboMinimalScf, type SzaboOptions } from "./szabo-ostlund-program.ts";

// STO-3G fit to a ζ = 1 Slater 1s function: exponents and coefficients of normalized
// primitives, Szabo & Ostlund §3.5.1 (the same numbers as W. J. Hehre, R. F. Stewart,
// J. A. Pople, J. Chem. Phys. 51, 2657 (1969), to the 6 digits the book prints); from memory.
const ALPHA_ZETA1 = [0.109818, 0.405771, 2.22766];
const D_STO3G = [0.444635, 0.535328, 0.154329];
// Szabo & Ostlund §3.5.1: for another Slater exponent ζ the Gaussian exponents scale as ζ².

/** The book's STO-3G(ζ) basis as a user basis set in our format. */
function bookSto3g(zetas: Record<string, number>): BasisSetData {
  const elements: Record<string, unknown> = {};
  for (const [sym, zeta] of Object.entries(zetas)) {
    elements[sym] = { shells: [{ l: 0, exponents: ALPHA_ZETA1.map((a) => a * zeta * zeta), coefficients: [D_STO3G] }] };
  }
  return validateBasisSet({
    format: "fieldbook-basis/1",
    name: "STO-3G (Szabo & Ostlund)",
    description: "STO-3G fit of Szabo & Ostlund §3.5.1, exponents scaled by ζ²",
    elements,
  });
}

const EXACT: SzaboOptions = { erf, renormalize: true, crit: 1e-12 };
// the book's program: Abramowitz–Stegun erf, contraction taken as normalized, CRIT = 1e-4
const AS_IN_BOOK: SzaboOptions = { erf: erfAbramowitzStegun, renormalize: false, crit: 1e-4 };

describe("H2 in STO-3G at R = 1.4 bohr (Szabo & Ostlund §3.5.2)", () => {
  const atoms = atomsBohr([["H", 0, 0, 0], ["H", 0, 0, 1.4]]);
  const r = runScf(scfProblem(atoms, "STO-3G", "rhf"));
  const eNuc = 1 / 1.4; // exact analytic result

  it("converges to the book's total energy −1.117 Eh and electronic energy −1.831 Eh at the printed 3 decimals", () => {
    // Szabo & Ostlund §3.5.2: E0 = −1.831 Eh (electronic), total −1.117 Eh; from memory
    expect(r.converged).toBe(true);
    expect(Math.abs(r.energy - -1.117)).toBeLessThanOrEqual(5e-4);
    expect(Math.abs(r.energy - eNuc - -1.831)).toBeLessThanOrEqual(5e-4);
  });

  it("has the book's orbital energies −0.578 and +0.670 Eh at the printed 3 decimals", () => {
    // Szabo & Ostlund §3.5.2: ε1 = −0.578, ε2 = 0.670 Eh; from memory
    const [e1, e2] = r.orbitals.alpha.energies;
    expect(Math.abs(e1 - -0.578)).toBeLessThanOrEqual(5e-4);
    expect(Math.abs(e2 - 0.67)).toBeLessThanOrEqual(5e-4);
  });

  it("agrees to 1e-9 Eh with an independent two-function program in the book's 6-digit basis, run exactly", () => {
    // the bundled (Basis Set Exchange) H STO-3G is the same fit with ζ = 1.24 and 10 digits;
    // the book's 6-digit numbers change the energy by ~5e-8, so both go through the book's basis here
    const book = runScf(scfProblem(atoms, bookSto3g({ H: 1.24 }), "rhf"));
    const ref = szaboMinimalScf([{ z: 0, zeta: 1.24 }, { z: 1.4, zeta: 1.24 }], [1, 1], ALPHA_ZETA1, D_STO3G, EXACT);
    expect(Math.abs(book.energy - ref.total)).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(book.energy - r.energy)).toBeLessThanOrEqual(1e-7);
  });
});

describe("HeH+ in the book's STO-3G basis at R = 1.4632 bohr (Szabo & Ostlund §3.5.3, Appendix B)", () => {
  // Szabo & Ostlund §3.5.3: ζ(He) = 2.0925, ζ(H) = 1.24, R = 1.4632 bohr; from memory (as in the brief)
  const R = 1.4632;
  const zetaHe = 2.0925;
  const zetaH = 1.24;
  const atoms = atomsBohr([["He", 0, 0, 0], ["H", 0, 0, R]]);
  const engine = runScf(scfProblem(atoms, bookSto3g({ He: zetaHe, H: zetaH }), "rhf", { charge: 1 }));
  const fns: [{ z: number; zeta: number }, { z: number; zeta: number }] = [{ z: 0, zeta: zetaHe }, { z: R, zeta: zetaH }];
  const exact = szaboMinimalScf(fns, [2, 1], ALPHA_ZETA1, D_STO3G, EXACT);
  const asBook = szaboMinimalScf(fns, [2, 1], ALPHA_ZETA1, D_STO3G, AS_IN_BOOK);
  // Szabo & Ostlund §3.5.3 and the sample output of Appendix B: total energy −2.860662 Eh,
  // electronic energy −4.227529 Eh; from memory. Consistency: −4.227529 + 2/1.4632
  // (= 1.366867, exact analytic) = −2.860662.
  const BOOK_TOTAL = -2.860662;
  const BOOK_ELECTRONIC = -4.227529;

  it("has book values that are consistent with each other through the nuclear repulsion 2/R", () => {
    expect(Math.abs(BOOK_ELECTRONIC + 2 / R - BOOK_TOTAL)).toBeLessThanOrEqual(1e-6); // two roundings of 5e-7
  });

  it("reproduces the book's printed energies when the book program's own approximations are reproduced", () => {
    expect(Math.abs(asBook.total - BOOK_TOTAL)).toBeLessThanOrEqual(5e-7);
    expect(Math.abs(asBook.electronic - BOOK_ELECTRONIC)).toBeLessThanOrEqual(5e-7);
    // Appendix B prints the electronic energy as −0.422752913203D+01 (from memory); the
    // re-implementation gives it to all 12 printed digits, which confirms the recollection of
    // both the number and the program (erf approximation, no renormalization, CRIT = 1e-4)
    expect(Math.abs(asBook.electronic - -4.22752913203)).toBeLessThanOrEqual(5e-12);
  });

  it("agrees with the same program run exactly (exact erf, renormalized contraction) to 1e-10 Eh", () => {
    expect(engine.converged).toBe(true);
    expect(Math.abs(engine.energy - exact.total)).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(engine.energy - 2 / R - exact.electronic)).toBeLessThanOrEqual(1e-10);
  });

  it("lies 3.3e-6 Eh above the book's printed energy, entirely explained by the book program's two approximations", () => {
    // 1. The 6-digit STO-3G coefficients give a contraction of norm 1 + 1.43e-6 (computed here),
    //    which the book's program treats as 1 (S11 = S22 = 1 and X built from S12 alone): its
    //    "orbital" is then not normalized and the energy comes out 3.45e-6 Eh too low — below the
    //    variational value for the basis. The engine renormalizes each contraction.
    // 2. The erf of Abramowitz & Stegun 7.1.26 (|error| ≤ 1.5e-7) shifts it by +1.7e-7 Eh.
    const norm = exact.contractionNorms;
    expect(norm[0] - 1).toBeCloseTo(1.426e-6, 9);
    expect(norm[1] - 1).toBeCloseTo(1.426e-6, 9);
    const explained = exact.total - asBook.total;
    const measured = engine.energy - BOOK_TOTAL;
    console.log(
      `HeH+ STO-3G(book): engine ${engine.energy.toFixed(10)}, book ${BOOK_TOTAL}, engine − book ${measured.toExponential(3)}; ` +
        `exact − book-program ${explained.toExponential(3)}`,
    );
    expect(measured).toBeGreaterThan(3e-6);
    expect(Math.abs(measured - explained)).toBeLessThanOrEqual(5e-7); // the book's printed precision
  });

  it("has the orbital energies −1.597 and −0.0617 Eh of the book at the printed digits", () => {
    // Szabo & Ostlund §3.5.3: ε1 = −1.597, ε2 = −0.0617 Eh; from memory, and only to these
    // digits: the book program stops at a density change of 1e-4, and orbital energies are
    // first-order in the density error, so its own ε1 (re-implementation: −1.597448) differs
    // from the converged one (−1.597452) in the 6th decimal; a recalled 4th decimal is not trusted
    const [e1, e2] = engine.orbitals.alpha.energies;
    expect(Math.abs(e1 - -1.597)).toBeLessThanOrEqual(5e-4);
    expect(Math.abs(e2 - -0.0617)).toBeLessThanOrEqual(5e-5);
    expect(Math.abs(asBook.orbitalEnergies[0] - -1.597)).toBeLessThanOrEqual(5e-4);
    expect(Math.abs(asBook.orbitalEnergies[1] - -0.0617)).toBeLessThanOrEqual(5e-5);
    // and the engine's converged values are those of the exact re-implementation
    expect(Math.abs(e1 - exact.orbitalEnergies[0])).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(e2 - exact.orbitalEnergies[1])).toBeLessThanOrEqual(1e-9);
  });
});

describe("the hydrogen atom in STO-3G", () => {
  const atoms = atomsBohr([["H", 0, 0, 0]]);
  const uhf = runScf(scfProblem(atoms, "STO-3G", "uhf", { multiplicity: 2 }));
  const rohf = runScf(scfProblem(atoms, "STO-3G", "rohf", { multiplicity: 2 }));

  /**
   * ⟨φ|T + V|φ⟩ / ⟨φ|φ⟩ of one contraction Σ c_k g_k of normalized s Gaussians on a unit charge
   * (exact analytic result): with N_k = (2a_k/π)^{3/4} and p = a_i + a_j,
   * S_ij = N_i N_j (π/p)^{3/2}, T_ij = (3 a_i a_j / p) S_ij, V_ij = −N_i N_j 2π/p.
   */
  function closedForm(exps: number[], c: number[]): number {
    let s = 0, h = 0;
    for (let i = 0; i < exps.length; i++)
      for (let j = 0; j < exps.length; j++) {
        const a = exps[i], b = exps[j], p = a + b;
        const nn = c[i] * c[j] * (2 * a / Math.PI) ** 0.75 * (2 * b / Math.PI) ** 0.75;
        const sij = nn * (Math.PI / p) ** 1.5;
        s += sij;
        h += (3 * a * b / p) * sij - nn * (2 * Math.PI / p);
      }
    return h / s;
  }

  it("has the UHF energy of the closed-form expectation value of the bundled STO-3G 1s function to 1e-12 Eh", () => {
    const sh = getBasisSet("STO-3G").elements.H.shells[0];
    expect(uhf.converged).toBe(true);
    expect(Math.abs(uhf.energy - closedForm(sh.exponents, sh.coefficients[0]))).toBeLessThanOrEqual(1e-12);
  });

  it("has the published STO-3G hydrogen-atom energy −0.466582 Eh at the printed 6 decimals", () => {
    // Szabo & Ostlund (STO-3G, ζ = 1.24): −0.466582 Eh; from memory (as quoted in the brief)
    expect(Math.abs(uhf.energy - -0.466582)).toBeLessThanOrEqual(5e-7);
  });

  it("gives ⟨S²⟩ = 3/4 and the same energy under ROHF, since one electron has nothing to relax", () => {
    expect(spinSquared(uhf)).toBeCloseTo(0.75, 12);
    expect(rohf.converged).toBe(true);
    expect(Math.abs(rohf.energy - uhf.energy)).toBeLessThanOrEqual(1e-12);
  });
});

describe("water in STO-3G at the tutorial geometry", () => {
  // geometry (bohr) and energy: published worked example of a public SCF programming tutorial (water STO-3G)
  const atoms = atomsBohr([
    ["O", 0, -0.143225816552, 0],
    ["H", 1.638036840407, 1.136548822547, 0],
    ["H", -1.638036840407, 1.136548822547, 0],
  ]);
  const PUBLISHED = -74.942079928192;
  const tight = { energy: 1e-12, density: 1e-10 };

  it("reproduces the published energy to 1e-12 Eh with the older 8-digit STO-3G parameters the example used", () => {
    // the STO-3G numbers as distributed with 8 significant digits (EMSL / NWChem-format files,
    // e.g. O 1s 130.7093200, 23.8088610, 6.4436083; 0.15432897, 0.53532814, 0.44463454;
    // from basis files in public repositories, the same numbers as Hehre, Stewart, Pople 1969)
    const c1s = [0.15432897, 0.53532814, 0.44463454];
    const sp = [5.0331513, 1.1695961, 0.380389];
    const older = validateBasisSet({
      format: "fieldbook-basis/1",
      name: "STO-3G (8 digits)",
      elements: {
        H: { shells: [{ l: 0, exponents: [3.42525091, 0.62391373, 0.1688554], coefficients: [c1s] }] },
        O: {
          shells: [
            { l: 0, exponents: [130.70932, 23.808861, 6.4436083], coefficients: [c1s] },
            { l: 0, exponents: sp, coefficients: [[-0.09996723, 0.39951283, 0.70011547]] },
            { l: 1, exponents: sp, coefficients: [[0.15591627, 0.60768372, 0.39195739]] },
          ],
        },
      },
    });
    const r = runScf(scfProblem(atoms, older, "rhf"), tight);
    expect(r.converged).toBe(true);
    // printed to 12 decimals (±5e-13) plus 5e-13 for summation order in a 75 Eh total (measured 2.3e-13)
    expect(Math.abs(r.energy - PUBLISHED)).toBeLessThanOrEqual(1e-12);
  });

  it("lies 2.6e-8 Eh below the published energy with the bundled Basis Set Exchange STO-3G (10 digits)", () => {
    // the tolerance is the effect of the parameter set (measured −2.585e-8 Eh), not numerical noise
    const r = runScf(scfProblem(atoms, "STO-3G", "rhf"), tight);
    expect(r.converged).toBe(true);
    const d = r.energy - PUBLISHED;
    console.log(`water STO-3G (BSE): ${r.energy.toFixed(12)}, published ${PUBLISHED}, difference ${d.toExponential(4)}`);
    expect(d).toBeLessThan(0);
    expect(Math.abs(d)).toBeLessThanOrEqual(3e-8);
  });
});
