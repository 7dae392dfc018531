/**
 * Open shells: UHF and ROHF for the OH radical and triplet CH2, ⟨S²⟩, and a broken-symmetry
 * UHF solution of stretched H2.
 */
import { describe, expect, it } from "vitest";
import { runScf, type ScfResult } from "../../../src/engine/scf/scf.ts";
import { atomsBohr, benchGeometry, scfProblem, spinSquared } from "./helpers.ts";

function allFinite(r: ScfResult): boolean {
  const nums = [r.energy, ...r.orbitals.alpha.energies, ...(r.orbitals.beta?.energies ?? [])];
  // iteration 1 has no previous energy or density: its ΔE and density change are NaN by design
  for (const it of r.iterations) nums.push(it.energy, it.diisError, ...(it.iteration > 1 ? [it.deltaEnergy, it.densityRms] : []));
  return nums.every(Number.isFinite);
}

// 6-31G*: small, and with polarization so the open-shell structure is not basis-starved
const BASIS = "6-31G*";

for (const [name, label, S, spinTol] of [
  // ⟨S²⟩ within 0.02 (doublet) / 0.05 (triplet) of S(S+1) for UHF: common practice for
  // "little spin contamination", no source
  ["oh_radical", "the OH radical (doublet)", 0.5, 0.02],
  ["ch2_triplet", "triplet CH2", 1, 0.05],
] as const) {
  describe(`${label} in ${BASIS}`, () => {
    const g = benchGeometry(name);
    const uhf = runScf(scfProblem(g.atoms, BASIS, "uhf", { multiplicity: g.multiplicity }));
    const rohf = runScf(scfProblem(g.atoms, BASIS, "rohf", { multiplicity: g.multiplicity }));

    it("converges under UHF and ROHF with the default settings", () => {
      expect(g.multiplicity).toBe(2 * S + 1);
      expect(uhf.converged).toBe(true);
      expect(rohf.converged).toBe(true);
      expect(allFinite(uhf) && allFinite(rohf)).toBe(true);
      console.log(`${name} ${BASIS}: E(UHF) ${uhf.energy.toFixed(10)} (${uhf.iterations.length} it), E(ROHF) ${rohf.energy.toFixed(10)} (${rohf.iterations.length} it), ⟨S²⟩ UHF ${spinSquared(uhf).toFixed(6)}`);
    });

    it("has E(UHF) ≤ E(ROHF), since UHF minimizes over a larger set of determinants", () => {
      expect(uhf.energy).toBeLessThanOrEqual(rohf.energy);
    });

    it(`has a UHF ⟨S²⟩ above but within ${spinTol} of S(S+1) = ${S * (S + 1)}`, () => {
      const s2 = spinSquared(uhf);
      expect(s2).toBeGreaterThan(S * (S + 1)); // some contamination is expected in UHF
      expect(s2 - S * (S + 1)).toBeLessThanOrEqual(spinTol);
    });

    it("has an ROHF ⟨S²⟩ of exactly S(S+1) (1e-10), a spin eigenfunction", () => {
      expect(Math.abs(spinSquared(rohf) - S * (S + 1))).toBeLessThanOrEqual(1e-10);
    });

    it("has ROHF α and β densities built from one set of orbitals: Pβ is the closed part of Pα", () => {
      // Pα − Pβ is the open-shell density: idempotent in the S metric, (ΔP S)² = ΔP S, with trace 2S
      const [Pa, Pb] = rohf.matrices.D;
      const Smat = rohf.matrices.S;
      const n = Math.round(Math.sqrt(Smat.length));
      const dP = Pa.map((x, k) => x - Pb[k]);
      const M = new Float64Array(n * n); // ΔP S
      for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) for (let j = 0; j < n; j++) M[i * n + j] += dP[i * n + k] * Smat[k * n + j];
      let tr = 0, dev = 0;
      for (let i = 0; i < n; i++) {
        tr += M[i * n + i];
        for (let j = 0; j < n; j++) {
          let mm = 0;
          for (let k = 0; k < n; k++) mm += M[i * n + k] * M[k * n + j];
          dev = Math.max(dev, Math.abs(mm - M[i * n + j]));
        }
      }
      expect(tr).toBeCloseTo(2 * S, 10);
      expect(dev).toBeLessThanOrEqual(1e-10);
    });
  });
}

