import request from "supertest";
import type { z } from "zod";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { User } from "../../server/entities";
import type { RouteInfo } from "../../server/routes/api-router";
import { CONTRACTS, NON_JSON_ENDPOINTS, RUN_STREAM_EVENTS, type EndpointContract } from "../../shared/contracts";
import { fieldPath } from "../../shared/schemas/field-path";
import { ROLES } from "../../shared/roles";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { SAMPLES, type Sample } from "./access-samples";
import { makeRunFixture } from "./access-samples/runs";

// Every route of the app's own route table has a contract (shared/contracts), or is one of the few that answer
// something other than JSON. Each route is called with its access-matrix sample by a person holding every role, and
// its answer must parse with the contract's response schema (strict objects: a field the contract does not name
// fails too). A route's validated body and query must be the very schema objects its contract names, so the client
// forms that check with the contract check what the server checks.

let t: TestContext;
let everyone: User;
const contracts: Record<string, EndpointContract> = CONTRACTS;
const nonJson: Record<string, string> = NON_JSON_ENDPOINTS;
const key = (r: RouteInfo) => `${r.method} ${r.path}`;
const cookieOf = (setCookie: string) => setCookie.split(";")[0];

beforeAll(async () => {
  t = await createTestContext();
  everyone = await t.buildUser({ roles: [...ROLES] });
});
afterAll(() => t?.close());

/** The sample request, signed in (a fresh session: sign-out ends the one it is given) unless the route is public. */
async function call(route: RouteInfo, sample: Sample) {
  let req = request(t.app)[route.method](sample.path).set("Origin", ORIGIN);
  if (route.access !== "public") req = req.set("Cookie", cookieOf(await t.ctx.sessions.create(everyone.id)));
  if (sample.files) {
    for (const [field, value] of Object.entries(sample.fields ?? {})) req = req.field(field, value);
    for (const [field, file] of Object.entries(sample.files)) req = req.attach(field, Buffer.from(file.content), file.filename);
    return req;
  }
  return sample.body === undefined ? req : req.send(sample.body as object);
}

/** Where and why an answer does not parse, one line per issue (`designs[0].owner.name: expected string`). */
function mismatches(schema: z.ZodType, body: unknown): string[] {
  const parsed = schema.safeParse(body);
  return parsed.success ? [] : parsed.error.issues.map((i) => `${fieldPath(i.path) || "(body)"}: ${i.message}`);
}

