/**
 * Shells prepared for integral evaluation: normalized contraction coefficients and the
 * function offsets of the basis.
 *
 * A primitive x^i y^j z^k exp(−a r²) is given the normalization of x^l,
 *   N(a, l) = (2a/π)^{3/4} (4a)^{l/2} / √((2l−1)!!),
 * and each contracted function (one coefficient row) is rescaled to unit norm using
 *   ⟨φ|φ⟩ = Σ_ij c_i c_j (2√(a_i a_j)/(a_i + a_j))^{l+3/2}   (coefficients of normalized primitives).
 * Other Cartesian components and solid harmonics are normalized by spherical.ts.
 */
import type { Shell } from "../basis/types.ts";
import { ncomp } from "../basis/types.ts";
import { doubleFactorial } from "./cartesian.ts";

export interface PreparedShell {
  l: number;
  pure: boolean;
  atom: number;
  x: number;
  y: number;
  z: number;
  nprim: number;
  exps: Float64Array;
  /** number of contracted functions sharing these primitives (general contraction) */
  ncontr: number;
  /** coef[r * nprim + p]: normalized coefficient of primitive p in contracted function r */
  coef: Float64Array;
  /** functions per contraction row (2l+1 or (l+1)(l+2)/2) */
  ncomp: number;
  /** ncontr × ncomp */
  nfunc: number;
  /** index of the shell's first basis function */
  offset: number;
  /**
   * Lowest angular momentum among the rows: l for ordinary shells; lower for a merged shell
   * (mergeSharedExponents), whose rows have different l (an sp shell: an s row, then a p row).
   */
  lmin: number;
  /** angular momentum of each row */
  rowL: Int32Array;
  /** first function of each row within the shell */
  rowOff: Int32Array;
  /** spherical (1) or Cartesian (0) per row */
  rowPure: Uint8Array;
}

export interface PreparedBasis {
  shells: PreparedShell[];
  nbf: number;
  maxL: number;
}

export function primitiveNorm(a: number, l: number): number {
  return (2 * a / Math.PI) ** 0.75 * (4 * a) ** (l / 2) / Math.sqrt(doubleFactorial(2 * l - 1));
}

export function prepareShells(shells: readonly Shell[]): PreparedBasis {
  let offset = 0;
  let maxL = 0;
  const out: PreparedShell[] = shells.map((s) => {
    const nprim = s.exponents.length;
    const ncontr = s.coefficients.length;
    const coef = new Float64Array(ncontr * nprim);
    for (let r = 0; r < ncontr; r++) {
      const row = s.coefficients[r];
      let norm = 0;
      for (let i = 0; i < nprim; i++)
        for (let j = 0; j < nprim; j++) {
          const ai = s.exponents[i];
          const aj = s.exponents[j];
          norm += row[i] * row[j] * ((2 * Math.sqrt(ai * aj)) / (ai + aj)) ** (s.l + 1.5);
        }
      if (!(norm > 0)) throw new Error(`contracted function with zero norm (l=${s.l}, atom ${s.atom})`);
      const scale = 1 / Math.sqrt(norm);
      for (let i = 0; i < nprim; i++) coef[r * nprim + i] = row[i] * scale * primitiveNorm(s.exponents[i], s.l);
    }
    const nc = ncomp(s.l, s.pure);
    const p: PreparedShell = {
      l: s.l,
      pure: s.pure,
      atom: s.atom,
      x: s.center[0],
      y: s.center[1],
      z: s.center[2],
      nprim,
      exps: Float64Array.from(s.exponents),
      ncontr,
      coef,
      ncomp: nc,
      nfunc: ncontr * nc,
      offset,
      lmin: s.l,
      rowL: new Int32Array(ncontr).fill(s.l),
      rowOff: Int32Array.from({ length: ncontr }, (_, r) => r * nc),
      rowPure: new Uint8Array(ncontr).fill(s.pure ? 1 : 0),
    };
    offset += p.nfunc;
    if (s.l > maxL) maxL = s.l;
    return p;
  });
  return { shells: out, nbf: offset, maxL };
}

/**
 * Shells for two-electron integrals: consecutive single-row shells on one atom with identical
 * exponents and consecutive l (the halves of a Pople sp shell, or spd) become one shell whose
 * rows have different l, so every primitive quartet is computed once for all of them.
 * Their functions are adjacent in the basis, so the merged shell's functions are too.
 * Shells with several rows of one l (general contractions) are left as they are.
 */
export function mergeSharedExponents(shells: readonly PreparedShell[]): PreparedShell[] {
  const out: PreparedShell[] = [];
  // a shell can absorb the next one when all its rows are single functions of consecutive l
  const open = (t: PreparedShell) => t.ncontr === 1 || t.lmin < t.l;
  for (const s of shells) {
    const last = out[out.length - 1];
    if (
      last !== undefined && open(last) && s.ncontr === 1 && s.l === last.l + 1 && last.atom === s.atom &&
      last.offset + last.nfunc === s.offset && last.nprim === s.nprim && last.exps.every((e, i) => e === s.exps[i])
    ) {
      const coef = new Float64Array((last.ncontr + 1) * s.nprim);
      coef.set(last.coef);
      coef.set(s.coef, last.ncontr * s.nprim);
      out[out.length - 1] = {
        ...last,
        l: s.l,
        pure: s.pure,
        ncontr: last.ncontr + 1,
        coef,
        ncomp: 0, // rows differ; use rowOff and the rows' own component counts
        nfunc: last.nfunc + s.nfunc,
        rowL: Int32Array.from([...last.rowL, s.l]),
        rowOff: Int32Array.from([...last.rowOff, last.nfunc]),
        rowPure: Uint8Array.from([...last.rowPure, s.pure ? 1 : 0]),
      };
    } else out.push(s);
  }
  return out;
}