describe("stretched H2 (R = 3.5 bohr, 2.5 × equilibrium) in 6-31G**", () => {
  const atoms = atomsBohr([["H", 0, 0, 0], ["H", 0, 0, 3.5]]);
  const rhfProblem = scfProblem(atoms, "6-31G**", "rhf");
  const rhf = runScf(rhfProblem);
  const uhfProblem = { ...rhfProblem, reference: "uhf" as const };

  /** RHF orbitals with HOMO (column 0) and LUMO (column 1) rotated by angle θ. */
  function rotated(theta: number): Float64Array {
    const C = rhf.matrices.C[0];
    const n = rhfProblem.basis.nbf;
    const m = rhf.orthogonalization.nmo;
    const out = C.slice();
    const c = Math.cos(theta), s = Math.sin(theta);
    for (let i = 0; i < n; i++) {
      const h = C[i * m], l = C[i * m + 1];
      out[i * m] = c * h + s * l;
      out[i * m + 1] = -s * h + c * l;
    }
    return out;
  }

  it("converges under RHF with the defaults, or reports non-convergence with a full, finite history", () => {
    expect(allFinite(rhf)).toBe(true);
    if (rhf.converged) expect(Math.abs(rhf.iterations[rhf.iterations.length - 1].deltaEnergy)).toBeLessThan(1e-10);
    else expect(rhf.iterations.length).toBe(128);
    // measured: converges in 6 iterations to −0.938582095 Eh
  });

  it("stays on the restricted solution under UHF when α and β start alike (no symmetry breaking by itself)", () => {
    const u = runScf(uhfProblem);
    expect(u.converged).toBe(true);
    expect(Math.abs(u.energy - rhf.energy)).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(spinSquared(u))).toBeLessThanOrEqual(1e-9);
  });

  it("finds a broken-symmetry UHF solution more than 1e-3 Eh below RHF, with ⟨S²⟩ clearly above 0, from HOMO–LUMO mixed by ±45°", () => {
    const u = runScf(uhfProblem, {}, undefined, { C: [rotated(Math.PI / 4), rotated(-Math.PI / 4)] });
    const s2 = spinSquared(u);
    console.log(`H2 R=3.5 6-31G**: E(RHF) ${rhf.energy.toFixed(10)}, E(UHF, broken symmetry) ${u.energy.toFixed(10)}, ΔE ${(u.energy - rhf.energy).toExponential(4)}, ⟨S²⟩ ${s2.toFixed(6)}`);
    expect(u.converged).toBe(true);
    expect(allFinite(u)).toBe(true);
    expect(u.energy).toBeLessThan(rhf.energy - 1e-3);
    expect(s2).toBeGreaterThan(0.5);
    // one α and one β electron: ⟨S²⟩ = 1 − |⟨φα|φβ⟩|² ≤ 1 (exact analytic result)
    expect(s2).toBeLessThan(1);
    // the α and β electrons localize on opposite atoms: the spin density is antisymmetric
    const [Pa, Pb] = u.matrices.D;
    const Sm = u.matrices.S;
    const n = rhfProblem.basis.nbf;
    const atomOf = (k: number) => (k < n / 2 ? 0 : 1); // 5 functions per H in 6-31G** (2s + 1p)
    const spinPop = [0, 0];
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) spinPop[atomOf(i)] += (Pa[i * n + j] - Pb[i * n + j]) * Sm[i * n + j];
    expect(Math.abs(spinPop[0] + spinPop[1])).toBeLessThanOrEqual(1e-9);
    expect(Math.abs(spinPop[0])).toBeGreaterThan(0.5);
  });
});
