import { randomUUID } from "node:crypto";
import request from "supertest";
import { In } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Session, User } from "../../server/entities";
import type { RouteInfo } from "../../server/routes/api-router";
import { ROLES, type Role } from "../../shared/roles";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { SAMPLES, type Sample } from "./access-samples";

// Every API route × no session / a forged session id / a deactivated account / an expired session / each role:
// 401 without a live session, 403 without the role, 2xx with it. The routes come from the app's own route table,
// so a route added without a sample fails this test.
//
// Speed: a refusal happens before input or records are read (routes/api-router.ts authorizes first), so refused
// calls use a placeholder path (a random UUID per parameter: it also shows that a refusal does not depend on the
// record existing) and run several at a time; only allowed calls build a real sample. Sessions are made with
// sessions.create, not by signing in (no argon2 per call).

let t: TestContext;
const people = new Map<Role, User>();
const PARALLEL = 6;

beforeAll(async () => {
  t = await createTestContext();
  for (const role of ROLES) people.set(role, await t.buildUser({ roles: [role] }));
});
afterAll(() => t?.close());

const key = (r: RouteInfo) => `${r.method} ${r.path}`;
const nonPublic = () => t.routes.filter((r) => r.access !== "public");
const cookieOf = (setCookie: string) => setCookie.split(";")[0];

/** The route's path with every parameter replaced: a UUID, or a trial number for `:index`. */
function placeholderPath(route: RouteInfo): string {
  return `/api${route.path.replace(/:(\w+)/g, (_m, name: string) => (name === "index" ? "1" : randomUUID()))}`;
}

/** Every route of this method whose pattern matches the path (as Express would: a parameter is one segment). */
function routesMatching(method: RouteInfo["method"], path: string): RouteInfo[] {
  return t.routes.filter((r) => {
    if (r.method !== method) return false;
    const pattern = r.path.split(/(:\w+)/).map((part) => (part.startsWith(":") ? "[^/]+" : part.replace(/[.*+?^${}()|[\]\\]/g, "\\$&"))).join("");
    return new RegExp(`^/api${pattern}$`).test(path);
  });
}

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

/** Runs `fn` over the items, at most PARALLEL at once; results in input order. */
async function inBatches<T, R>(items: readonly T[], fn: (item: T, index: number) => Promise<R>): Promise<R[]> {
  const out: R[] = [];
  for (let i = 0; i < items.length; i += PARALLEL) out.push(...(await Promise.all(items.slice(i, i + PARALLEL).map((x, k) => fn(x, i + k)))));
  return out;
}

/** Calls every non-public route on a placeholder path with cookies[i] and expects 401 UNAUTHENTICATED for each. */
async function expectAll401(cookies: (string | undefined)[], options: { blankCookie?: boolean } = {}) {
  const routes = nonPublic();
  const outcomes = await inBatches(routes, async (route, i) => {
    const res = await call(route, { path: placeholderPath(route) }, cookies[i]);
    const setCookie = ([] as string[]).concat(res.headers["set-cookie"] ?? []);
    return {
      route: key(route),
      status: res.status,
      code: res.body?.error?.code,
      ...(options.blankCookie ? { clearsCookie: setCookie.some((c) => c.startsWith(`${t.ctx.sessions.cookieName}=;`)) } : {}),
    };
  });
  const want = routes.map((r) => ({ route: key(r), status: 401, code: "UNAUTHENTICATED", ...(options.blankCookie ? { clearsCookie: true } : {}) }));
  expect(outcomes).toEqual(want);
}

