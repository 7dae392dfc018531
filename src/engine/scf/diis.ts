/**
 * Pulay's direct inversion in the iterative subspace (P. Pulay, Chem. Phys. Lett. 73, 393
 * (1980); J. Comput. Chem. 3, 556 (1982)): the next Fock matrix is the combination Σ c_i F_i
 * of stored ones that minimizes |Σ c_i e_i| subject to Σ c_i = 1, where e_i is the orbital
 * gradient (the commutator F D S − S D F in an orthonormal basis). Several matrices (α and β)
 * are extrapolated with shared coefficients.
 */
import { Matrix, solve } from "ml-matrix";

export class Diis {
  private fs: Float64Array[][] = [];
  private es: Float64Array[] = [];
  private readonly size: number;
  constructor(size = 8) {
    this.size = size;
  }

  /** Store (Fock matrices, error vector); returns the extrapolated Fock matrices. */
  extrapolate(focks: Float64Array[], error: Float64Array): Float64Array[] {
    this.fs.push(focks.map((f) => f.slice()));
    this.es.push(error.slice());
    if (this.fs.length > this.size) {
      this.fs.shift();
      this.es.shift();
    }
    const m = this.es.length;
    if (m < 2) return focks;
    const B = Matrix.zeros(m + 1, m + 1);
    let scale = 0;
    for (let i = 0; i < m; i++)
      for (let j = 0; j <= i; j++) {
        let s = 0;
        const ei = this.es[i], ej = this.es[j];
        for (let k = 0; k < ei.length; k++) s += ei[k] * ej[k];
        B.set(i, j, s);
        B.set(j, i, s);
        scale = Math.max(scale, Math.abs(s));
      }
    // scaled so that the constraint row is not swamped when errors are tiny
    const inv = scale > 0 ? 1 / scale : 1;
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) B.set(i, j, B.get(i, j) * inv);
    for (let i = 0; i < m; i++) {
      B.set(i, m, -1);
      B.set(m, i, -1);
    }
    const rhs = Matrix.zeros(m + 1, 1);
    rhs.set(m, 0, -1);
    let c: number[];
    try {
      c = solve(B, rhs, true).getColumn(0);
    } catch {
      return focks;
    }
    if (c.some((x) => !Number.isFinite(x))) {
      // a singular subspace: keep the latest vectors only
      this.fs = this.fs.slice(-1);
      this.es = this.es.slice(-1);
      return focks;
    }
    return focks.map((f, x) => {
      const out = new Float64Array(f.length);
      for (let i = 0; i < m; i++) {
        const ci = c[i];
        const fi = this.fs[i][x];
        for (let k = 0; k < out.length; k++) out[k] += ci * fi[k];
      }
      return out;
    });
  }

  reset(): void {
    this.fs = [];
    this.es = [];
  }
}
