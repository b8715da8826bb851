import { spawnSync } from "node:child_process";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createEmbeddedDispatcher, type RunDispatcher } from "../../server/engine/dispatcher";
import { createDistributedDispatcher, type DistributedDispatcher } from "../../server/engine/distributed-dispatcher";
import { toStoredResult } from "../../server/services/run-queue";
import type { RunOptions } from "../../shared/engine/run-options";
import type { RunResult } from "../../shared/engine/result";
import { recordingLogger, startTestRedis, startWorker, until, type WorkerProcess } from "../helpers/distributed";
import { LOWPASS, LOWPASS_LIMITS, LOWPASS_SWEEP } from "./access-samples/runs";

// Distributed mode across a real network boundary: two network namespaces, each joined to the root namespace by a
// veth pair, one worker process in each. Redis runs in the root namespace and the workers reach it only through the
// root-side veth addresses, so every command they send crosses a link this file can cut. Names and addresses carry
// the pid so parallel runs do not clash (interface names stay under Linux's 15 characters).
const PID = process.pid;
const OCTET = PID % 250;
const SIDES = {
  a: { ns: `lw${PID}a`, rootIf: `lw${PID}a0`, nsIf: `lw${PID}a1`, rootIp: `10.213.${OCTET}.1`, nsIp: `10.213.${OCTET}.2` },
  b: { ns: `lw${PID}b`, rootIf: `lw${PID}b0`, nsIf: `lw${PID}b1`, rootIp: `10.213.${OCTET}.5`, nsIp: `10.213.${OCTET}.6` },
};

const netnsProblem = probeNetns();
if (netnsProblem) console.log(`distributed-netns: skipped, network namespaces are not available here: ${netnsProblem}`);

let redis: Awaited<ReturnType<typeof startTestRedis>> | undefined;
let workerA: WorkerProcess | undefined;
let workerB: WorkerProcess | undefined;
let distributed: DistributedDispatcher | undefined;
let embedded: RunDispatcher | undefined;
const dispatchLog = recordingLogger();

const options = (trials: number, seed: number) => ({ trials, seed, sweep: LOWPASS_SWEEP }) as unknown as RunOptions;
const stored = (r: RunResult) => JSON.stringify(toStoredResult(r));
const ofRun = (w: WorkerProcess, runId: string) => w.chunksDone().filter((id) => id.startsWith(`${runId}.`));

