import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Run, User } from "../../server/entities";
import { createTestContext, type TestContext } from "../helpers/test-context";
import { makeDesign, makeRun, type DesignFixture } from "./access-samples/reviews";

// GET /api/runs (history: filters, sorting, paging) and GET /api/runs/compare, over rows written directly.

let t: TestContext;
let agent: Awaited<ReturnType<TestContext["signedInAgent"]>>["agent"];
let ada: User;
let ben: User;
let lowpass: DesignFixture;
let bandpass: DesignFixture;
const runs: Record<string, Run> = {};

const day = (iso: string) => new Date(`${iso}T12:00:00Z`);

beforeAll(async () => {
  t = await createTestContext();
  ({ agent } = await t.signedInAgent(["reviewer"]));
  ada = await t.buildUser({ roles: ["designer"], name: "Ada" });
  ben = await t.buildUser({ roles: ["analyst"], name: "Ben" });
  lowpass = await makeDesign(t, ada, { name: "Alpha low-pass" });
  bandpass = await makeDesign(t, ada, { name: "Beta band-pass" });
  // yields are passed/1000
  runs.a = await makeRun(t, lowpass, ada, { passed: 900, queuedAt: day("2025-03-01") });
  runs.b = await makeRun(t, lowpass, ben, { passed: 990, queuedAt: day("2025-03-02") });
  runs.c = await makeRun(t, bandpass, ben, { passed: 500, queuedAt: day("2025-03-03") });
  runs.d = await makeRun(t, bandpass, ada, { state: "queued", queuedAt: day("2025-03-04") });
  runs.e = await makeRun(t, lowpass, ada, { state: "failed", passed: null, queuedAt: day("2025-03-05") });
});
afterAll(() => t?.close());

const ids = (body: { runs: { id: string }[] }) => body.runs.map((r) => r.id);
const get = (query: string) => agent.get(`/api/runs${query}`);

describe("run history", () => {
  it("needs a session", async () => {
    const res = await request(t.app).get("/api/runs").expect(401);
    expect(res.body.error.code).toBe("UNAUTHENTICATED");
  });

  it("lists every run newest first as RunSummary, with total, page and pageSize defaults", async () => {
    const res = await get("").expect(200);
    expect(res.body).toMatchObject({ total: 5, page: 1, pageSize: 25 });
    expect(ids(res.body)).toEqual([runs.e, runs.d, runs.c, runs.b, runs.a].map((r) => r.id));
    const b = res.body.runs.find((r: { id: string }) => r.id === runs.b.id);
    expect(b).toMatchObject({
      designId: lowpass.design.id, designName: "Alpha low-pass", revisionId: lowpass.revision.id, revisionNumber: 1, limitSetId: lowpass.limitSet.id,
      state: "done", trialsDone: 1000, trialsTotal: 1000, passed: 990, yield: 0.99, seed: 7, launchedBy: { id: ben.id, name: "Ben" },
      queuedAt: "2025-03-02T12:00:00.000Z", bomCost: 1, lotSize: 1000,
    });
    expect(b.wilson95).toEqual([runs.b.wilsonLow, runs.b.wilsonHigh]);
    expect(b).not.toHaveProperty("netlist");
  });

  it("filters by design, revision, launcher, states, dates and yield range", async () => {
    expect(ids((await get(`?designId=${bandpass.design.id}`).expect(200)).body).sort()).toEqual([runs.c.id, runs.d.id].sort());
    expect((await get(`?revisionId=${lowpass.revision.id}`).expect(200)).body.total).toBe(3);
    expect(ids((await get(`?launchedBy=${ben.id}`).expect(200)).body)).toEqual([runs.c.id, runs.b.id]);
    expect(ids((await get("?state=queued,failed").expect(200)).body)).toEqual([runs.e.id, runs.d.id]);
    // from is inclusive at midnight; a date-only `to` includes that whole day
    expect(ids((await get("?from=2025-03-02&to=2025-03-03").expect(200)).body)).toEqual([runs.c.id, runs.b.id]);
    expect(ids((await get("?from=2025-03-02T12:00:00.001Z").expect(200)).body)).toEqual([runs.e.id, runs.d.id, runs.c.id]);
    // yields 0.9, 0.99, 0.5; runs without a yield drop out of a yield filter
    expect(ids((await get("?minYield=0.9&sort=yield&dir=asc").expect(200)).body)).toEqual([runs.a.id, runs.b.id]);
    expect(ids((await get("?maxYield=0.9").expect(200)).body)).toEqual([runs.c.id, runs.a.id]);
    expect((await get(`?designId=${lowpass.design.id}&state=done&minYield=0.95`).expect(200)).body.total).toBe(1);
  });

  it("sorts by yield, design and state, runs without the value last either way", async () => {
    expect(ids((await get("?sort=yield&dir=desc").expect(200)).body)).toEqual([runs.b, runs.a, runs.c, runs.e, runs.d].map((r) => r.id));
    expect(ids((await get("?sort=yield&dir=asc").expect(200)).body)).toEqual([runs.c, runs.a, runs.b, runs.e, runs.d].map((r) => r.id));
    // design name, then newest first inside a design
    expect(ids((await get("?sort=design&dir=asc").expect(200)).body)).toEqual([runs.e, runs.b, runs.a, runs.d, runs.c].map((r) => r.id));
    expect((await get("?sort=state&dir=asc").expect(200)).body.runs.map((r: Run) => r.state)).toEqual(["done", "done", "done", "failed", "queued"]);
    expect(ids((await get("?sort=finishedAt&dir=desc").expect(200)).body).slice(3).sort()).toEqual([runs.d.id, runs.e.id].sort());
  });

  it("pages without overlap", async () => {
    const pages = [];
    for (const page of [1, 2, 3]) pages.push((await get(`?pageSize=2&page=${page}&sort=yield`).expect(200)).body);
    expect(pages.map((p) => p.runs.length)).toEqual([2, 2, 1]);
    expect(pages.every((p) => p.total === 5 && p.pageSize === 2)).toBe(true);
    expect(new Set(pages.flatMap(ids)).size).toBe(5);
    expect((await get("?page=9").expect(200)).body).toMatchObject({ runs: [], total: 5, page: 9 });
  });

  it("answers 400 naming query fields", async () => {
    const cases: [string, string][] = [
      ["?pageSize=101", "query.pageSize"],
      ["?pageSize=0", "query.pageSize"],
      ["?page=1.5", "query.page"],
      ["?sort=cost", "query.sort"],
      ["?dir=up", "query.dir"],
      ["?state=done,lost", "query.state[1]"],
      ["?from=yesterday", "query.from"],
      ["?to=2025-02-30T25:00:00Z", "query.to"],
      ["?minYield=1.2", "query.minYield"],
      ["?minYield=0.9&maxYield=0.5", "query.minYield"],
      ["?designId=42", "query.designId"],
    ];
    for (const [query, field] of cases) {
      const res = await get(query);
      expect({ query, status: res.status, code: res.body.error?.code, fields: Object.keys(res.body.error?.fields ?? {}) }).toEqual({ query, status: 400, code: "VALIDATION_FAILED", fields: [field] });
    }
    expect((await get("?pageSize=101").expect(400)).body.error.message).toBe("query.pageSize: must be ≤ 100");
  });
});

