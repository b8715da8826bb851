import { RateLimiterMemory, RateLimiterRes } from "rate-limiter-flexible";
import { AppError } from "../errors";

export interface SignInLimiter {
  /** Throws RATE_LIMITED when this account or this address has failed too often lately. */
  check(email: string, address: string): Promise<void>;
  recordFailure(email: string, address: string): Promise<void>;
  recordSuccess(email: string): Promise<void>;
}

/**
 * Failed sign-ins are limited per account (5 per 15 min) and per client address (20 per 15 min).
 * In memory: one server process; a second process would need a shared store.
 */
export function createSignInLimiter(options: { perAccount?: number; perAddress?: number; windowSeconds?: number } = {}): SignInLimiter {
  const duration = options.windowSeconds ?? 900;
  const perAccount = new RateLimiterMemory({ keyPrefix: "acct", points: options.perAccount ?? 5, duration });
  const perAddress = new RateLimiterMemory({ keyPrefix: "addr", points: options.perAddress ?? 20, duration });

  const limited = (res: RateLimiterRes) => {
    const seconds = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
    return new AppError("RATE_LIMITED", `Too many failed sign-ins. Try again in ${Math.ceil(seconds / 60)} minute(s).`, {
      headers: { "Retry-After": String(seconds) },
    });
  };

  return {
    async check(email, address) {
      for (const [limiter, key] of [[perAccount, email], [perAddress, address]] as const) {
        const res = await limiter.get(key);
        if (res && res.remainingPoints <= 0) throw limited(res);
      }
    },
    async recordFailure(email, address) {
      await Promise.allSettled([perAccount.consume(email), perAddress.consume(address)]);
    },
    async recordSuccess(email) {
      await perAccount.delete(email);
    },
  };
}
