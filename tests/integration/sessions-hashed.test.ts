import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sessionIdOf } from "../../server/auth/sessions";
import { Session } from "../../server/entities";
import { migrations } from "../../server/migrations";
import { createTestContext, ORIGIN, TEST_PASSWORD, type TestContext } from "../helpers/test-context";

// Sessions are stored by the SHA-256 of the cookie's token (issue 11): reading `auth_session` gives no usable cookie.

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t?.close());

const cookieValue = (setCookie: string) => setCookie.split(";")[0].split("=")[1];

describe("hashed sessions", () => {
  it("stores the token's SHA-256, not the token; the cookie signs in, a copied row id does not", async () => {
    const user = await t.buildUser({ roles: ["analyst"] });
    const res = await request(t.app).post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: user.email, password: TEST_PASSWORD }).expect(200);
    const token = cookieValue((res.headers["set-cookie"] as unknown as string[])[0]);
    expect(token).toMatch(/^[a-z2-7]{40}$/); // 25 random bytes, base32
    const rows = await t.ctx.dataSource.getRepository(Session).findBy({ userId: user.id });
    expect(rows.map((r) => r.id)).toEqual([sessionIdOf(token)]);
    expect(rows[0].id).not.toBe(token);
    expect(rows[0].id).toMatch(/^[0-9a-f]{64}$/);

    const cookie = (value: string) => `${t.ctx.sessions.cookieName}=${value}`;
    expect((await request(t.app).get("/api/auth/me").set("Cookie", cookie(token)).expect(200)).body.user.id).toBe(user.id);
    // someone who read the table presents the stored id as a cookie: refused, and told to drop it
    const copied = await request(t.app).get("/api/auth/me").set("Cookie", cookie(rows[0].id)).expect(401);
    expect(String(copied.headers["set-cookie"])).toMatch(/lotwise_session=;/);
    expect(await t.ctx.dataSource.getRepository(Session).countBy({ userId: user.id })).toBe(1); // the real session is untouched

    // sign-out ends the stored row of this token
    await request(t.app).post("/api/auth/sign-out").set("Origin", ORIGIN).set("Cookie", cookie(token)).expect(204);
    expect(await t.ctx.dataSource.getRepository(Session).countBy({ userId: user.id })).toBe(0);
  });

  it("the migration ends every session stored before hashing (their rows held the cookie value itself)", async () => {
    const user = await t.buildUser();
    await t.ctx.dataSource.getRepository(Session).insert({ id: "b".repeat(40), userId: user.id, expiresAt: new Date(Date.now() + 86_400_000) });
    const migration = migrations.find((m) => m.name === "HashedSessions1764896400000")!;
    const runner = t.ctx.dataSource.createQueryRunner();
    try {
      await new migration().up(runner);
    } finally {
      await runner.release();
    }
    expect(await t.ctx.dataSource.getRepository(Session).count()).toBe(0);
    await request(t.app).get("/api/auth/me").set("Cookie", `${t.ctx.sessions.cookieName}=${"b".repeat(40)}`).expect(401);
  });
});
