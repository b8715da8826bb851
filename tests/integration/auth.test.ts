import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Session, User } from "../../server/entities";
import { createTestContext, linkIn, ORIGIN, TEST_PASSWORD, type TestContext } from "../helpers/test-context";

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext({ limiter: { perAccount: 3, perAddress: 50 } });
});
afterAll(() => t?.close());

const post = (path: string) => request(t.app).post(path).set("Origin", ORIGIN);

describe("sign-in", () => {
  it("signs in with the right password, sets an HttpOnly SameSite=Lax cookie, and /me shows the person", async () => {
    const user = await t.buildUser({ roles: ["designer", "analyst"], name: "Ada Field" });
    const res = await post("/api/auth/sign-in").send({ email: user.email.toUpperCase(), password: TEST_PASSWORD }).expect(200);
    const cookie = res.headers["set-cookie"][0] as string;
    expect(cookie).toMatch(/^lotwise_session=\w+/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Lax/);
    expect(cookie).not.toMatch(/Secure/); // Secure only in production
    const me = await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(200);
    expect(me.body.user).toEqual({ id: user.id, email: user.email, name: "Ada Field", roles: ["designer", "analyst"] });
  });

  it("answers a wrong password and an unknown account with the same 401 message", async () => {
    const user = await t.buildUser();
    const wrong = await post("/api/auth/sign-in").send({ email: user.email, password: "not the password" }).expect(401);
    const unknown = await post("/api/auth/sign-in").send({ email: "nobody@lotwise.test", password: "not the password" }).expect(401);
    expect(wrong.body.error).toEqual({ code: "INVALID_CREDENTIALS", message: "E-mail or password is incorrect." });
    expect(unknown.body.error).toEqual(wrong.body.error);
  });

  it("rate-limits an account after repeated failures, even for the right password, with Retry-After", async () => {
    const user = await t.buildUser();
    for (let i = 0; i < 3; i += 1) await post("/api/auth/sign-in").send({ email: user.email, password: "wrong wrong wrong" }).expect(401);
    const limited = await post("/api/auth/sign-in").send({ email: user.email, password: TEST_PASSWORD }).expect(429);
    expect(limited.body.error.code).toBe("RATE_LIMITED");
    expect(Number(limited.headers["retry-after"])).toBeGreaterThan(0);
  });

  it("rate-limits an address across accounts", async () => {
    const local = await createTestContext({ limiter: { perAccount: 100, perAddress: 4 } });
    try {
      for (let i = 0; i < 4; i += 1) {
        await request(local.app).post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: `x${i}@lotwise.test`, password: "nope" }).expect(401);
      }
      await request(local.app).post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: "other@lotwise.test", password: "nope" }).expect(429);
    } finally {
      await local.close();
    }
  });

  it("refuses a deactivated account with the same message", async () => {
    const user = await t.buildUser({ active: false });
    const res = await post("/api/auth/sign-in").send({ email: user.email, password: TEST_PASSWORD }).expect(401);
    expect(res.body.error.code).toBe("INVALID_CREDENTIALS");
  });

  it("gives a new session id on every sign-in (no fixation) and drops the one presented", async () => {
    const user = await t.buildUser();
    const first = await post("/api/auth/sign-in").send({ email: user.email, password: TEST_PASSWORD }).expect(200);
    const firstCookie = (first.headers["set-cookie"][0] as string).split(";")[0];
    const second = await post("/api/auth/sign-in").set("Cookie", firstCookie).send({ email: user.email, password: TEST_PASSWORD }).expect(200);
    const secondCookie = (second.headers["set-cookie"] as unknown as string[]).find((c) => !c.startsWith("lotwise_session=;"))!.split(";")[0];
    expect(secondCookie).not.toBe(firstCookie);
    await request(t.app).get("/api/auth/me").set("Cookie", firstCookie).expect(401);
  });

  it("rejects bad bodies with 400 and the field paths", async () => {
    const res = await post("/api/auth/sign-in").send({ email: "not-an-address", password: "" }).expect(400);
    expect(res.body.error.code).toBe("VALIDATION_FAILED");
    expect(res.body.error.message).toBe("email: must be an e-mail address");
    expect(res.body.error.fields).toEqual({ email: "must be an e-mail address", password: "is required" });
    const broken = await post("/api/auth/sign-in").set("Content-Type", "application/json").send("{not json").expect(400);
    expect(broken.body.error.code).toBe("INVALID_JSON");
  });

  it("refuses a state-changing request without a same-site Origin", async () => {
    const user = await t.buildUser();
    const none = await request(t.app).post("/api/auth/sign-in").send({ email: user.email, password: TEST_PASSWORD }).expect(403);
    expect(none.body.error.code).toBe("ORIGIN_MISMATCH");
    await request(t.app).post("/api/auth/sign-in").set("Origin", "http://evil.example").send({ email: user.email, password: TEST_PASSWORD }).expect(403);
  });
});

