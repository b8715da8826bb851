import http from "node:http";
import type { AddressInfo } from "node:net";
import { randomUUID } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DesignRevision, GradeSweep, Run, type User } from "../../server/entities";
import { createRunQueue } from "../../server/services/run-queue";
import { createEmbeddedDispatcher } from "../../server/engine/dispatcher";
import type { Netlist } from "../../shared/engine/netlist";
import { recordingLogger } from "../helpers/distributed";
import { createTestContext, ORIGIN, TEST_PASSWORD, type TestContext } from "../helpers/test-context";
import { insertRun, LOWPASS, makeRunFixture } from "./access-samples/runs";

// Issue 10 ("Trust"), the faults of runs and revisions: each case below failed on the code before the fix (noted
// beside it). Real MariaDB, real HTTP, real worker threads.

type Agent = ReturnType<typeof request.agent>;
let t: TestContext;
let designer: { agent: Agent; user: User };
let reviewer: { agent: Agent; user: User };
let planner: { agent: Agent; user: User };
let analyst: { agent: Agent; user: User };
let admin: { agent: Agent; user: User };

/** An n-section LC low-pass ladder (series L, shunt C), 50 ohm: a large circuit for cost and export tests. */
function longLadder(sections: number): Netlist {
  const parts: Netlist["parts"] = [];
  for (let k = 0; k < sections; k++) {
    parts.push({ ref: `L${k + 1}`, kind: "L", nodes: [`n${k}`, `n${k + 1}`], value: 80e-9, tolerance: 0.05 });
    parts.push({ ref: `C${k + 1}`, kind: "C", nodes: [`n${k + 1}`, "gnd"], value: 32e-12, tolerance: 0.05 });
  }
  return { name: `ladder of ${sections} sections`, ports: [{ name: "in", node: "n0", z0: 50 }, { name: "out", node: `n${sections}`, z0: 50 }], parts };
}
const HEAVY = longLadder(100); // 200 parts
const HEAVY_SWEEP = { from: 1e6, to: 1e9, points: 10001, scale: "log" as const };
const HEAVY_CORNERS = [-40, -10, 25, 55, 85];

beforeAll(async () => {
  t = await createTestContext({ maxRunning: 3, poolSize: 1 });
  designer = await t.signedInAgent(["designer"]);
  reviewer = await t.signedInAgent(["reviewer"]);
  planner = await t.signedInAgent(["planner"]);
  analyst = await t.signedInAgent(["analyst"]);
  admin = await t.signedInAgent(["admin"]);
}, 30_000);
afterAll(() => t?.close());

const post = (agent: Agent, path: string) => agent.post(path).set("Origin", ORIGIN);
const put = (agent: Agent, path: string) => agent.put(path).set("Origin", ORIGIN);
const changedNetlist = (n: Netlist, factor: number): Netlist => ({ ...n, parts: n.parts.map((p, k) => (k === 0 ? { ...p, value: p.value * factor } : p)) });

