import type { z } from "zod";
import { ApiError } from "@/lib/api-client";

/** Messages keyed by field path (`email`, `roles`, `items.0.value`). */
export type FieldErrors = Record<string, string>;

export type Validation<T> = { ok: true; data: T } | { ok: false; errors: FieldErrors };

/** Parses `values` with a shared zod schema; on failure, the first message for each field path. */
export function validateWith<S extends z.ZodType>(schema: S, values: unknown): Validation<z.output<S>> {
  const result = schema.safeParse(values);
  if (result.success) return { ok: true, data: result.data };
  const errors: FieldErrors = {};
  for (const issue of result.error.issues) {
    const key = issue.path.map(String).join(".");
    if (!(key in errors)) errors[key] = issue.message;
  }
  return { ok: false, errors };
}

/** Field messages from a 400 answer, and the message to show above the button for the rest. */
export function splitApiError(error: unknown): { fields: FieldErrors; message: string | null } {
  if (error instanceof ApiError) {
    const fields = error.fields ?? {};
    const hasFields = Object.keys(fields).length > 0;
    return { fields, message: hasFields && error.code === "VALIDATION_FAILED" ? null : error.message };
  }
  if (error instanceof Error) return { fields: {}, message: error.message };
  return { fields: {}, message: "Something went wrong." };
}

/**
 * A field message ready to read beside the field. The shared schemas say "must be …" or
 * "is required"; those read as a sentence after the field's name ("Password must be …").
 */
export function phraseFieldError(subject: string, message: string | undefined): string | undefined {
  if (!message) return undefined;
  const sentence = /^[a-z]/.test(message) ? `${subject} ${message}` : message;
  return /[.!?]$/.test(sentence) ? sentence : `${sentence}.`;
}
