import { QueryFailedError, type DataSource } from "typeorm";
import type { Request, Response } from "express";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createApp } from "../../server/app";
import type { AppContext } from "../../server/context";
import { User } from "../../server/entities";
import { createLogger } from "../../server/logger";
import { errorHandler } from "../../server/middlewares/error-handler";
import { createTestContext, linkIn, ORIGIN, TEST_PASSWORD, type TestContext } from "../helpers/test-context";

// No secrets in logs or error bodies: the real logger (JSON lines on stderr, captured here) over the real app during
// sign-in failures, a rate limit, resets, invitations, a failed mail and genuine 500s (a database layer that throws
// an error carrying the SQL and its parameters, as TypeORM's QueryFailedError does). No password, token, session id,
// password hash or database password may appear in a log line or a response; a 500 body carries no stack or detail.

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext({ limiter: { perAccount: 3, perAddress: 100 } });
});
afterAll(() => t?.close());

const INTERNAL = { error: { code: "INTERNAL", message: "Something went wrong on our side; it has been logged." } };
const cookieOf = (setCookie: string) => setCookie.split(";")[0];

/** Captures what the real logger writes to stderr while `fn` runs (nothing reaches the terminal meanwhile). */
async function captureStderr<T>(fn: () => Promise<T>): Promise<{ lines: string[]; value: T }> {
  const lines: string[] = [];
  const spy = vi.spyOn(process.stderr, "write").mockImplementation(((chunk: string | Uint8Array) => {
    lines.push(...String(chunk).split("\n").filter(Boolean));
    return true;
  }) as typeof process.stderr.write);
  try {
    return { lines, value: await fn() };
  } finally {
    spy.mockRestore();
  }
}

/**
 * A database error as mysql2 → TypeORM raise it: the driver error carries the SQL with its values. By default an
 * unknown column (a bug: answered 500); with `down`, a refused connection (answered 503 and logged as a warning).
 */
function queryFailed(sql: string, parameters: unknown[], o: { down?: boolean } = {}): QueryFailedError {
  const driverError = o.down
    ? Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:3321"), { code: "ECONNREFUSED", errno: -111, sql })
    : Object.assign(new Error("Unknown column 'pasword_hash' in 'field list'"), { code: "ER_BAD_FIELD_ERROR", errno: 1054, sql, sqlMessage: "Unknown column 'pasword_hash' in 'field list'" });
  return new QueryFailedError(sql, parameters, driverError);
}

/** The context's data source, except that reads and transactions throw `error` (the session store is untouched). */
function failingDataSource(real: DataSource, error: Error): DataSource {
  const fail = () => { throw error; };
  const manager = new Proxy(real.manager, { get: (target, prop, receiver) => (prop === "getRepository" || prop === "transaction" ? fail : Reflect.get(target, prop, receiver)) });
  return new Proxy(real, {
    get: (target, prop, receiver) => (prop === "getRepository" || prop === "transaction" || prop === "query" ? fail : prop === "manager" ? manager : Reflect.get(target, prop, receiver)),
  });
}

function expectNoSecrets(texts: string[], secrets: string[]) {
  const found = secrets.filter((s) => s.length >= 8).flatMap((secret) => texts.filter((text) => text.includes(secret)).map((text) => ({ secret: `${secret.slice(0, 6)}…`, in: text.slice(0, 200) })));
  expect(found).toEqual([]);
}

