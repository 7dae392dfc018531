/** Shared spec texts and a fake repository for the spec tests. */

/** Water at a fixed geometry (illustrative numbers, not a published structure), STO-3G. */
export const WATER = `fieldbook: 1
title: Water monomer
molecule:
  xyz: |
    O   0.000000   0.000000   0.117300
    H   0.000000   0.757200  -0.469200
    H   0.000000  -0.757200  -0.469200
model:
  basis: sto-3g
`;

/** Replace the lines of `text` matching `from` (a line, exactly) with `to` (one or more lines). */
export function edit(text: string, from: string, to: string): string {
  const lines = text.split("\n");
  const i = lines.indexOf(from);
  if (i < 0) throw new Error(`fixture: no line ${JSON.stringify(from)}`);
  lines.splice(i, 1, ...to.split("\n"));
  return lines.join("\n");
}

/** A few repository files for molecule.file / model.basis.file. */
export const REPO: Record<string, string> = {
  "geometries/h2.xyz": "2\nhydrogen molecule\nH 0 0 0\nH 0 0 0.74\n",
  "geometries/bad.xyz": "2\nbroken\nH 0 0 0\nH 0 0 zero\n",
  "geometries/water.zmat": "O\nH 1 r\nH 1 r 2 a\n\nr = 0.9572\na = 104.52\n",
};

export function readRepo(path: string): string {
  const t = REPO[path];
  if (t === undefined) throw new Error(`no such file: ${path}`);
  return t;
}

import { getBasisSet } from "../../src/engine/basis/index.ts";

/** A user basis file: the bundled STO-3G hydrogen only, under another name. */
const sto = getBasisSet("sto-3g");
REPO["basis/h-only.json"] = JSON.stringify(
  { ...sto, name: "STO-3G (H only)", family: "user", elements: { H: sto.elements.H } },
  null,
  2,
);
REPO["basis/broken.json"] = '{\n  "format": "fieldbook-basis/1",\n  "name": "x",\n  "elements": {\n';