describe.skipIf(netnsProblem !== null)("distributed mode across network namespaces", () => {
  beforeAll(async () => {
    for (const s of Object.values(SIDES)) {
      removeSide(s); // left over by an earlier run that had this pid
      ip("netns", "add", s.ns);
      ip("link", "add", s.rootIf, "type", "veth", "peer", "name", s.nsIf);
      ip("link", "set", s.nsIf, "netns", s.ns);
      ip("addr", "add", `${s.rootIp}/30`, "dev", s.rootIf);
      ip("link", "set", s.rootIf, "up");
      ip("-n", s.ns, "addr", "add", `${s.nsIp}/30`, "dev", s.nsIf);
      ip("-n", s.ns, "link", "set", s.nsIf, "up");
      ip("-n", s.ns, "link", "set", "lo", "up");
    }
    redis = await startTestRedis("netns", { extraBind: [SIDES.a.rootIp, SIDES.b.rootIp] });
    [workerA, workerB] = await Promise.all([
      startWorker(`redis://${SIDES.a.rootIp}:${redis.port}/`, `netns-a-${PID}`, { netns: SIDES.a.ns, threads: 1 }),
      startWorker(`redis://${SIDES.b.rootIp}:${redis.port}/`, `netns-b-${PID}`, { netns: SIDES.b.ns, threads: 1 }),
    ]);
    // The server side sits in the root namespace, as Redis does: loopback is its way in.
    distributed = createDistributedDispatcher({ redisUrl: redis.url, pollMs: 200, log: dispatchLog });
    embedded = createEmbeddedDispatcher({ size: 1 });
  }, 60_000);

  afterAll(async () => {
    // In this order even after a failure: a worker cut off mid-test would otherwise wait on its lost TCP segments.
    for (const s of Object.values(SIDES)) spawnSync("ip", ["link", "set", s.rootIf, "up"], { stdio: "ignore" });
    await Promise.allSettled([workerA?.stop(), workerB?.stop()]);
    await Promise.allSettled([distributed?.close(), embedded?.close()]);
    await redis?.cleanUp();
    for (const s of Object.values(SIDES)) removeSide(s);
  }, 60_000);

  it("gives the embedded result byte for byte, with chunks done in both namespaces", async () => {
    const runId = `netns-${PID}-same`;
    const t0 = Date.now();
    const dist = await distributed!.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(20_000, 5), { runId });
    const t1 = Date.now();
    const ref = await embedded!.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(20_000, 5));
    const t2 = Date.now();
    expect(stored(dist) === stored(ref), "distributed and embedded stored results differ").toBe(true);

    const a = ofRun(workerA!, runId);
    const b = ofRun(workerB!, runId);
    console.log(`netns run 1: 20000 trials, 8 chunks: A (${SIDES.a.ns}) did ${a.length}, B (${SIDES.b.ns}) did ${b.length}; distributed ${t1 - t0} ms, embedded ${t2 - t1} ms (both with thread start-up)`);
    expect(a.length).toBeGreaterThan(0);
    expect(b.length).toBeGreaterThan(0);
    // Both workers' connections come from their namespace addresses, so their commands did cross the veth links.
    const clients = redisCli("client", "list");
    expect(clients).toContain(`addr=${SIDES.a.nsIp}:`);
    expect(clients).toContain(`addr=${SIDES.b.nsIp}:`);
  }, 90_000);

  it("survives a partition of worker A: B takes over its chunk, the result is unchanged, A serves again once healed", async () => {
    const runId = `netns-${PID}-cut`;
    const trials = 60_000;
    const expectedChunks = Array.from({ length: trials / 2500 }, (_, k) => `${runId}.${k * 2500}.2500`);
    const ref = await embedded!.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(trials, 6));

    const t0 = Date.now();
    const run = distributed!.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(trials, 6), { runId });
    run.catch(() => undefined); // awaited below; keeps a failure from being reported as unhandled meanwhile
    await until("worker A to finish a chunk of the partition run", () => ofRun(workerA!, runId).length > 0, 30_000);
    ip("link", "set", SIDES.a.rootIf, "down");
    const cutWall = Date.now();
    const cutAt = cutWall - t0;
    const aBeforeCut = new Set(ofRun(workerA!, runId));
    const bAtCut = ofRun(workerB!, runId).length;
    // What A holds when the link goes: it can neither finish nor renew it, so its lock runs out (4 s).
    const stranded = (await distributed!.chunks.getActive()).filter((j) => j.processedBy === workerA!.name && j.id?.startsWith(`${runId}.`)).map((j) => j.id!);

    const dist = await run;
    const finishedAt = Date.now() - t0;
    const a = ofRun(workerA!, runId);
    const b = ofRun(workerB!, runId);
    const bAfterCut = b.slice(bAtCut);
    console.log(
      `netns run 2: ${trials} trials, ${expectedChunks.length} chunks: link of A cut at ${cutAt} ms, run finished at ${finishedAt} ms; ` +
        `A logged ${a.length} chunks (${aBeforeCut.size} before the cut, ${a.length - aBeforeCut.size} computed while cut off), ` +
        `B ${b.length} (${bAfterCut.length} after the cut); stranded on A: ${stranded.join(", ") || "none"}`,
    );
    expect(stored(dist) === stored(ref), "partitioned run's stored result differs from the embedded one").toBe(true);
    expect(bAfterCut.length).toBeGreaterThan(0);
    expect(stranded.length).toBeGreaterThan(0);
    for (const id of stranded) {
      expect(bAfterCut, `B finished A's stranded chunk ${id}`).toContain(id);
      expect(workerB!.output()).toMatch(new RegExp(`"event":"chunk_stalled_requeued".*"jobId":"${id.replace(/\./g, "\\.")}"`));
    }
    // Nothing A did behind the partition counted: Redis holds every chunk as finished by A before the cut or by B.
    // (Redis, not A's log, says who finished a chunk: A logs a chunk just before it hands it in, and a line written
    // in the instant before the cut may reach this process only after the snapshot above.)
    for (const id of expectedChunks) {
      const job = await distributed!.chunks.getJob(id);
      expect(job?.finishedOn, `chunk ${id} finished`).toBeDefined();
      if (job!.processedBy === workerA!.name) expect(job!.finishedOn!, `chunk ${id} handed in by A before the cut`).toBeLessThanOrEqual(cutWall);
      else {
        expect(job!.processedBy, `chunk ${id} finished by A before the cut or by B`).toBe(workerB!.name);
        expect(b, `B logged chunk ${id}`).toContain(id);
      }
    }

    // Heal the link with B gone: the next run can only finish if A is back on Redis and taking chunks.
    await workerB!.stop();
    ip("link", "set", SIDES.a.rootIf, "up");
    const healedAt = Date.now();
    const healId = `netns-${PID}-healed`;
    const healed = await withDeadline(
      distributed!.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(5000, 7), { runId: healId, chunkSize: 1000 }),
      40_000, "the run after the link came back (worker A alone)",
    );
    const healMs = Date.now() - healedAt;
    const aHealed = ofRun(workerA!, healId);
    console.log(`netns run 3: link back up, B stopped: 5000 trials in 5 chunks, A did ${aHealed.length}, run finished ${healMs} ms after the link came up`);
    const aEvents = workerA!.output().split("\n").filter((l) => l.startsWith("{") && !l.includes('"chunk_done"') && !l.includes('"worker_ready"'));
    console.log(`netns run 3: worker A's other log lines: ${aEvents.map((l) => l.slice(0, 240)).join(" | ") || "none"}`);
    expect(aHealed.length).toBe(5);
    expect(stored(healed) === stored(await embedded!.runMonteCarlo(LOWPASS, LOWPASS_LIMITS, options(5000, 7))), "healed run differs from embedded").toBe(true);
  }, 90_000);
});

