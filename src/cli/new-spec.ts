/**
 * `fieldbook new`: a spec to start from, written from an XYZ file with sensible defaults that
 * the user then edits: a closed shell gets RHF, an odd electron count UHF with the lowest
 * multiplicity; cc-pVDZ; no correlation; the geometry inline so the spec stands alone.
 */
import { electronCount, hillFormula, parseXyz } from "../engine/molecule.ts";

export interface NewSpecOptions {
  title?: string;
  charge?: number;
  basis?: string;
}

export function newSpecText(xyzText: string, xyzName: string, options: NewSpecOptions = {}): string {
  const geo = parseXyz(xyzText, { units: "angstrom", source: xyzName });
  const charge = options.charge ?? 0;
  const electrons = electronCount({ atoms: geo.atoms, charge, multiplicity: 1 });
  const multiplicity = electrons % 2 === 0 ? 1 : 2;
  const formula = hillFormula({ atoms: geo.atoms });
  // keep the coordinates exactly as the user wrote them
  const lines = xyzText.split(/\r?\n/);
  const atomLines = geo.lines.map((l) => lines[l - 1].trim());
  const title = options.title ?? `${formula} from ${xyzName}`;
  return [
    "fieldbook: 1",
    `title: ${JSON.stringify(title)}`,
    "authors: []",
    "tags: []",
    "molecule:",
    `  charge: ${charge}`,
    `  multiplicity: ${multiplicity}`,
    "  units: angstrom",
    "  xyz: |",
    ...atomLines.map((l) => `    ${l}`),
    "model:",
    `  reference: ${multiplicity === 1 ? "rhf" : "uhf"}`,
    "  correlation: none",
    `  basis: ${options.basis ?? "cc-pVDZ"}`,
    "",
  ].join("\n");
}
