import { Redis } from "ioredis";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createEmbeddedDispatcher } from "../../server/engine/dispatcher";
import { createDistributedDispatcher, EVENTS_KEPT, type DistributedDispatcher } from "../../server/engine/distributed-dispatcher";
import { Run } from "../../server/entities";
import { toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import { recordingLogger, startTestRedis, storedResultText, startWorker, until, type WorkerProcess } from "../helpers/distributed";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { LOWPASS, LOWPASS_LIMITS, LOWPASS_SWEEP, makeRunFixture, type RunFixture } from "./access-samples/runs";

// Distributed mode end to end: the real app and run queue over a private database, a private redis-server on
// loopback, and real worker processes (what `npm run worker` starts). The same run is launched in an embedded
// context (in-process pool) and in a distributed one, and the JSON stored in MariaDB is compared as text.

type Agent = Awaited<ReturnType<TestContext["signedInAgent"]>>["agent"];
interface Side {
  t: TestContext;
  agent: Agent;
  f: RunFixture;
}

let redis: Awaited<ReturnType<typeof startTestRedis>>;
let embedded: Side;
let distributed: Side;
let dispatcher: DistributedDispatcher | null = null;
const log = recordingLogger();
const workers: WorkerProcess[] = [];
// Every worker of this file fails the chunks of seed 4242 from trial 5000 on, every time (test-only hook of
// workers/trials.worker.ts), and the first try of the chunks of seed 5151 from trial 5000 on (workers/queue-worker.ts).
const FAULT_ENV = { LOTWISE_TEST_WORKER_FAULT: "throw:4242:5000", LOTWISE_TEST_CHUNK_FAULT: "failfirst:5151:5000" };

async function side(t: TestContext): Promise<Side> {
  const { agent, user } = await t.signedInAgent(["analyst"]);
  return { t, agent, f: await makeRunFixture(t, user, { name: "Distributed low-pass" }) };
}

async function launch(s: Side, body: Record<string, unknown>): Promise<string> {
  const res = await s.agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: s.f.revision.id, limitSetId: s.f.limitSet.id, ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.run.id as string;
}

async function finished(s: Side, id: string, ms = 60_000): Promise<Run> {
  return until(`run ${id} to end`, async () => {
    const r = await s.t.ctx.dataSource.getRepository(Run).findOneByOrFail({ id });
    return ["done", "failed", "cancelled"].includes(r.state) ? r : null;
  }, ms);
}

/** The stored result as MariaDB returns it (text), for a byte-for-byte comparison. */
async function storedText(s: Side, id: string): Promise<string> {
  return storedResultText(s.t.ctx.dataSource, id);
}

/** Launches the same run on both sides and returns both stored texts and the distributed run. */
async function sameRunBothWays(body: Record<string, unknown>): Promise<{ a: string; b: string; runA: Run; runB: Run }> {
  const [idA, idB] = [await launch(embedded, body), await launch(distributed, body)];
  const [runA, runB] = [await finished(embedded, idA), await finished(distributed, idB)];
  expect(runA.state).toBe("done");
  expect(runB.state, `${runB.errorCode}: ${runB.errorMessage}`).toBe("done");
  return { a: await storedText(embedded, idA), b: await storedText(distributed, idB), runA, runB };
}

const chunksOf = (w: WorkerProcess, runId: string) => w.chunksDone().filter((id) => id.startsWith(`${runId}.`));

beforeAll(async () => {
  redis = await startTestRedis("runs");
  embedded = await side(await createTestContext());
  distributed = await side(
    await createTestContext({ dispatcher: () => (dispatcher = createDistributedDispatcher({ redisUrl: redis.url, pollMs: 200, outageMs: 20_000, log })) }),
  );
  workers.push(await startWorker(redis.url, "runs-w1", { env: FAULT_ENV }));
}, 60_000);

afterAll(async () => {
  await Promise.all(workers.map((w) => w.kill()));
  await distributed?.t.close();
  await embedded?.t.close();
  await redis?.cleanUp();
}, 60_000);

describe("distributed mode: same seed, same stored result", () => {
  it("with one worker process the stored result is byte-identical to embedded mode", async () => {
    const { a, b, runB } = await sameRunBothWays({ trials: 12_000, seed: 7 });
    expect(b).toBe(a);
    expect(chunksOf(workers[0], runB.id)).toHaveLength(5); // 12,000 trials in chunks of 2,500
    expect(runB.trialsDone).toBe(12_000);
  }, 90_000);

  it("with three worker processes too, and the chunks are spread over the processes", async () => {
    workers.push(await startWorker(redis.url, "runs-w2", { env: FAULT_ENV }), await startWorker(redis.url, "runs-w3", { env: FAULT_ENV }));
    const { a, b, runB } = await sameRunBothWays({ trials: 30_000, seed: 8, corners: [-20, 25, 70] });
    expect(b).toBe(a);
    const perWorker = workers.map((w) => chunksOf(w, runB.id).length);
    console.log(`three worker processes, 12 chunks of run ${runB.id}: ${perWorker.join(" / ")} chunks per process`);
    expect(perWorker.reduce((x, y) => x + y, 0)).toBe(12);
    expect(perWorker.filter((n) => n > 0).length).toBeGreaterThanOrEqual(2);
    // Chunk results are copied into the event stream; it stays short (trimmed approximately, hence the slack).
    const client = new Redis(redis.url);
    const events = await client.xlen("lotwise:chunks:events").finally(() => client.disconnect());
    expect(events).toBeGreaterThan(0);
    expect(events).toBeLessThanOrEqual(2 * EVENTS_KEPT);
  }, 90_000);

  it("stop when sure: the same stopping point and result, with progress after every batch", async () => {
    const { a, b, runA, runB } = await sameRunBothWays({ trials: 100_000, seed: 9, targetHalfWidth: 0.01 });
    expect(b).toBe(a);
    expect(runB.trialsDone).toBe(runA.trialsDone);
    expect(runB.trialsDone).toBeLessThan(100_000);
    expect(runB.trialsDone % 1000).toBe(0); // whole batches of 1,000

    // Progress, straight from the dispatcher: increasing, chunk by chunk, ending at the trials run.
    const seen: number[] = [];
    const direct = await dispatcher!.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, { trials: 100_000, seed: 9, targetHalfWidth: 0.01, sweep: LOWPASS_SWEEP } as RunOptions, {
      onProgress: (p) => seen.push(p.done),
    });
    expect(seen.length).toBeGreaterThan(4);
    expect(seen.every((x, k) => k === 0 || x > seen[k - 1])).toBe(true);
    expect(seen.at(-1)).toBe(direct.trials);
    expect(direct.trials).toBe(runB.trialsDone);
  }, 90_000);

  it("cancel mid-run: the run ends cancelled, its waiting chunks leave Redis, the next run goes through", async () => {
    const id = await launch(distributed, { trials: 400_000, seed: 10 });
    await until("the run to report progress", async () => (await distributed.t.ctx.dataSource.getRepository(Run).findOneByOrFail({ id })).trialsDone > 0, 30_000);
    const res = await distributed.agent.post(`/api/runs/${id}/cancel`).set("Origin", ORIGIN).send({});
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect((await finished(distributed, id, 15_000)).state).toBe("cancelled");
    await until("no chunk of the run left waiting", async () => {
      const waiting = await dispatcher!.chunks.getJobs(["waiting", "prioritized", "delayed"]);
      return waiting.filter((j) => j.id?.startsWith(`${id}.`)).length === 0;
    }, 10_000);
    const doneBefore = workers.reduce((n, w) => n + chunksOf(w, id).length, 0);
    expect(doneBefore).toBeLessThan(160); // far from all 160 chunks

    const { a, b } = await sameRunBothWays({ trials: 5_000, seed: 11 });
    expect(b).toBe(a);
  }, 90_000);

  it("a chunk that fails on every try fails its run with WORKER_FAILED and the reason, after 3 tries", async () => {
    const id = await launch(distributed, { trials: 12_000, seed: 4242 });
    const run = await finished(distributed, id, 60_000);
    expect(run.state).toBe("failed");
    expect(run.errorCode).toBe("WORKER_FAILED");
    expect(run.errorMessage).toMatch(/^A worker failed on trials (5000\.\.7499|7500\.\.9999|10000\.\.11999) \(3 tries\): .*test fault: worker failed at trial/);
    // The inputs stay stored, and the embedded side computes the same seed (its pool has no fault hook set).
    expect(run.netlist).toEqual(LOWPASS);
    expect(run.options).toMatchObject({ trials: 12_000, seed: 4242 });
  }, 90_000);

  it("a chunk whose first try fails is retried, and the run ends with the same result as embedded mode", async () => {
    const { a, b, runB } = await sameRunBothWays({ trials: 12_000, seed: 5151 });
    expect(b).toBe(a);
    const failedTries = workers.flatMap((w) => [...w.output().matchAll(/"event":"chunk_failed","worker":"[^"]*","jobId":"([^"]+)","attempt":(\d+)/g)])
      .filter((m) => m[1].startsWith(`${runB.id}.`));
    expect(failedTries.map((m) => m[1].slice(runB.id.length + 1)).sort()).toEqual(["10000.2000", "5000.2500", "7500.2500"]);
    expect(failedTries.every((m) => m[2] === "1")).toBe(true);
    expect(workers.flatMap((w) => chunksOf(w, runB.id))).toHaveLength(5); // each chunk finished once
  }, 90_000);

  it("health tells the dispatch mode and how many worker processes are connected", async () => {
    const { agent } = await distributed.t.signedInAgent(["admin"]);
    const res = await agent.get("/api/health").expect(200);
    expect(res.body.dispatch).toMatchObject({ mode: "distributed", redis: "up", workers: workers.length });
    const emb = await (await embedded.t.signedInAgent(["admin"])).agent.get("/api/health").expect(200);
    expect(emb.body.dispatch).toMatchObject({ mode: "embedded", threads: 1 });
  }, 30_000);
});

describe("a reference check of the comparison itself", () => {
  it("a different seed gives a different stored text (the comparison can fail)", async () => {
    const pool = createEmbeddedDispatcher({ size: 1 });
    try {
      const opts = { trials: 3000, sweep: LOWPASS_SWEEP } as RunOptions;
      const [x, y] = await Promise.all([pool.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, { ...opts, seed: 1 }), pool.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, { ...opts, seed: 2 })]);
      expect(JSON.stringify(toStoredResult(x))).not.toBe(JSON.stringify(toStoredResult(y)));
    } finally {
      await pool.close();
    }
  }, 30_000);
});

describe("distributed mode: fair sharing between runs", () => {
  // Before: chunks were taken from Redis first come, first served, so a small run waited behind every chunk of a long one.
  it("a small run started beside a long one has its chunks taken first and finishes long before it", async () => {
    const own = dispatcher ? null : createDistributedDispatcher({ redisUrl: redis.url, pollMs: 200, outageMs: 20_000, log }); // when run alone
    const d = dispatcher ?? own!;
    const options = (trials: number, seed: number): RunOptions => ({ trials, seed, sweep: LOWPASS_SWEEP });
    let longDone = 0;
    let longDoneAtSmallEnd = -1;
    const long = d.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(150_000, 31), { onProgress: (p) => (longDone = p.done) });
    await until("the long run's first chunk", async () => longDone > 0, 30_000);
    const small = await d.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(7_500, 32));
    longDoneAtSmallEnd = longDone;
    const longResult = await long;
    console.log(`distributed fair share: the small run (3 chunks) finished with the long run at ${longDoneAtSmallEnd} of 150000 trials`);
    expect(small.trials).toBe(7_500);
    expect(longResult.trials).toBe(150_000);
    expect(longDoneAtSmallEnd).toBeLessThan(75_000);
    await own?.close();
  }, 120_000);
});