describe("compare", () => {
  it("returns the runs in the order asked, each with its stored result or null", async () => {
    const stored = { trials: 1000, passed: 990, yield: 0.99, ruleFailures: [3, 0, 7, 0, 0] };
    const withResult = await makeRun(t, lowpass, ada, { passed: 990, result: stored });
    const res = await get(`/compare?ids=${runs.d.id},${withResult.id}`).expect(200);
    expect(res.body.runs.map((r: { run: { id: string } }) => r.run.id)).toEqual([runs.d.id, withResult.id]);
    expect(res.body.runs[0]).toMatchObject({ run: { state: "queued", yield: null, wilson95: null }, result: null });
    expect(res.body.runs[1]).toMatchObject({ run: { designName: "Alpha low-pass", yield: 0.99 }, result: stored });
  });

  it("answers 400 for fewer than 2, more than 6, repeated or malformed ids, and 404 for an unknown run", async () => {
    const two = `${runs.a.id},${runs.b.id}`;
    expect((await get(`/compare?ids=${runs.a.id}`).expect(400)).body.error.message).toBe("query.ids: needs at least 2 runs");
    expect((await get(`/compare?ids=${[two, two, two, runs.c.id].join(",")}`).expect(400)).body.error.fields).toHaveProperty(["query.ids"]);
    expect((await get(`/compare?ids=${runs.a.id},${runs.a.id}`).expect(400)).body.error.message).toBe("query.ids: must not repeat a run");
    expect((await get(`/compare?ids=${runs.a.id},nope`).expect(400)).body.error.fields).toHaveProperty(["query.ids[1]"]);
    expect((await get("/compare").expect(400)).body.error.fields).toHaveProperty(["query.ids"]);
    const unknown = "3b241101-e2bb-4255-8caf-4136c566a962";
    const res = await get(`/compare?ids=${two},${unknown}`).expect(404);
    expect(res.body.error.message).toContain(unknown);
  });
});
