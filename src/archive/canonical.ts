/**
 * Canonical JSON: the one byte form of a value that the input hash is taken over.
 *
 * - objects: keys sorted by UTF-16 code units (Array.prototype.sort's default order), no
 *   whitespace; properties whose value is `undefined` are left out (as JSON.stringify does);
 * - arrays: in order; typed arrays (Float64Array, Int32Array, ...) are written as plain arrays;
 * - numbers: the shortest form that round-trips (ECMAScript Number::toString, i.e. what
 *   JSON.stringify writes), with −0 written as 0; NaN and ±Infinity are refused (they have no
 *   JSON form, and silently writing null would let two different inputs hash the same);
 * - strings: JSON.stringify's escaping;
 * - true, false, null as JSON.
 * Anything else (undefined at the top or inside an array, functions, symbols, bigint, Map, Set,
 * Date, class instances other than typed arrays) is refused with a CanonicalJsonError naming the
 * path, so a value that cannot be reproduced from JSON never reaches the hash.
 */

export class CanonicalJsonError extends Error {
  readonly path: string;
  constructor(message: string, path: string) {
    super(`${message} at ${path || "(top)"}`);
    this.name = "CanonicalJsonError";
    this.path = path;
  }
}

function isPlainObject(v: object): boolean {
  const proto = Object.getPrototypeOf(v);
  return proto === Object.prototype || proto === null;
}

function writeNumber(x: number, path: string): string {
  if (!Number.isFinite(x)) throw new CanonicalJsonError(`non-finite number ${String(x)} has no canonical JSON form`, path);
  return Object.is(x, -0) ? "0" : JSON.stringify(x);
}

function write(v: unknown, path: string, seen: Set<object>): string {
  if (v === null) return "null";
  switch (typeof v) {
    case "boolean":
      return v ? "true" : "false";
    case "number":
      return writeNumber(v, path);
    case "string":
      return JSON.stringify(v);
    case "object":
      break;
    default:
      throw new CanonicalJsonError(`a ${typeof v} has no canonical JSON form`, path);
  }
  const o = v as object;
  if (seen.has(o)) throw new CanonicalJsonError("circular reference", path);
  seen.add(o);
  try {
    if (ArrayBuffer.isView(o)) {
      if (o instanceof DataView || typeof (o as unknown as { length?: unknown }).length !== "number") {
        throw new CanonicalJsonError("a DataView has no canonical JSON form", path);
      }
      const arr = o as unknown as ArrayLike<number | bigint>;
      const parts: string[] = [];
      for (let i = 0; i < arr.length; i++) {
        const x = arr[i];
        if (typeof x !== "number") throw new CanonicalJsonError("a bigint has no canonical JSON form", `${path}[${i}]`);
        parts.push(writeNumber(x, `${path}[${i}]`));
      }
      return `[${parts.join(",")}]`;
    }
    if (Array.isArray(o)) {
      const parts: string[] = [];
      for (let i = 0; i < o.length; i++) {
        const item: unknown = o[i];
        if (item === undefined) throw new CanonicalJsonError("undefined (or a hole) in an array", `${path}[${i}]`);
        parts.push(write(item, `${path}[${i}]`, seen));
      }
      return `[${parts.join(",")}]`;
    }
    if (!isPlainObject(o)) {
      const name = (o as { constructor?: { name?: string } }).constructor?.name ?? "object";
      throw new CanonicalJsonError(`a ${name} instance has no canonical JSON form (use plain objects and arrays)`, path);
    }
    const rec = o as Record<string, unknown>;
    const keys = Object.keys(rec).filter((k) => rec[k] !== undefined).sort();
    const parts = keys.map((k) => `${JSON.stringify(k)}:${write(rec[k], path ? `${path}.${k}` : k, seen)}`);
    return `{${parts.join(",")}}`;
  } finally {
    seen.delete(o);
  }
}

/** The canonical JSON text of `value` (see the module comment). Throws CanonicalJsonError. */
export function canonicalJson(value: unknown): string {
  if (value === undefined) throw new CanonicalJsonError("undefined has no canonical JSON form", "");
  return write(value, "", new Set());
}