async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, ms = 20_000): Promise<T> {
  const until = Date.now() + ms;
  for (;;) {
    const v = await probe();
    if (v) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}
const runRow = (id: string) => t.ctx.dataSource.getRepository(Run).findOneByOrFail({ id });

describe("review states freeze the revision (fault 1)", () => {
  // Before: PUT on an approved (or in-review) revision answered 200 and changed its values.
  it("refuses an edit while awaiting sign-off, after sign-off and after a return for rework, with 409 and nothing changed", async () => {
    const f = await makeRunFixture(t, designer.user);
    const path = `/api/revisions/${f.revision.id}`;
    await post(designer.agent, `${path}/review`).send({ action: "submit" }).expect(200);
    const inReview = await put(designer.agent, path).send({ netlist: changedNetlist(LOWPASS, 3) }).expect(409);
    expect(inReview.body.error).toMatchObject({ code: "REVISION_LOCKED" });
    expect(inReview.body.error.message).toMatch(/awaiting sign-off.*new revision/);
    await post(reviewer.agent, `${path}/review`).send({ action: "sign-off", comment: "ok" }).expect(200);
    const approved = await put(designer.agent, path).send({ netlist: changedNetlist(LOWPASS, 3) }).expect(409);
    expect(approved.body.error.message).toMatch(/signed off/);
    const stored = await t.ctx.dataSource.getRepository(DesignRevision).findOneByOrFail({ id: f.revision.id });
    expect(stored.netlist).toEqual(LOWPASS);
    expect(stored.locked).toBe(true);
    // a change goes into a new revision, which starts as an editable draft
    const copy = await post(designer.agent, `/api/designs/${f.design.id}/revisions`).send({ netlist: changedNetlist(LOWPASS, 3), parentId: f.revision.id }).expect(201);
    expect(copy.body.revision).toMatchObject({ number: 2, reviewState: "draft", locked: false });

    const g = await makeRunFixture(t, designer.user);
    await post(designer.agent, `/api/revisions/${g.revision.id}/review`).send({ action: "submit" }).expect(200);
    await post(reviewer.agent, `/api/revisions/${g.revision.id}/review`).send({ action: "return", comment: "C1?" }).expect(200);
    await put(designer.agent, `/api/revisions/${g.revision.id}`).send({ netlist: changedNetlist(LOWPASS, 2) }).expect(409);
  });
});

describe("a run's sweep is the server's to set (fault 2)", () => {
  // Before: POST /api/runs took a client-sent sweepId (any id, another person's sweep) and answered 201.
  it("refuses sweepId in POST /api/runs with 400 naming the field, and stores nothing", async () => {
    const f = await makeRunFixture(t, analyst.user);
    const sweep = await post(analyst.agent, "/api/sweeps").send({
      revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 50, seed: 3, targetYield: 0.5,
      assignments: [{ label: "as drawn", gradeOverrides: {} }],
    }).expect(201);
    const before = await t.ctx.dataSource.getRepository(Run).countBy({ sweepId: sweep.body.sweep.id });
    for (const sweepId of [sweep.body.sweep.id, randomUUID()]) {
      const res = await post(planner.agent, "/api/runs").send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 50, sweepId, toleranceOverrides: { C1: { tolerance: 0 } } }).expect(400);
      expect(res.body.error.fields).toHaveProperty(["sweepId"]);
    }
    expect(await t.ctx.dataSource.getRepository(Run).countBy({ sweepId: sweep.body.sweep.id })).toBe(before);
  });

  it("keeps a run's sweep a real reference: removing a sweep clears it from its runs", async () => {
    const f = await makeRunFixture(t, analyst.user);
    const sweep = await post(analyst.agent, "/api/sweeps").send({
      revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 20, seed: 3, targetYield: 0.5, assignments: [{ label: "a", gradeOverrides: {} }],
    }).expect(201);
    const runId = sweep.body.runs[0].id;
    const bogus = t.ctx.dataSource.getRepository(Run).update({ id: runId }, { sweepId: randomUUID() });
    await expect(bogus).rejects.toThrow(/foreign key/i);
    await t.ctx.runQueue.idle();
    await t.ctx.dataSource.getRepository(GradeSweep).delete({ id: sweep.body.sweep.id });
    expect((await runRow(runId)).sweepId).toBeNull();
  });
});

describe("fields the server owns are refused, not ignored", () => {
  // Before: these bodies were parsed leniently and the extra field silently dropped (201/200).
  it("names the field in a 400 on comments, reviews, sweeps, invitations and member changes", async () => {
    const f = await makeRunFixture(t, analyst.user);
    const run = await insertRun(t, analyst.user, "done", 10);
    const cases: [Agent, "post" | "patch", string, Record<string, unknown>, string][] = [
      [analyst.agent, "post", `/api/runs/${run.id}/comments`, { body: "fine", authorId: admin.user.id }, "authorId"],
      [designer.agent, "post", `/api/revisions/${f.revision.id}/review`, { action: "submit", actorId: reviewer.user.id }, "actorId"],
      [analyst.agent, "post", "/api/sweeps", { revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 10, targetYield: 0.5, createdById: admin.user.id, assignments: [{ label: "a", gradeOverrides: {} }] }, "createdById"],
      [analyst.agent, "post", "/api/sweeps", { revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 10, targetYield: 0.5, assignments: [{ label: "a", gradeOverrides: {}, sweepId: randomUUID() }] }, "assignments[0].sweepId"],
      [admin.agent, "post", "/api/team/invitations", { email: "x-owned@lotwise.test", roles: ["analyst"], invitedById: analyst.user.id }, "invitedById"],
      [admin.agent, "patch", `/api/team/members/${planner.user.id}`, { name: "P", email: "other@lotwise.test" }, "email"],
    ];
    for (const [agent, method, path, body, field] of cases) {
      const res = await agent[method](path).set("Origin", ORIGIN).send(body);
      expect(res.status, `${method} ${path}`).toBe(400);
      expect(res.body.error.fields, `${method} ${path}`).toHaveProperty([field]);
    }
    expect(await t.ctx.dataSource.getRepository(GradeSweep).countBy({ revisionId: f.revision.id })).toBe(0);
  });
});

