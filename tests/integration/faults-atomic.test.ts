import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// A run's result is written with its final state in one transaction, so no reader ever sees half a run: while runs
// finish one after another, concurrent readers poll the API (GET /api/runs/:id) and the tables directly, and never see
// a run `done` without its run_result row, nor a run_result row for a run that is not `done`.

let t: TestContext;
let agent: Awaited<ReturnType<TestContext["signedInAgent"]>>["agent"];
let f: RunFixture;

beforeAll(async () => {
  t = await createTestContext();
  const signed = await t.signedInAgent(["designer"]);
  agent = signed.agent;
  f = await makeRunFixture(t, signed.user, { name: "Atomic low-pass" });
}, 30_000);
afterAll(() => t?.close());

describe("results are written atomically", () => {
  it("never shows a done run without its result, under concurrent readers", async () => {
    const ids: string[] = [];
    for (let k = 0; k < 5; k++) {
      const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 1500, seed: 500 + k });
      expect(res.status).toBe(201);
      ids.push(res.body.run.id);
    }
    const violations: string[] = [];
    const seen = { api: 0, sql: 0, twoStep: 0, running: 0, done: 0 };
    let stop = false;

    const apiReader = async () => {
      while (!stop) {
        for (const id of ids) {
          const body = (await agent.get(`/api/runs/${id}`).expect(200)).body;
          seen.api++;
          if (body.run.state === "running") seen.running++;
          if (body.run.state === "done") seen.done++;
          if (body.run.state === "done" && !body.result) violations.push(`api: ${id} done without result`);
          if (body.run.state !== "done" && body.result) violations.push(`api: ${id} ${body.run.state} with a result`);
        }
      }
    };
    // One statement: a consistent snapshot of both tables.
    const sqlReader = async () => {
      while (!stop) {
        const rows: { id: string; state: string; has: number | string }[] = await t.ctx.dataSource.query(
          "SELECT r.id, r.state, (rr.run_id IS NOT NULL) AS has FROM run r LEFT JOIN run_result rr ON rr.run_id = r.id WHERE r.id IN (?)", [ids],
        );
        seen.sql++;
        for (const r of rows) if ((r.state === "done") !== (Number(r.has) === 1)) violations.push(`sql: ${r.id} ${r.state} has=${r.has}`);
      }
    };
    // Two statements in the worst order for each invariant, outside any transaction (as a careless reader would).
    const twoStepReader = async () => {
      while (!stop) {
        for (const id of ids) {
          const [run] = await t.ctx.dataSource.query("SELECT state FROM run WHERE id = ?", [id]);
          const [res] = await t.ctx.dataSource.query("SELECT COUNT(*) AS n FROM run_result WHERE run_id = ?", [id]);
          if (run.state === "done" && Number(res.n) !== 1) violations.push(`two-step: ${id} done, then no result`);
          const [res2] = await t.ctx.dataSource.query("SELECT COUNT(*) AS n FROM run_result WHERE run_id = ?", [id]);
          const [run2] = await t.ctx.dataSource.query("SELECT state FROM run WHERE id = ?", [id]);
          if (Number(res2.n) === 1 && run2.state !== "done") violations.push(`two-step: ${id} result, then ${run2.state}`);
          seen.twoStep++;
        }
      }
    };
    const readers = [apiReader(), apiReader(), sqlReader(), twoStepReader()];
    await t.ctx.runQueue.idle();
    stop = true;
    await Promise.all(readers);

    console.log(`atomic results: ${seen.api} API reads, ${seen.sql} joined reads, ${seen.twoStep} two-step reads while 5 runs finished; ` +
      `${seen.running} reads saw a run running, ${seen.done} saw one done; violations: ${violations.length}`);
    expect(violations).toEqual([]);
    expect(seen.running).toBeGreaterThan(0); // the readers really overlapped the runs
    const states = await Promise.all(ids.map(async (id) => (await agent.get(`/api/runs/${id}`).expect(200)).body.run.state));
    expect(states).toEqual(["done", "done", "done", "done", "done"]);
  }, 60_000);
});
