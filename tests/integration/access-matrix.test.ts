import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { User } from "../../server/entities";
import type { RouteInfo } from "../../server/routes/api-router";
import { inviteMember } from "../../server/services/accounts";
import { ROLES, type Role } from "../../shared/roles";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";

// Every API route × no session / each role: 401 without a session, 403 without the role, 2xx with it.
// The routes come from the app's own route table, so a route added without a sample below fails this test.

interface Sample {
  path: string;
  body?: unknown;
}
type SampleMaker = (t: TestContext, caller: User) => Promise<Sample>;

let seq = 0;
const SAMPLES: Record<string, SampleMaker> = {
  "get /health": async () => ({ path: "/api/health" }),
  "get /outbox": async () => ({ path: "/api/outbox" }),
  "get /auth/me": async () => ({ path: "/api/auth/me" }),
  "post /auth/sign-in": async (t) => {
    const u = await t.buildUser();
    return { path: "/api/auth/sign-in", body: { email: u.email, password: "correct horse battery staple" } };
  },
  "post /auth/sign-out": async () => ({ path: "/api/auth/sign-out" }),
  "get /auth/invitations/:token": async (t, caller) => ({ path: `/api/auth/invitations/${await openInvitationToken(t, caller)}` }),
  "post /auth/accept-invitation": async (t, caller) => ({
    path: "/api/auth/accept-invitation",
    body: { token: await openInvitationToken(t, caller), name: "Invitee", password: "a long enough password" },
  }),
  "post /auth/request-reset": async () => ({ path: "/api/auth/request-reset", body: { email: "someone@lotwise.test" } }),
  "post /auth/reset-password": async (t) => {
    const u = await t.buildUser();
    await request(t.app).post("/api/auth/request-reset").set("Origin", ORIGIN).send({ email: u.email }).expect(202);
    const mail = (await t.outbox()).find((m) => m.to.includes(u.email))!;
    return { path: "/api/auth/reset-password", body: { token: mail.text.match(/reset-password\/(\S+)/)![1], password: "a fresh long password" } };
  },
  "get /team/members": async () => ({ path: "/api/team/members" }),
  "patch /team/members/:id": async (t) => ({ path: `/api/team/members/${(await t.buildUser()).id}`, body: { roles: ["analyst"] } }),
  "get /team/invitations": async () => ({ path: "/api/team/invitations" }),
  "post /team/invitations": async () => ({ path: "/api/team/invitations", body: { email: `inv-${++seq}@lotwise.test`, roles: ["designer"] } }),
  "delete /team/invitations/:id": async (t, caller) => {
    const inv = await inviteMember(t.ctx, caller, `revoke-${++seq}@lotwise.test`, ["planner"]);
    return { path: `/api/team/invitations/${inv.id}` };
  },
};

async function openInvitationToken(t: TestContext, caller: User): Promise<string> {
  const email = `token-${++seq}@lotwise.test`;
  await inviteMember(t.ctx, caller, email, ["designer"]);
  const mail = (await t.outbox()).find((m) => m.to.includes(email))!;
  return mail.text.match(/invitation\/(\S+)/)![1];
}

let t: TestContext;
const people = new Map<Role, User>();
beforeAll(async () => {
  t = await createTestContext();
  for (const role of ROLES) people.set(role, await t.buildUser({ roles: [role] }));
});
afterAll(() => t?.close());

const key = (r: RouteInfo) => `${r.method} ${r.path}`;

async function call(route: RouteInfo, sample: Sample, cookie?: string) {
  let req = request(t.app)[route.method](sample.path).set("Origin", ORIGIN);
  if (cookie) req = req.set("Cookie", cookie);
  return sample.body === undefined ? req : req.send(sample.body as object);
}

describe("access matrix", () => {
  it("has a sample request for every route the app registers", () => {
    expect(t.routes.length).toBeGreaterThan(10);
    const missing = t.routes.map(key).filter((k) => !SAMPLES[k]);
    expect(missing).toEqual([]);
  });

  it("answers 401 without a session on every non-public route", async () => {
    for (const route of t.routes.filter((r) => r.access !== "public")) {
      const res = await call(route, await SAMPLES[key(route)](t, people.get("admin")!));
      expect({ route: key(route), status: res.status, code: res.body?.error?.code }).toEqual({ route: key(route), status: 401, code: "UNAUTHENTICATED" });
    }
  });

  for (const role of ROLES) {
    it(`answers 403 without the role and 2xx with it, as ${role}`, async () => {
      const caller = people.get(role)!;
      for (const route of t.routes) {
        const cookie = (await t.ctx.sessions.create(caller.id)).split(";")[0];
        const res = await call(route, await SAMPLES[key(route)](t, caller), cookie);
        const allowed = route.access === "public" || route.access === "signed-in" || route.access.includes(role);
        const outcome = { route: key(route), ok: res.status >= 200 && res.status < 300, status: res.status };
        if (allowed) expect(outcome, JSON.stringify(res.body)).toMatchObject({ route: key(route), ok: true });
        else expect(outcome).toEqual({ route: key(route), ok: false, status: 403 });
      }
    });
  }
});
