import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { JSON_SCHEMA_PATH, jsonSchemaText } from "../../src/spec/json-schema.ts";
import { SPEC_SCHEMA, toJsonSchema } from "../../src/spec/schema.ts";

describe("JSON Schema for editors", () => {
  it("the committed file equals the generated one (run: node scripts/write-spec-schema.ts)", () => {
    const committed = readFileSync(new URL(`../../${JSON_SCHEMA_PATH}`, import.meta.url), "utf8");
    expect(committed).toBe(jsonSchemaText());
  });

  it("is draft 2020-12, closed objects, and mirrors the schema's keys", () => {
    const js = toJsonSchema() as Record<string, any>;
    expect(js.$schema).toBe("https://json-schema.org/draft/2020-12/schema");
    expect(js.additionalProperties).toBe(false);
    expect(js.required).toEqual(["fieldbook", "title", "molecule", "model"]);
    expect(Object.keys(js.properties)).toEqual(Object.keys(SPEC_SCHEMA.properties));
    const mol = js.properties.molecule;
    expect(mol.oneOf).toEqual([{ required: ["xyz"] }, { required: ["zmatrix"] }, { required: ["file"] }]);
    expect(mol.properties.multiplicity).toMatchObject({ type: "integer", minimum: 1, default: 1 });
    expect(js.properties.model.properties.reference).toMatchObject({ enum: ["rhf", "uhf", "rohf"], default: "rhf" });
    expect(js.properties.model.properties.basis.oneOf).toHaveLength(3);
    expect(js.properties.convergence.properties.damping).toMatchObject({ minimum: 0, exclusiveMaximum: 1, default: 0 });
    expect(js.properties.checks.items.required).toEqual(["quantity", "expected", "tolerance", "unit", "source"]);
  });

  it("describes every field", () => {
    const walk = (s: Record<string, any>, path: string) => {
      expect(typeof s.description === "string" && s.description.length > 0, path).toBe(true);
      for (const [k, v] of Object.entries(s.properties ?? {})) walk(v as Record<string, any>, `${path}.${k}`);
      if (s.items) walk(s.items, `${path}[]`);
    };
    walk(toJsonSchema() as Record<string, any>, "");
  });
});
