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
import type { ShellPair } from "./shell-pairs.ts";

/**
 * Size limit of an unrolled loop, in estimated bytes of bytecode. V8 does not optimize larger
 * functions (its limit is 60 KiB), and unoptimized straight-line code is far slower than the
 * table-driven loops.
 */
export const MAX_UNROLLED_BYTES = 40000;

let codegenAllowed: boolean | undefined;

export function canGenerate(): boolean {
  if (codegenAllowed === undefined) {
    try {
      codegenAllowed = new Function("return 1")() === 1;
    } catch {
      codegenAllowed = false;
    }
  }
  return codegenAllowed;
}

/**
 * Rough bytecode size: ~60 bytes per recurrence statement, ~25 per accumulation statement
 * (ket rows, and with a general bra its coefficient step over each bra kind's slice).
 */
function estimatedBytes(cls: EriClass, braSeg: boolean, ketSeg: boolean): number {
  let n = 0;
  for (let o = 0; o < cls.bM.length; o++) n += cls.bM[o];
  for (let o = 0; o < cls.kM.length; o++) n += cls.kM[o];
  let acc = 0;
  if (ketSeg) acc = cls.nE * cls.nF;
  else for (const k of cls.ketKinds) acc += cls.nE * k.size;
  if (!braSeg && ketSeg) for (const k of cls.braKinds) acc += k.size * cls.nF;
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
 * The whole primitive contraction of one quartet, unrolled for one class and one pair of
 * contraction types: for every bra primitive pair, the loop over the ket's primitive pairs
 * with the Boys function (the evaluation of boys.ts, inlined for this L), the vertical
 * recurrences and the accumulation, then the bra's contraction coefficients. One call per
 * quartet; every call site inside is monomorphic.
 *
 * acc[(rab · nrcd + rcd) · blk …] receives, for each row combination, its kinds' slice
 * [e of the bra kind][f of the ket kind] (the layout finishRows in eri.ts reads). tmp holds
 * per-bra-primitive partial sums over ket rows when the bra is a general contraction.
 * Primitive quartets with bound_ab · bound_cd / √(p+q) < cut are skipped (0 keeps all).
 */
export type Contraction = (bra: ShellPair, ket: ShellPair, cut: number, acc: Float64Array, tmp: Float64Array) => void;

/** Classes up to this L evaluate every Boys order by its own Taylor series (no e^−T). */
const BOYS_OWN_TAYLOR = 2;

/** Above this many block entries a bra-general contraction sums into tmp instead of locals. */
const MAX_LOCAL_SUMS = 48;

/** Generated contractions per class (classes are cached, so this is per process). */
const made = new WeakMap<EriClass, (Contraction | null | undefined)[]>();

/** The unrolled contraction of a class, made on first use; null for classes too large. */
export function generateContraction(cls: EriClass, braSeg: boolean, ketSeg: boolean): Contraction | null {
  let m = made.get(cls);
  if (m === undefined) made.set(cls, (m = [undefined, undefined, undefined, undefined]));
  const v = (braSeg ? 2 : 0) + (ketSeg ? 1 : 0);
  let c = m[v];
  if (c === undefined) m[v] = c = makeContraction(cls, braSeg, ketSeg);
  return c;
}

function makeContraction(cls: EriClass, braSeg: boolean, ketSeg: boolean): Contraction | null {
  if (!canGenerate() || estimatedBytes(cls, braSeg, ketSeg) > MAX_UNROLLED_BYTES) return null;
  // a segmented side has shells of one l each, hence one kind starting at 0
  if ((braSeg && cls.braKinds.length !== 1) || (ketSeg && cls.ketKinds.length !== 1)) return null;
  const L = cls.L;
  const B = BOYS_TABLE;
  const name = (idx: number) => `v${idx}`;
  const blk = cls.gather.length;
  const nE = cls.nE, nF = cls.nF;
  const locals = !braSeg && ketSeg && blk <= MAX_LOCAL_SUMS;
  const src: string[] = [];
  src.push("const nb = bra.nprim, bP = bra.p, bK = bra.k, bPc = bra.pc, bPa = bra.pa, bBd = bra.bound;");
  src.push("const nk = ket.nprim, kp = ket.p, kpc = ket.pc, kk = ket.k, kb = ket.bound;");
  src.push("const Cx = ket.a.x, Cy = ket.a.y, Cz = ket.a.z, kmax = ket.maxBound, kminp = ket.minP;");
  if (!ketSeg) src.push("const kStart = ket.comboStart, kRow = ket.comboRow, kCoef = ket.comboCoef, rowKind = ket.rowKind;");
  if (!braSeg) {
    src.push("const bStart = bra.comboStart, bRow = bra.comboRow, bCoef = bra.comboCoef, bKind = bra.rowKind;");
    src.push(`const nrcd = ket.nrows, nt = nrcd * ${blk}, kRK = ket.rowKind;`);
  }
  // bra-general sums go to tmp (or locals); otherwise straight into acc
  const target = braSeg ? "acc" : "tmp";
  src.push("for (let i = 0; i < nb; i++) {");
  src.push("const bb = bBd[i], p = bP[i];");
  src.push("if (bb * kmax < cut * Math.sqrt(p + kminp)) continue;");
  src.push("const lim = cut / bb, kab = bK[i];");
  src.push("const Px = bPc[3 * i], Py = bPc[3 * i + 1], Pz = bPc[3 * i + 2];");
  src.push("const pax = bPa[3 * i], pay = bPa[3 * i + 1], paz = bPa[3 * i + 2];");
  src.push("const h2p = 0.5 / p;");
  if (locals) src.push(`let ${Array.from({ length: blk }, (_, k) => `s${k} = 0`).join(", ")};`);
  else if (!braSeg) src.push("for (let k = 0; k < nt; k++) tmp[k] = 0;");
  src.push("for (let j = 0; j < nk; j++) {");
  src.push("const q = kp[j];");
  src.push("const ipq = 1 / (p + q), sq = Math.sqrt(ipq);");
  src.push("if (kb[j] * sq < lim) continue;");
  src.push("const Qx = kpc[3 * j], Qy = kpc[3 * j + 1], Qz = kpc[3 * j + 2], rho = p * q * ipq;");
  src.push("const dx = Px - Qx, dy = Py - Qy, dz = Pz - Qz;");
  src.push("const T = rho * (dx * dx + dy * dy + dz * dz);");
  src.push("const pref = kab * kk[j] * sq;");
  // Boys F_0..F_L, as boys.ts evaluates it, except: up to L = BOYS_OWN_TAYLOR each order takes
  // its own Taylor series from the table (independent chains the CPU overlaps, where the
  // downward recursion needs e^−T, a call that costs more than the chains); and beyond the
  // table (T ≥ 64) the upward recursion drops e^−T < 2e−28, below 1e−16 of F_m for m ≤ 8
  for (let m = 0; m <= L; m++) src.push(`let f${m};`);
  src.push(`if (T < ${B.tTable}) {`);
  src.push(`const g = Math.round(T * ${1 / B.step}), d = g * ${B.step} - T, b = g * ${B.orders};`);
  const taylor = (m: number) => {
    let h = `grid[b + ${m + B.terms - 1}] * ${B.invFact[B.terms - 1]}`;
    for (let k = B.terms - 2; k >= 0; k--) h = `(${h}) * d + grid[b + ${m + k}] * ${B.invFact[k]}`;
    return h;
  };
  if (L <= BOYS_OWN_TAYLOR) {
    for (let m = 0; m <= L; m++) src.push(`f${m} = ${taylor(m)};`);
  } else {
    src.push(`f${L} = ${taylor(L)};`);
    src.push("const e = Math.exp(-T), t2 = 2 * T;");
    for (let m = L - 1; m >= 0; m--) src.push(`f${m} = (t2 * f${m + 1} + e) * ${1 / (2 * m + 1)};`);
  }
  src.push("} else {");
  src.push(`f0 = ${B.halfSqrtPi} / Math.sqrt(T);`);
  if (L > 0) {
    if (L <= 8) {
      src.push("const i2t = 0.5 / T;");
      for (let m = 0; m < L; m++) src.push(`f${m + 1} = ${2 * m + 1} * f${m} * i2t;`);
    } else {
      src.push("const e = Math.exp(-T), i2t = 0.5 / T;");
      for (let m = 0; m < L; m++) src.push(`f${m + 1} = (${2 * m + 1} * f${m} - e) * i2t;`);
    }
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
  if (ketSeg) {
    for (let k = 0; k < blk; k++) {
      if (locals) src.push(`s${k} += ${name(cls.gather[k])};`);
      else src.push(`${target}[${k}] += ${name(cls.gather[k])};`);
    }
  } else {
    src.push("for (let c = kStart[j]; c < kStart[j + 1]; c++) {");
    src.push(`const cf = kCoef[c], r = kRow[c], o = r * ${blk};`);
    const kinds = cls.ketKinds;
    if (kinds.length > 1) src.push("switch (rowKind[r]) {");
    kinds.forEach((kind, ki) => {
      if (kinds.length > 1) src.push(`case ${ki}: {`);
      for (let e = 0; e < nE; e++)
        for (let f = 0; f < kind.size; f++)
          src.push(`${target}[o + ${e * kind.size + f}] += cf * ${name(cls.gather[e * nF + kind.start + f])};`);
      if (kinds.length > 1) src.push("break; }");
    });
    if (kinds.length > 1) src.push("}");
    src.push("}");
  }
  src.push("}"); // ket primitives
  if (!braSeg) {
    // the bra's coefficients: acc[rab][rcd] += c · (bra kind's e slice of the sums of row rcd)
    src.push("for (let c = bStart[i]; c < bStart[i + 1]; c++) {");
    src.push("const cf = bCoef[c], rab = bRow[c];");
    const bk = cls.braKinds;
    if (bk.length > 1) src.push("switch (bKind[rab]) {");
    bk.forEach((kind, ki) => {
      if (bk.length > 1) src.push(`case ${ki}: {`);
      if (locals) {
        // one ket row of nF entries
        src.push(`const o = rab * ${blk};`);
        for (let e = 0; e < kind.size; e++)
          for (let f = 0; f < nF; f++) src.push(`acc[o + ${e * nF + f}] += cf * s${(kind.start + e) * nF + f};`);
      } else {
        src.push("for (let rcd = 0; rcd < nrcd; rcd++) {");
        src.push(`const fs = ketSizes[kRK[rcd]], sO = rcd * ${blk} + ${kind.start} * fs, dO = (rab * nrcd + rcd) * ${blk}, n = ${kind.size} * fs;`);
        src.push("for (let k = 0; k < n; k++) acc[dO + k] += cf * tmp[sO + k];");
        src.push("}");
      }
      if (bk.length > 1) src.push("break; }");
    });
    if (bk.length > 1) src.push("}");
    src.push("}");
  }
  src.push("}"); // bra primitives
  const ketSizes = Int32Array.from(cls.ketKinds, (k) => k.size);
  const f = new Function("grid", "ketSizes", `return function contraction(bra, ket, cut, acc, tmp) {\n${src.join("\n")}\n};`);
  return f(B.grid, ketSizes) as Contraction;
}