describe("validation gaps (fault 9)", () => {
  // Before: each of these was stored (201/200) and failed later, in the queue or the worker.
  it("refuses an absolute tolerance as large as the value when the revision is saved", async () => {
    const f = await makeRunFixture(t, designer.user);
    const netlist: Netlist = { ...LOWPASS, parts: [{ ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 8.2e-12, toleranceAbs: 1 }, ...LOWPASS.parts.slice(1)] };
    const res = await put(designer.agent, `/api/revisions/${f.revision.id}`).send({ netlist }).expect(400);
    expect(res.body.error.fields).toHaveProperty(["netlist.parts[0].toleranceAbs"]);
    const made = await post(designer.agent, `/api/designs/${f.design.id}/revisions`).send({ netlist }).expect(400);
    expect(made.body.error.code).toBe("INVALID_NETLIST");
  });

  it("refuses a sweep or a rule band beyond 1 mHz … 1 THz, naming the field", async () => {
    const f = await makeRunFixture(t, designer.user);
    const res = await put(designer.agent, `/api/revisions/${f.revision.id}`).send({ netlist: LOWPASS, sweep: { from: 1e-300, to: 1e308, points: 11 } }).expect(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(["sweep.from", "sweep.to"]);
    const lim = await put(planner.agent, `/api/limit-sets/${f.limitSet.id}`).send({ name: "x", lotSize: 100, limits: { rules: [{ metric: "s21_db", from: 1e6, to: 1e300, min: -1 }] } });
    expect(lim.status).toBe(400);
    expect(JSON.stringify(lim.body.error.fields)).toContain("rules[0].to");
  });

  it("refuses `__proto__` as a part ref in grade and tolerance overrides instead of ignoring it", async () => {
    const f = await makeRunFixture(t, analyst.user);
    const body = `{"revisionId":"${f.revision.id}","limitSetId":"${f.limitSet.id}","trials":10,"gradeOverrides":{"__proto__":"J"}}`;
    const res = await post(analyst.agent, "/api/runs").set("Content-Type", "application/json").send(body).expect(400);
    expect(res.body.error.fields).toHaveProperty(["gradeOverrides.__proto__"]);
    const tol = `{"revisionId":"${f.revision.id}","limitSetId":"${f.limitSet.id}","trials":10,"toleranceOverrides":{"__proto__":{"tolerance":0}}}`;
    expect((await post(analyst.agent, "/api/runs").set("Content-Type", "application/json").send(tol).expect(400)).body.error.fields).toHaveProperty(["toleranceOverrides.__proto__"]);
    expect(await t.ctx.dataSource.getRepository(Run).countBy({ revisionId: f.revision.id })).toBe(0);
  });
});

describe("launch and edit race (fault 4)", () => {
  // Before: in 4 of 16 tries both requests succeeded, and the run held the old values while the locked revision held the new.
  it("a run always copies the values its revision keeps, whatever the order of a launch and an edit", async () => {
    let bothSucceeded = 0;
    for (let k = 0; k < 16; k++) {
      const f = await makeRunFixture(t, designer.user);
      const edited = changedNetlist(LOWPASS, 1.5);
      // 0–28 ms apart, either one first, so every ordering of the two transactions gets tried
      const later = <T>(ms: number, send: () => PromiseLike<T>) => new Promise<T>((resolve, reject) => setTimeout(() => send().then(resolve, reject), ms));
      const gap = (k % 8) * 4;
      const [edit, launch] = await Promise.all([
        later(k < 8 ? gap : 0, () => put(designer.agent, `/api/revisions/${f.revision.id}`).send({ netlist: edited })),
        later(k < 8 ? 0 : gap, () => post(designer.agent, "/api/runs").send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 5, seed: k })),
      ]);
      expect([200, 409]).toContain(edit.status);
      expect(launch.status).toBe(201);
      const stored = await t.ctx.dataSource.getRepository(DesignRevision).findOneByOrFail({ id: f.revision.id });
      expect((await runRow(launch.body.run.id)).netlist).toEqual(stored.netlist);
      expect(stored.netlist).toEqual(edit.status === 200 ? edited : LOWPASS);
      if (edit.status === 200) bothSucceeded++;
    }
    console.log(`launch/edit race: ${bothSucceeded} of 16 edits landed before the launch, the rest were refused 409`);
    expect(bothSucceeded).toBeLessThan(16); // the orderings were really mixed
    await t.ctx.runQueue.idle();
  }, 60_000);
});

