/** Stable error codes of the Lotwise API; the client switches on these, never on messages. */
export const ERROR_CODES = {
  VALIDATION_FAILED: 400,
  INVALID_JSON: 400,
  TOKEN_INVALID: 400,
  INVALID_NETLIST: 400,
  INVALID_LIMITS: 400,
  INVALID_INPUT: 400,
  SINGULAR_MATRIX: 400,
  NO_CONVERGENCE: 400,
  UNAUTHENTICATED: 401,
  INVALID_CREDENTIALS: 401,
  FORBIDDEN: 403,
  ORIGIN_MISMATCH: 403,
  NOT_FOUND: 404,
  ALREADY_MEMBER: 409,
  LAST_ADMIN: 409,
  CONFLICT: 409,
  PAYLOAD_TOO_LARGE: 413,
  RATE_LIMITED: 429,
  INTERNAL: 500,
  MAIL_FAILED: 502,
  DATABASE_UNAVAILABLE: 503,
  // history, comments, review, grade sweeps (engineer H2)
  REVIEW_STATE: 409,
  // designs, revisions, uploads, limits and grades (engineer G)
  REVISION_LOCKED: 409,
  INVALID_FILE: 400,
  GRADE_EXISTS: 409,
  // runs, run queue and exports (engineer H1): cancelling a run that has already ended
  RUN_FINISHED: 409,
  // trust: compute limits, exports of runs that are not done, exports past their time budget
  RUN_TOO_COSTLY: 400,
  RUN_NOT_DONE: 409,
  EXPORT_TIMEOUT: 503,
} as const;

export type ErrorCode = keyof typeof ERROR_CODES;

/** An error meant for the client: a status, a stable code, a readable message and optional per-field messages. */
export class AppError extends Error {
  readonly code: ErrorCode;
  readonly status: number;
  readonly fields?: Record<string, string>;
  readonly headers?: Record<string, string>;

  constructor(code: ErrorCode, message: string, options: { fields?: Record<string, string>; status?: number; headers?: Record<string, string> } = {}) {
    super(message);
    this.name = "AppError";
    this.code = code;
    this.status = options.status ?? ERROR_CODES[code];
    this.fields = options.fields;
    this.headers = options.headers;
  }
}

export const notFound = (what: string) => new AppError("NOT_FOUND", `${what} was not found.`);
