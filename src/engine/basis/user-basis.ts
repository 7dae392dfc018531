/**
 * User-supplied basis files in our own format ("fieldbook-basis/1", see library.ts).
 */
import { InputError } from "../errors.ts";
import { validateBasisSet, BasisValidationError, BASIS_FORMAT } from "./format.ts";
import type { BasisSetData } from "./format.ts";
import { locateJsonPath, lineColumn, findJsonSyntaxError } from "./json-locate.ts";

/**
 * Parse and validate the text of a basis file. Errors are InputErrors naming `sourceName`,
 * with 1-based line and column: code "basis-file-syntax" (not JSON) or "basis-file-invalid"
 * (JSON, but not a valid basis set: the message names the element, shell index and field).
 */
export function parseBasisText(text: string, sourceName: string): BasisSetData {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    const where: { source: string; line?: number; column?: number } = { source: sourceName };
    const found = findJsonSyntaxError(text);
    const msg = found ? found.message : e instanceof Error ? e.message : String(e);
    if (found) Object.assign(where, lineColumn(text, found.offset));
    throw new InputError("basis-file-syntax", `${sourceName}: not valid JSON: ${msg}`, {
      hint: `A basis file is a JSON document in the "${BASIS_FORMAT}" format (see the bundled sets for examples).`,
      where,
    });
  }
  try {
    return validateBasisSet(value);
  } catch (e) {
    if (!(e instanceof BasisValidationError)) throw e;
    const where: { source: string; line?: number; column?: number } = { source: sourceName };
    // the deepest part of the path that can be found in the text
    for (let n = e.path.length; n >= 0; n--) {
      const at = locateJsonPath(text, e.path.slice(0, n));
      if (at !== undefined) {
        Object.assign(where, lineColumn(text, at));
        break;
      }
    }
    throw new InputError("basis-file-invalid", `${sourceName}: ${e.message}`, {
      hint: `Basis files use the "${BASIS_FORMAT}" format: elements -> symbol -> shells [{ l, pure, exponents, coefficients }].`,
      where,
    });
  }
}
