import { expect } from "vitest";
import type { Response } from "supertest";
import { ERROR_CODES } from "../../server/errors";
import { diffSnapshots, snapshotDb, type DbSnapshot, type SnapshotOptions } from "./db-snapshot";
import type { TestContext } from "./test-context";

/**
 * The one property every fuzzed API request must have: a 2xx, or a 4xx whose body is `{ error: { code, message } }`
 * with a code of server/errors.ts and the status that code stands for — never a 5xx — and, when rejected, a
 * database exactly as it was before (every table's row count and checksum).
 */

/** supertest timeouts per request: a request that hangs fails the property instead of stalling the file. */
export const REQUEST_TIMEOUT = { response: 8_000, deadline: 12_000 } as const;

const KNOWN = new Set(Object.keys(ERROR_CODES));

/** Asserts a coded 4xx or a 2xx; returns the response for further checks. `what` labels the failure. */
export function expectCodedAnswer(res: Response, what: string): Response {
  const detail = `${what} → ${res.status} ${JSON.stringify(res.body)?.slice(0, 400)}`;
  expect(res.status < 500, detail).toBe(true);
  if (res.status >= 400) {
    const error = res.body?.error;
    expect(error && typeof error.code === "string" && KNOWN.has(error.code), detail).toBe(true);
    expect(ERROR_CODES[error.code as keyof typeof ERROR_CODES], detail).toBe(res.status);
    expect(typeof error.message === "string" && error.message.length > 0, detail).toBe(true);
  } else {
    expect(res.status >= 200 && res.status < 300, detail).toBe(true);
  }
  return res;
}

/**
 * Keeps the database's fingerprint between fuzzed requests: `send` a request, check its answer, and when it was
 * rejected check that the database did not change; when accepted, take the new fingerprint as the baseline.
 */
export class DbGuard {
  private snap: DbSnapshot | null = null;
  accepted = 0;
  rejected = 0;
  /** slowest request so far (ms) and what it was */
  slowest = { ms: 0, what: "" };
  readonly statuses = new Map<number, number>();

  constructor(private readonly t: TestContext, private readonly options: SnapshotOptions = {}) {}

  async reset(): Promise<void> {
    this.snap = await snapshotDb(this.t.ctx.dataSource, this.options);
  }

  async send(what: string, request: () => PromiseLike<Response>): Promise<Response> {
    if (!this.snap) await this.reset();
    const t0 = performance.now();
    const res = expectCodedAnswer(await request(), what);
    const ms = performance.now() - t0;
    if (ms > this.slowest.ms) this.slowest = { ms, what: what.slice(0, 80) };
    this.statuses.set(res.status, (this.statuses.get(res.status) ?? 0) + 1);
    if (res.status >= 400) {
      this.rejected++;
      const after = await snapshotDb(this.t.ctx.dataSource, this.options);
      expect(diffSnapshots(this.snap!, after), `${what} was rejected (${res.status} ${res.body?.error?.code}) but changed the database`).toEqual([]);
    } else {
      this.accepted++;
      await this.reset();
    }
    return res;
  }

  /** "201×3 400×57, slowest 41 ms (…)" — for a test's summary line. */
  summary(): string {
    const counts = [...this.statuses.entries()].sort((a, b) => a[0] - b[0]).map(([s, n]) => `${s}×${n}`).join(" ");
    return `${counts}, slowest ${Math.round(this.slowest.ms)} ms (${this.slowest.what})`;
  }
}
