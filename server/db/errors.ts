/** How database errors are told apart: the HTTP error handler answers 503 on them, the run queue retries its writes. */

const DOWN_CODES = new Set([
  "ECONNREFUSED", "PROTOCOL_CONNECTION_LOST", "ETIMEDOUT", "ECONNRESET", "ER_CON_COUNT_ERROR", "EPIPE", "ENOTFOUND", "EHOSTUNREACH",
  "ER_SERVER_SHUTDOWN", "PROTOCOL_SEQUENCE_TIMEOUT", "POOL_CLOSED",
]);

interface CodedError {
  code?: string;
  message?: string;
  driverError?: CodedError;
  cause?: CodedError;
}

/**
 * True when an error says the database cannot be reached (refused or lost connection, server shutting down), as
 * mysql2 reports it directly or wrapped by TypeORM (`driverError`). Such errors answer 503 DATABASE_UNAVAILABLE with
 * Retry-After, and the run queue retries its writes on them.
 */
export function isDatabaseDown(error: unknown): boolean {
  const e = error as CodedError | null | undefined;
  const code = e?.code ?? e?.driverError?.code ?? e?.cause?.code;
  if (typeof code === "string" && DOWN_CODES.has(code)) return true;
  // mysql2 on a connection a fatal error has already closed (no code of its own)
  return typeof e?.message === "string" && /connection is in closed state|Connection lost: The server closed the connection/i.test(e.message);
}
