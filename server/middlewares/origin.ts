import type { NextFunction, Request, Response } from "express";
import { AppError } from "../errors";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * CSRF defence: a state-changing request must carry an Origin header of this site — the configured public
 * origin or the origin of the Host it was sent to, over the scheme it arrived on. Scheme, host and port are all
 * compared (`https://host:port` is another site than `http://host:port`). Browsers always send Origin on such
 * requests; scripts must set it.
 */
export function requireSameOrigin(publicOrigin: string) {
  const allowed = originOf(publicOrigin);
  return (req: Request, _res: Response, next: NextFunction) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = originOf(req.headers.origin);
    // req.protocol is the socket's own ("trust proxy" is off): behind a TLS proxy the public origin is the match.
    const own = req.headers.host ? originOf(`${req.protocol}://${req.headers.host}`) : null;
    if (!origin || (origin !== allowed && origin !== own)) {
      return next(new AppError("ORIGIN_MISMATCH", "This request must come from a Lotwise page (Origin header missing or foreign)."));
    }
    next();
  };
}

/** scheme://host[:port] as URL normalizes it (lower case, default port dropped), or null for anything else ("null", garbage). */
function originOf(text: string | undefined): string | null {
  if (!text) return null;
  try {
    const url = new URL(text);
    if (url.protocol !== "http:" && url.protocol !== "https:") return null;
    return url.origin;
  } catch {
    return null;
  }
}
