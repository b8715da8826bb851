/**
 * Coded errors across a thread boundary: structured cloning keeps an Error's message but drops
 * its `code`, `path` and `details`, so workers send this plain shape and the pool rebuilds the
 * EngineError from it.
 */
import { EngineError, type EngineErrorCode } from "./errors";

/** An EngineError as plain data. */
export interface SerializedEngineError {
  code: EngineErrorCode;
  message: string;
  path?: string;
  details?: Record<string, unknown>;
}

/** Plain-data copy of an EngineError. */
export function serializeEngineError(err: EngineError): SerializedEngineError {
  const out: SerializedEngineError = { code: err.code, message: err.message };
  if (err.path !== undefined) out.path = err.path;
  if (err.details !== undefined) out.details = err.details;
  return out;
}

/** Rebuilds the EngineError. */
export function deserializeEngineError(data: SerializedEngineError): EngineError {
  const options: { path?: string; details?: Record<string, unknown> } = {};
  if (data.path !== undefined) options.path = data.path;
  if (data.details !== undefined) options.details = data.details;
  return new EngineError(data.code, data.message, options);
}
