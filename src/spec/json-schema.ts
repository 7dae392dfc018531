/** The JSON Schema file for editors: where it lives and its exact text (see scripts/write-spec-schema.ts). */
import { toJsonSchema } from "./schema.ts";

/** Repository-relative path of the generated schema (served as /schemas/fieldbook-spec-1.json). */
export const JSON_SCHEMA_PATH = "public/schemas/fieldbook-spec-1.json";

/** The file's content: toJsonSchema(), two-space indented, with a final newline. */
export function jsonSchemaText(): string {
  return JSON.stringify(toJsonSchema(), null, 2) + "\n";
}
