import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Run, RunResultRow, type User } from "../../server/entities";
import { createEmbeddedDispatcher } from "../../server/engine/dispatcher";
import { createRunQueue } from "../../server/services/run-queue";
import type { Netlist } from "../../shared/engine/netlist";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// The run queue over a real MariaDB: SSE progress, cancel, failure with its reason, order with one run at a
// time, and recovery of a run left `running` by a stopped server.

let t: TestContext;
let agent: Awaited<ReturnType<TestContext["signedInAgent"]>>["agent"];
let user: User;
let f: RunFixture;

const textParser = (res: any, cb: (err: Error | null, body: string) => void) => {
  let data = "";
  res.setEncoding("utf8");
  res.on("data", (c: string) => (data += c));
  res.on("end", () => cb(null, data));
};

function parseSse(text: string): { event: string; data: any }[] {
  return text.split("\n\n").filter((b) => b.trim()).map((block) => {
    const event = /^event: (.*)$/m.exec(block)![1];
    return { event, data: JSON.parse(/^data: (.*)$/m.exec(block)![1]) };
  });
}

async function launch(body: Record<string, unknown>, fixture = f): Promise<string> {
  const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: fixture.revision.id, limitSetId: fixture.limitSet.id, ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.run.id;
}

async function waitFor(runId: string, pred: (run: any) => boolean, ms = 20_000): Promise<any> {
  const end = Date.now() + ms;
  for (;;) {
    const run = (await agent.get(`/api/runs/${runId}`).expect(200)).body.run;
    if (pred(run) || Date.now() > end) return run;
    await new Promise((r) => setTimeout(r, 100));
  }
}

beforeAll(async () => {
  t = await createTestContext();
  ({ agent, user } = await t.signedInAgent(["designer"]));
  f = await makeRunFixture(t, user, { name: "Preselector" });
  await launch({ trials: 10, seed: 1 }); // warms the worker thread
  await t.ctx.runQueue.idle();
}, 30_000);
afterAll(() => t?.close());