describe("compute limits (fault 3)", () => {
  // Before: 1,000,000 trials of a 500-part, 10,001-point, 10-corner circuit answered 201.
  it("refuses a run over the cost limit with 400 naming trials and the most trials allowed; the admin can change the limit", async () => {
    const f = await makeRunFixture(t, analyst.user, { netlist: HEAVY, sweep: HEAVY_SWEEP, limits: { rules: [{ metric: "s21_db", from: 1e6, to: 5e6, min: -3 }] } });
    const res = await post(analyst.agent, "/api/runs").send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 1_000_000, corners: HEAVY_CORNERS }).expect(400);
    expect(res.body.error.code).toBe("RUN_TOO_COSTLY");
    expect(res.body.error.fields.trials).toMatch(/at most \d+ trials/);
    expect(await t.ctx.dataSource.getRepository(Run).countBy({ revisionId: f.revision.id })).toBe(0);

    const small = await makeRunFixture(t, analyst.user);
    const limits = (await analyst.agent.get("/api/settings/compute-limits").expect(200)).body.limits;
    expect(limits).toEqual({ maxRunCost: 2e10, maxTrialCost: 3e6, maxExportCost: 1e9, maxExportSeconds: 60 });
    await put(analyst.agent, "/api/settings/compute-limits").send({ ...limits, maxRunCost: 1e6 }).expect(403);
    const bad = await put(admin.agent, "/api/settings/compute-limits").send({ ...limits, maxRunCost: -5 }).expect(400);
    expect(bad.body.error.fields).toHaveProperty(["maxRunCost"]);
    await put(admin.agent, "/api/settings/compute-limits").send({ ...limits, maxRunCost: 1e6 }).expect(200);
    try {
      // 103 grid points × 3 parts × 1 corner = 309 per trial: 3,236 trials fit in 1e6
      const over = await post(analyst.agent, "/api/runs").send({ revisionId: small.revision.id, limitSetId: small.limitSet.id, trials: 5000 }).expect(400);
      expect(over.body.error.fields.trials).toMatch(/at most 3236 trials/);
      await post(analyst.agent, "/api/runs").send({ revisionId: small.revision.id, limitSetId: small.limitSet.id, trials: 3000 }).expect(201);
    } finally {
      await put(admin.agent, "/api/settings/compute-limits").send(limits).expect(200);
    }
    // [C] one trial of 10 corners × 10,002 grid points (10,001 sweep points + the 5 MHz band edge) × 200 parts = 2.0004e7
    // part evaluations, over the per-trial limit (3e6, the default in shared/schemas/settings.ts) however few trials: named by corners
    const perTrial = await post(analyst.agent, "/api/runs").send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 5, corners: [-40, -25, -10, 0, 10, 25, 40, 55, 70, 85] }).expect(400);
    expect(perTrial.body.error.fields.corners).toMatch(/one trial of this run would cost 2\.00e7 .* the limit per trial is 3\.00e6/);
    const oneCorner = await post(analyst.agent, "/api/runs").send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 5 }).expect(201); // 200 × 10,002 ≈ 2.0e6
    await t.ctx.runQueue.cancel(oneCorner.body.run.id);
    await t.ctx.runQueue.idle();
  }, 30_000);
});