describe("sessions", () => {
  it("sign-out invalidates the session in the database", async () => {
    const { agent, user } = await t.signedInAgent(["planner"]);
    expect(await t.ctx.dataSource.getRepository(Session).countBy({ userId: user.id })).toBe(1);
    await agent.post("/api/auth/sign-out").set("Origin", ORIGIN).expect(204);
    await agent.get("/api/auth/me").expect(401);
    expect(await t.ctx.dataSource.getRepository(Session).countBy({ userId: user.id })).toBe(0);
  });

  it("treats an expired session as signed out", async () => {
    const { agent, user } = await t.signedInAgent(["planner"]);
    await t.ctx.dataSource.getRepository(Session).update({ userId: user.id }, { expiresAt: new Date(Date.now() - 60_000) });
    const res = await agent.get("/api/auth/me").expect(401);
    expect(res.body.error.code).toBe("UNAUTHENTICATED");
  });

  it("ends the sessions of a deactivated account", async () => {
    const { agent, user } = await t.signedInAgent(["analyst"]);
    await t.ctx.dataSource.getRepository(User).update({ id: user.id }, { active: false });
    await agent.get("/api/auth/me").expect(401);
  });
});

describe("invitation round trip", () => {
  it("admin invites; the mail's single-use link creates the account with the invited roles and signs in", async () => {
    const { agent } = await t.signedInAgent(["admin"]);
    const invited = await agent.post("/api/team/invitations").set("Origin", ORIGIN).send({ email: "New.Person@Lotwise.test", roles: ["planner", "reviewer"] }).expect(201);
    expect(invited.body.invitation).toMatchObject({ email: "new.person@lotwise.test", roles: ["planner", "reviewer"], acceptedAt: null });

    const [mail] = await t.outbox();
    expect(mail.to).toEqual(["new.person@lotwise.test"]);
    expect(mail.subject).toBe("You are invited to Lotwise");
    const link = linkIn(mail.text);
    expect(link.startsWith(`${ORIGIN}/invitation/`)).toBe(true);
    const token = link.split("/invitation/")[1];

    const peek = await request(t.app).get(`/api/auth/invitations/${token}`).expect(200);
    expect(peek.body.invitation).toMatchObject({ email: "new.person@lotwise.test", roles: ["planner", "reviewer"] });

    const accepted = await post("/api/auth/accept-invitation").send({ token, name: "New Person", password: "a long enough password" }).expect(201);
    expect(accepted.body.user).toMatchObject({ email: "new.person@lotwise.test", roles: ["planner", "reviewer"] });
    const cookie = (accepted.headers["set-cookie"][0] as string).split(";")[0];
    await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(200);

    const again = await post("/api/auth/accept-invitation").send({ token, name: "Someone Else", password: "another long password" }).expect(400);
    expect(again.body.error.code).toBe("TOKEN_INVALID");
    await request(t.app).get(`/api/auth/invitations/${token}`).expect(404);
    await post("/api/auth/sign-in").send({ email: "new.person@lotwise.test", password: "a long enough password" }).expect(200);
  });

  it("does not store the token itself, and an expired or revoked invitation's link is dead", async () => {
    const { agent } = await t.signedInAgent(["admin"]);
    const res = await agent.post("/api/team/invitations").set("Origin", ORIGIN).send({ email: "late@lotwise.test", roles: ["analyst"] }).expect(201);
    const mail = (await t.outbox()).find((m) => m.to.includes("late@lotwise.test"))!;
    const token = linkIn(mail.text).split("/invitation/")[1];
    const rows = await t.ctx.dataSource.query("SELECT token_hash FROM invitation WHERE id = ?", [res.body.invitation.id]);
    expect(rows[0].token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(rows[0].token_hash).not.toContain(token);

    await t.ctx.dataSource.query("UPDATE invitation SET expires_at = ? WHERE id = ?", [new Date(Date.now() - 1000), res.body.invitation.id]);
    await post("/api/auth/accept-invitation").send({ token, name: "Late", password: "a long enough password" }).expect(400);

    const second = await agent.post("/api/team/invitations").set("Origin", ORIGIN).send({ email: "revoked@lotwise.test", roles: ["analyst"] }).expect(201);
    await agent.delete(`/api/team/invitations/${second.body.invitation.id}`).set("Origin", ORIGIN).expect(204);
    const revokedMail = (await t.outbox()).find((m) => m.to.includes("revoked@lotwise.test"))!;
    const revokedToken = linkIn(revokedMail.text).split("/invitation/")[1];
    await post("/api/auth/accept-invitation").send({ token: revokedToken, name: "Gone", password: "a long enough password" }).expect(400);
  });

  it("refuses to invite an existing member (409) and stores nothing", async () => {
    const { agent } = await t.signedInAgent(["admin"]);
    const member = await t.buildUser();
    const before = await t.ctx.dataSource.query("SELECT COUNT(*) AS n FROM invitation");
    const res = await agent.post("/api/team/invitations").set("Origin", ORIGIN).send({ email: member.email, roles: ["designer"] }).expect(409);
    expect(res.body.error.code).toBe("ALREADY_MEMBER");
    expect(await t.ctx.dataSource.query("SELECT COUNT(*) AS n FROM invitation")).toEqual(before);
  });

  it("rejects a short password on acceptance with the field named", async () => {
    const res = await post("/api/auth/accept-invitation").send({ token: "x".repeat(43), name: "", password: "short" }).expect(400);
    expect(res.body.error.fields).toEqual({ name: "is required", password: "must be at least 12 characters" });
  });
});

describe("password reset round trip", () => {
  it("mails a single-use link, sets the new password and signs the account out everywhere", async () => {
    const user = await t.buildUser({ email: "forgetful@lotwise.test" });
    const { agent } = { agent: request.agent(t.app) };
    await agent.post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: user.email, password: TEST_PASSWORD }).expect(200);

    const res = await post("/api/auth/request-reset").send({ email: "forgetful@lotwise.test" }).expect(202);
    expect(res.body).toEqual({ ok: true });
    const mail = (await t.outbox()).find((m) => m.to.includes("forgetful@lotwise.test"))!;
    expect(mail.subject).toBe("Reset your Lotwise password");
    const token = linkIn(mail.text).split("/reset-password/")[1];

    await post("/api/auth/reset-password").send({ token, password: "a brand new passphrase" }).expect(200);
    await agent.get("/api/auth/me").expect(401);
    await post("/api/auth/sign-in").send({ email: user.email, password: TEST_PASSWORD }).expect(401);
    await post("/api/auth/sign-in").send({ email: user.email, password: "a brand new passphrase" }).expect(200);
    const reuse = await post("/api/auth/reset-password").send({ token, password: "yet another passphrase" }).expect(400);
    expect(reuse.body.error.code).toBe("TOKEN_INVALID");
  });

  it("answers an unknown address exactly like a known one and sends nothing", async () => {
    const before = (await t.outbox()).length;
    const res = await post("/api/auth/request-reset").send({ email: "nobody-here@lotwise.test" }).expect(202);
    expect(res.body).toEqual({ ok: true });
    expect((await t.outbox()).length).toBe(before);
  });
});
