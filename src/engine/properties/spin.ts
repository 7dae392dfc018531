/**
 * ⟨S²⟩ of a single determinant with α and β orbitals (A. Szabo, N. S. Ostlund, Modern Quantum
 * Chemistry (1989), §2.5, eq. (2.271); equation number from memory, not checked):
 *   ⟨S²⟩ = S_z(S_z + 1) + N_β − Σ_{i∈α} Σ_{j∈β} |⟨ψ_i^α|ψ_j^β⟩|²,   S_z = (N_α − N_β)/2,
 * and the double sum is tr(Pα S Pβ S) in the AO basis. When the β orbitals span a subspace of the
 * α ones (RHF, ROHF) the sum is N_β and ⟨S²⟩ = S(S+1) exactly with S = S_z.
 */
import { matmul, traceProduct } from "../linalg/dense.ts";

export interface SSquared {
  value: number;
  /** S(S+1) of the intended state, S = (N_α − N_β)/2 */
  exact: number;
}

export function sSquared(Pa: Float64Array, Pb: Float64Array, S: Float64Array, n: number, nalpha: number, nbeta: number): SSquared {
  const sz = (nalpha - nbeta) / 2;
  const PaS = matmul(Pa, S, n, n, n);
  const PbS = matmul(Pb, S, n, n, n);
  const overlap = traceProduct(PaS, PbS, n);
  return { value: sz * (sz + 1) + nbeta - overlap, exact: sz * (sz + 1) };
}
