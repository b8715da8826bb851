import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createEmbeddedDispatcher } from "../../server/engine/dispatcher";
import { Run, User } from "../../server/entities";
import { toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import { startTestRedis, startWorker, storedResultText, until, type WorkerProcess } from "../helpers/distributed";
import { createScratchDatabase, signInCookie, startServerProcess, type ScratchDatabase, type ServerProcess } from "../helpers/server-process";
import type { TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// Distributed mode as `npm start` sets it up: real server processes configured only by LOTWISE_REDIS_URL (settings →
// createDispatcher), real worker processes. The server is killed (SIGKILL) in the middle of a run; a second server on
// the same database and Redis re-queues the run, finds the run's batch still in Redis and uses the chunks the workers
// finished meanwhile: every chunk is computed exactly once, and the stored result is the undisturbed one.

const PASSWORD = "correct horse battery staple";
let db: ScratchDatabase;
let ds: ScratchDatabase["ds"];
let redis: Awaited<ReturnType<typeof startTestRedis>>;
const workers: WorkerProcess[] = [];
const servers: ServerProcess[] = [];
let user: User;
let f: RunFixture;

async function serve(): Promise<ServerProcess> {
  const s = await startServerProcess(db.dbName, { LOTWISE_REDIS_URL: redis.url });
  servers.push(s);
  return s;
}

beforeAll(async () => {
  db = await createScratchDatabase("lotwise_dkill", { email: "dkill@lotwise.test", name: "Distributed Restart", roles: ["analyst"], password: PASSWORD });
  ({ ds, user } = db);
  f = await makeRunFixture({ ctx: { dataSource: ds } } as unknown as TestContext, user, { name: "Distributed restart low-pass" });
  redis = await startTestRedis("restart");
  workers.push(...(await Promise.all([startWorker(redis.url, "restart-w1"), startWorker(redis.url, "restart-w2")])));
}, 60_000);

afterAll(async () => {
  for (const s of servers) s.child.kill("SIGKILL");
  await Promise.all(workers.map((w) => w.kill()));
  await redis?.cleanUp();
  await db?.drop();
}, 60_000);

/**
 * Launches a 100,000-trial run (40 chunks) on the newest server, stops that server with `signal` once a few chunks
 * are done, starts the next one and checks the run ends with the undisturbed result, every chunk computed once.
 */
async function interruptAndResume(signal: "SIGKILL" | "SIGTERM", seed: number): Promise<{ atStop: number; stateAtStop: string }> {
  const current = servers.at(-1)!;
  const cookie = await signInCookie(current.origin, user.email, PASSWORD);
  const res = await fetch(`${current.origin}/api/runs`, {
    method: "POST", headers: { "content-type": "application/json", origin: current.origin, cookie },
    body: JSON.stringify({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 100_000, seed }),
  });
  expect(res.status).toBe(201);
  const id = ((await res.json()) as { run: { id: string } }).run.id;
  const chunksOf = () => workers.flatMap((w) => w.chunksDone()).filter((j) => j.startsWith(`${id}.`));
  await until("a few chunks done", async () => chunksOf().length >= 3, 30_000);

  current.child.kill(signal);
  await current.exited;
  const atStop = chunksOf().length;
  const stateAtStop = (await ds.getRepository(Run).findOneByOrFail({ id })).state;

  await serve();
  const run = await until("the run to end", async () => {
    const r = await ds.getRepository(Run).findOneByOrFail({ id });
    return ["done", "failed", "cancelled"].includes(r.state) ? r : null;
  }, 60_000);
  expect(run.state, `${run.errorCode}: ${run.errorMessage}`).toBe("done");
  const stored = await storedResultText(ds, id);
  const pool = createEmbeddedDispatcher({ size: 1 });
  try {
    expect(stored).toBe(JSON.stringify(toStoredResult(await pool.runMonteCarlo(run.netlist, run.limits, run.options as unknown as RunOptions))));
  } finally {
    await pool.close();
  }
  const done = chunksOf();
  expect(done).toHaveLength(40); // 100,000 trials in chunks of 2,500, each computed once
  expect(new Set(done).size).toBe(40);
  return { atStop, stateAtStop };
}

describe("distributed mode: server killed mid-run", () => {
  it("the next server resumes the run from the chunks in Redis: none computed twice, the result unchanged", async () => {
    const first = await serve();
    const health = (await (await fetch(`${first.origin}/api/health`)).json()) as { dispatch?: { mode: string; workers: number } };
    expect(health.dispatch).toMatchObject({ mode: "distributed", workers: 2 });
    const { atStop, stateAtStop } = await interruptAndResume("SIGKILL", 41);
    expect(stateAtStop).toBe("running"); // nobody handed it back
    console.log(`server killed (SIGKILL) after ${atStop} of 40 chunks; the second server used every chunk in Redis: 40 computed in all, result identical`);
  }, 120_000);

  it("a clean stop (SIGTERM) mid-run leaves the run's chunks in Redis: the next server uses them, the result unchanged", async () => {
    const stopping = servers.at(-1)!;
    const { atStop, stateAtStop } = await interruptAndResume("SIGTERM", 42);
    expect(stopping.child.exitCode).toBe(0);
    expect(stateAtStop).toBe("queued"); // handed back by the stopping server
    console.log(`server stopped (SIGTERM) after ${atStop} of 40 chunks; the next server used the chunks in Redis: 40 computed in all, result identical`);
  }, 120_000);
});
