/**
 * Writes public/schemas/fieldbook-spec-1.json, the spec format as a JSON Schema (draft 2020-12)
 * for editors, from src/spec/schema.ts. Run after changing the schema:
 *   node scripts/write-spec-schema.ts
 * test/spec/json-schema.test.ts fails while the committed file is stale.
 */
import { writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { JSON_SCHEMA_PATH, jsonSchemaText } from "../src/spec/json-schema.ts";

const target = fileURLToPath(new URL(`../${JSON_SCHEMA_PATH}`, import.meta.url));
writeFileSync(target, jsonSchemaText());
console.log(`wrote ${JSON_SCHEMA_PATH}`);
