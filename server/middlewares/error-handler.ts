import type { NextFunction, Request, Response } from "express";
import { EngineError } from "../../shared/engine/errors";
import { AppError, ERROR_CODES } from "../errors";
import type { Logger } from "../logger";

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
      if (known.headers) res.set(known.headers);
      res.status(known.status).json({ error: { code: known.code, message: known.message, ...(known.fields ? { fields: known.fields } : {}) } });
      return;
    }
    const err = error as Error;
    log.error("request_failed", { method: req.method, path: req.path, error: err?.name, message: err?.message, stack: err?.stack });
    res.status(500).json({ error: { code: "INTERNAL", message: "Something went wrong on our side; it has been logged." } });
  };
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
  if (isDatabaseDown(http)) return new AppError("DATABASE_UNAVAILABLE", "The database is not reachable right now; try again shortly.", { headers: { "Retry-After": "5" } });
  return null;
}

const DOWN_CODES = new Set(["ECONNREFUSED", "PROTOCOL_CONNECTION_LOST", "ETIMEDOUT", "ECONNRESET", "ER_CON_COUNT_ERROR", "EPIPE"]);
function isDatabaseDown(error: HttpError): boolean {
  const code = error?.code ?? (error as { driverError?: HttpError })?.driverError?.code;
  return typeof code === "string" && DOWN_CODES.has(code);
}
