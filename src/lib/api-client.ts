/**
 * The one HTTP client of the Lotwise front end. JSON under `/api`, the session cookie sent by the
 * browser (`credentials: "same-origin"`), errors turned into {@link ApiError}.
 */

import type { z } from "zod";
import { fieldPath } from "@shared/schemas/field-path";

/** A failed request: HTTP status (0 when the server could not be reached), stable code, message. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields?: Record<string, string>;

  constructor(status: number, code: string, message: string, fields?: Record<string, string>) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.fields = fields;
  }

  /** True for 4xx answers: the request itself was refused, so repeating it will not help. */
  get isClientError(): boolean {
    return this.status >= 400 && this.status < 500;
  }
}

/**
 * Checks a request body with the endpoint's contract schema (the same object the server validates with) before it
 * is sent: a failure is the 400 VALIDATION_FAILED the server would answer, fields named the same way, so forms show
 * it like any other refusal. The value goes out as given (the server applies the schema's own trimming).
 */
export function checkBody<T>(schema: z.ZodType, value: T): T {
  const parsed = schema.safeParse(value);
  if (parsed.success) return value;
  const fields: Record<string, string> = {};
  for (const issue of parsed.error.issues) {
    const keys = issue.code === "unrecognized_keys" ? issue.keys : [undefined];
    for (const key of keys) {
      const at = key === undefined ? issue.path : [...issue.path, key];
      const path = at.length ? fieldPath(at) : "body";
      fields[path] ??= key === undefined ? issue.message : `${key} is not a field this request takes`;
    }
  }
  const [firstPath, firstMessage] = Object.entries(fields)[0];
  throw new ApiError(400, "VALIDATION_FAILED", `${firstPath}: ${firstMessage}`, fields);
}

type UnauthenticatedHandler = () => void;
let handleUnauthenticated: UnauthenticatedHandler = () => {};

/**
 * Registers what to do when the session turns out to be gone (401 from anything but
 * `GET /auth/me`, which answers 401 to say "nobody is signed in").
 */
export function setUnauthenticatedHandler(handler: UnauthenticatedHandler): void {
  handleUnauthenticated = handler;
}

type Method = "GET" | "POST" | "PATCH" | "PUT" | "DELETE";

async function request<T>(method: Method, path: string, body?: unknown): Promise<T> {
  const headers: Record<string, string> = { Accept: "application/json" };
  // FormData goes as multipart (the browser sets the boundary); anything else as JSON.
  const multipart = body instanceof FormData;
  if (body !== undefined && !multipart) headers["Content-Type"] = "application/json";

  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method,
      headers,
      credentials: "same-origin",
      body: body === undefined ? undefined : multipart ? body : JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, "NETWORK_ERROR", "Could not reach the Lotwise server. Check the connection and try again.");
  }

  const payload = await readJson(response);
  if (response.ok) return payload as T;

  const error = toApiError(response.status, payload);
  if (error.status === 401 && error.code !== "INVALID_CREDENTIALS" && path !== "/auth/me") {
    handleUnauthenticated();
  }
  throw error;
}

export const api = {
  get: <T>(path: string) => request<T>("GET", path),
  post: <T>(path: string, body?: unknown) => request<T>("POST", path, body ?? {}),
  patch: <T>(path: string, body: unknown) => request<T>("PATCH", path, body),
  put: <T>(path: string, body: unknown) => request<T>("PUT", path, body),
  /** multipart/form-data POST: a `file` field plus text fields. */
  upload: <T>(path: string, file: File, fields: Record<string, string> = {}) => {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) form.append(k, v);
    form.append("file", file);
    return request<T>("POST", path, form);
  },
  delete: <T = void>(path: string) => request<T>("DELETE", path),
};

async function readJson(response: Response): Promise<unknown> {
  if (response.status === 204) return undefined;
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

function toApiError(status: number, payload: unknown): ApiError {
  const error = (payload as { error?: { code?: unknown; message?: unknown; fields?: unknown } } | undefined)?.error;
  const code = typeof error?.code === "string" ? error.code : `HTTP_${status}`;
  const message =
    typeof error?.message === "string" && error.message ? error.message : fallbackMessage(status);
  const fields =
    error?.fields && typeof error.fields === "object" ? (error.fields as Record<string, string>) : undefined;
  return new ApiError(status, code, message, fields);
}

function fallbackMessage(status: number): string {
  if (status === 401) return "Please sign in.";
  if (status === 403) return "Your roles do not allow this.";
  if (status === 404) return "Not found.";
  if (status === 429) return "Too many attempts. Wait a little and try again.";
  if (status >= 500) return "The server ran into a problem. Try again in a moment.";
  return `The request failed (HTTP ${status}).`;
}
