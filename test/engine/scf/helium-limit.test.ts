/**
 * The helium atom approaching the Hartree–Fock limit with even-tempered s bases.
 */
import { describe, expect, it } from "vitest";
import { evenTemperedBasisSet } from "../../../src/engine/basis/even-tempered.ts";
import { runScf } from "../../../src/engine/scf/scf.ts";
import { atomsBohr, scfProblem } from "./helpers.ts";

// He Hartree–Fock limit: E. Clementi, C. Roetti, At. Data Nucl. Data Tables 14, 177 (1974),
// He ground state, −2.8616800 Eh (as quoted in the brief; the numerical HF value is
// −2.86167999561 Eh, from memory), i.e. the printed value is at most 5e-8 from the limit.
const E_LIMIT = -2.86168;

// (n, α, β): per basis size, the (α, β) minimizing the RHF energy, found once by alternating
// golden-section searches on ln α and ln β (three sweeps, each n started from the previous
// optimum; done outside the test with this engine) and rounded to 4 digits. The "local
// minimum" test below checks that the rounded values are still minima at the 1 % scale.
const BASES: [number, number, number][] = [
  [4, 0.3192, 4.596],
  [6, 0.2342, 3.582],
  [8, 0.1891, 3.069],
  [10, 0.1604, 2.756],
  [12, 0.1402, 2.545],
  [14, 0.1248, 2.39],
];

const he = atomsBohr([["He", 0, 0, 0]]);
function energy(n: number, alpha: number, beta: number): number {
  const set = evenTemperedBasisSet("He", [{ l: 0, alpha, beta, count: n }]);
  const r = runScf(scfProblem(he, set, "rhf"));
  if (!r.converged) throw new Error(`He ${n}s (α ${alpha}, β ${beta}) did not converge`);
  if (r.orthogonalization.dropped !== 0) throw new Error(`He ${n}s: ${r.orthogonalization.dropped} functions dropped`);
  return r.energy;
}

describe("helium in even-tempered s bases", () => {
  const table = BASES.map(([n, a, b]) => ({ n, alpha: a, beta: b, E: energy(n, a, b) }));
  console.log(
    "He RHF, even-tempered s bases (E_limit = −2.8616800, Clementi & Roetti 1974):\n" +
      table.map((t) => `  n=${String(t.n).padStart(2)}  α=${t.alpha}  β=${t.beta}  E=${t.E.toFixed(10)}  E−E_limit=${(t.E - E_LIMIT).toExponential(3)}`).join("\n"),
  );

  it("lowers the RHF energy monotonically as the basis grows from 4 to 14 functions", () => {
    for (let k = 1; k < table.length; k++) expect(table[k].E).toBeLessThan(table[k - 1].E);
  });

  it("never goes below the Hartree–Fock limit by more than 1e-9 Eh (variational principle)", () => {
    for (const t of table) expect(t.E).toBeGreaterThanOrEqual(E_LIMIT - 1e-9);
  });

  it("reaches the Hartree–Fock limit within 1e-5 Eh with 14 functions", () => {
    // measured: E − E_limit = 1.71e-6 Eh
    expect(table[table.length - 1].E - E_LIMIT).toBeLessThanOrEqual(1e-5);
  });

  it("has the tabulated (α, β) as local minima: a 1 % change of either raises the energy", () => {
    for (const [n, a, b] of [BASES[0], BASES[BASES.length - 1]]) {
      const e0 = energy(n, a, b);
      for (const [fa, fb] of [[1.01, 1], [0.99, 1], [1, 1.01], [1, 0.99]]) expect(energy(n, a * fa, b * fb)).toBeGreaterThan(e0);
    }
  });

  it("never raises the energy when a tighter function is added to a fixed even-tempered sequence (nested spaces)", () => {
    // the (n + 1)-function space contains the n-function one, so E cannot increase (exact
    // consequence of the variational principle); each added function in fact lowers it
    const [, a, b] = BASES[BASES.length - 1];
    let prev = Infinity;
    for (let n = 1; n <= 14; n++) {
      const e = energy(n, a, b);
      expect(e).toBeLessThan(prev);
      prev = e;
    }
  });
});
