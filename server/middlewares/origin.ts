import type { NextFunction, Request, Response } from "express";
import { AppError } from "../errors";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * CSRF defence: a state-changing request must carry an Origin header of this site — the configured public
 * origin or the origin of the Host it was sent to. Browsers always send Origin on such requests; scripts must set it.
 */
export function requireSameOrigin(publicOrigin: string) {
  const allowed = new URL(publicOrigin).host;
  return (req: Request, _res: Response, next: NextFunction) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = req.headers.origin;
    let host: string | null = null;
    try {
      host = origin ? new URL(origin).host : null;
    } catch {
      host = null;
    }
    if (!host || (host !== allowed && host !== req.headers.host)) {
      return next(new AppError("ORIGIN_MISMATCH", "This request must come from a Lotwise page (Origin header missing or foreign)."));
    }
    next();
  };
}
