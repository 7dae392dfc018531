#!/usr/bin/env node
/**
 * Developer tool, run once by hand (never at run time, never in tests):
 *   node scripts/import-basis.mjs [reference-folder]
 * Reads the published open basis-set data (Basis Set Exchange open dataset, MolSSI,
 * BSD-3-Clause; default folder ../shared/reference/basis) and writes the project's own
 * format (see src/engine/basis/data/README.md) to src/engine/basis/data/<slug>.json.
 *
 * Conversion rules:
 *  - elements keyed by symbol (H–Kr), in order of atomic number;
 *  - combined shells (l = [0, 1], or [0, 1, 2]) are split into one shell per l with the same
 *    exponents, in the order of the l list, at the same position; the published set has one
 *    coefficient row per l;
 *  - numbers are parseFloat of the published strings (the same doubles);
 *  - pure: the published per-shell flag for l >= 2; false for s and p (published null).
 *  - citations: the published text without its leading key line, one field per line.
 */
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { BASIS_SYMBOLS } from "../src/engine/basis/symbols.ts";

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const refDir = path.resolve(process.argv[2] ?? path.join(repoRoot, "../shared/reference/basis"));
const outDir = path.join(repoRoot, "src/engine/basis/data");

/** name -> [family, role]; the sets bundled with fieldbook */
const SETS = [
  ["STO-3G", "pople", "orbital"],
  ["3-21G", "pople", "orbital"],
  ["6-31G", "pople", "orbital"],
  ["6-31G*", "pople", "orbital"],
  ["6-31G**", "pople", "orbital"],
  ["6-31+G*", "pople", "orbital"],
  ["6-31++G**", "pople", "orbital"],
  ["6-311G**", "pople", "orbital"],
  ["cc-pVDZ", "dunning", "orbital"],
  ["cc-pVTZ", "dunning", "orbital"],
  ["cc-pVQZ", "dunning", "orbital"],
  ["aug-cc-pVDZ", "dunning", "orbital"],
  ["aug-cc-pVTZ", "dunning", "orbital"],
  ["def2-SVP", "karlsruhe", "orbital"],
  ["def2-TZVP", "karlsruhe", "orbital"],
  ["cc-pVDZ-RIFIT", "dunning", "fitting"],
  ["cc-pVTZ-RIFIT", "dunning", "fitting"],
  ["def2-SVP-RIFIT", "karlsruhe", "fitting"],
  ["def2-TZVP-RIFIT", "karlsruhe", "fitting"],
];

/** File slug: lower case; "**" -> "-dp", "*" -> "-d" (the (d,p)/(d) notation); "+" -> "p". */
export function slugOf(name) {
  return name.toLowerCase().replace(/\*\*/g, "-dp").replace(/\*/g, "-d").replace(/\+/g, "p");
}

function num(s, where) {
  if (typeof s !== "string" || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s.trim())) {
    throw new Error(`${where}: not a number: ${JSON.stringify(s)}`);
  }
  return parseFloat(s);
}

function citation(key, text) {
  const lines = text.split("\n");
  if (lines[0].trim() === key) lines.shift();
  const fields = [];
  for (const line of lines) {
    if (!line.trim()) continue;
    const indent = line.length - line.trimStart().length;
    if (fields.length && indent > 4) fields[fields.length - 1] += " " + line.trim();
    else fields.push(line.trim());
  }
  return fields.join("\n");
}

