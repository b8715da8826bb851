import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTrialPool } from "../../workers/trial-pool";
import { RunResultRow } from "../../server/entities";
import { toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// Faults in the trial pool: a worker thread that exits (process.exit) or throws a plain Error in the middle of a run
// fails that run with its reason; the pool replaces the thread and the next runs succeed with the same result as on a
// fresh pool. The faults come from the worker's test-only hook (workers/trials.worker.ts): the environment variable
// LOTWISE_TEST_WORKER_FAULT, read by each worker thread when it starts (the pool here starts on the first run, after
// this line).
const EXIT_SEED = 910_001;
const THROW_SEED = 910_002;
process.env.LOTWISE_TEST_WORKER_FAULT = `exit:${EXIT_SEED}:5000,throw:${THROW_SEED}:2500`;

let t: TestContext;
let agent: Awaited<ReturnType<TestContext["signedInAgent"]>>["agent"];
let f: RunFixture;

async function launch(trials: number, seed: number): Promise<string> {
  const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials, seed });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.run.id;
}

beforeAll(async () => {
  t = await createTestContext({ poolSize: 1 });
  const signed = await t.signedInAgent(["designer"]);
  agent = signed.agent;
  f = await makeRunFixture(t, signed.user, { name: "Fault low-pass" });
}, 30_000);
afterAll(async () => {
  delete process.env.LOTWISE_TEST_WORKER_FAULT;
  await t?.close();
});

describe("worker faults", () => {
  it("fails a run whose worker exits mid-run, and one whose worker throws, with the reason; the next runs succeed", async () => {
    // 6000 trials in chunks of 2500: the exit comes in the third chunk (trials 5000..5999), after two good chunks.
    const exited = await launch(6000, EXIT_SEED);
    const thrown = await launch(6000, THROW_SEED);
    const after = [await launch(2000, 910_003), await launch(2000, 910_004)];
    await t.ctx.runQueue.idle();

    const a = (await agent.get(`/api/runs/${exited}`).expect(200)).body;
    expect(a.run.state).toBe("failed");
    expect(a.run.errorCode).toBe("WORKER_FAILED");
    expect(a.run.errorMessage).toMatch(/^A worker failed on trials \d+\.\.\d+: worker exited with code: 7$/);
    expect(a.result).toBeNull();
    const b = (await agent.get(`/api/runs/${thrown}`).expect(200)).body;
    expect(b.run.state).toBe("failed");
    expect(b.run.errorCode).toBe("WORKER_FAILED");
    // Which failing chunk reports first depends on the pool's scheduling; every chunk from trial 2500 on fails.
    expect(b.run.errorMessage).toMatch(/^A worker failed on trials \d+\.\.\d+: test fault: worker failed at trial \d+$/);
    expect(b.result).toBeNull();
    console.log(`worker faults: exit → ${a.run.errorCode} "${a.run.errorMessage}"; throw → ${b.run.errorCode} "${b.run.errorMessage}"`);

    // The launcher is told why.
    const mails = await t.outbox();
    expect(mails.filter((m) => m.subject.startsWith("Run failed: Fault low-pass")).length).toBe(2);

    // The runs after the faults are done, with the same stored result as on a pool that never saw a fault.
    const fresh = createTrialPool({ size: 1 });
    try {
      for (const id of after) {
        const body = (await agent.get(`/api/runs/${id}`).expect(200)).body;
        expect(body.run.state).toBe("done");
        const row = await t.ctx.dataSource.getRepository(RunResultRow).findOneByOrFail({ runId: id });
        const ref = await fresh.runMonteCarlo(f.revision.netlist, f.limitSet.limits, { trials: 2000, seed: body.run.seed, sweep: f.revision.sweep } as unknown as RunOptions);
        expect(row.result).toEqual(JSON.parse(JSON.stringify(toStoredResult(ref))));
      }
    } finally {
      await fresh.close();
    }
  }, 60_000);

  it("with two runs at once on one thread, a crashing run and a cancelled run do not take the other run down", async () => {
    const t2 = await createTestContext({ poolSize: 1, maxRunning: 2 });
    try {
      const s2 = await t2.signedInAgent(["designer"]);
      const f2 = await makeRunFixture(t2, s2.user, { name: "Shared thread" });
      const go = async (trials: number, seed: number) =>
        (await s2.agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f2.revision.id, limitSetId: f2.limitSet.id, trials, seed }).expect(201)).body.run.id as string;
      // The innocent run's chunks share the one thread with the crashing run's chunks (and later with a cancelled run's).
      const innocent = await go(10_000, 910_010);
      const crashing = await go(6000, EXIT_SEED);
      await t2.ctx.runQueue.idle();
      const victim = await go(10_000, 910_011);
      const cancelled = await go(1_000_000, 910_012);
      const end = Date.now() + 20_000;
      while (Date.now() < end && (t2.ctx.runQueue.live(cancelled)?.trialsDone ?? 0) === 0) await new Promise((r) => setTimeout(r, 50));
      await s2.agent.post(`/api/runs/${cancelled}/cancel`).set("Origin", ORIGIN).expect(200);
      await t2.ctx.runQueue.idle();

      const state = async (id: string) => (await s2.agent.get(`/api/runs/${id}`).expect(200)).body.run;
      expect((await state(crashing)).state).toBe("failed");
      expect((await state(cancelled)).state).toBe("cancelled");
      const fresh = createTrialPool({ size: 1 });
      try {
        for (const [id, seed] of [[innocent, 910_010], [victim, 910_011]] as const) {
          expect((await state(id)).state).toBe("done");
          const row = await t2.ctx.dataSource.getRepository(RunResultRow).findOneByOrFail({ runId: id });
          const ref = await fresh.runMonteCarlo(f2.revision.netlist, f2.limitSet.limits, { trials: 10_000, seed, sweep: f2.revision.sweep } as unknown as RunOptions);
          expect(row.result).toEqual(JSON.parse(JSON.stringify(toStoredResult(ref))));
        }
      } finally {
        await fresh.close();
      }
    } finally {
      await t2.close();
    }
  }, 60_000);
});
