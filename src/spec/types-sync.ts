/**
 * Compile-time proof that the hand-written types in ./types.ts mirror the schema in ./schema.ts.
 * `npm run typecheck` fails here when one changes without the other. (No runtime code.)
 */
import type { Infer, SPEC_SCHEMA, WrittenSpec } from "./schema.ts";
import type { NormalizedSpec, SpecBasis, SpecCheck } from "./types.ts";

type Equal<A, B> = (<T>() => T extends A ? 1 : 2) extends <T>() => T extends B ? 1 : 2 ? true : false;
type Assert<T extends true> = T;

/** Fields computed by the parser rather than copied from the text. */
type Derived = "id" | "molecule";
type MoleculeSettings = "charge" | "multiplicity" | "units";

export type SpecInSync = [
  Assert<Equal<Omit<WrittenSpec, Derived>, Omit<NormalizedSpec, Derived>>>,
  Assert<Equal<Pick<WrittenSpec["molecule"], MoleculeSettings>, Pick<NormalizedSpec["molecule"], MoleculeSettings>>>,
  Assert<Equal<WrittenSpec["model"]["basis"], SpecBasis>>,
  Assert<Equal<WrittenSpec["checks"][number], SpecCheck>>,
  Assert<Equal<WrittenSpec["id"], string | null>>,
  Assert<Equal<Infer<(typeof SPEC_SCHEMA)["properties"]["molecule"]["properties"]["xyz"]>, string | null>>,
];