/** Null when this process may make network namespaces (it tries one), else why not. */
function probeNetns(): string | null {
  const name = `lw${PID}p`;
  const r = spawnSync("ip", ["netns", "add", name], { encoding: "utf8" });
  if (r.status === 0) {
    spawnSync("ip", ["netns", "del", name], { stdio: "ignore" });
    return null;
  }
  return r.error?.message ?? (r.stderr.trim() || `ip netns add exited with ${r.status}`);
}

/** Runs `ip` with these arguments. @throws Error with its stderr when it fails */
function ip(...args: string[]): void {
  const r = spawnSync("ip", args, { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`ip ${args.join(" ")} failed: ${r.error?.message ?? r.stderr.trim()}`);
}

/** Deletes a side's namespace (which takes its veth end, and so the pair) and the root end, if either is there. */
function removeSide(s: { ns: string; rootIf: string }): void {
  spawnSync("ip", ["netns", "del", s.ns], { stdio: "ignore" });
  spawnSync("ip", ["link", "del", s.rootIf], { stdio: "ignore" });
}

function redisCli(...args: string[]): string {
  return spawnSync("redis-cli", ["-h", "127.0.0.1", "-p", String(redis!.port), ...args], { encoding: "utf8" }).stdout ?? "";
}

function withDeadline<T>(p: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const deadline = new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error(`${what} did not finish within ${ms} ms`)), ms)));
  return Promise.race([p, deadline]).finally(() => clearTimeout(timer));
}
