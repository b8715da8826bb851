import type { ChildProcess } from "node:child_process";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTrialPool } from "../../workers/trial-pool";
import { Run, RunResultRow, User } from "../../server/entities";
import { toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import { until } from "../helpers/distributed";
import { createScratchDatabase, signInCookie, startServerProcess, type ScratchDatabase } from "../helpers/server-process";
import type { TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// The server killed (SIGKILL) with one run running and three queued: a real server process (node --import tsx
// server/index.ts) on a fresh database of the test MariaDB is killed, a second one is started on the same database,
// and every accepted run finishes with exactly the stored result an uninterrupted run of the same inputs and seed
// gives (the interrupted one is re-run from its stored netlist, limits, options and seed). Nothing accepted is lost.

const PASSWORD = "correct horse battery staple";
let db: ScratchDatabase;
let ds: ScratchDatabase["ds"];
const children = new Set<ChildProcess>();
let user: User;
let f: RunFixture;

const startServer = async () => {
  const server = await startServerProcess(db.dbName);
  children.add(server.child);
  server.child.once("exit", () => children.delete(server.child));
  return server;
};
const signIn = (origin: string) => signInCookie(origin, user.email, PASSWORD);

beforeAll(async () => {
  db = await createScratchDatabase("lotwise_kill", { email: "restart@lotwise.test", name: "Restart Tester", roles: ["designer"], password: PASSWORD });
  ({ ds, user } = db);
  f = await makeRunFixture({ ctx: { dataSource: ds } } as unknown as TestContext, user, { name: "Restart low-pass" });
}, 30_000);

afterAll(async () => {
  for (const c of children) c.kill("SIGKILL");
  await db?.drop();
}, 30_000);

describe("server killed mid-run", () => {
  it("loses no accepted run: the queued ones run, the interrupted one re-runs to the uninterrupted result", async () => {
    const first = await startServer();
    const cookie = await signIn(first.origin);
    const submit = async (trials: number, seed: number, extra: Record<string, unknown> = {}) => {
      const res = await fetch(`${first.origin}/api/runs`, {
        method: "POST", headers: { "content-type": "application/json", origin: first.origin, cookie },
        body: JSON.stringify({ revisionId: f.revision.id, limitSetId: f.limitSet.id, trials, seed, ...extra }),
      });
      const body = (await res.json()) as { run: { id: string } };
      expect(res.status, JSON.stringify(body)).toBe(201);
      return body.run.id;
    };
    const ids = [await submit(7500, 31), await submit(3000, 32), await submit(2000, 33, { corners: [0, 70] }), await submit(1500, 34)];
    const running = await until("the first run to be running with progress stored", async () => {
      const r = await ds.getRepository(Run).findOneByOrFail({ id: ids[0] });
      return r.state === "running" && r.trialsDone > 0 ? r : null;
    });

    first.child.kill("SIGKILL");
    await until("the first server to die", async () => first.child.exitCode !== null || first.child.signalCode !== null);
    const atKill = await ds.getRepository(Run).find({ order: { queuedAt: "ASC" } });
    expect(atKill.map((r) => r.state)).toEqual(["running", "queued", "queued", "queued"]);
    console.log(`server killed (SIGKILL) at ${running.trialsDone}/${running.trialsTotal} trials of the first run; three runs queued`);

    const second = await startServer();
    try {
      const done = await until("every run to be done", async () => {
        const rows = await ds.getRepository(Run).find({ order: { queuedAt: "ASC" } });
        return rows.every((r) => r.state === "done") ? rows : null;
      }, 40_000);
      expect(done.map((r) => r.id)).toEqual(ids);
      for (let k = 1; k < done.length; k++) expect(done[k].startedAt!.getTime()).toBeGreaterThanOrEqual(done[k - 1].finishedAt!.getTime());

      // Each stored result equals the uninterrupted run of the same stored inputs and seed.
      const pool = createTrialPool({ size: 1 });
      try {
        for (const run of done) {
          const row = await ds.getRepository(RunResultRow).findOneByOrFail({ runId: run.id });
          const ref = await pool.runMonteCarlo(run.netlist, run.limits, run.options as unknown as RunOptions);
          expect(row.result).toEqual(JSON.parse(JSON.stringify(toStoredResult(ref))));
          expect(run).toMatchObject({ trialsDone: ref.trials, passed: ref.passed, yieldFraction: ref.yield });
        }
      } finally {
        await pool.close();
      }
      console.log(`after restart: ${done.length}/${done.length} runs done, results identical to uninterrupted runs (yields ${done.map((r) => r.yieldFraction!.toFixed(4)).join(", ")})`);
    } finally {
      second.child.kill("SIGTERM");
      await until("the second server to stop", async () => second.child.exitCode !== null || second.child.signalCode !== null, 15_000).catch(() => second.child.kill("SIGKILL"));
    }
  }, 90_000);
});