describe("replays and exports run off the request thread (fault 3)", () => {
  let heavyRun: Run;
  beforeAll(async () => {
    // A finished run of the heavy circuit, written directly: replays and exports need only its inputs and seed.
    heavyRun = await insertRun(t, analyst.user, "done", 200);
    await t.ctx.dataSource.getRepository(Run).update({ id: heavyRun.id }, {
      netlist: HEAVY, limits: { rules: [{ metric: "s21_db", from: 1e6, to: 5e6, min: -3 }] }, options: { trials: 200, seed: 5, sweep: HEAVY_SWEEP, corners: HEAVY_CORNERS },
    });
  });

  // Before: the replay ran on the main thread, and /api/health waited for it.
  it("answers /api/health while a large replay computes", async () => {
    const order: string[] = [];
    const replay = analyst.agent.get(`/api/runs/${heavyRun.id}/trials/3`).then((r) => {
      order.push("replay");
      return r;
    });
    await new Promise((r) => setTimeout(r, 300));
    const started = Date.now();
    const health = await request(t.app).get("/api/health");
    const healthMs = Date.now() - started;
    order.push("health");
    const r = await replay;
    expect(r.status, JSON.stringify(r.body).slice(0, 300)).toBe(200);
    expect(r.body.trial.parts).toHaveLength(200);
    console.log(`health during a ${HEAVY.parts.length}-part × ${HEAVY_SWEEP.points}-point × ${HEAVY_CORNERS.length}-corner replay: ${healthMs} ms`);
    expect(health.status).toBe(200);
    expect(order).toEqual(["health", "replay"]);
  }, 60_000);

  // Before: exports of cancelled (and queued) runs were computed.
  it("refuses replays and trial exports of a run that is not done, with 409", async () => {
    for (const state of ["cancelled", "queued", "failed"] as const) {
      const run = await insertRun(t, analyst.user, state === "queued" ? "running" : state, 20);
      if (state === "queued") await t.ctx.dataSource.getRepository(Run).update({ id: run.id }, { state: "queued" });
      for (const path of ["trials/3", "trials/3.s2p", "trials.csv"]) {
        const res = await analyst.agent.get(`/api/runs/${run.id}/${path}`);
        expect(res.status, `${state} ${path}`).toBe(409);
        expect(res.body.error.code).toBe("RUN_NOT_DONE");
      }
      if (state === "queued") await t.ctx.runQueue.cancel(run.id);
    }
  });

  it("refuses a CSV export over the export cost limit before writing anything", async () => {
    const res = await analyst.agent.get(`/api/runs/${heavyRun.id}/trials.csv`).expect(400);
    expect(res.body.error.code).toBe("RUN_TOO_COSTLY");
    expect(res.body.error.fields.trials).toMatch(/export limit/);
  });

  it("stops an export past its time budget (the download ends short) and keeps the server answering", async () => {
    const limits = (await admin.agent.get("/api/settings/compute-limits").expect(200)).body.limits;
    await put(admin.agent, "/api/settings/compute-limits").send({ ...limits, maxExportCost: 1e12, maxExportSeconds: 1 }).expect(200);
    try {
      const server = http.createServer(t.app).listen(0, "127.0.0.1");
      await new Promise((r) => server.once("listening", r));
      const port = (server.address() as AddressInfo).port;
      const cookie = await signInCookie(analyst.user);
      const started = Date.now();
      const outcome = await new Promise<{ bytes: number; complete: boolean; error?: string }>((resolve) => {
        http.get({ host: "127.0.0.1", port, path: `/api/runs/${heavyRun.id}/trials.csv`, headers: { cookie } }, (res) => {
          let bytes = 0;
          res.on("data", (c: Buffer) => (bytes += c.length));
          res.on("end", () => resolve({ bytes, complete: res.complete }));
          res.on("error", (e) => resolve({ bytes, complete: false, error: e.message }));
          res.on("aborted", () => resolve({ bytes, complete: false, error: "aborted" }));
        }).on("error", (e) => resolve({ bytes: 0, complete: false, error: e.message }));
      });
      const seconds = (Date.now() - started) / 1000;
      console.log(`export past its 1 s budget: stopped after ${seconds.toFixed(1)} s with ${outcome.bytes} bytes (${outcome.error ?? "ended"})`);
      expect(outcome.complete).toBe(false);
      expect(seconds).toBeLessThan(20);
      server.close();
    } finally {
      await put(admin.agent, "/api/settings/compute-limits").send(limits).expect(200);
    }
    // the export thread is free again: a replay of a small finished run answers
    const small = await insertRun(t, analyst.user, "done", 20);
    await analyst.agent.get(`/api/runs/${small.id}/trials/2`).expect(200);
  }, 60_000);
});

