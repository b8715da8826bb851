/**
 * Distributed mode: the server splits a run into chunk jobs on BullMQ (Redis) and merges what worker processes
 * (`npm run worker`, workers/queue-worker.ts) return. The result is the same as embedded mode, byte for byte: the
 * same chunks of the same plan, merged exactly, finalized here.
 *
 * - Each batch of a run (the whole run, or one stop-when-sure batch) is one BullMQ flow: a parent job
 *   `<runId>.batch.<start>.<trials>` in the `batches` queue (no worker takes it: it groups the batch and fails
 *   when a chunk fails for good) with one child per chunk in the `chunks` queue (chunk-jobs.ts). Job ids are
 *   fixed by the run and the trial range, so a re-started run reuses chunks that are already there.
 * - Waiting: completions and failures arrive as QueueEvents and each is read from its job; every `pollMs`
 *   (default 1 s) all unfinished chunks are also looked at, so a missed event only delays. A chunk that is
 *   missing from Redis (Redis restarted without its data) is added again: the run resumes.
 * - Faults (BullMQ's own): a worker process that dies mid-chunk stops renewing the chunk's lock; another
 *   worker's stalled-job check moves it back to waiting and some worker runs it again (same trials, same
 *   aggregate). A chunk that fails `CHUNK_ATTEMPTS` times fails its run with WORKER_FAILED and the reason.
 * - Outages: while Redis cannot be reached the run waits; after `outageMs` (default 60 s) without Redis the
 *   run fails with QUEUE_UNAVAILABLE (only a command Redis answered ends an outage: a pass that asked it nothing
 *   does not), and after `noWorkersMs` (default 10 min) with no worker process connected it fails with
 *   NO_WORKERS — never a silent hang. Its inputs stay stored in MariaDB either way.
 * - Cancel: the run's waiting chunks are removed; chunks already running finish and are dropped, then the
 *   batch is removed.
 */
import { randomUUID } from "node:crypto";
import { FlowProducer, Queue, QueueEvents } from "bullmq";
import type { TrialAggregate } from "../../shared/engine/aggregate";
import { EngineError } from "../../shared/engine/errors";
import { costBoundedChunkSize, driveRun, validateChunkSize, type ChunkTask } from "../../shared/engine/monte-carlo";
import { shapeRun } from "../../shared/engine/run-plan";
import { createLogger, type Logger } from "../logger";
import {
  BATCH_QUEUE, CHUNK_ATTEMPTS, CHUNK_QUEUE, CHUNK_QUEUE_PREFIX, chunkJobId, redactUrl, redisConnection, unpackChunkResult,
  type ChunkJobData, type ChunkJobResult,
} from "./chunk-jobs";
import { createBatchRemover } from "./batch-removal";
import type { DispatchStatus, RunDispatcher } from "./dispatcher";
import { isRedisTrouble, within } from "./redis-bounds";
import { ServerStopping, WorkerFailure } from "../../workers/trial-pool";

export interface DistributedDispatcherOptions {
  redisUrl: string;
  /** trials per chunk job (default 2500; at most ⌈batchSize/4⌉ when the run stops when sure) */
  chunkSize?: number;
  /** how long Redis may be unreachable before a run fails (default 60 s) */
  outageMs?: number;
  /** how long no worker process may be connected while a run waits before it fails (default 10 min) */
  noWorkersMs?: number;
  /** how often every unfinished chunk is looked at besides the events (default 1000 ms) */
  pollMs?: number;
  log?: Logger;
}

/** A distributed dispatcher with the chunk queue it fills (tests and the benchmark look at it). */
export interface DistributedDispatcher extends RunDispatcher {
  readonly chunks: Queue<ChunkJobData, ChunkJobResult>;
}

const KEEP_FINISHED = { age: 24 * 3600 };
export { isRedisTrouble };

/** Events kept in the chunk queue's stream (BullMQ's default of 10,000 would hold gigabytes of chunk results). */
export const EVENTS_KEPT = 100;

