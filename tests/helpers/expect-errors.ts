import { expect } from "vitest";
import { EngineError } from "../../shared/engine/errors";
import { FormatError } from "../../shared/formats/format-error";

/** Asserts that `run` throws an EngineError with this code, a message matching `message` and (when given) this path. */
export function expectEngineError(run: () => unknown, code: string, message: RegExp, path?: string): void {
  try {
    run();
  } catch (err) {
    expect(err).toBeInstanceOf(EngineError);
    expect((err as EngineError).code).toBe(code);
    expect((err as EngineError).message).toMatch(message);
    if (path !== undefined) expect((err as EngineError).path).toBe(path);
    return;
  }
  throw new Error("expected an EngineError");
}

/** Asserts that `run` throws an INVALID_FILE FormatError with exactly this message, line and field. */
export function expectFormatError(run: () => unknown, message: string, line: number | undefined, field: string): void {
  let caught: unknown;
  try {
    run();
  } catch (err) {
    caught = err;
  }
  expect(caught).toBeInstanceOf(FormatError);
  const e = caught as FormatError;
  expect(e.message).toBe(message);
  expect(e.line).toBe(line);
  expect(e.field).toBe(field);
  expect(e.code).toBe("INVALID_FILE");
}
