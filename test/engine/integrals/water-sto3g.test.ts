import { describe, expect, it } from "vitest";
import { buildBasis } from "../../../src/engine/basis/index.ts";
import { nuclearRepulsion } from "../../../src/engine/molecule.ts";
import { kineticMatrix, overlapMatrix } from "../../../src/engine/integrals/one-electron.ts";
import { prepareShells } from "../../../src/engine/integrals/shells.ts";
import type { Vec3 } from "./helpers.ts";

// Geometry (bohr): published worked example of a public SCF programming tutorial (water STO-3G)
const O: Vec3 = [0, -0.143225816552, 0];
const H1: Vec3 = [1.638036840407, 1.136548822547, 0];
const H2: Vec3 = [-1.638036840407, 1.136548822547, 0];
const ATOMS = [
  { symbol: "O", xyz: O },
  { symbol: "H", xyz: H1 },
  { symbol: "H", xyz: H2 },
];

// function order: O 1s, O 2s, O 2px, O 2py, O 2pz, H1 1s, H2 1s
const O1S = 0, O2S = 1, OPX = 2, OPY = 3, H1S = 5, H2S = 6;

// published worked example of a public SCF programming tutorial (water STO-3G), values printed to 7 decimals
const S_PUBLISHED: [number, number, number][] = [
  [O1S, O2S, 0.2367039],
  [O2S, H1S, 0.3861388],
  [OPX, H1S, 0.2684382],
  [OPY, H1S, 0.2097269],
  [H1S, H2S, 0.1817599],
];
// same source, same 7 printed decimals
const T_PUBLISHED: [number, number, number][] = [
  [O1S, O1S, 29.0031999],
  [O2S, O2S, 0.808128],
  [OPX, OPX, 2.5287312],
  [H1S, H1S, 0.7600319],
  [O1S, O2S, -0.1680109],
];

describe("water in STO-3G (bundled basis data)", () => {
  const built = buildBasis(ATOMS, "STO-3G");
  const basis = prepareShells(built.shells);
  const n = basis.nbf;
  const S = overlapMatrix(basis);
  const T = kineticMatrix(basis);

  it("orders the functions O 1s, O 2s, O 2p (x, y, z), H1 1s, H2 1s with H1 the +x hydrogen", () => {
    expect(n).toBe(7);
    expect(built.functionLabels).toEqual(["O1 1s", "O1 2s", "O1 2px", "O1 2py", "O1 2pz", "H2 1s", "H3 1s"]);
    expect(built.shells[3].center[0]).toBeGreaterThan(0);
  });

  it("gives the published nuclear repulsion energy 8.002367061810450 Eh to 1e-12", () => {
    // published worked example of a public SCF programming tutorial (water STO-3G), nuclear repulsion energy
    const e = nuclearRepulsion({ atoms: ATOMS.map((a) => ({ ...a, z: a.symbol === "O" ? 8 : 1 })) });
    expect(Math.abs(e - 8.00236706181045)).toBeLessThanOrEqual(1e-12);
  });

  // The worked example used older STO-3G parameters (8 significant digits); the bundled data are
  // the Basis Set Exchange values with 10. So the engine's values may differ from the printed ones
  // by the rounding of the 7th decimal (≤ 5e-8) plus the effect of the different parameters.
  // Measured differences (engine − printed): S 2.1e-8, 5.7e-8, 5.4e-8, 4.9e-8, −1.7e-8;
  // T(O2s,O2s) −9.7e-8, T(O2p,O2p) 2.6e-8, T(H1s,H1s) −2.0e-8, T(O1s,O2s) −6.1e-8 — all within
  // 1.5e-7, the tolerance used (printed rounding plus a parameter effect below 1e-7).
  it("reproduces the published overlap elements to 1.5e-7 (7 printed decimals plus the parameter set)", () => {
    for (const [i, j, v] of S_PUBLISHED) expect(Math.abs(S[i * n + j] - v)).toBeLessThanOrEqual(1.5e-7);
  });

  // T(O1s,O1s) ≈ 29 is dominated by the tight 130.709… exponent and comes out 4.16e-6 above the
  // printed value. That is NOT explained by the digit count alone: with every bundled exponent and
  // coefficient rounded to 8 significant digits the difference stays at 4.3e-6, and
  // the contraction norms of the bundled data differ from 1 by < 1e-10 (both measured while
  // writing this test). An independent 30-digit
  // evaluation of the closed form Σ c_i c_j S_ij 3a_ia_j/p / Σ c_i c_j S_ij with the bundled
  // parameters gives 29.0032040647, the engine's value, so the engine is right for its data and the
  // tutorial's parameters must differ in value, not only in digits (a second exponent of 23.808861
  // instead of 23.808866, from memory and unverified, would give 29.0031997). Tolerance 5e-6 for
  // that element is therefore "measured difference between the parameter sets", nothing more.
  it("reproduces the published kinetic-energy elements to 1.5e-7, and T(O1s,O1s) to 5e-6 (different parameter set)", () => {
    for (const [i, j, v] of T_PUBLISHED) {
      const tol = i === O1S && j === O1S ? 5e-6 : 1.5e-7;
      expect(Math.abs(T[i * n + j] - v), `T(${i},${j})`).toBeLessThanOrEqual(tol);
    }
  });

  it("gives T(O1s,O1s) = 29.0032040647 for the bundled parameters, the closed-form value, to 1e-10", () => {
    // exact analytic result for a contracted s function on one centre, evaluated in 30-digit
    // arithmetic (mpmath) by the test author with the bundled exponents/coefficients
    expect(Math.abs(T[O1S * n + O1S] - 29.003204064678086)).toBeLessThanOrEqual(1e-10);
  });
});
