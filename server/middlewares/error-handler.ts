import type { NextFunction, Request, Response } from "express";
import { EngineError } from "../../shared/engine/errors";
import { AppError, ERROR_CODES } from "../errors";
import { isDatabaseDown } from "../db/errors";
import type { Logger } from "../logger";

export { isDatabaseDown };

interface HttpError {
  type?: string;
  status?: number;
  code?: string;
  limit?: number;
}

/** Turns any error into `{ error: { code, message, fields? } }`; unknown errors are logged and answered 500 without detail. */
export function errorHandler(log: Logger) {
  // Express recognises error middleware by its four parameters.
  return (error: unknown, req: Request, res: Response, _next: NextFunction) => {
    const known = toAppError(error);
    if (known) {
      if (!(error instanceof AppError) && (known.code === "DATABASE_UNAVAILABLE" || known.code === "CONFLICT")) {
        log.warn("request_database_transient", { method: req.method, path: loggablePath(req.path), code: known.code, cause: (error as HttpError)?.code ?? (error as { driverError?: HttpError })?.driverError?.code });
      }
      if (known.headers) res.set(known.headers);
      res.status(known.status).json({ error: { code: known.code, message: known.message, ...(known.fields ? { fields: known.fields } : {}) } });
      return;
    }
    const err = error as Error;
    log.error("request_failed", { method: req.method, path: loggablePath(req.path), error: err?.name, message: err?.message, stack: err?.stack });
    res.status(500).json({ error: { code: "INTERNAL", message: "Something went wrong on our side; it has been logged." } });
  };
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/**
 * The request path for a log line, with every segment that may be a secret token replaced by `:token`: a path may
 * carry one (/auth/invitations/<token>). Record ids (UUIDs) and short words stay, so the line still says what failed.
 */
export function loggablePath(path: string): string {
  return path.split("/").map((seg) => (seg.length >= 16 && !UUID.test(seg) ? ":token" : seg)).join("/");
}

function toAppError(error: unknown): AppError | null {
  if (error instanceof AppError) return error;
  if (error instanceof EngineError) {
    const code = error.code in ERROR_CODES ? (error.code as keyof typeof ERROR_CODES) : "INVALID_INPUT";
    return new AppError(code, error.message, { status: 400, fields: error.path ? { [error.path]: error.message } : undefined });
  }
  const http = error as HttpError;
  if (http?.type === "entity.parse.failed") return new AppError("INVALID_JSON", "The request body is not valid JSON.");
  if (http?.type === "entity.too.large") return new AppError("PAYLOAD_TOO_LARGE", `The request body is larger than the limit of ${http.limit} bytes.`);
  // body-parser's other refusals (found by tests/integration/fuzz-netlists.test.ts): a charset or Content-Encoding
  // it cannot decode, a body shorter or longer than its Content-Length. The client's fault, so 400, not 500.
  if (http?.type === "charset.unsupported" || http?.type === "encoding.unsupported" || http?.type === "request.size.invalid" || http?.type === "request.aborted") {
    return new AppError("INVALID_JSON", `The request body cannot be read (${(error as Error).message}); send UTF-8 JSON.`);
  }
  // A body that does not decompress as its Content-Encoding (gzip, deflate, br) says: not compressed at all,
  // truncated or garbled. body-parser passes zlib's error on as a 400 without a `type`; zlib names it by its code.
  if (isDecompressionError(error)) {
    return new AppError("INVALID_JSON", `The request body cannot be decompressed as its Content-Encoding says (${(error as Error).message}); send it compressed that way, or uncompressed without Content-Encoding.`);
  }
  // Express's router cannot decode a path parameter with a bad %-escape (GET /api/runs/%): a URIError with status 400.
  if (error instanceof URIError && http?.status === 400) return new AppError("VALIDATION_FAILED", "The URL holds a malformed %-escape.", { fields: { path: "malformed %-escape" } });
  if (isDatabaseDown(http)) return new AppError("DATABASE_UNAVAILABLE", "The database is not reachable right now; try again shortly.", { headers: { "Retry-After": "5" } });
  // A deadlock victim or a lock wait that timed out: the transaction was rolled back whole, so nothing was saved
  // and the same request may simply be sent again.
  if (isLockConflict(http)) return new AppError("CONFLICT", "This request collided with another one changing the same records; nothing was saved. Try again.", { headers: { "Retry-After": "1" } });
  return null;
}

function isDecompressionError(error: unknown): boolean {
  const e = error as HttpError & { errno?: unknown } | null | undefined;
  return e?.status === 400 && e.type === undefined && typeof e.errno === "number" && typeof e.code === "string" && /^(Z_|ERR_BROTLI|ERR__ERROR_)/.test(e.code);
}

function isLockConflict(error: unknown): boolean {
  const e = error as HttpError & { driverError?: HttpError } | null | undefined;
  const code = e?.code ?? e?.driverError?.code;
  return code === "ER_LOCK_DEADLOCK" || code === "ER_LOCK_WAIT_TIMEOUT";
}