/** A chunk's BullMQ priority: its place in its run, 1-based (1 … 2^21, BullMQ's range; lower is taken first). */
function chunkPriority(c: { start: number; count: number }): number {
  return Math.min(2 ** 21, 1 + Math.floor(c.start / Math.max(1, c.count)));
}

export function createDistributedDispatcher(options: DistributedDispatcherOptions): DistributedDispatcher {
  const log = options.log ?? createLogger();
  const defaultChunk = validateChunkSize(options.chunkSize);
  const outageMs = options.outageMs ?? 60_000;
  const noWorkersMs = options.noWorkersMs ?? 600_000;
  const pollMs = options.pollMs ?? 1000;
  // One look at Redis may take this long before it counts as Redis not answering.
  const passTimeoutMs = Math.max(1000, Math.min(10_000, outageMs / 2));
  const where = redactUrl(options.redisUrl);
  const producer = redisConnection(options.redisUrl, "producer");
  // BullMQ copies a job's return value into its event stream; a chunk's is ~0.1–0.5 MB, so the stream is kept short
  // (the poll covers an event trimmed before it was read).
  const chunks = new Queue<ChunkJobData, ChunkJobResult>(CHUNK_QUEUE, { connection: producer, prefix: CHUNK_QUEUE_PREFIX, streams: { events: { maxLen: EVENTS_KEPT } } });
  const batches = new Queue(BATCH_QUEUE, { connection: producer, prefix: CHUNK_QUEUE_PREFIX });
  const flows = new FlowProducer({ connection: producer, prefix: CHUNK_QUEUE_PREFIX });
  // QueueEvents (a blocking connection of its own) starts once Redis has answered: if it never reached Redis, its
  // close() would wait for a first connection that may never come, and keep the process alive retrying.
  let events: QueueEvents | null = null;
  // ioredis reports every failed reconnect as an 'error'; the runs waiting on Redis report the outage themselves.
  let lastErrorLog = 0;
  const onRedisError = (err: Error) => {
    if (Date.now() - lastErrorLog < 10_000) return;
    lastErrorLog = Date.now();
    log.warn("redis_unreachable", { redis: where, message: String(err?.message ?? err).slice(0, 200) });
  };
  chunks.on("error", onRedisError);
  batches.on("error", onRedisError);
  flows.on("error", onRedisError);
  const pokes = new Map<string, () => void>();
  function listen(): void {
    if (events || closed) return;
    events = new QueueEvents(CHUNK_QUEUE, { connection: redisConnection(options.redisUrl, "worker"), prefix: CHUNK_QUEUE_PREFIX });
    events.on("error", onRedisError);
    events.on("completed", ({ jobId }) => pokes.get(jobId)?.());
    events.on("failed", ({ jobId }) => pokes.get(jobId)?.());
    events.on("stalled", ({ jobId }) => log.warn("chunk_job_stalled", { jobId }));
  }
  let closed = false;
  const wakers = new Set<() => void>();
  let lastTrim = 0;
  // Parents whose batch ended but could not be removed (a run cancelled while the server was down, a removal given
  // up on) end in `wait` or `failed`, where no worker takes them: drop those older than a day, now and every hour.
  const sweepOld = () =>
    void Promise.all([batches.clean(KEEP_FINISHED.age * 1000, 1000, "wait"), batches.clean(KEEP_FINISHED.age * 1000, 1000, "failed")]).catch(() => undefined);
  sweepOld();
  const sweeper = setInterval(sweepOld, 3600_000);
  sweeper.unref();

  /** The number of connected worker processes; null when Redis does not let us list clients (an ACL without CLIENT LIST). */
  async function workerCount(): Promise<number | null> {
    try {
      return await chunks.getWorkersCount();
    } catch (err) {
      if (/NOPERM/i.test(String((err as Error)?.message))) return null;
      throw err;
    }
  }

  /** Runs one batch as a flow and passes each chunk's aggregate to `accept` as it arrives (each chunk exactly once). */
  async function runBatch(runId: string, base: Omit<ChunkTask, "start" | "count">, batch: { start: number; count: number }[], accept: (agg: TrialAggregate) => void, signal: AbortSignal): Promise<void> {
    const first = batch[0].start;
    const size = batch.reduce((n, c) => n + c.count, 0);
    const parentId = `${runId}.batch.${first}.${size}`;
    const ids = batch.map((c) => chunkJobId(runId, c));
    const rangeOf = new Map(ids.map((id, k) => [id, batch[k]]));
    const open = new Set(ids);
    const poked = new Set<string>();
    let wake: (() => void) | null = null;
    const poke = (id: string) => {
      poked.add(id);
      wake?.();
    };
    for (const id of ids) pokes.set(id, () => poke(id));
    const onAbort = () => wake?.();
    signal.addEventListener("abort", onAbort);
    wakers.add(onAbort);
    let added = false;
    let redisDownSince: number | null = null;
    let noWorkersSince: number | null = null;
    let strangeErrors = 0;
    let lastSweep = 0;
    // Each look at Redis is one numbered pass; a pass given up on (timed out) can never accept a chunk afterwards,
    // and a chunk is accepted only while it is still open, in the same synchronous step that closes it.
    let pass = 0;
    const chunkJob = (id: string) => {
      const c = rangeOf.get(id)!;
      return {
        name: "chunk",
        queueName: CHUNK_QUEUE,
        data: { runId, task: { ...base, start: c.start, count: c.count } } satisfies ChunkJobData,
        // Fair sharing between runs: a chunk's priority is its place in its run (1 for the first), so a run that starts
        // beside a long one has its first chunks taken before the long run's later ones (BullMQ takes the lowest first).
        opts: { jobId: id, priority: chunkPriority(c), attempts: CHUNK_ATTEMPTS, backoff: { type: "fixed" as const, delay: 500 }, failParentOnFailure: true, removeOnComplete: KEEP_FINISHED, removeOnFail: KEEP_FINISHED },
      };
    };
    const flow = (only: readonly string[] = ids) => ({
      name: "batch",
      queueName: BATCH_QUEUE,
      data: { runId, start: first, trials: size },
      opts: { jobId: parentId, removeOnComplete: KEEP_FINISHED, removeOnFail: KEEP_FINISHED },
      children: only.map(chunkJob),
    });

    /**
     * One look at Redis. Resolves true when Redis answered at least one command in it, false when the pass asked it
     * nothing (no sweep due and no chunk poked): only an answer shows Redis reachable, so only that ends an outage.
     */
    async function onePass(gen: number): Promise<boolean> {
      const current = () => gen === pass && !signal.aborted && !closed;
      let answered = false;
      if (!added) {
        // A batch left by an earlier start of this run is reused, unless a chunk of it failed for good (BullMQ marks
        // the parent with a deferred failure, as no worker takes parents): then it is tried afresh.
        const old = await batches.getJob(parentId);
        answered = true;
        const reuse = old !== undefined && !old.deferredFailure && (await old.getState()) !== "failed";
        if (!current()) return answered;
        if (old && !reuse) await old.remove(); // "locked" while a chunk of it still runs: tried again next pass
        if (!current()) return answered;
        if (!reuse) await flows.add(flow());
        added = true;
      }
      // While Redis is away every pass is a full sweep: each one then asks Redis, so the outage is measured by
      // real attempts and its end is seen within one pass.
      const sweep = redisDownSince !== null || Date.now() - lastSweep >= pollMs;
      if (sweep) lastSweep = Date.now();
      const look = sweep ? [...open] : [...poked].filter((id) => open.has(id));
      poked.clear();
      const missing: string[] = [];
      // States are asked 100 at a time (sent together), so a 400-chunk run is a handful of round trips per sweep.
      for (let k = 0; k < look.length; k += 100) {
        const slice = look.slice(k, k + 100);
        const states = await Promise.all(slice.map((id) => chunks.getJobState(id)));
        answered = true;
        if (!current()) return answered;
        for (let j = 0; j < slice.length; j++) {
          const id = slice[j];
          const state = states[j];
          if (state === "unknown") {
            missing.push(id);
            continue;
          }
          if (state !== "completed" && state !== "failed") continue;
          // The state first, then (once completed, which it stays) the job with its return value: a job read first
          // could complete between the two reads and show no return value yet.
          const job = await chunks.getJob(id);
          if (!current()) return answered;
          if (!job) {
            missing.push(id);
          } else if (state === "completed" && open.has(id)) {
            const agg = unpackChunkResult(job.returnvalue);
            open.delete(id);
            accept(agg);
          } else if (state === "failed") {
            const r = rangeOf.get(id)!;
            throw new WorkerFailure(`A worker failed on trials ${r.start}..${r.start + r.count - 1} (${job.attemptsMade} tries): ${job.failedReason}`);
          }
        }
      }
      if (open.size === 0 || !sweep) return answered;
      const gone = missing.filter((id) => open.has(id));
      if (gone.length > 0) {
        // Redis lost these chunks (restarted without its data, or an earlier clean-up removed them): add them again.
        const parent = await batches.getJob(parentId);
        answered = true;
        if (!current()) return answered;
        log.warn("chunk_batch_missing_readded", { runId, batch: parentId, missing: gone.length, parent: parent ? "kept" : "lost" });
        if (parent) await chunks.addBulk(gone.map((id) => { const { name, data, opts } = chunkJob(id); return { name, data, opts: { ...opts, failParentOnFailure: false } }; }));
        else await flows.add(flow(gone));
      }
      const workers = await workerCount();
      answered = true;
      if (!current()) return answered;
      noWorkersSince = workers !== 0 ? null : (noWorkersSince ?? Date.now());
      if (noWorkersSince !== null && Date.now() - noWorkersSince > noWorkersMs) {
        throw new WorkerFailure(`No Lotwise worker process has been connected to Redis at ${where} for ${Math.round(noWorkersMs / 1000)} s (start one with \`npm run worker\`)`, { code: "NO_WORKERS" });
      }
      if (Date.now() - lastTrim > 10_000) {
        lastTrim = Date.now();
        await chunks.trimEvents(EVENTS_KEPT); // the stream's length setting is lost if Redis lost its data
      }
      return answered;
    }

    let stopping = false;
    try {
      for (;;) {
        if (signal.aborted) throw new EngineError("CANCELLED", "run cancelled");
        if (closed) throw new EngineError("CANCELLED", "dispatcher closed");
        const gen = ++pass;
        try {
          const answered = await within(onePass(gen), passTimeoutMs, signal);
          // A pass that asked Redis nothing proves nothing: it neither ends an outage nor starts QueueEvents.
          if (answered) {
            listen();
            if (redisDownSince !== null) log.info("redis_reachable_again", { runId, redis: where, afterMs: Date.now() - redisDownSince });
            redisDownSince = null;
            strangeErrors = 0;
          }
          if (open.size === 0) break;
        } catch (err) {
          pass++; // whatever that pass still does, it accepts nothing
          if (err instanceof EngineError || err instanceof WorkerFailure) throw err;
          if (isRedisTrouble(err)) {
            redisDownSince ??= Date.now();
            if (Date.now() - redisDownSince > outageMs) {
              throw new WorkerFailure(`Redis at ${where} could not be reached for ${Math.round(outageMs / 1000)} s: ${(err as Error).message}`, { code: "QUEUE_UNAVAILABLE", cause: err });
            }
          } else if (++strangeErrors >= 5) {
            throw new Error(`distributed run: ${(err as Error)?.message ?? String(err)}`, { cause: err });
          } else log.warn("chunk_batch_pass_failed", { runId, message: String((err as Error)?.message ?? err).slice(0, 300) });
        }
        await new Promise<void>((resolve) => {
          const timer = setTimeout(done, redisDownSince === null ? pollMs : Math.min(pollMs, 500));
          function done() {
            clearTimeout(timer);
            wake = null;
            resolve();
          }
          wake = done;
          if (poked.size > 0 || signal.aborted || closed) done();
        });
      }
    } catch (err) {
      // A server that is stopping leaves its batches in Redis: the next start re-queues the run and uses them.
      stopping = closed || signal.reason instanceof ServerStopping;
      throw err;
    } finally {
      if (!stopping) cleanUp(parentId, ids);
      signal.removeEventListener("abort", onAbort);
      wakers.delete(onAbort);
      for (const id of ids) pokes.delete(id);
    }
  }

  const remover = createBatchRemover({ chunks, batches, passTimeoutMs, isClosed: () => closed });
  const cleanUp = (parentId: string, ids: string[]) => remover.remove(parentId, ids);

  let cachedStatus: { at: number; value: Promise<DispatchStatus> } | null = null;
  async function readStatus(): Promise<DispatchStatus> {
    try {
      const [workers, counts] = await within(Promise.all([workerCount(), chunks.getJobCounts("waiting", "active", "prioritized")]), 2000, new AbortController().signal);
      return { mode: "distributed", redis: "up", workers, waitingChunks: (counts.waiting ?? 0) + (counts.prioritized ?? 0), activeChunks: counts.active ?? 0 };
    } catch {
      return { mode: "distributed", redis: "down", workers: null, waitingChunks: null, activeChunks: null };
    }
  }

  return {
    mode: "distributed",
    chunks,
    async runMonteCarlo(netlist, limits, runOptions, controls = {}) {
      const plan = shapeRun(netlist, limits, runOptions); // bad input fails here with its coded error, before Redis (no solve: the workers plan)
      const runId = controls.runId ?? randomUUID();
      const base = { netlist, limits, options: runOptions };
      const local = new AbortController();
      const abort = () => local.abort(controls.signal?.reason);
      controls.signal?.addEventListener("abort", abort, { once: true });
      if (controls.signal?.aborted) abort();
      const chunkSize = costBoundedChunkSize(plan, controls.chunkSize ?? defaultChunk);
      try {
        return await driveRun(plan, (batch, accept) => runBatch(runId, base, batch, accept, local.signal), {
          chunkSize: plan.options.targetHalfWidth === null ? chunkSize : Math.min(chunkSize, Math.ceil(plan.options.batchSize / 4)),
          onProgress: controls.onProgress,
          cancel: local.signal,
        });
      } catch (err) {
        if (controls.signal?.aborted && !(err instanceof EngineError && err.code === "CANCELLED")) throw new EngineError("CANCELLED", "run cancelled");
        throw err;
      } finally {
        controls.signal?.removeEventListener("abort", abort);
      }
    },
    /** Cached for 2 s: health is public and polled, and each look lists Redis's clients. */
    status(): Promise<DispatchStatus> {
      if (!cachedStatus || Date.now() - cachedStatus.at > 2000) cachedStatus = { at: Date.now(), value: readStatus() };
      return cachedStatus.value;
    },
    async close() {
      closed = true;
      clearInterval(sweeper);
      for (const w of [...wakers]) w();
      const bounded = (p: Promise<unknown>, ms: number) => Promise.race([p, new Promise((r) => setTimeout(r, ms).unref())]);
      // Let the removal of finished batches end, then close; both bounded, as Redis may be away.
      await bounded(Promise.allSettled(remover.pending()), 3000);
      // A connection that never reached Redis can keep close() (QueueEvents) waiting: bounded, then dropped.
      const conns = [events, flows, batches, chunks].filter((c) => c !== null);
      await bounded(Promise.allSettled(conns.map((c) => c.close())), 5000);
      await bounded(Promise.allSettled(conns.map((c) => c.disconnect())), 1000);
    },
  };
}