describe("no secrets in logs or error bodies", () => {
  it("logs nothing secret during sign-ins, limits, invitations, resets, a failed mail and 500s, and 500 bodies carry no detail", async () => {
    const log = createLogger("info");
    const ctx: AppContext = { ...t.ctx, log };
    const { app } = createApp(ctx);
    const bodies: string[] = [];
    const secrets: string[] = [TEST_PASSWORD, t.ctx.config.db.password];
    const keep = (res: request.Response) => {
      bodies.push(res.text ?? "", JSON.stringify({ ...res.headers, "set-cookie": undefined }));
      for (const c of ([] as string[]).concat(res.headers["set-cookie"] ?? [])) secrets.push(cookieOf(c).split("=")[1] ?? "");
      return res;
    };
    const post = (a: typeof app, path: string, body: object, cookie?: string) => {
      const req = request(a).post(path).set("Origin", ORIGIN);
      return (cookie ? req.set("Cookie", cookie) : req).send(body).then(keep);
    };

    const { lines } = await captureStderr(async () => {
      // Sign-in: wrong passwords for a real and an unknown account, a deactivated account, then the account limit.
      const user = await t.buildUser({ email: "log-check@lotwise.test" });
      const inactive = await t.buildUser({ active: false });
      for (const wrong of ["wrong-password-one", "wrong-password-two", "wrong-password-three"]) {
        secrets.push(wrong);
        await post(app, "/api/auth/sign-in", { email: user.email, password: wrong });
        await post(app, "/api/auth/sign-in", { email: "nobody-at-all@lotwise.test", password: wrong });
      }
      expect((await post(app, "/api/auth/sign-in", { email: user.email, password: TEST_PASSWORD })).status).toBe(429);
      await post(app, "/api/auth/sign-in", { email: inactive.email, password: TEST_PASSWORD });
      const other = await t.buildUser();
      const signedIn = await post(app, "/api/auth/sign-in", { email: other.email, password: TEST_PASSWORD });
      const cookie = cookieOf(([] as string[]).concat(signedIn.headers["set-cookie"])[0]);
      keep(await request(app).get("/api/auth/me").set("Cookie", cookie));

      // Reset: request, use, reuse; invitation: issue, peek, accept with a bad password, accept.
      await post(app, "/api/auth/request-reset", { email: other.email });
      const resetToken = linkIn((await t.outbox()).find((m) => m.to.includes(other.email))!.text).split("/reset-password/")[1];
      secrets.push(resetToken, "a replacement passphrase");
      await post(app, "/api/auth/reset-password", { token: resetToken, password: "a replacement passphrase" });
      await post(app, "/api/auth/reset-password", { token: resetToken, password: "a replacement passphrase" });
      const admin = await t.buildUser({ roles: ["admin"] });
      const adminCookie = cookieOf(await t.ctx.sessions.create(admin.id));
      secrets.push(adminCookie.split("=")[1]);
      await post(app, "/api/team/invitations", { email: "log-invitee@lotwise.test", roles: ["analyst"] }, adminCookie);
      const inviteToken = linkIn((await t.outbox()).find((m) => m.to.includes("log-invitee@lotwise.test"))!.text).split("/invitation/")[1];
      secrets.push(inviteToken, "an invitee passphrase");
      keep(await request(app).get(`/api/auth/invitations/${inviteToken}`));
      await post(app, "/api/auth/accept-invitation", { token: inviteToken, name: "Invitee", password: "short" });
      await post(app, "/api/auth/accept-invitation", { token: inviteToken, name: "Invitee", password: "an invitee passphrase" });

      // A reset whose mail cannot be sent: logged as mail_failed, without the link.
      const brokenMail = createApp({ ...ctx, mailer: { mode: "smtp", close: () => undefined, send: async () => { throw new Error("connect ECONNREFUSED 127.0.0.1:25"); } } }).app;
      expect((await post(brokenMail, "/api/auth/request-reset", { email: user.email })).status).toBe(202);

      // Genuine 500s: the database layer throws an error that carries the SQL and its parameters.
      for (const u of [user, other, admin]) secrets.push((await t.ctx.dataSource.getRepository(User).findOneByOrFail({ id: u.id })).passwordHash);
      const hash = (await t.ctx.dataSource.getRepository(User).findOneByOrFail({ id: other.id })).passwordHash;
      const failing = createApp({ ...ctx, dataSource: failingDataSource(t.ctx.dataSource, queryFailed(`UPDATE auth_user SET password_hash = '${hash}' WHERE id = '${other.id}'`, [hash, resetToken])) }).app;
      const crashes = [
        await post(failing, "/api/auth/reset-password", { token: resetToken, password: "a replacement passphrase" }),
        keep(await request(failing).get("/api/designs").set("Cookie", adminCookie)),
        keep(await request(failing).get(`/api/auth/invitations/${inviteToken}`)),
      ];
      for (const res of crashes) {
        expect(res.status).toBe(500);
        expect(res.body).toEqual(INTERNAL);
      }
      // The database unreachable: 503 with a coded error, logged as a warning (also without the token of the path).
      const down = createApp({ ...ctx, dataSource: failingDataSource(t.ctx.dataSource, queryFailed(`SELECT * FROM invitation WHERE token_hash = '${hash}'`, [hash], { down: true })) }).app;
      const unavailable = keep(await request(down).get(`/api/auth/invitations/${inviteToken}`));
      expect(unavailable.status).toBe(503);
      expect(unavailable.body.error.code).toBe("DATABASE_UNAVAILABLE");
    });

    const events = lines.map((l) => (JSON.parse(l) as { event: string }).event);
    expect(events.filter((e) => e === "request_failed")).toHaveLength(3);
    expect(events).toContain("mail_failed");
    const failed = lines.map((l) => JSON.parse(l) as Record<string, unknown>).filter((l) => l.event === "request_failed");
    for (const l of failed) expect(l.stack).toMatch(/QueryFailedError/); // the stack is logged (for us), never sent
    expectNoSecrets([...lines, ...bodies], secrets);
    for (const body of bodies) expect(body).not.toMatch(/\n\s+at |QueryFailedError|auth_user/);
  });

  it("the error handler itself answers an unknown error with a bare 500 and logs no request data", async () => {
    const lines: string[] = [];
    const log = { info: () => undefined, warn: () => undefined, error: (event: string, fields?: Record<string, unknown>) => void lines.push(JSON.stringify({ event, ...fields })) };
    const secret = "Sup3r-secret-passphrase-in-a-body";
    const error = queryFailed(`INSERT INTO auth_user (password_hash) VALUES ('${secret}')`, [secret]);
    const req = { method: "POST", path: "/auth/reset-password", headers: { cookie: "lotwise_session=abcdefghijklmnopqrstuvwxyz0123456789abcd" }, body: { password: secret } } as unknown as Request;
    let status = 0;
    let sent: unknown;
    const res = { status(s: number) { status = s; return this; }, json(b: unknown) { sent = b; return this; }, set() { return this; } } as unknown as Response;
    errorHandler(log)(error, req, res, () => undefined);
    expect(status).toBe(500);
    expect(sent).toEqual(INTERNAL);
    expect(lines).toHaveLength(1);
    expect(lines[0]).not.toContain(secret);
    expect(lines[0]).not.toContain("abcdefghijklmnopqrstuvwxyz0123456789abcd");
  });
});
