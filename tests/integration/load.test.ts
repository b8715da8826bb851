import { createServer, type Server } from "node:http";
import { performance } from "node:perf_hooks";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Run } from "../../server/entities";
import { createLoadClient, formatSummary, runLoops, signInOver, type LoadClient } from "../../scripts/soak";
import { createTestContext, TEST_PASSWORD, type TestContext } from "../helpers/test-context";
import { makeRunFixture, type RunFixture } from "./access-samples/runs";

// Load, bounded in count and time, over real HTTP on loopback: 50 run submissions at once (small runs), then 200
// concurrent readers of run dashboards (GET /api/runs/:id) and history (GET /api/runs) while the queue works through
// them. Asserted: no request is lost or fails (429s are waited out and retried by the client), every accepted run is
// stored and finishes, and with one run at a time they start and finish in the order they were accepted. The latency
// percentiles and throughput are printed, not asserted (this machine's speed is not the product's promise).

const SUBMISSIONS = 50;
const READERS = 200;
const READS_PER_READER = 3;

let t: TestContext;
let server: Server;
let origin: string;
let client: LoadClient;
let f: RunFixture;
const cookies: string[] = [];

beforeAll(async () => {
  t = await createTestContext({ maxRunning: 1, poolSize: 1 });
  server = createServer(t.app);
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  origin = `http://127.0.0.1:${(server.address() as { port: number }).port}`;
  // The app accepts state-changing requests from its public origin only: this listener's origin.
  t.ctx.config.publicOrigin = origin;
  client = createLoadClient(origin);
  const people = [];
  for (let k = 0; k < 4; k++) people.push(await t.buildUser({ roles: ["designer", "analyst"] }));
  for (const p of people) cookies.push(await signInOver(client, p.email, TEST_PASSWORD));
  f = await makeRunFixture(t, people[0], { name: "Load low-pass" });
  client.reset();
}, 30_000);

afterAll(async () => {
  await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
  server?.closeAllConnections();
  await t?.close();
});

describe("load on loopback", () => {
  it("takes 50 submissions at once and 200 concurrent readers without losing or failing a request; queue order kept", async () => {
    const started = performance.now();
    const submitted = await Promise.all(
      Array.from({ length: SUBMISSIONS }, async (_, k) => {
        const res = await client.send("submit run", "POST", "/api/runs", {
          cookie: cookies[k % cookies.length], body: { revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 50, seed: 7000 + k },
        });
        expect(res.status, JSON.stringify(res.body)).toBe(201);
        return res.body.run as { id: string; seed: number };
      }),
    );
    const submitSeconds = (performance.now() - started) / 1000;
    const ids = submitted.map((r) => r.id);
    expect(new Set(ids).size).toBe(SUBMISSIONS);

    // 200 readers at once, each reading a few dashboards and a history page, while the queue runs.
    const readStart = performance.now();
    let dashboardBytes = 0;
    await runLoops(READERS, async (i) => {
      for (let k = 0; k < READS_PER_READER; k++) {
        const id = ids[(i * 7 + k * 13) % ids.length];
        const res = await client.send("run dashboard", "GET", `/api/runs/${id}`, { cookie: cookies[i % cookies.length] });
        expect(res.body.run.id).toBe(id);
        if (res.body.result) dashboardBytes = Math.max(dashboardBytes, JSON.stringify(res.body).length);
        if (k % 2 === 0) {
          const page = 1 + ((i + k) % 3);
          const h = await client.send("history", "GET", `/api/runs?designId=${f.design.id}&page=${page}&pageSize=20&sort=queuedAt&dir=asc`, { cookie: cookies[i % cookies.length] });
          expect(h.body.total).toBeGreaterThanOrEqual(SUBMISSIONS);
        }
      }
      return false;
    });
    const readSeconds = (performance.now() - readStart) / 1000;
    await t.ctx.runQueue.idle();
    const allSeconds = (performance.now() - started) / 1000;

    const rows = client.summary();
    console.log(
      `load: ${SUBMISSIONS} submissions at once took ${submitSeconds.toFixed(2)} s; ${READERS} readers × ${READS_PER_READER} dashboards (+ history) took ${readSeconds.toFixed(2)} s; ` +
        `queue drained after ${allSeconds.toFixed(2)} s; largest dashboard body ${(dashboardBytes / 1024).toFixed(0)} KiB\n` +
        formatSummary(rows, submitSeconds + readSeconds),
    );
    // Nothing lost or failed (429s were retried by the client and are not failures).
    expect(client.failures).toEqual([]);
    const byKind = Object.fromEntries(rows.map((r) => [r.kind, r]));
    expect(byKind["submit run"].requests).toBe(SUBMISSIONS);
    expect(byKind["run dashboard"].requests).toBe(READERS * READS_PER_READER);
    expect(byKind["history"].requests).toBe(READERS * Math.ceil(READS_PER_READER / 2));

    // Every accepted run is stored and done; with one at a time they ran in the order they were accepted.
    const runs = await t.ctx.dataSource.getRepository(Run).find({ where: { designId: f.design.id }, order: { queuedAt: "ASC", id: "ASC" } });
    expect(runs.map((r) => r.id).sort()).toEqual([...ids].sort());
    expect(runs.every((r) => r.state === "done")).toBe(true);
    for (let k = 1; k < runs.length; k++) {
      expect(runs[k].queuedAt.getTime()).toBeGreaterThan(runs[k - 1].queuedAt.getTime());
      expect(runs[k].startedAt!.getTime()).toBeGreaterThanOrEqual(runs[k - 1].finishedAt!.getTime());
    }
    // The history agrees: all 50, in acceptance order.
    const history = await client.send("history", "GET", `/api/runs?designId=${f.design.id}&pageSize=100&sort=queuedAt&dir=asc`, { cookie: cookies[0] });
    expect(history.body.runs.map((r: { id: string }) => r.id)).toEqual(runs.map((r) => r.id));
  }, 60_000);
});
