import { Mysql2Adapter } from "@lucia-auth/adapter-mysql";
import { Lucia, TimeSpan } from "lucia";
import mysql from "mysql2/promise";
import type { ServerConfig } from "../config/env";
import { ROLES, type Role } from "../../shared/roles";

// Lucia v3 is unmaintained upstream (deprecated in 2025, no more fixes): it is used only inside this module, so replacing it with our
// own ~100 lines of session code on the same two tables touches nothing else.

/** The signed-in person as the rest of the server sees them. */
export interface AuthUser {
  id: string;
  email: string;
  name: string;
  roles: Role[];
  active: boolean;
}

interface UserRow {
  email: string;
  name: string;
  roles: string | Role[];
  active: number | boolean;
}

export interface SessionCheck {
  user: AuthUser | null;
  sessionId: string | null;
  /** A Set-Cookie value to send back: a refreshed session cookie, or a blank one for a dead session. */
  setCookie?: string;
}

export interface SessionService {
  cookieName: string;
  /** Starts a new session (a fresh id on every sign-in, so a planted id is never adopted) and returns its Set-Cookie value. */
  create(userId: string): Promise<string>;
  validate(sessionId: string | null): Promise<SessionCheck>;
  readCookie(cookieHeader: string | undefined): string | null;
  invalidate(sessionId: string): Promise<void>;
  invalidateAllFor(userId: string): Promise<void>;
  blankCookie(): string;
  close(): Promise<void>;
}

/** Session cookies: HttpOnly, SameSite=Lax, Secure in production; 30 days, extended while in use. */
export function createSessionService(db: ServerConfig["db"], options: { secure: boolean }): SessionService {
  const pool = mysql.createPool({
    host: db.host,
    port: db.port,
    user: db.user,
    password: db.password,
    database: db.name,
    timezone: "Z",
    connectionLimit: 5,
  });
  const adapter = new Mysql2Adapter(pool, { user: "auth_user", session: "auth_session" });
  const lucia = new Lucia<Record<never, never>, AuthUserAttributes>(adapter, {
    sessionExpiresIn: new TimeSpan(30, "d"),
    sessionCookie: { name: "lotwise_session", attributes: { secure: options.secure, sameSite: "lax" } },
    getUserAttributes: (row) => toAttributes(row as unknown as UserRow),
  });

  return {
    cookieName: lucia.sessionCookieName,
    async create(userId) {
      const session = await lucia.createSession(userId, {});
      return lucia.createSessionCookie(session.id).serialize();
    },
    async validate(sessionId) {
      if (!sessionId) return { user: null, sessionId: null };
      const { session, user } = await lucia.validateSession(sessionId);
      if (!session || !user) return { user: null, sessionId: null, setCookie: lucia.createBlankSessionCookie().serialize() };
      if (!user.active) {
        await lucia.invalidateUserSessions(user.id);
        return { user: null, sessionId: null, setCookie: lucia.createBlankSessionCookie().serialize() };
      }
      const setCookie = session.fresh ? lucia.createSessionCookie(session.id).serialize() : undefined;
      return { user: { id: user.id, email: user.email, name: user.name, roles: user.roles, active: user.active }, sessionId: session.id, setCookie };
    },
    readCookie: (header) => lucia.readSessionCookie(header ?? ""),
    invalidate: (sessionId) => lucia.invalidateSession(sessionId),
    invalidateAllFor: (userId) => lucia.invalidateUserSessions(userId),
    blankCookie: () => lucia.createBlankSessionCookie().serialize(),
    close: () => pool.end(),
  };
}

type AuthUserAttributes = Omit<AuthUser, "id">;

function toAttributes(row: UserRow): AuthUserAttributes {
  const raw = typeof row.roles === "string" ? (JSON.parse(row.roles) as unknown) : row.roles;
  const roles = Array.isArray(raw) ? raw.filter((r): r is Role => (ROLES as readonly string[]).includes(r)) : [];
  return { email: row.email, name: row.name, roles, active: Boolean(row.active) };
}

declare module "lucia" {
  interface Register {
    Lucia: Lucia<Record<never, never>, AuthUserAttributes>;
    DatabaseUserAttributes: AuthUserAttributes;
  }
}
