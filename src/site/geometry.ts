/** Coordinates in ångström and the XYZ download (CODATA 2018 bohr radius from src/engine/constants.ts). */
import type { FieldbookRecord } from "../archive/record.ts";
import { BOHR_RADIUS_ANGSTROM } from "../engine/constants.ts";
import { fixed } from "./format.ts";

export const ANGSTROM_PER_BOHR = BOHR_RADIUS_ANGSTROM;

export interface CoordinateRow {
  index: number;
  symbol: string;
  bohr: [number, number, number];
  angstrom: [number, number, number];
}

export function coordinateRows(r: FieldbookRecord): CoordinateRow[] {
  return r.molecule.atoms.map(([symbol, x, y, z], i) => ({
    index: i + 1, symbol, bohr: [x, y, z], angstrom: [x * ANGSTROM_PER_BOHR, y * ANGSTROM_PER_BOHR, z * ANGSTROM_PER_BOHR],
  }));
}

/** XYZ file text: count, comment line, then "El  x y z" in Å with 10 decimals (ASCII only). */
export function xyzText(r: FieldbookRecord): string {
  const rows = coordinateRows(r);
  const comment = `${r.id} ${r.input_hash} charge=${r.molecule.charge} multiplicity=${r.molecule.multiplicity} units=angstrom (a0 = ${ANGSTROM_PER_BOHR} A, CODATA 2018)`;
  const lines = rows.map((a) => `${a.symbol.padEnd(3)}${a.angstrom.map((v) => fixed(v, 10).padStart(18)).join("")}`);
  return `${rows.length}\n${comment}\n${lines.join("\n")}\n`;
}
