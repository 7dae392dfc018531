/**
 * One-dimensional overlap integrals S_ij = ∫ x_A^i x_B^j exp(−a x_A² − b x_B²) dx by the
 * Obara–Saika recurrences (S. Obara, A. Saika, J. Chem. Phys. 84, 3963 (1986), eqs. 25–26):
 *   S_00 = √(π/p) exp(−μ X_AB²),  S_{i+1,0} = X_PA S_i0 + i/(2p) S_{i−1,0},
 * then the horizontal transfer S_{i,j+1} = S_{i+1,j} + X_AB S_ij.
 * p = a + b, μ = ab/p, P = (aA + bB)/p.
 * The recurrence is always run from the tighter primitive towards the more diffuse one, and
 * the table transposed when that is B: transferring onto a tight function loses digits.
 */

/**
 * Writes S[i * (jmax+1) + j] for i ≤ imax, j ≤ jmax into out (allocation-free; work needs
 * (imax+jmax+1)² entries).
 */
export function overlap1d(
  imax: number,
  jmax: number,
  A: number,
  B: number,
  a: number,
  b: number,
  out: Float64Array,
  work: Float64Array,
): void {
  if (b > a) {
    build(jmax, imax, B, A, b, a, work);
    const n = imax + jmax + 1;
    const w = jmax + 1;
    for (let i = 0; i <= imax; i++) for (let j = 0; j <= jmax; j++) out[i * w + j] = work[j * n + i];
    return;
  }
  build(imax, jmax, A, B, a, b, work);
  const n = imax + jmax + 1;
  const w = jmax + 1;
  for (let i = 0; i <= imax; i++) for (let j = 0; j <= jmax; j++) out[i * w + j] = work[i * n + j];
}

/** work[i * n + j] (n = imax + jmax + 1) for i + j < n, transferring from A to B. */
function build(imax: number, jmax: number, A: number, B: number, a: number, b: number, work: Float64Array): void {
  const p = a + b;
  const P = (a * A + b * B) / p;
  const xpa = P - A;
  const xab = A - B;
  const n = imax + jmax + 1;
  // work[i * n + j]
  work[0] = Math.sqrt(Math.PI / p) * Math.exp(-((a * b) / p) * xab * xab);
  const h = 0.5 / p;
  for (let i = 0; i + 1 < n; i++) work[(i + 1) * n] = xpa * work[i * n] + (i > 0 ? i * h * work[(i - 1) * n] : 0);
  for (let j = 0; j < jmax; j++)
    for (let i = 0; i + j + 1 < n; i++) work[i * n + j + 1] = work[(i + 1) * n + j] + xab * work[i * n + j];
}
