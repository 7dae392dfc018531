/**
 * Small text helpers shared by the geometry readers: whitespace tokens with their 1-based
 * columns, and a strict decimal-number reader.
 */

import { InputError } from "../errors.ts";
import { angstromToBohr } from "../constants.ts";
import type { LengthUnit } from "./types.ts";

export interface Token {
  text: string;
  /** 1-based column of the first character */
  column: number;
}

/** Whitespace-separated tokens of one line with their 1-based columns. */
export function tokenize(line: string): Token[] {
  const out: Token[] = [];
  const re = /\S+/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(line)) !== null) out.push({ text: m[0], column: m.index + 1 });
  return out;
}

/** Lines of a text (LF, CRLF or CR line ends). */
export function splitLines(text: string): string[] {
  return text.split(/\r\n|\r|\n/);
}

/** 1-based column just past the last non-blank character (where a missing token would go). */
export function endColumn(line: string): number {
  return line.replace(/\s+$/, "").length + 1;
}

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * A decimal number such as 1, -0.5, .25, 1e-3. Returns:
 * a finite number; "not-finite" for NaN / Infinity spellings or overflow; "not-a-number" otherwise.
 */
export function readNumber(text: string): number | "not-finite" | "not-a-number" {
  if (DECIMAL.test(text)) {
    const v = Number(text);
    return Number.isFinite(v) ? v : "not-finite";
  }
  if (/^[+-]?(nan|inf|infinity)$/i.test(text)) return "not-finite";
  return "not-a-number";
}

/** Positive integer written with digits only. */
export function isDigits(text: string): boolean {
  return /^\d+$/.test(text);
}

/** Function that turns a length in `units` into bohr; anything but "angstrom"/"bohr" → InputError "units-unknown". */
export function lengthToBohr(units: LengthUnit, source?: string): (x: number) => number {
  if (units === "bohr") return (x) => x;
  if (units === "angstrom") return angstromToBohr;
  throw new InputError("units-unknown", `unknown length unit ${JSON.stringify(units)}`, {
    hint: `use "angstrom" or "bohr"`,
    where: source === undefined ? {} : { source },
  });
}
