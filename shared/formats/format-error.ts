/**
 * Coded errors of the Lotwise file readers and writers (Touchstone, parts CSV). A bad upload becomes
 * a {@link FormatError} naming the 1-based line and the field, so the server can answer 400 with
 * "line 7: S21 angle: not a number ("1.2.3")" and store nothing.
 */

/**
 * Stable error codes: `INVALID_FILE` for text that does not follow the format, `INVALID_INPUT` for
 * bad arguments to a writer (a programming error of the caller, not of a user's file).
 */
export type FormatErrorCode = "INVALID_FILE" | "INVALID_INPUT";

/**
 * A file that cannot be read (or data that cannot be written).
 *
 * The message starts with "line N: field: " when both are known, so it reads well on its own.
 *
 * @param code - stable error code
 * @param reason - what is wrong, without the line/field prefix, e.g. `not a number ("1.2.3")`
 * @param options.line - 1-based line number in the file
 * @param options.field - which field, e.g. "frequency", "S21 angle", "option line", "value"
 * @example
 * throw new FormatError("INVALID_FILE", 'not a number ("1.2.3")', { line: 7, field: "S21 angle" });
 * // message: line 7: S21 angle: not a number ("1.2.3")
 */
export class FormatError extends Error {
  readonly code: FormatErrorCode;
  readonly line?: number;
  readonly field?: string;
  /** The reason alone, without the "line N: field: " prefix. */
  readonly reason: string;

  constructor(code: FormatErrorCode, reason: string, options?: { line?: number; field?: string }) {
    super(prefix(options?.line, options?.field) + reason);
    this.name = "FormatError";
    this.code = code;
    this.reason = reason;
    if (options?.line !== undefined) this.line = options.line;
    if (options?.field !== undefined) this.field = options.field;
  }
}

/** True when `err` is a {@link FormatError} (optionally with the given code). */
export function isFormatError(err: unknown, code?: FormatErrorCode): err is FormatError {
  return err instanceof FormatError && (code === undefined || err.code === code);
}

/** Shorthand for an `INVALID_FILE` error at a line and field. */
export function fileError(reason: string, line?: number, field?: string): FormatError {
  return new FormatError("INVALID_FILE", reason, { line, field });
}

function prefix(line?: number, field?: string): string {
  return (line === undefined ? "" : `line ${line}: `) + (field === undefined ? "" : `${field}: `);
}
