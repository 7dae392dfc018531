/**
 * Conformance of the bundled basis library with the published open data it was converted
 * from (Basis Set Exchange open dataset, MolSSI, BSD-3-Clause), when that data is present at
 * ../shared/reference/basis (outside the repository). Every exponent and every contraction
 * coefficient must be the same double as parseFloat of the published string.
 */
import { describe, it, expect } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { listBasisSets, getBasisSet } from "../../../src/engine/basis/library.ts";
import { BASIS_SYMBOLS } from "../../../src/engine/basis/symbols.ts";

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../..");
const refDir = path.resolve(repoRoot, "../shared/reference/basis");
const present = fs.existsSync(path.join(refDir, "index.json"));
if (!present) console.warn(`basis conformance tests skipped: published reference data not found at ${refDir}`);

interface RefShell {
  l: number[];
  pure: boolean | null;
  exponents: string[];
  coefficients: string[][];
}
interface RefSet {
  name: string;
  elements: Record<string, { shells: RefShell[]; references: string[] }>;
  references: Record<string, string>;
}

function loadRef(name: string): RefSet {
  const index = JSON.parse(fs.readFileSync(path.join(refDir, "index.json"), "utf8")) as { name: string; file: string }[];
  const entry = index.find((e) => e.name === name);
  if (!entry) throw new Error(`${name} not in ${refDir}/index.json`);
  return JSON.parse(fs.readFileSync(path.join(refDir, entry.file), "utf8")) as RefSet;
}

/** Published shells with combined shells split into one per l (coefficient row k for l[k]). */
function splitShells(shells: RefShell[]) {
  return shells.flatMap((s) =>
    s.l.length === 1
      ? [{ l: s.l[0], pure: s.pure, exponents: s.exponents, coefficients: s.coefficients }]
      : s.l.map((l, k) => ({ l, pure: s.pure, exponents: s.exponents, coefficients: [s.coefficients[k]] })),
  );
}

const collapse = (t: string) => t.replace(/\s+/g, " ").trim();

describe.skipIf(!present)("the bundled basis library conforms to the published data", () => {
  for (const summary of listBasisSets()) {
    describe(summary.name, () => {
      const ours = getBasisSet(summary.name);
      const ref = present ? loadRef(summary.name) : undefined;

      it("defines exactly the elements H–Kr that the published set defines", () => {
        const expected = Object.keys(ref!.elements)
          .map(Number)
          .filter((z) => z >= 1 && z <= 36)
          .sort((a, b) => a - b)
          .map((z) => BASIS_SYMBOLS[z - 1]);
        expect(Object.keys(ours.elements)).toEqual(expected);
      });

      it("has every exponent and contraction coefficient equal to the published value, shell by shell", () => {
        let checked = 0;
        for (const [sym, el] of Object.entries(ours.elements)) {
          const z = BASIS_SYMBOLS.indexOf(sym) + 1;
          const refShells = splitShells(ref!.elements[String(z)].shells);
          expect(el.shells.length, `${sym}: number of shells`).toBe(refShells.length);
          el.shells.forEach((sh, i) => {
            const rs = refShells[i];
            const at = `${summary.name} ${sym} shell ${i}`;
            expect(sh.l, `${at}: l`).toBe(rs.l);
            expect(sh.pure, `${at}: pure`).toBe(rs.l >= 2 ? rs.pure : false);
            expect(sh.exponents, `${at}: exponents`).toEqual(rs.exponents.map((s) => parseFloat(s)));
            expect(sh.coefficients, `${at}: coefficients`).toEqual(rs.coefficients.map((r) => r.map((s) => parseFloat(s))));
            checked += sh.exponents.length * (1 + sh.coefficients.length);
          });
        }
        expect(checked).toBeGreaterThan(0);
      });

      it("cites the published references for each element and for the set", () => {
        for (const [sym, el] of Object.entries(ours.elements)) {
          const z = BASIS_SYMBOLS.indexOf(sym) + 1;
          expect(el.references, `${sym} references`).toEqual(ref!.elements[String(z)].references);
        }
        expect(Object.keys(ours.references).sort()).toEqual(Object.keys(ref!.references).sort());
        for (const [key, text] of Object.entries(ours.references)) {
          // ours: the published text without its leading key line, one field per line
          const published = ref!.references[key].replace(new RegExp(`^\\s*${key}\\s*\\n`), "");
          expect(collapse(text), key).toBe(collapse(published));
        }
      });
    });
  }
});
