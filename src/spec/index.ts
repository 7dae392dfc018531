/** The spec module: YAML spec → NormalizedSpec (located errors), → engine RunInput; the format's schema. */
export { parseSpec, defaultSpecId, MAX_SPEC_CHARS, MAX_ALIAS_COUNT, type ParseOptions, type ParseResult } from "./parse.ts";
export { specToRunInput } from "./to-run-input.ts";
export { formatSpecError, type SpecError } from "./errors.ts";
export { SPEC_SCHEMA, SPEC_FORMAT_VERSION, ID_PATTERN, toJsonSchema, type Infer, type WrittenSpec, type Schema } from "./schema.ts";
export { JSON_SCHEMA_PATH, jsonSchemaText } from "./json-schema.ts";
export { checkRepoPath, type RepoPathResult } from "./paths.ts";
export type { NormalizedSpec, SpecBasis, SpecCheck, SpecReference, SpecCorrelation, SpecHarmonics, CheckQuantity, CheckUnit } from "./types.ts";
