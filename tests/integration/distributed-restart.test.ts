import { randomBytes, randomUUID } from "node:crypto";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { hashPassword } from "../../server/auth/passwords";
import { loadConfig } from "../../server/config/env";
import { createDataSource, openAndMigrate } from "../../server/db/data-source";
import { createEmbeddedDispatcher } from "../../server/engine/dispatcher";
import { Run, User } from "../../server/entities";
import { toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import { startTestRedis, startWorker, until, type WorkerProcess } from "../helpers/distributed";
import { signInCookie, startServerProcess, type ServerProcess } from "../helpers/server-process";
import type { TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// Distributed mode as `npm start` sets it up: real server processes configured only by LOTWISE_REDIS_URL (settings →
// createDispatcher), real worker processes. The server is killed (SIGKILL) in the middle of a run; a second server on
// the same database and Redis re-queues the run, finds the run's batch still in Redis and uses the chunks the workers
// finished meanwhile: every chunk is computed exactly once, and the stored result is the undisturbed one.

const PASSWORD = "correct horse battery staple";
const base = loadConfig(process.env);
const dbName = `lotwise_dkill_${process.pid}_${randomBytes(3).toString("hex")}`;
const ds = createDataSource({ ...base.db, name: dbName }, { poolSize: 3 });
let redis: Awaited<ReturnType<typeof startTestRedis>>;
const workers: WorkerProcess[] = [];
const servers: ServerProcess[] = [];
let user: User;
let f: RunFixture;

async function serve(): Promise<ServerProcess> {
  const s = await startServerProcess(dbName, { LOTWISE_REDIS_URL: redis.url });
  servers.push(s);
  return s;
}

beforeAll(async () => {
  if (!process.env.LOTWISE_TEST_DB_READY) throw new Error("run through `npm test`");
  const admin = await mysql.createConnection({ host: base.db.host, port: base.db.port, user: base.db.user, password: base.db.password });
  await admin.query(`CREATE DATABASE \`${dbName}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.end();
  await openAndMigrate(ds);
  user = ds.getRepository(User).create({
    id: randomUUID(), email: "dkill@lotwise.test", name: "Distributed Restart", roles: ["analyst"], active: true, passwordHash: await hashPassword(PASSWORD),
  });
  await ds.getRepository(User).insert(user);
  f = await makeRunFixture({ ctx: { dataSource: ds } } as unknown as TestContext, user, { name: "Distributed restart low-pass" });
  redis = await startTestRedis("restart");
  workers.push(...(await Promise.all([startWorker(redis.url, "restart-w1"), startWorker(redis.url, "restart-w2")])));
}, 60_000);

afterAll(async () => {
  for (const s of servers) s.child.kill("SIGKILL");
  await Promise.all(workers.map((w) => w.kill()));
  await redis?.cleanUp();
  if (ds.isInitialized) {
    await ds.query(`DROP DATABASE \`${dbName}\``);
    await ds.destroy();
  }
}, 60_000);

describe("distributed mode: server killed mid-run", () => {
  it("the next server resumes the run from the chunks in Redis: none computed twice, the result unchanged", async () => {
    const first = await serve();
    const cookie = await signInCookie(first.origin, user.email, PASSWORD);
    const health = (await (await fetch(`${first.origin}/api/health`)).json()) as { dispatch?: { mode: string; workers: number } };
    expect(health.dispatch).toMatchObject({ mode: "distributed", workers: 2 });
    const res = await fetch(`${first.origin}/api/runs`, {
      method: "POST", headers: { "content-type": "application/json", origin: first.origin, cookie },
      body: JSON.stringify({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 100_000, seed: 41 }),
    });
    expect(res.status).toBe(201);
    const id = ((await res.json()) as { run: { id: string } }).run.id;
    const chunksOf = () => workers.flatMap((w) => w.chunksDone()).filter((j) => j.startsWith(`${id}.`));
    await until("a few chunks done", async () => chunksOf().length >= 3, 30_000);

    first.child.kill("SIGKILL");
    await first.exited;
    const atKill = chunksOf().length;
    expect((await ds.getRepository(Run).findOneByOrFail({ id })).state).toBe("running");

    await serve();
    const run = await until("the run to end", async () => {
      const r = await ds.getRepository(Run).findOneByOrFail({ id });
      return ["done", "failed", "cancelled"].includes(r.state) ? r : null;
    }, 60_000);
    expect(run.state, `${run.errorCode}: ${run.errorMessage}`).toBe("done");
    const rows = (await ds.query("SELECT result FROM run_result WHERE run_id = ?", [id])) as { result: unknown }[];
    const stored = typeof rows[0].result === "string" ? rows[0].result : JSON.stringify(rows[0].result);
    const pool = createEmbeddedDispatcher({ size: 1 });
    try {
      const ref = await pool.runMonteCarlo(run.netlist, run.limits, run.options as unknown as RunOptions);
      expect(stored).toBe(JSON.stringify(toStoredResult(ref)));
    } finally {
      await pool.close();
    }
    const done = chunksOf();
    expect(done).toHaveLength(40); // 100,000 trials in chunks of 2,500, each once
    expect(new Set(done).size).toBe(40);
    console.log(`server killed (SIGKILL) after ${atKill} of 40 chunks; the second server used every chunk in Redis: 40 computed in all, result identical`);
  }, 120_000);

  it("a clean stop (SIGTERM) mid-run leaves the run's chunks in Redis: the next server uses them, the result unchanged", async () => {
    const current = servers.at(-1)!;
    const cookie = await signInCookie(current.origin, user.email, PASSWORD);
    const res = await fetch(`${current.origin}/api/runs`, {
      method: "POST", headers: { "content-type": "application/json", origin: current.origin, cookie },
      body: JSON.stringify({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 100_000, seed: 42 }),
    });
    expect(res.status).toBe(201);
    const id = ((await res.json()) as { run: { id: string } }).run.id;
    const chunksOf = () => workers.flatMap((w) => w.chunksDone()).filter((j) => j.startsWith(`${id}.`));
    await until("a few chunks done", async () => chunksOf().length >= 3, 30_000);
    current.child.kill("SIGTERM");
    await current.exited;
    expect(current.child.exitCode).toBe(0);
    const atStop = chunksOf().length;
    expect((await ds.getRepository(Run).findOneByOrFail({ id })).state).toBe("queued"); // handed back by the stopping server

    await serve();
    const run = await until("the run to end", async () => {
      const r = await ds.getRepository(Run).findOneByOrFail({ id });
      return ["done", "failed", "cancelled"].includes(r.state) ? r : null;
    }, 60_000);
    expect(run.state, `${run.errorCode}: ${run.errorMessage}`).toBe("done");
    const rows = (await ds.query("SELECT result FROM run_result WHERE run_id = ?", [id])) as { result: unknown }[];
    const stored = typeof rows[0].result === "string" ? rows[0].result : JSON.stringify(rows[0].result);
    const pool = createEmbeddedDispatcher({ size: 1 });
    try {
      expect(stored).toBe(JSON.stringify(toStoredResult(await pool.runMonteCarlo(run.netlist, run.limits, run.options as unknown as RunOptions))));
    } finally {
      await pool.close();
    }
    expect(chunksOf()).toHaveLength(40);
    expect(new Set(chunksOf()).size).toBe(40);
    console.log(`server stopped (SIGTERM) after ${atStop} of 40 chunks; the next server used the chunks in Redis: 40 computed in all, result identical`);
  }, 120_000);
});
