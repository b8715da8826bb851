/**
 * Coded errors of the Lotwise engine. Every failure the engine reports on purpose is an
 * {@link EngineError} with a stable `code`; the server maps codes to HTTP statuses and the CLI to
 * exit messages, so messages may change but codes may not.
 */

/** Stable error codes (SCREAMING_SNAKE). */
export type EngineErrorCode =
  | "INVALID_NETLIST"
  | "INVALID_LIMITS"
  | "INVALID_INPUT"
  | "SINGULAR_MATRIX"
  | "NO_CONVERGENCE"
  | "CANCELLED";

/**
 * An engine failure with a machine-readable code.
 *
 * @param code - stable error code
 * @param message - human-readable message naming the offending part, port, field or frequency
 * @param options.path - where in the input the problem is, e.g. `"parts[2].value"` or `"ports[0].node"`
 * @param options.details - extra data for callers, e.g. `{ freq: 1.2e9 }`
 * @example
 * throw new EngineError("INVALID_NETLIST", "part C3: value must be a finite number > 0", { path: "parts[2].value" });
 */
export class EngineError extends Error {
  readonly code: EngineErrorCode;
  readonly path?: string;
  readonly details?: Record<string, unknown>;

  constructor(code: EngineErrorCode, message: string, options?: { path?: string; details?: Record<string, unknown> }) {
    super(message);
    this.name = "EngineError";
    this.code = code;
    if (options?.path !== undefined) this.path = options.path;
    if (options?.details !== undefined) this.details = options.details;
  }
}

/** True when `err` is an {@link EngineError} (optionally with the given code). */
export function isEngineError(err: unknown, code?: EngineErrorCode): err is EngineError {
  return err instanceof EngineError && (code === undefined || err.code === code);
}
