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
import { BOYS_TABLE } from "./boys.ts";
import type { EriClass } from "./eri-class.ts";

/**
 * Size limit of an unrolled loop, in estimated bytes of bytecode. V8 does not optimize larger
 * functions (its limit is 60 KiB), and unoptimized straight-line code is far slower than the
 * table-driven loops.
 */
export const MAX_UNROLLED_BYTES = 40000;

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

/** Rough bytecode size: ~60 bytes per recurrence statement, ~25 per accumulation statement. */
function estimatedBytes(cls: EriClass, segmented: boolean): number {
  let n = 0;
  for (let o = 0; o < cls.bM.length; o++) n += cls.bM[o];
  for (let o = 0; o < cls.kM.length; o++) n += cls.kM[o];
  let acc = 0;
  if (segmented) acc = cls.nE * cls.nF;
  else for (const k of cls.ketKinds) acc += cls.nE * k.size;
  return 60 * n + 25 * acc;
}

const AX = ["x", "y", "z"];

/** Statements of both vertical recurrences; v<index> is the W entry of that index (eri-class.ts). */
function recurrenceLines(cls: EriClass, name: (idx: number) => string): string[] {
  const lines: string[] = [];
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
  return lines;
}

/**
 * The whole inner loop over the ket's primitive pairs for one bra primitive pair, unrolled
 * for one class: Boys function (the evaluation of boys.ts, inlined for this L), vertical
 * recurrences, and accumulation. One call per bra primitive pair instead of several calls
 * per primitive quartet, and every call site inside is monomorphic.
 *
 * bp = [p, K_ab, Px, Py, Pz, PAx, PAy, PAz, Cx, Cy, Cz, lim] (C: the ket's first centre).
 * Primitive quartets with kb[j] / √(p+q) < lim are skipped (lim = cutoff / bra bound; 0 keeps all).
 * Segmented ket (`segmented`): out[k] += block. Otherwise, for each combo c of ket primitive
 * pair j, with row r = kRow[c] of kind rowKind[r]: out[r · blk + e · fs + f] += coef_c ·
 * block[e][f0 + f] over the kind's f slice (f0, fs).
 */
export type KetLoop = (
  bp: Float64Array, nk: number, kp: Float64Array, kpc: Float64Array, kk: Float64Array, kb: Float64Array,
  kStart: Int32Array, kRow: Int32Array, kCoef: Float64Array, rowKind: Int32Array, out: Float64Array,
) => void;

export function generateKetLoop(cls: EriClass, segmented: boolean): KetLoop | null {
  if (!canGenerate() || estimatedBytes(cls, segmented) > MAX_UNROLLED_BYTES) return null;
  const L = cls.L;
  const B = BOYS_TABLE;
  const name = (idx: number) => `v${idx}`;
  const src: string[] = [];
  src.push("const p = bp[0], kab = bp[1], Px = bp[2], Py = bp[3], Pz = bp[4];");
  src.push("const pax = bp[5], pay = bp[6], paz = bp[7], Cx = bp[8], Cy = bp[9], Cz = bp[10], lim = bp[11];");
  src.push("const h2p = 0.5 / p;");
  src.push("for (let j = 0; j < nk; j++) {");
  src.push("const q = kp[j];");
  src.push("const ipq = 1 / (p + q), sq = Math.sqrt(ipq);");
  src.push("if (kb[j] * sq < lim) continue;");
  src.push("const Qx = kpc[3 * j], Qy = kpc[3 * j + 1], Qz = kpc[3 * j + 2], rho = p * q * ipq;");
  src.push("const dx = Px - Qx, dy = Py - Qy, dz = Pz - Qz;");
  src.push("const T = rho * (dx * dx + dy * dy + dz * dz);");
  src.push("const pref = kab * kk[j] * sq;");
  // Boys F_0..F_L, as boys.ts evaluates it
  for (let m = 0; m <= L; m++) src.push(`let f${m};`);
  src.push(`if (T < ${B.tTable}) {`);
  src.push(`const g = Math.round(T * ${1 / B.step}), d = g * ${B.step} - T, b = g * ${B.orders} + ${L};`);
  let horner = `grid[b + ${B.terms - 1}] * ${B.invFact[B.terms - 1]}`;
  for (let k = B.terms - 2; k >= 0; k--) horner = `(${horner}) * d + grid[b + ${k}] * ${B.invFact[k]}`;
  src.push(`f${L} = ${horner};`);
  if (L > 0) {
    src.push("const e = Math.exp(-T), t2 = 2 * T;");
    for (let m = L - 1; m >= 0; m--) src.push(`f${m} = (t2 * f${m + 1} + e) * ${1 / (2 * m + 1)};`);
  }
  src.push("} else {");
  src.push(`f0 = ${B.halfSqrtPi} / Math.sqrt(T);`);
  if (L > 0) {
    src.push("const e = Math.exp(-T), i2t = 0.5 / T;");
    for (let m = 0; m < L; m++) src.push(`f${m + 1} = (${2 * m + 1} * f${m} - e) * i2t;`);
  }
  src.push("}");
  for (let m = 0; m <= L; m++) src.push(`const ${name(m)} = pref * f${m};`);
  if (L > 0) {
    src.push("const Wx = (p * Px + q * Qx) * ipq, Wy = (p * Py + q * Qy) * ipq, Wz = (p * Pz + q * Qz) * ipq;");
    src.push("const wpx = Wx - Px, wpy = Wy - Py, wpz = Wz - Pz, wqx = Wx - Qx, wqy = Wy - Qy, wqz = Wz - Qz;");
    src.push("const qcx = Qx - Cx, qcy = Qy - Cy, qcz = Qz - Cz;");
    src.push("const rp = rho / p, h2q = 0.5 / q, rq = rho / q, h2pq = 0.5 * ipq;");
  }
  src.push(...recurrenceLines(cls, name));
  const blk = cls.gather.length;
  if (segmented) {
    for (let k = 0; k < blk; k++) src.push(`out[${k}] += ${name(cls.gather[k])};`);
  } else {
    src.push("for (let c = kStart[j]; c < kStart[j + 1]; c++) {");
    src.push(`const cf = kCoef[c], r = kRow[c], o = r * ${blk};`);
    const kinds = cls.ketKinds;
    if (kinds.length > 1) src.push("switch (rowKind[r]) {");
    kinds.forEach((kind, ki) => {
      if (kinds.length > 1) src.push(`case ${ki}: {`);
      for (let e = 0; e < cls.nE; e++)
        for (let f = 0; f < kind.size; f++)
          src.push(`out[o + ${e * kind.size + f}] += cf * ${name(cls.gather[e * cls.nF + kind.start + f])};`);
      if (kinds.length > 1) src.push("break; }");
    });
    if (kinds.length > 1) src.push("}");
    src.push("}");
  }
  src.push("}");
  const f = new Function("grid", `return function ketLoop(bp, nk, kp, kpc, kk, kb, kStart, kRow, kCoef, rowKind, out) {\n${src.join("\n")}\n};`);
  return f(B.grid) as KetLoop;
}