describe("a slowly read trials CSV (fault 12, the listener warning)", () => {
  // Before: every back-pressure wait added a `close` listener that stayed, and a slow download logged MaxListenersExceededWarning.
  it("streams 100,000 rows to a slow reader with correct back-pressure and no listener left behind", async () => {
    const run = await insertRun(t, analyst.user, "done", 100_000);
    const warnings: string[] = [];
    const onWarning = (w: Error) => warnings.push(`${w.name}: ${w.message}`);
    process.on("warning", onWarning);
    const server = http.createServer(t.app).listen(0, "127.0.0.1");
    await new Promise((r) => server.once("listening", r));
    try {
      const port = (server.address() as AddressInfo).port;
      const cookie = await signInCookie(analyst.user);
      const { rows, pauses } = await new Promise<{ rows: number; pauses: number }>((resolve, reject) => {
        http.get({ host: "127.0.0.1", port, path: `/api/runs/${run.id}/trials.csv`, headers: { cookie } }, (res) => {
          let rows = 0;
          let pauses = 0;
          res.on("data", (c: Buffer) => {
            for (const b of c) if (b === 10) rows++;
            res.pause(); // a slow reader: the server's socket fills and it must wait for `drain`, many times
            pauses++;
            setTimeout(() => res.resume(), 2);
          });
          res.on("end", () => resolve({ rows, pauses }));
          res.on("error", reject);
        }).on("error", reject);
      });
      console.log(`slow CSV reader: ${rows - 1} rows in ${pauses} bursts`);
      expect(rows).toBe(100_001);
      await new Promise((r) => setTimeout(r, 100)); // warnings are emitted on the next tick
      expect(warnings.filter((w) => w.includes("MaxListeners"))).toEqual([]);
    } finally {
      process.off("warning", onWarning);
      server.close();
    }
  }, 90_000);
});

describe("an export stops when its client leaves (fault 3)", () => {
  // Before: a trials CSV kept computing on the server's thread for seconds after the client had gone.
  it("stops computing the trials CSV once the download is dropped", async () => {
    const run = await insertRun(t, analyst.user, "done", 200);
    await t.ctx.dataSource.getRepository(Run).update({ id: run.id }, {
      netlist: HEAVY, limits: { rules: [{ metric: "s21_db", from: 1e6, to: 5e6, min: -3 }] }, options: { trials: 200, seed: 9, sweep: HEAVY_SWEEP },
    });
    const limits = (await admin.agent.get("/api/settings/compute-limits").expect(200)).body.limits;
    await put(admin.agent, "/api/settings/compute-limits").send({ ...limits, maxExportCost: 1e12 }).expect(200);
    const log = recordingLogger();
    const quiet = t.ctx.log;
    t.ctx.log = log;
    const server = http.createServer(t.app).listen(0, "127.0.0.1");
    await new Promise((r) => server.once("listening", r));
    try {
      const port = (server.address() as AddressInfo).port;
      const cookie = await signInCookie(analyst.user);
      await new Promise<void>((resolve, reject) => {
        const req = http.get({ host: "127.0.0.1", port, path: `/api/runs/${run.id}/trials.csv`, headers: { cookie } }, (res) => {
          res.once("data", () => {
            req.destroy(); // the person closes the tab after the first rows
            resolve();
          });
        });
        req.on("error", () => undefined);
        setTimeout(() => reject(new Error("no data")), 30_000);
      });
      await waitFor("the export to stop", async () => log.lines.some((l) => l.event === "export_stopped" && l.fields?.reason === "client_gone"), 10_000);
    } finally {
      t.ctx.log = quiet;
      server.close();
      await put(admin.agent, "/api/settings/compute-limits").send(limits).expect(200);
    }
  }, 60_000);
});

