import type { NextFunction, Request, Response } from "express";
import type { SessionService } from "../auth/sessions";

/** Reads the session cookie, puts the signed-in person (or null) in `res.locals.user`, refreshes the cookie when due. */
export function loadSession(sessions: SessionService) {
  return async (req: Request, res: Response, next: NextFunction) => {
    const check = await sessions.validate(sessions.readCookie(req.headers.cookie));
    if (check.setCookie) res.append("Set-Cookie", check.setCookie);
    res.locals.user = check.user;
    res.locals.sessionId = check.sessionId;
    res.locals.sessionToken = check.token;
    next();
  };
}
