/**
 * Straight-line vertical recurrences for small angular-momentum classes.
 *
 * The same recurrences as eri-class.ts (Obara–Saika / Head-Gordon–Pople), unrolled at run
 * time into one JavaScript function per class: intermediates become local variables, the
 * integer factors N_i(e), N_i(f) become literals, and terms with a zero factor disappear.
 * That removes the table look-ups and short inner loops that dominate low-l classes.
 * Large classes stay with the table-driven loops (the unrolled code would be too long for
 * the JIT to optimize). Where code generation is not allowed (a browser page with a strict
 * content-security policy), every class falls back to the tables.
 */
import type { EriClass } from "./eri-class.ts";

/**
 * (fm, par, pb): fm holds pref·F_0 … pref·F_L; par holds, in this order,
 * PA(xyz), WP(xyz), QC(xyz), WQ(xyz), 1/(2p), ρ/p, 1/(2q), ρ/q, 1/(2(p+q)) — a typed array, so
 * no number is boxed on the call; the function writes the nE × nF primitive block into pb.
 */
export type VrrKernel = (fm: Float64Array, par: Float64Array, pb: Float64Array) => void;

export const PARAM_NAMES = ["pax", "pay", "paz", "wpx", "wpy", "wpz", "qcx", "qcy", "qcz", "wqx", "wqy", "wqz",
  "h2p", "rp", "h2q", "rq", "h2pq"];

/** Classes whose unrolled recurrence has at most this many statements are generated. */
export const MAX_UNROLLED_STATEMENTS = 1400;

let codegenAllowed: boolean | undefined;

function canGenerate(): boolean {
  if (codegenAllowed === undefined) {
    try {
      codegenAllowed = new Function("return 1")() === 1;
    } catch {
      codegenAllowed = false;
    }
  }
  return codegenAllowed;
}

function statementCount(cls: EriClass): number {
  let n = 0;
  for (let o = 0; o < cls.bM.length; o++) n += cls.bM[o];
  for (let o = 0; o < cls.kM.length; o++) n += cls.kM[o];
  return n;
}

const AX = ["x", "y", "z"];

/** The unrolled kernel for a class, or null when it should use the tables. */
export function generateVrr(cls: EriClass): VrrKernel | null {
  if (!canGenerate() || statementCount(cls) > MAX_UNROLLED_STATEMENTS) return null;
  const name = (idx: number) => `v${idx}`; // idx = W index ((f·NE + e)·M + m)
  const lines: string[] = [];
  PARAM_NAMES.forEach((n, i) => lines.push(`const ${n} = par[${i}];`));
  for (let m = 0; m <= cls.L; m++) lines.push(`const ${name(m)} = fm[${m}];`);
  // bra: w[d+m] = c1 w[s+m] + c2 w[s+m+1] + n h2p (w[t+m] − rp w[t+m+1])
  for (let o = 0; o < cls.bDst.length; o++) {
    const ax = AX[cls.bAx[o]];
    const n = cls.bN[o];
    for (let m = 0; m < cls.bM[o]; m++) {
      const d = cls.bDst[o] + m, s = cls.bS1[o] + m, t = cls.bS2[o] + m;
      let e = `pa${ax} * ${name(s)} + wp${ax} * ${name(s + 1)}`;
      if (n !== 0) e += ` + ${n} * h2p * (${name(t)} - rp * ${name(t + 1)})`;
      lines.push(`const ${name(d)} = ${e};`);
    }
  }
  for (let o = 0; o < cls.kDst.length; o++) {
    const ax = AX[cls.kAx[o]];
    const nf = cls.kNf[o];
    const ne = cls.kNe[o];
    for (let m = 0; m < cls.kM[o]; m++) {
      const d = cls.kDst[o] + m, s = cls.kS1[o] + m, t = cls.kS2[o] + m, u = cls.kE1[o] + m + 1;
      let e = `qc${ax} * ${name(s)} + wq${ax} * ${name(s + 1)}`;
      if (nf !== 0) e += ` + ${nf} * h2q * (${name(t)} - rq * ${name(t + 1)})`;
      if (ne !== 0) e += ` + ${ne} * h2pq * ${name(u)}`;
      lines.push(`const ${name(d)} = ${e};`);
    }
  }
  for (let k = 0; k < cls.gather.length; k++) lines.push(`pb[${k}] = ${name(cls.gather[k])};`);
  return new Function("fm", "par", "pb", lines.join("\n")) as VrrKernel;
}
