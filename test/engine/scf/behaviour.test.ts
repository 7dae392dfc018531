/**
 * Behaviour of the SCF loop: references and guesses that must agree, non-convergence as a
 * result, the iteration history, and self-consistency of what is returned.
 */
import { describe, expect, it } from "vitest";
import { runScf, type ScfProblem, type ScfResult } from "../../../src/engine/scf/scf.ts";
import { benchGeometry, scfProblem } from "./helpers.ts";

const water = benchGeometry("water");
const rhfProblem = scfProblem(water.atoms, "cc-pVDZ", "rhf");
const uhfProblem: ScfProblem = { ...rhfProblem, reference: "uhf" };
const rhfSad = runScf(rhfProblem, { guess: "sad" });
const rhfCore = runScf(rhfProblem, { guess: "core" });
const uhfSad = runScf(uhfProblem, { guess: "sad" });

function matmul(A: Float64Array, B: Float64Array, n: number, k: number, m: number): Float64Array {
  const C = new Float64Array(n * m);
  for (let i = 0; i < n; i++)
    for (let p = 0; p < k; p++) {
      const a = A[i * k + p];
      for (let j = 0; j < m; j++) C[i * m + j] += a * B[p * m + j];
    }
  return C;
}

describe("water in cc-pVDZ", () => {
  it("converges to the same RHF energy from the SAD and the core-Hamiltonian guess (1e-9 Eh)", () => {
    expect(rhfSad.converged && rhfCore.converged).toBe(true);
    expect(Math.abs(rhfSad.energy - rhfCore.energy)).toBeLessThanOrEqual(1e-9);
    console.log(`water cc-pVDZ RHF: SAD ${rhfSad.energy.toFixed(12)} (${rhfSad.iterations.length} it), core ${rhfCore.energy.toFixed(12)} (${rhfCore.iterations.length} it)`);
  });

  it("gives the same energy under RHF and UHF for the closed shell (1e-9 Eh) with identical α and β densities", () => {
    expect(uhfSad.converged).toBe(true);
    expect(Math.abs(uhfSad.energy - rhfSad.energy)).toBeLessThanOrEqual(1e-9);
    const [Da, Db] = uhfSad.matrices.D;
    let dev = 0;
    for (let k = 0; k < Da.length; k++) dev = Math.max(dev, Math.abs(Da[k] - Db[k]));
    expect(dev).toBeLessThanOrEqual(1e-7);
  });

  it("records an iteration history whose energies stabilise: the last ΔE is below 1e-10 Eh and equals the last step", () => {
    for (const r of [rhfSad, rhfCore, uhfSad]) {
      const its = r.iterations;
      expect(its.map((x) => x.iteration)).toEqual(its.map((_, k) => k + 1));
      for (let k = 1; k < its.length; k++) expect(its[k].deltaEnergy).toBe(its[k].energy - its[k - 1].energy);
      const last = its[its.length - 1];
      expect(Math.abs(last.deltaEnergy)).toBeLessThan(1e-10);
      expect(last.densityRms).toBeLessThan(1e-8);
      expect(last.fullBuild).toBe(true); // convergence is only declared on a full Fock build
      expect(r.energy).toBe(last.energy);
      expect(its.every((x) => Number.isFinite(x.energy) && Number.isFinite(x.diisError))).toBe(true);
    }
  });

  it("returns orbitals that are orthonormal (Cᵀ S C = 1) and reproduce the returned density (self-consistency)", () => {
    const r = rhfSad;
    const n = rhfProblem.basis.nbf;
    const m = r.orthogonalization.nmo;
    const C = r.matrices.C[0];
    const Ct = new Float64Array(m * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < m; j++) Ct[j * n + i] = C[i * m + j];
    const CtSC = matmul(Ct, matmul(r.matrices.S, C, n, n, m), m, n, m);
    let dev = 0;
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) dev = Math.max(dev, Math.abs(CtSC[i * m + j] - (i === j ? 1 : 0)));
    expect(dev).toBeLessThanOrEqual(1e-10);
    // D from the returned (final Fock) orbitals vs the density of the last iteration
    let ddev = 0;
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k < r.nalpha; k++) s += C[i * m + k] * C[j * m + k];
        ddev = Math.max(ddev, Math.abs(s - r.matrices.D[0][i * n + j]));
      }
    // converged to an RMS density change below 1e-8, so one more step moves elements by about
    // that much (measured 1.2e-9)
    expect(ddev).toBeLessThanOrEqual(1e-7);
  });

  it("reports an energy equal to ½ tr[D(H + F)] + E_nuc of the returned matrices", () => {
    const r = rhfSad;
    const { H, F, D } = r.matrices;
    let e = 0;
    for (let k = 0; k < H.length; k++) e += (D[0][k] + D[1][k]) * H[k] + D[0][k] * F[0][k] + D[1][k] * F[1][k];
    expect(Math.abs(0.5 * e + rhfProblem.nuclearRepulsion - r.energy)).toBeLessThanOrEqual(1e-10);
  });
});

describe("non-convergence", () => {
  const r: ScfResult = runScf(rhfProblem, { maxIterations: 3, accelerator: "none" });

  it("is a result: 3 iterations without DIIS return converged: false with 3 iterations recorded", () => {
    expect(r.converged).toBe(false);
    expect(r.iterations).toHaveLength(3);
    expect(r.iterations.map((x) => x.iteration)).toEqual([1, 2, 3]);
  });

  it("carries finite numbers: energies, changes, gradients (and density changes after the first iteration)", () => {
    expect(Number.isFinite(r.energy)).toBe(true);
    expect(r.energy).toBe(r.iterations[2].energy);
    for (const it of r.iterations) {
      expect(Number.isFinite(it.energy) && Number.isFinite(it.diisError)).toBe(true);
      // iteration 1 has no previous energy or density: its ΔE and density change are NaN by design
      if (it.iteration > 1) expect(Number.isFinite(it.deltaEnergy) && Number.isFinite(it.densityRms)).toBe(true);
      else expect(Number.isNaN(it.deltaEnergy) && Number.isNaN(it.densityRms)).toBe(true);
    }
    expect(r.orbitals.alpha.energies.every(Number.isFinite)).toBe(true);
    // 3 undamped steps from SAD are still far from the converged energy, and above it: the
    // density of every iteration is that of a determinant, whose energy the HF minimum bounds
    expect(r.energy - rhfSad.energy).toBeGreaterThan(1e-4);
  });

  it("returns the orbitals that made the returned density, so C, D and the energy belong together", () => {
    const n = rhfProblem.basis.nbf;
    const m = r.orthogonalization.nmo;
    const C = r.matrices.C[0];
    let dev = 0;
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let k = 0; k < r.nalpha; k++) s += C[i * m + k] * C[j * m + k];
        dev = Math.max(dev, Math.abs(s - r.matrices.D[0][i * n + j]));
      }
    expect(dev).toBeLessThanOrEqual(1e-12);
  });
});