async function signInCookie(user: User): Promise<string> {
  const res = await request(t.app).post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: user.email, password: TEST_PASSWORD }).expect(200);
  return (res.headers["set-cookie"] as unknown as string[]).map((c) => c.split(";")[0]).join("; ");
}

describe("fair sharing of the queue (fault 3)", () => {
  // Before: the small run's chunks queued behind every chunk of the big run already on the pool, so it finished after it.
  it("a small run of one person finishes while another person's big run executes; one person's second run waits its turn", async () => {
    const big = await makeRunFixture(t, planner.user);
    const small = await makeRunFixture(t, analyst.user);
    const bigIds: string[] = [];
    for (const seed of [1, 2]) {
      bigIds.push((await post(planner.agent, "/api/runs").send({ revisionId: big.revision.id, limitSetId: big.limitSet.id, trials: 300_000, seed }).expect(201)).body.run.id);
    }
    await waitFor("the big run to start", async () => (await runRow(bigIds[0])).state === "running");
    const smallId = (await post(analyst.agent, "/api/runs").send({ revisionId: small.revision.id, limitSetId: small.limitSet.id, trials: 5000, seed: 9 }).expect(201)).body.run.id;
    await waitFor("the small run to finish", async () => (await runRow(smallId)).state === "done", 60_000);
    const [first, second] = await Promise.all(bigIds.map(runRow));
    console.log(`fair share: small run done while the big run had ${first.trialsDone} of ${first.trialsTotal} trials`);
    expect(first.state).toBe("running");
    expect(second.state).toBe("queued"); // the same person's next run waits for their first
    for (const id of bigIds) await t.ctx.runQueue.cancel(id);
    await t.ctx.runQueue.idle();
  }, 90_000);
});

describe("progress streams end with the session (fault 10)", () => {
  // Before: an open GET /api/runs/:id/events kept sending after its owner was deactivated.
  it("closes an open stream with `signed-out` once the person is deactivated", async () => {
    const person = await t.buildUser({ roles: ["analyst"] });
    const cookie = await signInCookie(person);
    const f = await makeRunFixture(t, person);
    const run = await insertRun(t, person, "running", 20); // no queue picks up a row written as running
    const server = http.createServer(t.app).listen(0, "127.0.0.1");
    await new Promise((r) => server.once("listening", r));
    const port = (server.address() as AddressInfo).port;
    let text = "";
    const closed = new Promise<void>((resolve) => {
      http.get({ host: "127.0.0.1", port, path: `/api/runs/${run.id}/events`, headers: { cookie } }, (res) => {
        res.setEncoding("utf8");
        res.on("data", (c: string) => (text += c));
        res.on("end", () => resolve());
      });
    });
    await waitFor("the first progress event", async () => text.includes("event: progress"));
    await request(t.app).patch(`/api/team/members/${person.id}`).set("Origin", ORIGIN).set("Cookie", await signInCookie(admin.user)).send({ active: false }).expect(200);
    await Promise.race([closed, new Promise((_, rej) => setTimeout(() => rej(new Error(`stream still open: ${text.slice(-200)}`)), 8000))]);
    expect(text).toContain('event: end\ndata: {"state":"signed-out"}');
    server.close();
    void f;
  }, 30_000);
});

describe("interrupted runs say so (fault 13)", () => {
  // Before: a run re-queued after a server stop looked like any other run.
  it("counts an interruption when a new queue finds the run left running, then runs it to done", async () => {
    const run = await insertRun(t, analyst.user, "running", 50);
    const queue = createRunQueue({ dataSource: t.ctx.dataSource, mailer: t.ctx.mailer, log: t.ctx.log, config: t.ctx.config, dispatcher: () => createEmbeddedDispatcher({ size: 1 }) });
    try {
      await queue.start();
      await queue.idle();
    } finally {
      await queue.close();
    }
    const row = await runRow(run.id);
    expect(row).toMatchObject({ state: "done", interruptions: 1 });
    expect(row.lastInterruptedAt).toBeInstanceOf(Date);
    const body = (await analyst.agent.get(`/api/runs/${run.id}`).expect(200)).body;
    expect(body.run).toMatchObject({ interruptions: 1 });
    expect(typeof body.run.lastInterruptedAt).toBe("string");
  }, 30_000);
});
