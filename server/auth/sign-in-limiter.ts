import { RateLimiterMemory, RateLimiterRes } from "rate-limiter-flexible";
import { AppError } from "../errors";

export interface SignInLimiter {
  /** Throws RATE_LIMITED when this account or this address has failed too often lately. */
  check(email: string, address: string): Promise<void>;
  recordFailure(email: string, address: string): Promise<void>;
  recordSuccess(email: string): Promise<void>;
  /**
   * Counts one password-reset request (whether or not the e-mail belongs to anyone, so a refusal says nothing
   * about that) and throws RATE_LIMITED when this client address or this e-mail address has asked too often lately.
   */
  consumeResetRequest(email: string, address: string): Promise<void>;
}

export interface LimiterOptions {
  /** failed sign-ins per account per window (5) */
  perAccount?: number;
  /** failed sign-ins per client address per window (20) */
  perAddress?: number;
  /** sign-in window in seconds (900) */
  windowSeconds?: number;
  /** reset requests per e-mail address per window (3): one person's mailbox is not flooded */
  resetPerEmail?: number;
  /** reset requests per client address per window (20): one client cannot probe many addresses */
  resetPerAddress?: number;
  /** reset window in seconds (900) */
  resetWindowSeconds?: number;
}

/**
 * Failed sign-ins are limited per account (5 per 15 min) and per client address (20 per 15 min); password-reset
 * requests per e-mail address (3 per 15 min) and per client address (20 per 15 min).
 * In memory: one server process; a second process would need a shared store.
 */
export function createSignInLimiter(options: LimiterOptions = {}): SignInLimiter {
  const duration = options.windowSeconds ?? 900;
  const perAccount = new RateLimiterMemory({ keyPrefix: "acct", points: options.perAccount ?? 5, duration });
  const perAddress = new RateLimiterMemory({ keyPrefix: "addr", points: options.perAddress ?? 20, duration });
  const resetDuration = options.resetWindowSeconds ?? 900;
  const resetPerEmail = new RateLimiterMemory({ keyPrefix: "reset-email", points: options.resetPerEmail ?? 3, duration: resetDuration });
  const resetPerAddress = new RateLimiterMemory({ keyPrefix: "reset-addr", points: options.resetPerAddress ?? 20, duration: resetDuration });

  const limited = (res: RateLimiterRes, what: string) => {
    const seconds = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
    return new AppError("RATE_LIMITED", `Too many ${what}. Try again in ${Math.ceil(seconds / 60)} minute(s).`, {
      headers: { "Retry-After": String(seconds) },
    });
  };

  return {
    async check(email, address) {
      for (const [limiter, key] of [[perAccount, email], [perAddress, address]] as const) {
        const res = await limiter.get(key);
        if (res && res.remainingPoints <= 0) throw limited(res, "failed sign-ins");
      }
    },
    async recordFailure(email, address) {
      await Promise.allSettled([perAccount.consume(email), perAddress.consume(address)]);
    },
    async recordSuccess(email) {
      await perAccount.delete(email);
    },
    async consumeResetRequest(email, address) {
      // The client address first: a client that is already refused does not use up the e-mail address's allowance.
      for (const [limiter, key] of [[resetPerAddress, address], [resetPerEmail, email]] as const) {
        try {
          await limiter.consume(key);
        } catch (error) {
          if (error instanceof RateLimiterRes) throw limited(error, "password-reset requests");
          throw error;
        }
      }
    },
  };
}