function convert(ref, family, role) {
  const elements = {};
  let nCart = 0;
  let nSph = 0;
  const zs = Object.keys(ref.elements).map(Number).sort((a, b) => a - b);
  for (const z of zs) {
    if (z < 1 || z > BASIS_SYMBOLS.length) continue; // bundle H–Kr only
    const sym = BASIS_SYMBOLS[z - 1];
    const el = ref.elements[String(z)];
    const shells = [];
    el.shells.forEach((sh, i) => {
      const where = `${ref.name} ${sym} shell ${i}`;
      const exponents = sh.exponents.map((s) => num(s, where));
      const rows = sh.coefficients.map((r) => r.map((s) => num(s, where)));
      const ls = sh.l;
      const parts = ls.length === 1 ? [[ls[0], rows]] : ls.map((l, k) => [l, [rows[k]]]);
      if (ls.length > 1 && rows.length !== ls.length) throw new Error(`${where}: combined shell rows != l count`);
      for (const [l, coefficients] of parts) {
        if (l >= 2 && typeof sh.pure !== "boolean") throw new Error(`${where}: l=${l} without pure flag`);
        const pure = l >= 2 ? sh.pure : false;
        if (l >= 2) pure ? nSph++ : nCart++;
        for (const r of coefficients) if (r.length !== exponents.length) throw new Error(`${where}: row length`);
        shells.push({ l, pure, exponents, coefficients });
      }
    });
    elements[sym] = { references: el.references ?? [], shells };
  }
  const used = new Set(Object.values(elements).flatMap((e) => e.references));
  const references = {};
  for (const key of Object.keys(ref.references).sort()) {
    if (used.has(key)) references[key] = citation(key, ref.references[key]);
  }
  for (const key of used) if (!(key in references)) throw new Error(`${ref.name}: reference ${key} has no citation`);
  const harmonics = nCart && nSph ? "mixed" : nSph ? "spherical" : "cartesian";
  return {
    format: "fieldbook-basis/1",
    name: ref.name,
    family,
    role,
    harmonics,
    description: ref.description.replace(/\s+/g, " ").trim(),
    source: "Basis Set Exchange open dataset (MolSSI, BSD-3-Clause), converted by scripts/import-basis.mjs",
    references,
    elements,
  };
}

/** JSON number text that parses back to the same double (including -0). */
function numText(x) {
  if (!Number.isFinite(x)) throw new Error(`non-finite number ${x}`);
  return Object.is(x, -0) ? "-0" : JSON.stringify(x);
}
const arr = (a) => "[" + a.map(numText).join(",") + "]";

/** Compact, diff-friendly layout: one line per shell. */
function serialize(set) {
  const out = [];
  out.push("{");
  for (const k of ["format", "name", "family", "role", "harmonics", "description", "source"]) {
    out.push(`  ${JSON.stringify(k)}: ${JSON.stringify(set[k])},`);
  }
  const refs = Object.entries(set.references).map(([k, v]) => `    ${JSON.stringify(k)}: ${JSON.stringify(v)}`);
  out.push(`  "references": {\n${refs.join(",\n")}\n  },`);
  const els = Object.entries(set.elements).map(([sym, el]) => {
    const shells = el.shells.map(
      (s) =>
        `      {"l":${s.l},"pure":${s.pure},"exponents":${arr(s.exponents)},"coefficients":[${s.coefficients.map(arr).join(",")}]}`,
    );
    return `    ${JSON.stringify(sym)}: {\n      "references": ${JSON.stringify(el.references)},\n      "shells": [\n  ${shells.join(",\n  ")}\n      ]\n    }`;
  });
  out.push(`  "elements": {\n${els.join(",\n")}\n  }`);
  out.push("}");
  return out.join("\n") + "\n";
}

function main() {
  const index = JSON.parse(fs.readFileSync(path.join(refDir, "index.json"), "utf8"));
  const fileOf = new Map(index.map((e) => [e.name, e.file]));
  fs.mkdirSync(outDir, { recursive: true });
  let total = 0;
  for (const [name, family, role] of SETS) {
    const file = fileOf.get(name);
    if (!file) throw new Error(`${name} not in ${refDir}/index.json`);
    const ref = JSON.parse(fs.readFileSync(path.join(refDir, file), "utf8"));
    const set = convert(ref, family, role);
    const text = serialize(set);
    // round trip: what we wrote must read back as exactly what we converted
    const back = JSON.parse(text);
    if (JSON.stringify(back) !== JSON.stringify(set)) throw new Error(`${name}: round trip differs`);
    const outFile = path.join(outDir, slugOf(name) + ".json");
    fs.writeFileSync(outFile, text);
    total += text.length;
    console.log(`${name.padEnd(16)} ${String(Object.keys(set.elements).length).padStart(2)} elements  ${set.harmonics.padEnd(9)} ${(text.length / 1024).toFixed(1)} KB  -> ${path.relative(repoRoot, outFile)}`);
  }
  console.log(`total ${(total / 1024).toFixed(1)} KB`);
}

main();
