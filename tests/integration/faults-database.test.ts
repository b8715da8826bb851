import { randomUUID } from "node:crypto";
import mysql from "mysql2/promise";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ensureDatabase, startMariaDb, type MariaDb } from "../../scripts/mariadb";
import { createApp } from "../../server/app";
import { hashPassword } from "../../server/auth/passwords";
import { loadConfig, type ServerConfig } from "../../server/config/env";
import type { AppContext } from "../../server/context";
import { createContext } from "../../server/create-context";
import { createEmbeddedDispatcher } from "../../server/engine/dispatcher";
import { createTrialPool } from "../../workers/trial-pool";
import { Run, RunResultRow, User } from "../../server/entities";
import type { Logger } from "../../server/logger";
import { createRunQueue, toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import type { TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// The database going away and coming back, on a private MariaDB of this file (its own folder and port, derived from
// the test server's port so parallel test stacks never share it): while it is down the API answers 503
// DATABASE_UNAVAILABLE with Retry-After and /api/health says degraded; a run that finishes computing meanwhile keeps
// its result until it can be stored; when the database is back the same app (no restart) answers again, the run
// queue goes on, and the run's stored result is the one an uninterrupted run gives.

const PORT = Number(process.env.LOTWISE_TEST_DB_PORT ?? 3308) + 25;
const DIR = `.tmp/mariadb-fault-${PORT}`;
const ORIGIN = "http://127.0.0.1";
const PASSWORD = "correct horse battery staple";
const creds = { host: "127.0.0.1", port: PORT, name: "lotwise_fault", user: "lotwise_fault", password: "lotwise-fault-db" };

let db: MariaDb;
let ctx: AppContext & { close(): Promise<void> };
let app: ReturnType<typeof createApp>["app"];
let agent: ReturnType<typeof request.agent>;
let f: RunFixture;
/** What the server logged (silently): the run queue's retries are checked below. */
const logged: { level: string; event: string; fields?: Record<string, unknown> }[] = [];
const log: Logger = {
  info: (event, fields) => void logged.push({ level: "info", event, fields }),
  warn: (event, fields) => void logged.push({ level: "warn", event, fields }),
  error: (event, fields) => void logged.push({ level: "error", event, fields }),
};

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
async function until<T>(what: string, probe: () => Promise<T | null | undefined | false>, ms = 20_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await probe().catch(() => null);
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await sleep(100);
  }
}

beforeAll(async () => {
  if (!process.env.LOTWISE_TEST_DB_READY) throw new Error("run through `npm test`");
  db = await startMariaDb({ dir: DIR, port: PORT });
  ensureDatabase(db, creds);
  const admin = await mysql.createConnection({ host: creds.host, port: PORT, user: creds.user, password: creds.password });
  await admin.query(`DROP DATABASE IF EXISTS ${creds.name}`);
  await admin.query(`CREATE DATABASE ${creds.name} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.end();
  const base = loadConfig(process.env);
  const config: ServerConfig = { ...base, db: { ...creds }, publicOrigin: ORIGIN, workers: 1, smtp: { ...base.smtp, host: undefined, sinkPort: 9 } };
  ctx = await createContext(config, { log, maxRunning: 1 });
  app = createApp(ctx).app;
  const user = ctx.dataSource.getRepository(User).create({
    id: randomUUID(), email: "outage@lotwise.test", name: "Outage Tester", roles: ["designer"], active: true, passwordHash: await hashPassword(PASSWORD),
  });
  await ctx.dataSource.getRepository(User).insert(user);
  agent = request.agent(app);
  await agent.post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: user.email, password: PASSWORD }).expect(200);
  f = await makeRunFixture({ ctx } as unknown as TestContext, user, { name: "Outage low-pass" });
}, 90_000);

afterAll(async () => {
  await ctx?.close().catch(() => undefined);
  await db?.stop();
}, 60_000);

describe("database outage", () => {
  it("answers 503 while MariaDB is down and recovers without a restart; the run queue goes on", async () => {
    const launch = async (trials: number, seed: number) =>
      (await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials, seed }).expect(201)).body.run.id as string;
    const long = await launch(8000, 4242);
    const next = await launch(1000, 4243);
    await until("the first run to make progress", async () => (ctx.runQueue.live(long)?.trialsDone ?? 0) > 0);

    const downAt = Date.now();
    await db.stop();
    const stoppedMs = Date.now() - downAt;

    const health = await request(app).get("/api/health");
    expect(health.status).toBe(503);
    expect(health.body).toEqual({ status: "degraded", database: "down", dispatch: { mode: "embedded", threads: 1 } });
    const reads = [
      await agent.get("/api/runs"),
      await agent.get(`/api/runs/${long}`),
      await agent.post("/api/runs").set("Origin", ORIGIN).send({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 100, seed: 1 }),
      await request(app).post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: "outage@lotwise.test", password: PASSWORD }),
    ];
    for (const res of reads) {
      expect(res.status, JSON.stringify(res.body)).toBe(503);
      expect(res.body.error.code).toBe("DATABASE_UNAVAILABLE");
      expect(res.headers["retry-after"]).toBe("5");
    }

    // The running run finishes computing while the database is down; its result waits in memory.
    await until("the first run to finish computing", async () => {
      const live = ctx.runQueue.live(long);
      return live === null || live.trialsDone === live.trialsTotal;
    }, 30_000);
    await sleep(500); // a few failed attempts to store it

    const upAt = Date.now();
    db = await startMariaDb({ dir: DIR, port: PORT });
    const backMs = await until("/api/health to say ok", async () => {
      const res = await request(app).get("/api/health");
      return res.status === 200 && res.body.status === "ok" ? Date.now() - upAt : null;
    });
    // The same app, no restart: reads, sign-in and writes work again.
    await agent.get("/api/runs").expect(200);
    await request(app).post("/api/auth/sign-in").set("Origin", ORIGIN).send({ email: "outage@lotwise.test", password: PASSWORD }).expect(200);
    const third = await launch(500, 4244);

    await until("the runs to finish", async () => {
      const states = await Promise.all([long, next, third].map(async (id) => (await agent.get(`/api/runs/${id}`)).body.run?.state));
      return states.every((s) => s === "done");
    }, 30_000);
    await ctx.runQueue.idle();
    // The result of the first run was held and its write retried, not dropped and not turned into a failure.
    expect(logged.some((l) => l.event === "run_write_waiting_for_database" && l.fields?.runId === long && l.fields?.what === "result")).toBe(true);
    expect(logged.filter((l) => l.event === "run_write_failed")).toEqual([]);
    console.log(`database outage: MariaDB stopped in ${stoppedMs} ms; the API answered 503 DATABASE_UNAVAILABLE (Retry-After 5) and health "degraded"; ` +
      `after restart /api/health was ok again ${backMs} ms after the restart began; the run that finished during the outage and the two after it are done`);

    // The run that finished during the outage stored the result an uninterrupted run gives.
    const pool = createTrialPool({ size: 1 });
    try {
      for (const [id, trials, seed] of [[long, 8000, 4242], [next, 1000, 4243]] as const) {
        const row = await ctx.dataSource.getRepository(RunResultRow).findOneByOrFail({ runId: id });
        const ref = await pool.runMonteCarlo(f.revision.netlist, f.limitSet.limits, { trials, seed, sweep: f.revision.sweep } as unknown as RunOptions);
        expect(row.result).toEqual(JSON.parse(JSON.stringify(toStoredResult(ref))));
      }
    } finally {
      await pool.close();
    }
  }, 90_000);

  it("looks for queued runs again by itself after a look failed because the database was down", async () => {
    // A run stored `queued` without a kick (as another server would leave it); a second queue's look fails while the
    // database is down; once it is back, the queue's retry finds the run and runs it, with no new request.
    await ctx.runQueue.idle();
    const template = await ctx.dataSource.getRepository(Run).findOneOrFail({ where: { state: "done" }, order: { queuedAt: "ASC" } });
    const id = randomUUID();
    const repo = ctx.dataSource.getRepository(Run);
    await repo.save(repo.create({
      ...template, id, state: "queued", trialsDone: 0, passed: null, yieldFraction: null, wilsonLow: null, wilsonHigh: null,
      queuedAt: new Date(), startedAt: null, finishedAt: null, label: "left queued",
    }));
    const queue = createRunQueue({ dataSource: ctx.dataSource, mailer: ctx.mailer, log, config: ctx.config, dispatcher: () => createEmbeddedDispatcher({ size: 1 }), retryMs: 100 });
    try {
      await db.stop();
      const before = logged.filter((l) => l.event === "run_queue_pump_failed").length;
      queue.kick();
      await until("the look to fail", async () => logged.filter((l) => l.event === "run_queue_pump_failed").length > before);
      db = await startMariaDb({ dir: DIR, port: PORT });
      const run = await until("the left run to be done", async () => {
        const r = await ctx.dataSource.getRepository(Run).findOneBy({ id });
        return r?.state === "done" ? r : null;
      });
      expect(run.passed).toBe(template.passed);
      console.log(`database outage: ${logged.filter((l) => l.event === "run_queue_pump_failed").length - before} failed look(s) for queued runs while down, then the queue ran the waiting run by itself`);
    } finally {
      await queue.close();
    }
  }, 60_000);
});
