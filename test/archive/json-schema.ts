/**
 * A small JSON Schema (draft 2020-12) validator for the subset of keywords our schemas use:
 * $ref (local "#/$defs/..."), type (incl. "integer", arrays of types), const, enum, properties,
 * required, additionalProperties, items, prefixItems, minItems, maxItems, minimum, pattern,
 * allOf, anyOf, oneOf, if/then/else and boolean schemas. Any other keyword is refused, so the
 * schema cannot silently rely on something this validator ignores. (No JSON Schema library is
 * installed; this keeps the tests dependency-free.)
 */
type Schema = boolean | { [k: string]: unknown };

const ANNOTATIONS = new Set(["$schema", "$id", "title", "description", "$defs", "$comment", "examples", "default"]);
const KEYWORDS = new Set([
  "$ref", "type", "const", "enum", "properties", "required", "additionalProperties", "items", "prefixItems",
  "minItems", "maxItems", "minimum", "pattern", "allOf", "anyOf", "oneOf", "if", "then", "else",
]);

function typeOf(v: unknown): string {
  if (v === null) return "null";
  if (Array.isArray(v)) return "array";
  return typeof v;
}

function hasType(v: unknown, t: string): boolean {
  if (t === "integer") return typeof v === "number" && Number.isInteger(v);
  if (t === "number") return typeof v === "number" && Number.isFinite(v);
  return typeOf(v) === t;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

export function validate(root: Schema, value: unknown): string[] {
  const errors: string[] = [];
  const resolve = (ref: string): Schema => {
    if (!ref.startsWith("#/")) throw new Error(`unsupported $ref ${ref}`);
    let s: unknown = root;
    for (const part of ref.slice(2).split("/")) s = (s as Record<string, unknown>)[part];
    if (s === undefined) throw new Error(`unresolved $ref ${ref}`);
    return s as Schema;
  };
  const check = (schema: Schema, v: unknown, at: string, out: string[]): void => {
    if (schema === true) return;
    if (schema === false) {
      out.push(`${at}: not allowed`);
      return;
    }
    for (const k of Object.keys(schema)) {
      if (!KEYWORDS.has(k) && !ANNOTATIONS.has(k)) throw new Error(`json-schema.ts does not support keyword "${k}" (at schema for ${at})`);
    }
    const s = schema as Record<string, unknown>;
    if (s.$ref !== undefined) check(resolve(s.$ref as string), v, at, out);
    if (s.type !== undefined) {
      const types = Array.isArray(s.type) ? (s.type as string[]) : [s.type as string];
      if (!types.some((t) => hasType(v, t))) {
        out.push(`${at}: expected ${types.join("|")}, got ${typeOf(v)}${typeof v === "number" ? ` ${v}` : ""}`);
        return;
      }
    }
    if (s.const !== undefined && !same(s.const, v)) out.push(`${at}: expected ${JSON.stringify(s.const)}, got ${JSON.stringify(v)}`);
    if (s.enum !== undefined && !(s.enum as unknown[]).some((e) => same(e, v))) out.push(`${at}: ${JSON.stringify(v)} not in ${JSON.stringify(s.enum)}`);
    if (typeof v === "number" && typeof s.minimum === "number" && v < s.minimum) out.push(`${at}: ${v} < minimum ${s.minimum}`);
    if (typeof v === "string" && typeof s.pattern === "string" && !new RegExp(s.pattern, "u").test(v)) out.push(`${at}: ${JSON.stringify(v)} does not match ${s.pattern}`);
    if (Array.isArray(v)) {
      if (typeof s.minItems === "number" && v.length < s.minItems) out.push(`${at}: fewer than ${s.minItems} items`);
      if (typeof s.maxItems === "number" && v.length > s.maxItems) out.push(`${at}: more than ${s.maxItems} items`);
      const prefix = (s.prefixItems as Schema[] | undefined) ?? [];
      v.forEach((item, i) => {
        if (i < prefix.length) check(prefix[i], item, `${at}[${i}]`, out);
        else if (s.items !== undefined) check(s.items as Schema, item, `${at}[${i}]`, out);
      });
    }
    if (typeOf(v) === "object") {
      const o = v as Record<string, unknown>;
      for (const r of (s.required as string[] | undefined) ?? []) if (!(r in o)) out.push(`${at}: missing "${r}"`);
      const props = (s.properties as Record<string, Schema> | undefined) ?? {};
      for (const [k, x] of Object.entries(o)) {
        if (k in props) check(props[k], x, `${at}.${k}`, out);
        else if (s.additionalProperties !== undefined) check(s.additionalProperties as Schema, x, `${at}.${k}`, out);
      }
    }
    for (const sub of (s.allOf as Schema[] | undefined) ?? []) check(sub, v, at, out);
    if (s.anyOf !== undefined) {
      const ok = (s.anyOf as Schema[]).some((sub) => {
        const e: string[] = [];
        check(sub, v, at, e);
        return e.length === 0;
      });
      if (!ok) out.push(`${at}: matches none of anyOf`);
    }
    if (s.oneOf !== undefined) {
      const results = (s.oneOf as Schema[]).map((sub) => {
        const e: string[] = [];
        check(sub, v, at, e);
        return e;
      });
      const n = results.filter((e) => e.length === 0).length;
      if (n !== 1) out.push(`${at}: matches ${n} of oneOf (${results.map((e) => e[0] ?? "ok").join(" / ")})`);
    }
    if (s.if !== undefined) {
      const e: string[] = [];
      check(s.if as Schema, v, at, e);
      if (e.length === 0) {
        if (s.then !== undefined) check(s.then as Schema, v, at, out);
      } else if (s.else !== undefined) check(s.else as Schema, v, at, out);
    }
  };
  check(root, value, "$", errors);
  return errors;
}
