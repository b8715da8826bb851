import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t?.close());

describe("API conventions", () => {
  it("reports the database state on /api/health", async () => {
    const res = await request(t.app).get("/api/health").expect(200);
    expect(res.body).toEqual({ status: "ok", database: "up" });
  });

  it("answers an unknown API path with a coded 404", async () => {
    const res = await request(t.app).get("/api/no-such-thing").expect(404);
    expect(res.body.error.code).toBe("NOT_FOUND");
  });

  it("answers an oversized body with 413 naming the limit", async () => {
    const res = await request(t.app).post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: "a@b.example", password: "x".repeat(1_100_000) }).expect(413);
    expect(res.body.error.code).toBe("PAYLOAD_TOO_LARGE");
    expect(res.body.error.message).toMatch(/1048576 bytes/);
  });

  it("refuses to take away the last active admin (409)", async () => {
    const { agent, user } = await t.signedInAgent(["admin"]);
    const others = await t.ctx.dataSource.query("SELECT id FROM auth_user WHERE id <> ?", [user.id]);
    expect(others).toEqual([]);
    const res = await agent.patch(`/api/team/members/${user.id}`).set("Origin", ORIGIN).send({ active: false }).expect(409);
    expect(res.body.error.code).toBe("LAST_ADMIN");
  });
});