describe("API contracts", () => {
  it("names a contract for every JSON route, and only routes that exist", () => {
    const routes = t.routes.map(key);
    expect(routes.filter((k) => !contracts[k] && !nonJson[k])).toEqual([]);
    expect([...Object.keys(contracts), ...Object.keys(nonJson)].filter((k) => !routes.includes(k))).toEqual([]);
    expect(Object.keys(contracts).filter((k) => nonJson[k])).toEqual([]);
  });

  it("validates each route's body and query with the contract's own schema objects", () => {
    const drift = t.routes.flatMap((route) => {
      const c = contracts[key(route)];
      if (!c) return [];
      const out: string[] = [];
      if (route.body !== c.body) out.push(`${key(route)}: body schema`);
      if (route.query && route.query !== c.query) out.push(`${key(route)}: query schema`);
      return out;
    });
    expect(drift).toEqual([]);
  });

  it("answers every JSON route with a body its contract parses (204 routes with no body)", async () => {
    const outcomes: { route: string; status: number; problems: string[] }[] = [];
    for (const route of t.routes) {
      const c = contracts[key(route)];
      if (!c) continue;
      const res = await call(route, await SAMPLES[key(route)](t, everyone));
      const problems =
        res.status >= 300
          ? [`status ${res.status}: ${JSON.stringify(res.body)}`]
          : c.response === null
            ? res.status === 204 ? [] : [`expected 204, got ${res.status}`]
            : mismatches(c.response, res.body);
      outcomes.push({ route: key(route), status: res.status, problems });
    }
    expect(outcomes.filter((o) => o.problems.length)).toEqual([]);
    expect(outcomes.length).toBeGreaterThan(40);
  });

  it("answers the non-JSON routes with their content type", async () => {
    const outcomes: { route: string; type: string }[] = [];
    for (const route of t.routes) {
      const want = nonJson[key(route)];
      if (!want) continue;
      const res = await call(route, await SAMPLES[key(route)](t, everyone));
      outcomes.push({ route: key(route), type: `${res.status} ${String(res.headers["content-type"]).split(";")[0]}` });
    }
    expect(outcomes).toEqual(Object.entries(nonJson).map(([route, type]) => ({ route, type: `200 ${type}` })));
  });

  it("parses a finished run's detail, compare entry, history page and replayed trial, result included", async () => {
    const f = await makeRunFixture(t, everyone, { name: "Contract low-pass" });
    const cookie = cookieOf(await t.ctx.sessions.create(everyone.id));
    const launch = async () => {
      const res = await request(t.app).post("/api/runs").set("Origin", ORIGIN).set("Cookie", cookie).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 40, seed: 7 });
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(mismatches(CONTRACTS["post /runs"].response, res.body)).toEqual([]);
      return res.body.run.id as string;
    };
    const ids = [await launch(), await launch()];
    await t.ctx.runQueue.idle();
    const get = (path: string) => request(t.app).get(path).set("Cookie", cookie);

    const detail = await get(`/api/runs/${ids[0]}`);
    expect(detail.body.run.state).toBe("done");
    expect(detail.body.result).not.toBeNull();
    expect(mismatches(CONTRACTS["get /runs/:id"].response, detail.body)).toEqual([]);
    const compare = await get(`/api/runs/compare?ids=${ids.join(",")}`);
    expect(mismatches(CONTRACTS["get /runs/compare"].response, compare.body)).toEqual([]);
    const page = await get(`/api/runs?designId=${f.design.id}`);
    expect(page.body.runs).toHaveLength(2);
    expect(mismatches(CONTRACTS["get /runs"].response, page.body)).toEqual([]);
    const trial = await get(`/api/runs/${ids[0]}/trials/3`);
    expect(mismatches(CONTRACTS["get /runs/:id/trials/:index"].response, trial.body)).toEqual([]);
    const design = await get(`/api/designs/${f.design.id}`);
    expect(design.body.design.latestYield).not.toBeNull();
    expect(mismatches(CONTRACTS["get /designs/:id"].response, design.body)).toEqual([]);
  });

  it("streams progress and end events whose data parse with the stream's contract", async () => {
    const f = await makeRunFixture(t, everyone, { name: "Contract stream" });
    const cookie = cookieOf(await t.ctx.sessions.create(everyone.id));
    const launched = await request(t.app).post("/api/runs").set("Origin", ORIGIN).set("Cookie", cookie).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 20_000, seed: 5 });
    expect(launched.status, JSON.stringify(launched.body)).toBe(201);
    const res = await request(t.app)
      .get(`/api/runs/${launched.body.run.id}/events`)
      .set("Cookie", cookie)
      .buffer(true)
      .parse((r, cb) => {
        let text = "";
        r.setEncoding("utf8");
        r.on("data", (c: string) => (text += c));
        r.on("end", () => cb(null, text));
      });
    const events = String(res.body).split("\n\n").filter((b) => b.trim()).map((block) => ({
      event: /^event: (.*)$/m.exec(block)?.[1] ?? "(none)",
      data: JSON.parse(/^data: (.*)$/m.exec(block)?.[1] ?? "null") as unknown,
    }));
    const streams: Record<string, z.ZodType> = RUN_STREAM_EVENTS;
    expect(events.flatMap((e) => (streams[e.event] ? mismatches(streams[e.event], e.data).map((m) => `${e.event}: ${m}`) : [`unknown event ${e.event}`]))).toEqual([]);
    expect(events.at(-1)).toEqual({ event: "end", data: { state: "done" } });
    expect(events.some((e) => e.event === "progress")).toBe(true);
  });

  it("fails an answer that leaves out a field, adds one or changes its type", () => {
    const schema = CONTRACTS["get /auth/me"].response;
    const user = { id: everyone.id, email: everyone.email, name: everyone.name, roles: everyone.roles };
    expect(mismatches(schema, { user })).toEqual([]);
    expect(mismatches(schema, { user: { ...user, name: undefined } })).toEqual(["user.name: Invalid input: expected string, received undefined"]);
    expect(mismatches(schema, { user: { ...user, passwordHash: "x" } })).toEqual(['user: Unrecognized key: "passwordHash"']);
    expect(mismatches(schema, { user: { ...user, roles: ["owner"] } })).toHaveLength(1);
  });
});
