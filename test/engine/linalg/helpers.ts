/** Shared test matrices. */
import { rng } from "../integrals/helpers.ts";

/** A symmetric n × n matrix with entries uniform in [−½, ½), reproducible from the seed. */
export function randomSymmetric(n: number, seed: number): Float64Array {
  const next = rng(seed);
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) A[i * n + j] = A[j * n + i] = next() - 0.5;
  return A;
}
