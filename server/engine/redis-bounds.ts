/** Bounded looks at Redis for the distributed dispatcher: a time limit on every command, and what counts as Redis trouble. */
import { EngineError } from "../../shared/engine/errors";

/**
 * Resolves or rejects as `p` does, but rejects with a RedisTimeout after `ms` and with CANCELLED when `signal`
 * aborts, so a look at a Redis that never answers (never connected, a half-open link) cannot hold a run forever.
 */
export function within<T>(p: Promise<T>, ms: number, signal: AbortSignal): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const settle = (fn: () => void) => {
      clearTimeout(timer);
      signal.removeEventListener("abort", onAbort);
      fn();
    };
    const timer = setTimeout(() => settle(() => reject(new RedisTimeout(`no answer from Redis within ${ms} ms`))), ms);
    timer.unref();
    const onAbort = () => settle(() => reject(new EngineError("CANCELLED", "run cancelled")));
    signal.addEventListener("abort", onAbort, { once: true });
    p.then((v) => settle(() => resolve(v)), (e: unknown) => settle(() => reject(e)));
  });
}

export class RedisTimeout extends Error {
  constructor(message: string) {
    super(message);
    this.name = "RedisTimeout";
  }
}

/** Errors that mean Redis is away or not ready yet (waited out up to `outageMs`), as opposed to a fault of ours. */
export function isRedisTrouble(err: unknown): boolean {
  if (err instanceof RedisTimeout) return true;
  const e = err as { name?: string; code?: string; message?: string } | null;
  if (e?.name === "MaxRetriesPerRequestError") return true;
  if (e?.code && /^(ECONNREFUSED|ECONNRESET|ETIMEDOUT|EPIPE|EHOSTUNREACH|ENETUNREACH|ENOTFOUND|EAI_AGAIN)$/.test(e.code)) return true;
  return /Connection is closed|Stream isn't writeable|Command timed out|ECONNREFUSED|ECONNRESET|ETIMEDOUT|^LOADING|^BUSY|^TRYAGAIN|^MASTERDOWN|^READONLY|locked/i.test(String(e?.message ?? ""));
}
