/**
 * User-facing errors of the engine. A user fault (bad geometry, unknown element, a basis set
 * that lacks an element, impossible charge/multiplicity) is an InputError with a stable code,
 * a message that carries the offending values, a hint saying what to do, and, when the input
 * was text, the 1-based line and column. Broken invariants are plain Errors (bugs).
 */
export interface InputLocation {
  /** name of the text the error is in (file name, or a label such as "xyz") */
  source?: string;
  /** 1-based line */
  line?: number;
  /** 1-based column */
  column?: number;
}

export class InputError extends Error {
  readonly code: string;
  readonly hint: string | undefined;
  readonly where: InputLocation;

  constructor(code: string, message: string, options: { hint?: string; where?: InputLocation } = {}) {
    const where = options.where ?? {};
    super(message);
    this.name = "InputError";
    this.code = code;
    this.hint = options.hint;
    this.where = where;
  }

  /** "file:line:col: message (hint)" for terminals and logs. */
  describe(): string {
    const w = this.where;
    const loc = [w.source, w.line, w.column].filter((x) => x !== undefined).join(":");
    return `${loc ? loc + ": " : ""}${this.message}${this.hint ? `\n  hint: ${this.hint}` : ""}`;
  }
}
