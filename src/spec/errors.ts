/**
 * Errors of a spec: each names the file, the 1-based line and column, what was expected, and
 * (usually) how to fix it. `file` is repository-relative: the spec itself, or the geometry or
 * basis file the spec points to when the fault is in there.
 */
export interface SpecError {
  /** stable, kebab-case code (listed in parse.ts) */
  code: string;
  message: string;
  hint?: string;
  file: string;
  /** 1-based */
  line: number;
  /** 1-based */
  column: number;
}

/** "file:line:column: message" and an indented hint line, for terminals and logs. */
export function formatSpecError(e: SpecError): string {
  return `${e.file}:${e.line}:${e.column}: ${e.message} [${e.code}]${e.hint ? `\n  hint: ${e.hint}` : ""}`;
}
