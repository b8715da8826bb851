import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { User } from "../../server/entities";
import type { RouteInfo } from "../../server/routes/api-router";
import { ROLES, type Role } from "../../shared/roles";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { SAMPLES, type Sample } from "./access-samples";

// Every API route × no session / each role: 401 without a session, 403 without the role, 2xx with it.
// The routes come from the app's own route table, so a route added without a sample below fails this test.

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
  if (sample.files) {
    for (const [field, value] of Object.entries(sample.fields ?? {})) req = req.field(field, value);
    for (const [field, file] of Object.entries(sample.files)) req = req.attach(field, Buffer.from(file.content), file.filename);
    return req;
  }
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