describe("run queue", () => {
  it("streams progress over SSE, then end, and closes", async () => {
    const id = await launch({ trials: 20_000, seed: 2 });
    const res = await agent.get(`/api/runs/${id}/events`).buffer(true).parse(textParser).expect(200);
    expect(res.headers["content-type"]).toMatch(/^text\/event-stream/);
    const events = parseSse(res.body);
    const progress = events.filter((e) => e.event === "progress");
    expect(events.at(-1)).toEqual({ event: "end", data: { state: "done" } });
    expect(progress.length).toBeGreaterThan(0);
    expect(progress.some((e) => e.data.state === "running" && e.data.trialsDone > 0 && e.data.trialsDone < 20_000)).toBe(true);
    const last = progress.filter((e) => e.data.trialsDone > 0).at(-1)!.data;
    expect(last).toMatchObject({ state: "running", trialsTotal: 20_000 });
    expect(last.ratePerSecond).toBeGreaterThan(0);
    expect(last.etaSeconds).toBeGreaterThanOrEqual(0);
    // trialsDone never goes back
    const done = progress.map((e) => e.data.trialsDone);
    expect(done).toEqual([...done].sort((a, b) => a - b));
  }, 30_000);

  it("cancels a running run and a queued one; cancelling again is 409", async () => {
    const a = await launch({ trials: 1_000_000, seed: 3 });
    const b = await launch({ trials: 1_000_000, seed: 4 });
    const running = await waitFor(a, (r) => r.state === "running" && r.trialsDone > 0);
    expect(running.trialsDone).toBeGreaterThan(0); // progress is persisted while it runs
    expect((await agent.get(`/api/runs/${b}`)).body.run.state).toBe("queued"); // one run at a time
    expect((await agent.post(`/api/runs/${b}/cancel`).set("Origin", ORIGIN).expect(200)).body.run.state).toBe("cancelled");
    expect((await agent.post(`/api/runs/${a}/cancel`).set("Origin", ORIGIN).expect(200)).body.run.state).toBe("cancelled");
    await t.ctx.runQueue.idle();
    const after = (await agent.get(`/api/runs/${a}`).expect(200)).body;
    expect(after.run.state).toBe("cancelled");
    expect(after.run.trialsDone).toBeLessThan(1_000_000);
    expect(after.result).toBeNull();
    expect((await agent.post(`/api/runs/${a}/cancel`).set("Origin", ORIGIN).expect(409)).body.error.code).toBe("RUN_FINISHED");
    const sse = await agent.get(`/api/runs/${b}/events`).buffer(true).parse(textParser).expect(200);
    expect(parseSse(sse.body).at(-1)).toEqual({ event: "end", data: { state: "cancelled" } });
  }, 30_000);

  it("fails a singular run with the reason and mails it; the next run succeeds", async () => {
    // Two series capacitors: at 0 Hz the middle node has no admittance left (a lin sweep from 0 Hz includes DC).
    const singular: Netlist = {
      ports: [{ name: "in", node: "a", z0: 50 }, { name: "out", node: "b", z0: 50 }],
      parts: [
        { ref: "C1", kind: "C", nodes: ["a", "m"], value: 1e-12, tolerance: 0.05 },
        { ref: "C2", kind: "C", nodes: ["m", "b"], value: 1e-12, tolerance: 0.05 },
      ],
    };
    const bad = await makeRunFixture(t, user, { netlist: singular, sweep: { from: 0, to: 1e9, points: 11, scale: "lin" }, name: "Broken" });
    const id = await launch({ trials: 100, seed: 5 }, bad);
    const next = await launch({ trials: 100, seed: 6 });
    await t.ctx.runQueue.idle();
    const failed = (await agent.get(`/api/runs/${id}`).expect(200)).body;
    expect(failed.run).toMatchObject({ state: "failed", errorCode: "SINGULAR_MATRIX" });
    expect(failed.run.errorMessage).toContain("0 Hz");
    expect(failed.result).toBeNull();
    expect((await agent.get(`/api/runs/${next}`).expect(200)).body.run.state).toBe("done");
    const mail = (await t.outbox()).find((m) => m.subject.startsWith("Run failed: Broken r1"));
    expect(mail?.text).toContain("singular");
  }, 30_000);

  it("runs queued runs oldest first, one at a time", async () => {
    const ids: string[] = [];
    for (let k = 0; k < 3; k++) ids.push(await launch({ trials: 3000, seed: 10 + k }));
    await t.ctx.runQueue.idle();
    const runs = await Promise.all(ids.map((id) => t.ctx.dataSource.getRepository(Run).findOneByOrFail({ id })));
    expect(runs.map((r) => r.state)).toEqual(["done", "done", "done"]);
    for (let k = 1; k < 3; k++) {
      expect(runs[k].queuedAt.getTime()).toBeGreaterThan(runs[k - 1].queuedAt.getTime());
      expect(runs[k].startedAt!.getTime()).toBeGreaterThanOrEqual(runs[k - 1].finishedAt!.getTime());
    }
  }, 30_000);

  it("re-queues a run left running by a stopped server and gives the same result", async () => {
    const id = await launch({ trials: 2000, seed: 77 });
    await t.ctx.runQueue.idle();
    const repo = t.ctx.dataSource.getRepository(Run);
    const before = (await agent.get(`/api/runs/${id}`).expect(200)).body;
    // Simulate a crash mid-run: the row says running, half done, no result.
    await t.ctx.dataSource.getRepository(RunResultRow).delete({ runId: id });
    await repo.update({ id }, { state: "running", trialsDone: 1000, passed: null, yieldFraction: null, wilsonLow: null, wilsonHigh: null, finishedAt: null });
    const queue = createRunQueue({ dataSource: t.ctx.dataSource, mailer: t.ctx.mailer, log: t.ctx.log, config: t.ctx.config, dispatcher: createEmbeddedDispatcher({ size: 1 }) });
    try {
      await queue.start();
      await queue.idle();
    } finally {
      await queue.close();
    }
    const after = (await agent.get(`/api/runs/${id}`).expect(200)).body;
    expect(after.run).toMatchObject({ state: "done", trialsDone: 2000, passed: before.run.passed, yield: before.run.yield });
    expect(after.result).toEqual(before.result);
  }, 30_000);
});
