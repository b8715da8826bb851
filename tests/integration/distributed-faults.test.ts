import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createEmbeddedDispatcher, type RunDispatcher } from "../../server/engine/dispatcher";
import { createDistributedDispatcher, type DistributedDispatcher } from "../../server/engine/distributed-dispatcher";
import { Run } from "../../server/entities";
import { toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import { WorkerFailure } from "../../workers/trial-pool";
import { freePort, recordingLogger, sleep, startTestRedis, storedResultText, startWorker, until, type WorkerProcess } from "../helpers/distributed";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// Distributed mode under faults, BullMQ's way: a worker process killed (SIGKILL) in the middle of a chunk, Redis
// restarted with its data, Redis restarted without it, Redis gone for longer than the dispatcher waits, and no worker
// at all. Every run either ends with exactly the result of an undisturbed embedded run, or fails with a code and a
// reason; none hangs, and its stored inputs stay as they were.
//
// Chunks of 10,000 trials at three temperature corners take a few seconds each here, so "mid-chunk" is a wide window.
// Workers hold a chunk's lock for 4 s and check for stalled chunks every 0.5 s (tests/helpers/distributed.ts).

const OUTAGE_MS = 8000;
let redis: Awaited<ReturnType<typeof startTestRedis>>;
let t: TestContext;
let agent: Awaited<ReturnType<TestContext["signedInAgent"]>>["agent"];
let f: RunFixture;
let dispatcher: DistributedDispatcher | null = null;
let reference: RunDispatcher;
const log = recordingLogger();
let a: WorkerProcess;
let b: WorkerProcess;
const runs = () => t.ctx.dataSource.getRepository(Run);

async function launch(body: Record<string, unknown>): Promise<string> {
  const res = await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.run.id as string;
}

const finished = (id: string, ms = 60_000) =>
  until(`run ${id} to end`, async () => {
    const r = await runs().findOneByOrFail({ id });
    return ["done", "failed", "cancelled"].includes(r.state) ? r : null;
  }, ms);

/** The stored result equals an undisturbed embedded run of the run's own stored inputs, as text. */
async function expectReferenceResult(run: Run): Promise<void> {
  expect(run.state, `${run.errorCode}: ${run.errorMessage}`).toBe("done");
  const stored = await storedResultText(t.ctx.dataSource, run.id);
  const ref = await reference.runMonteCarlo(run.netlist, run.limits, run.options as unknown as RunOptions);
  expect(stored).toBe(JSON.stringify(toStoredResult(ref)));
}

const logged = (event: string) => log.lines.filter((l) => l.event === event);

beforeAll(async () => {
  redis = await startTestRedis("faults");
  t = await createTestContext({
    dispatcher: () => (dispatcher = createDistributedDispatcher({ redisUrl: redis.url, chunkSize: 10_000, pollMs: 200, outageMs: OUTAGE_MS, noWorkersMs: OUTAGE_MS, log })),
  });
  const signedIn = await t.signedInAgent(["analyst"]);
  agent = signedIn.agent;
  f = await makeRunFixture(t, signedIn.user, { name: "Fault low-pass" });
  reference = createEmbeddedDispatcher({ size: 1 });
  [a, b] = await Promise.all([startWorker(redis.url, "fault-a"), startWorker(redis.url, "fault-b")]);
}, 60_000);

afterAll(async () => {
  await Promise.all([a?.kill(), b?.kill()]);
  await t?.close();
  await reference?.close();
  await redis?.cleanUp();
}, 60_000);

describe("distributed mode under faults", () => {
  it("a worker process killed mid-chunk: its chunk stalls, the other worker runs it, the result is unchanged", async () => {
    const id = await launch({ trials: 40_000, seed: 21, corners: [-20, 25, 70] });
    const victim = await until("worker A to be in the middle of a chunk of the run", async () => {
      const active = (await dispatcher?.chunks.getActive()) ?? [];
      return active.find((j) => j.processedBy === a.name && j.id?.startsWith(`${id}.`));
    }, 30_000);
    const killedAt = Date.now();
    await a.kill();
    expect(a.chunksDone()).not.toContain(victim.id); // it died holding the chunk

    const run = await finished(id);
    await expectReferenceResult(run);
    expect(b.chunksDone()).toContain(victim.id);
    expect(logged("chunk_job_stalled").map((l) => l.fields?.jobId)).toContain(victim.id);
    console.log(
      `worker A killed (SIGKILL) holding chunk ${victim.id}; worker B ran it again; run done ${((run.finishedAt!.getTime() - killedAt) / 1000).toFixed(1)} s after the kill, ` +
        `result identical to the embedded run (yield ${run.yieldFraction})`,
    );
    a = await startWorker(redis.url, "fault-a2");
  }, 120_000);

  it("Redis restarted mid-run on its data: the run waits, resumes and ends with the unchanged result", async () => {
    const id = await launch({ trials: 40_000, seed: 22, corners: [-20, 25, 70] });
    await until("a first chunk done", async () => (await runs().findOneByOrFail({ id })).trialsDone > 0, 30_000);
    const before = logged("redis_reachable_again").length;
    await redis.stop(); // SIGTERM: Redis writes its append-only file and exits
    await sleep(1500);
    await redis.restart();
    const run = await finished(id);
    await expectReferenceResult(run);
    expect(logged("redis_reachable_again").length).toBeGreaterThan(before);
  }, 120_000);

  it("Redis restarted without its data: the missing chunks are added again and the run ends with the unchanged result", async () => {
    const id = await launch({ trials: 40_000, seed: 23, corners: [-20, 25, 70] });
    await until("a first chunk done", async () => (await runs().findOneByOrFail({ id })).trialsDone > 0, 30_000);
    await redis.kill(); // SIGKILL and a new, empty data folder: every job of the run is gone
    await redis.restart({ fresh: true });
    const run = await finished(id);
    await expectReferenceResult(run);
    expect(logged("chunk_batch_missing_readded").some((l) => String(l.fields?.batch).startsWith(`${id}.`))).toBe(true);
  }, 120_000);

  it("Redis gone longer than the dispatcher waits: the run fails with QUEUE_UNAVAILABLE, its inputs kept; runs work again once Redis is back", async () => {
    const id = await launch({ trials: 40_000, seed: 24, corners: [-20, 25, 70] });
    await until("the run to start", async () => (await runs().findOneByOrFail({ id })).state === "running", 30_000);
    const stopped = Date.now();
    await redis.stop();
    const run = await finished(id, OUTAGE_MS + 20_000);
    const after = (Date.now() - stopped) / 1000;
    expect(run.state).toBe("failed");
    expect(run.errorCode).toBe("QUEUE_UNAVAILABLE");
    expect(run.errorMessage).toContain(`Redis at ${redis.url} could not be reached for 8 s`);
    expect(run.netlist).toEqual(f.revision.netlist);
    expect(run.options).toMatchObject({ trials: 40_000, seed: 24, corners: [-20, 25, 70] });
    const health = await agent.get("/api/health");
    expect(health.status).toBe(503);
    expect(health.body.dispatch).toMatchObject({ mode: "distributed", redis: "down" });
    console.log(`Redis stopped for good: the run failed after ${after.toFixed(1)} s with ${run.errorCode}: ${run.errorMessage}`);

    await redis.restart();
    await until("both workers back on Redis", async () => (await dispatcher!.status()).mode === "distributed" && (await dispatcher!.status() as { workers: number }).workers === 2, 20_000);
    await expectReferenceResult(await finished(await launch({ trials: 10_000, seed: 25 })));
  }, 120_000);

  it("Redis unreachable from the start (never connected): the run fails with QUEUE_UNAVAILABLE instead of hanging", async () => {
    const nowhere = `redis://127.0.0.1:${await freePort()}/`;
    const lonely = createDistributedDispatcher({ redisUrl: nowhere, pollMs: 200, outageMs: 2000, log: recordingLogger() });
    const started = Date.now();
    try {
      const err = (await lonely.runMonteCarlo(f.revision.netlist, f.limitSet.limits, { trials: 1000, seed: 27 } as RunOptions).catch((e: unknown) => e)) as WorkerFailure;
      expect(err).toBeInstanceOf(WorkerFailure);
      expect(err.code).toBe("QUEUE_UNAVAILABLE");
      expect(err.message).toContain(`Redis at ${nowhere} could not be reached for 2 s`);
      expect(Date.now() - started).toBeLessThan(15_000);
      expect(await lonely.status()).toMatchObject({ mode: "distributed", redis: "down" });
    } finally {
      await lonely.close();
    }
  }, 30_000);

  it("no worker process connected: the run fails with NO_WORKERS and says how to start one", async () => {
    await Promise.all([a.kill(), b.kill()]);
    const id = await launch({ trials: 10_000, seed: 26 });
    const run = await finished(id, OUTAGE_MS + 20_000);
    expect(run.state).toBe("failed");
    expect(run.errorCode).toBe("NO_WORKERS");
    expect(run.errorMessage).toContain("npm run worker");
  }, 60_000);
});
