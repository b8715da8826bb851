import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Run, User } from "../../server/entities";
import { startTestRedis, startWorker, until, type WorkerProcess } from "../helpers/distributed";
import { createScratchDatabase, signInCookie, startServerProcess, type ScratchDatabase, type ServerProcess } from "../helpers/server-process";
import type { TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// The promised failures of distributed mode, with the timing a real server uses: a server process configured only by
// its settings (LOTWISE_REDIS_URL, LOTWISE_REDIS_OUTAGE_S, LOTWISE_NO_WORKERS_S), so the dispatcher polls Redis at its
// default pace. Only the documented limits are set short (5 s). Redis stopped for good fails the run with
// QUEUE_UNAVAILABLE about 5 s later; no worker at all fails it with NO_WORKERS about 5 s later; neither leaves it
// `running`.

const PASSWORD = "correct horse battery staple";
const LIMIT_S = 5;
let db: ScratchDatabase;
let redis: Awaited<ReturnType<typeof startTestRedis>>;
let worker: WorkerProcess | null = null;
let server: ServerProcess;
let user: User;
let f: RunFixture;
let cookie: string;
const runs = () => db.ds.getRepository(Run);

async function launch(body: Record<string, unknown>): Promise<string> {
  const res = await fetch(`${server.origin}/api/runs`, {
    method: "POST", headers: { "content-type": "application/json", origin: server.origin, cookie },
    body: JSON.stringify({ revisionId: f.revision.id, limitSetId: f.limitSet.id, ...body }),
  });
  expect(res.status, await res.clone().text()).toBe(201);
  return ((await res.json()) as { run: { id: string } }).run.id;
}

const ended = (id: string, ms: number) =>
  until(`run ${id} to end`, async () => {
    const r = await runs().findOneByOrFail({ id });
    return ["done", "failed", "cancelled"].includes(r.state) ? r : null;
  }, ms);

/** The server's log lines with this event (it logs JSON lines at info level here). */
const logged = (event: string) => server.output().split("\n").filter((l) => l.includes(`"event":"${event}"`));

beforeAll(async () => {
  db = await createScratchDatabase("lotwise_dtime", { email: "dtime@lotwise.test", name: "Distributed Timeouts", roles: ["analyst"], password: PASSWORD });
  user = db.user;
  f = await makeRunFixture({ ctx: { dataSource: db.ds } } as unknown as TestContext, user, { name: "Timeout low-pass" });
  redis = await startTestRedis("timeouts");
  worker = await startWorker(redis.url, "timeouts-w1");
  server = await startServerProcess(db.dbName, {
    LOTWISE_REDIS_URL: redis.url, LOTWISE_REDIS_OUTAGE_S: String(LIMIT_S), LOTWISE_NO_WORKERS_S: String(LIMIT_S), LOTWISE_LOG_LEVEL: "info",
  });
  cookie = await signInCookie(server.origin, user.email, PASSWORD);
}, 60_000);

afterAll(async () => {
  server?.child.kill("SIGKILL");
  await server?.exited;
  await worker?.kill();
  await redis?.cleanUp();
  await db?.drop();
}, 60_000);

describe("distributed mode: the promised failures at the default poll", () => {
  it(`Redis stopped for good: the run fails with QUEUE_UNAVAILABLE about LOTWISE_REDIS_OUTAGE_S=${LIMIT_S} s later`, async () => {
    const id = await launch({ trials: 60_000, seed: 61, corners: [-20, 25, 70] });
    await until("a first chunk done", async () => (await runs().findOneByOrFail({ id })).trialsDone > 0, 60_000);
    const reachableBefore = logged("redis_reachable_again").length;
    const stopped = Date.now();
    await redis.stop();
    // The outage limit plus a pass or two; before the fix the run stayed `running` for as long as one cared to wait.
    const run = await ended(id, LIMIT_S * 1000 + 15_000);
    const after = (Date.now() - stopped) / 1000;
    expect(run.state).toBe("failed");
    expect(run.errorCode).toBe("QUEUE_UNAVAILABLE");
    expect(run.errorMessage).toContain(`could not be reached for ${LIMIT_S} s`);
    expect(after).toBeGreaterThanOrEqual(LIMIT_S - 1);
    // Nothing answered meanwhile, so nothing may have counted as Redis being back.
    expect(logged("redis_reachable_again").length).toBe(reachableBefore);
    const health = await fetch(`${server.origin}/api/health`);
    expect(health.status).toBe(503);
    console.log(`Redis stopped for good: the run failed ${after.toFixed(1)} s later with ${run.errorCode}: ${run.errorMessage}`);

    await redis.restart();
    await until("the worker back on Redis", async () => {
      const h = (await (await fetch(`${server.origin}/api/health`)).json()) as { dispatch?: { workers?: number } };
      return h.dispatch?.workers === 1;
    }, 30_000);
    const next = await ended(await launch({ trials: 5000, seed: 62 }), 60_000);
    expect(next.state, `${next.errorCode}: ${next.errorMessage}`).toBe("done");
  }, 150_000);

  it(`no worker process connected: the run fails with NO_WORKERS about LOTWISE_NO_WORKERS_S=${LIMIT_S} s later`, async () => {
    if (!redis.pid()) await redis.restart(); // the test before may have failed with Redis stopped
    await worker?.kill();
    worker = null;
    await until("no worker on Redis", async () => {
      const h = (await (await fetch(`${server.origin}/api/health`)).json()) as { dispatch?: { workers?: number } };
      return h.dispatch?.workers === 0;
    }, 30_000);
    const launched = Date.now();
    const id = await launch({ trials: 5000, seed: 63 });
    const run = await ended(id, LIMIT_S * 1000 + 15_000);
    const after = (Date.now() - launched) / 1000;
    expect(run.state).toBe("failed");
    expect(run.errorCode).toBe("NO_WORKERS");
    expect(run.errorMessage).toContain("npm run worker");
    expect(after).toBeGreaterThanOrEqual(LIMIT_S - 1);
    console.log(`no worker: the run failed ${after.toFixed(1)} s after launch with ${run.errorCode}`);
  }, 60_000);
});
