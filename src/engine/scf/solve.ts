/**
 * SCF with a stability check: for UHF, after convergence the real orbital Hessian is tested
 * (stability.ts); on a negative eigenvalue the orbitals are rotated along that mode and the SCF
 * re-converged, at most `maxRestarts` times. Each visited solution is recorded, so a page can
 * show that (and why) the final solution differs from the first.
 */
import { runScf, type ScfEvent, type ScfOptions, type ScfProblem, type ScfResult } from "./scf.ts";
import { rotateAlong, type StabilityRecord, uhfStability } from "./stability.ts";

export interface StabilityOptions {
  /** default true for UHF (the only reference checked) */
  check?: boolean;
  maxRestarts?: number;
  /** eigenvalues above this count as stable; default −1e-5 hartree */
  threshold?: number;
}

export function solveScf(
  problem: ScfProblem, options: ScfOptions = {}, stability: StabilityOptions = {}, onEvent?: (e: ScfEvent) => void,
): { scf: ScfResult; stability: StabilityRecord } {
  let r = runScf(problem, options, onEvent);
  const rec: StabilityRecord = { checked: false, lowestEigenvalue: null, stable: null, restarts: 0, energies: [r.energy] };
  if (problem.reference !== "uhf" || stability.check === false) return { scf: r, stability: rec };
  const maxRestarts = stability.maxRestarts ?? 3;
  const threshold = stability.threshold ?? -1e-5;
  const n = problem.basis.nbf;
  for (;;) {
    if (!r.converged) break;
    const m = r.orthogonalization.nmo;
    const st = uhfStability(r.matrices.jk, n, m,
      { C: r.matrices.C[0], eps: r.orbitals.alpha.energies, nocc: problem.nalpha },
      { C: r.matrices.C[1], eps: r.orbitals.beta!.energies, nocc: problem.nbeta });
    rec.checked = true;
    rec.lowestEigenvalue = st.lowestEigenvalue;
    rec.stable = st.lowestEigenvalue >= threshold;
    if (rec.stable || rec.restarts >= maxRestarts) break;
    // step along the unstable mode; a larger step if the first re-converges to the same point
    let moved = false;
    for (const step of [0.5, 1.0]) {
      const C = rotateAlong([r.matrices.C[0], r.matrices.C[1]], [problem.nalpha, problem.nbeta], n, m, st.vector, step);
      const r2 = runScf(problem, options, onEvent, { C: [C[0], C[1]], matrices: r.matrices });
      if (r2.converged && r2.energy < r.energy - 1e-8) {
        r = r2;
        moved = true;
        break;
      }
    }
    rec.restarts++;
    rec.energies.push(r.energy);
    if (!moved) break;
  }
  return { scf: r, stability: rec };
}
