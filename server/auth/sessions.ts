import { createHash } from "node:crypto";
import { Mysql2Adapter } from "@lucia-auth/adapter-mysql";
import { generateIdFromEntropySize, Lucia, TimeSpan } from "lucia";
import mysql, { type Pool } from "mysql2/promise";
import type { ServerConfig } from "../config/env";
import type { DataSource } from "typeorm";
import { ROLES, type Role } from "../../shared/roles";

// Lucia v3 is unmaintained upstream (deprecated in 2025, no more fixes): it is used only inside this module, so replacing it with our
// own ~100 lines of session code on the same two tables touches nothing else.
//
// The cookie carries a random token (25 bytes of entropy, 40 base32 characters); the session row's id is the token's
// SHA-256 (hex), given to lucia as a caller-chosen session id. Whoever reads `auth_session` learns no usable cookie.

/** The stored session id of a cookie token. */
export function sessionIdOf(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

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
  /** the stored id (the token's hash), for invalidate() */
  sessionId: string | null;
  /** the cookie's token, for a later validate() of the same session (a progress stream re-checks it) */
  token: string | null;
  /** A Set-Cookie value to send back: a refreshed session cookie, or a blank one for a dead session. */
  setCookie?: string;
}

export interface SessionService {
  cookieName: string;
  /** Starts a new session (a fresh id on every sign-in, so a planted id is never adopted) and returns its Set-Cookie value. */
  create(userId: string): Promise<string>;
  /** Checks a cookie token (as readCookie returns it). */
  validate(token: string | null): Promise<SessionCheck>;
  readCookie(cookieHeader: string | undefined): string | null;
  invalidate(sessionId: string): Promise<void>;
  invalidateAllFor(userId: string): Promise<void>;
  blankCookie(): string;
  close(): Promise<void>;
}

/**
 * Session cookies: HttpOnly, SameSite=Lax, Secure in production; 30 days, extended while in use. Sessions live in the
 * DataSource's own MariaDB pool (mysql2, timezone "Z" as lucia's DATETIME expiry needs), so there is one pool per server.
 */
export function createSessionService(source: DataSource | ServerConfig["db"], options: { secure: boolean }): SessionService {
  // A DataSource lends its pool; bare settings (a tool, a test that needs a second service) get a small pool of their own.
  const own = "driver" in source ? null : mysql.createPool({ host: source.host, port: source.port, user: source.user, password: source.password, database: source.name, timezone: "Z", connectionLimit: 2 });
  const pool: Pool = own ?? ((source as DataSource).driver as unknown as { pool: { promise(): Pool } }).pool.promise();
  const adapter = new Mysql2Adapter(pool, { user: "auth_user", session: "auth_session" });
  const lucia = new Lucia<Record<never, never>, AuthUserAttributes>(adapter, {
    sessionExpiresIn: new TimeSpan(30, "d"),
    sessionCookie: { name: "lotwise_session", attributes: { secure: options.secure, sameSite: "lax" } },
    getUserAttributes: (row) => toAttributes(row as unknown as UserRow),
  });
  const blank = { user: null, sessionId: null, token: null } as const;

  return {
    cookieName: lucia.sessionCookieName,
    async create(userId) {
      const token = generateIdFromEntropySize(25);
      await lucia.createSession(userId, {}, { sessionId: sessionIdOf(token) });
      return lucia.createSessionCookie(token).serialize();
    },
    async validate(token) {
      if (!token) return { ...blank };
      const { session, user } = await lucia.validateSession(sessionIdOf(token));
      if (!session || !user) return { ...blank, setCookie: lucia.createBlankSessionCookie().serialize() };
      if (!user.active) {
        await lucia.invalidateUserSessions(user.id);
        return { ...blank, setCookie: lucia.createBlankSessionCookie().serialize() };
      }
      const setCookie = session.fresh ? lucia.createSessionCookie(token).serialize() : undefined;
      return { user: { id: user.id, email: user.email, name: user.name, roles: user.roles, active: user.active }, sessionId: session.id, token, setCookie };
    },
    readCookie: (header) => lucia.readSessionCookie(header ?? ""),
    invalidate: (sessionId) => lucia.invalidateSession(sessionId),
    invalidateAllFor: (userId) => lucia.invalidateUserSessions(userId),
    blankCookie: () => lucia.createBlankSessionCookie().serialize(),
    close: async () => {
      await own?.end(); // a DataSource's pool closes with the DataSource
    },
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