describe("access matrix", () => {
  it("has a sample request for every route the app registers", () => {
    expect(t.routes.length).toBeGreaterThan(40);
    const missing = t.routes.map(key).filter((k) => !SAMPLES[k]);
    expect(missing).toEqual([]);
  });

  it("reaches each route with its placeholder path (any other pattern it matches has the same policy)", () => {
    for (const route of t.routes) {
      const matches = routesMatching(route.method, placeholderPath(route));
      expect(matches.map(key)).toContain(key(route));
      expect({ route: key(route), policies: [...new Set(matches.map((m) => JSON.stringify(m.access)))] }).toEqual({ route: key(route), policies: [JSON.stringify(route.access)] });
    }
  });

  it("answers 401 without a session on every non-public route", async () => {
    await expectAll401(nonPublic().map(() => undefined));
  });

  it("answers 401 to a forged session id on every non-public route, and clears the cookie", async () => {
    await expectAll401(nonPublic().map(() => `${t.ctx.sessions.cookieName}=${"a".repeat(40)}`), { blankCookie: true });
  });

  it("answers 401 to a live session of a deactivated account on every non-public route, and ends it", async () => {
    // One deactivated account per route (inserted directly: no password hashing), each with a session made while it
    // was active, so every route meets the "session valid, account inactive" case rather than a session already ended.
    const ids = nonPublic().map(() => randomUUID());
    await t.ctx.dataSource.getRepository(User).insert(ids.map((id, k) => ({
      id, email: `gone-${k}-${id.slice(0, 8)}@lotwise.test`, name: "Former member", roles: [...ROLES], active: true, passwordHash: "not-a-hash",
    })));
    const cookies = await Promise.all(ids.map(async (id) => cookieOf(await t.ctx.sessions.create(id))));
    await t.ctx.dataSource.getRepository(User).update({ id: In(ids) }, { active: false });
    expect(await t.ctx.dataSource.getRepository(User).countBy({ id: In(ids), active: false })).toBe(ids.length);
    await expectAll401(cookies, { blankCookie: true });
    expect(await t.ctx.dataSource.getRepository(Session).countBy({ userId: In(ids) })).toBe(0);
  });

  it("answers 401 to an expired session on every non-public route, and clears the cookie", async () => {
    const holder = await t.buildUser({ roles: [...ROLES] });
    const cookies = await Promise.all(nonPublic().map(async () => cookieOf(await t.ctx.sessions.create(holder.id))));
    await t.ctx.dataSource.getRepository(Session).update({ userId: holder.id }, { expiresAt: new Date(Date.now() - 60_000) });
    await expectAll401(cookies, { blankCookie: true });
  });

  it("serves the public routes to a caller without a session and to one with an expired or forged cookie", async () => {
    const holder = await t.buildUser({ roles: ["admin"] });
    const stale = async () => {
      const cookie = cookieOf(await t.ctx.sessions.create(holder.id));
      await t.ctx.dataSource.getRepository(Session).update({ id: cookie.split("=")[1] }, { expiresAt: new Date(Date.now() - 60_000) });
      return cookie;
    };
    const cases = t.routes.filter((r) => r.access === "public").flatMap((route) => (["none", "expired", "forged"] as const).map((state) => ({ route, state })));
    const outcomes = await inBatches(cases, async ({ route, state }) => {
      const cookie = state === "none" ? undefined : state === "expired" ? await stale() : `${t.ctx.sessions.cookieName}=${"b".repeat(40)}`;
      const res = await call(route, await SAMPLES[key(route)](t, holder), cookie);
      return { route: key(route), state, ok: res.status >= 200 && res.status < 300, ...(res.status >= 300 ? { status: res.status, body: res.body } : {}) };
    });
    expect(outcomes).toEqual(cases.map(({ route, state }) => ({ route: key(route), state, ok: true })));
  });

  for (const role of ROLES) {
    it(`answers 403 without the role and 2xx with it, as ${role}`, async () => {
      const caller = people.get(role)!;
      const allowed = (r: RouteInfo) => r.access === "public" || r.access === "signed-in" || r.access.includes(role);
      const denied = t.routes.filter((r) => !allowed(r));
      const cookie = cookieOf(await t.ctx.sessions.create(caller.id));
      const refusals = await inBatches(denied, async (route) => {
        const res = await call(route, { path: placeholderPath(route) }, cookie);
        return { route: key(route), status: res.status, code: res.body?.error?.code };
      });
      expect(refusals).toEqual(denied.map((r) => ({ route: key(r), status: 403, code: "FORBIDDEN" })));

      // Allowed calls, each with its own real sample (samples build their own records, so they may run side by side)
      // and a fresh session (sign-out ends the one it is given).
      const granted = t.routes.filter(allowed);
      const outcomes = await inBatches(granted, async (route) => {
        const session = cookieOf(await t.ctx.sessions.create(caller.id));
        const res = await call(route, await SAMPLES[key(route)](t, caller), session);
        return { route: key(route), ok: res.status >= 200 && res.status < 300, ...(res.status >= 300 ? { status: res.status, body: res.body } : {}) };
      });
      expect(outcomes).toEqual(granted.map((r) => ({ route: key(r), ok: true })));
    });
  }
});
