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
 *   run fails with QUEUE_UNAVAILABLE, and after `noWorkersMs` (default 10 min) with no worker process connected
 *   it fails with NO_WORKERS — never a silent hang. Its inputs stay stored in MariaDB either way.
 * - Cancel: the run's waiting chunks are removed; chunks already running finish and are dropped, then the
 *   batch is removed.
 */
import { randomUUID } from "node:crypto";
import { FlowProducer, Queue, QueueEvents } from "bullmq";
import type { TrialAggregate } from "../../shared/engine/aggregate";
import { EngineError } from "../../shared/engine/errors";
import { driveRun, validateChunkSize, type ChunkTask } from "../../shared/engine/monte-carlo";
import { planRun } from "../../shared/engine/run-plan";
import { createLogger, type Logger } from "../logger";
import {
  BATCH_QUEUE, CHUNK_ATTEMPTS, CHUNK_QUEUE, CHUNK_QUEUE_PREFIX, chunkJobId, redisConnection, unpackChunkResult,
  type ChunkJobData, type ChunkJobResult,
} from "./chunk-jobs";
import type { DispatchStatus, RunDispatcher } from "./dispatcher";
import { WorkerFailure } from "./trial-pool";

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
/** Events kept in the chunk queue's stream (BullMQ's default of 10,000 would hold gigabytes of chunk results). */
export const EVENTS_KEPT = 100;

export function createDistributedDispatcher(options: DistributedDispatcherOptions): DistributedDispatcher {
  const log = options.log ?? createLogger();
  const defaultChunk = validateChunkSize(options.chunkSize);
  const outageMs = options.outageMs ?? 60_000;
  const noWorkersMs = options.noWorkersMs ?? 600_000;
  const pollMs = options.pollMs ?? 1000;
  const where = redactUrl(options.redisUrl);
  const producer = redisConnection(options.redisUrl, "producer");
  // BullMQ copies a job's return value into its event stream; a chunk's is ~0.1–0.5 MB, so the stream is kept short
  // (the poll covers an event trimmed before it was read).
  const chunks = new Queue<ChunkJobData, ChunkJobResult>(CHUNK_QUEUE, { connection: producer, prefix: CHUNK_QUEUE_PREFIX, streams: { events: { maxLen: EVENTS_KEPT } } });
  const batches = new Queue(BATCH_QUEUE, { connection: producer, prefix: CHUNK_QUEUE_PREFIX });
  const flows = new FlowProducer({ connection: producer, prefix: CHUNK_QUEUE_PREFIX });
  const events = new QueueEvents(CHUNK_QUEUE, { connection: redisConnection(options.redisUrl, "worker"), prefix: CHUNK_QUEUE_PREFIX });
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
  events.on("error", onRedisError);
  const pokes = new Map<string, () => void>();
  events.on("completed", ({ jobId }) => pokes.get(jobId)?.());
  events.on("failed", ({ jobId }) => pokes.get(jobId)?.());
  events.on("stalled", ({ jobId }) => log.warn("chunk_job_stalled", { jobId }));
  let closed = false;
  const wakers = new Set<() => void>();

  /** Runs one batch as a flow and passes each chunk's aggregate to `accept` as it arrives. */
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
    let lastSweep = 0;
    const flow = () => ({
      name: "batch",
      queueName: BATCH_QUEUE,
      data: { runId, start: first, trials: size },
      opts: { jobId: parentId, removeOnComplete: KEEP_FINISHED, removeOnFail: KEEP_FINISHED },
      children: batch.map((c, k) => ({
        name: "chunk",
        queueName: CHUNK_QUEUE,
        data: { runId, task: { ...base, start: c.start, count: c.count } } satisfies ChunkJobData,
        opts: { jobId: ids[k], attempts: CHUNK_ATTEMPTS, backoff: { type: "fixed", delay: 500 }, failParentOnFailure: true, removeOnComplete: false, removeOnFail: false },
      })),
    });
    try {
      for (;;) {
        if (signal.aborted) throw new EngineError("CANCELLED", "run cancelled");
        if (closed) throw new EngineError("CANCELLED", "dispatcher closed");
        try {
          if (!added) {
            // A batch left by an earlier start of this run is reused, unless it failed (then it is tried afresh).
            const old = await batches.getJob(parentId);
            const reuse = old !== undefined && (await old.getState()) !== "failed";
            if (old && !reuse) await old.remove();
            if (!reuse) await flows.add(flow());
            added = true;
          }
          const sweep = Date.now() - lastSweep >= pollMs;
          const look = sweep ? [...open] : [...poked].filter((id) => open.has(id));
          poked.clear();
          let missing = 0;
          for (const id of look) {
            const job = await chunks.getJob(id);
            if (!job) {
              missing++;
              continue;
            }
            if (job.finishedOn && job.returnvalue != null && !job.failedReason) {
              accept(unpackChunkResult(job.returnvalue));
              open.delete(id);
            } else if ((await job.getState()) === "failed") {
              const r = rangeOf.get(id)!;
              throw new WorkerFailure(`A worker failed on trials ${r.start}..${r.start + r.count - 1} (${job.attemptsMade} tries): ${job.failedReason}`);
            }
          }
          if (open.size === 0) break;
          if (sweep) {
            lastSweep = Date.now();
            if (missing > 0 && (await batches.getJob(parentId)) === undefined) {
              // Redis came back without this batch (restarted without its data): add it again and go on.
              log.warn("chunk_batch_missing_readded", { runId, batch: parentId, missing });
              await flows.add({ ...flow(), children: flow().children.filter((c) => open.has(c.opts.jobId)) });
            }
            const workers = await chunks.getWorkersCount();
            noWorkersSince = workers > 0 ? null : (noWorkersSince ?? Date.now());
            if (noWorkersSince !== null && Date.now() - noWorkersSince > noWorkersMs) {
              throw new WorkerFailure(`No Lotwise worker process has been connected to Redis at ${where} for ${Math.round(noWorkersMs / 1000)} s (start one with \`npm run worker\`)`, { code: "NO_WORKERS" });
            }
          }
          if (redisDownSince !== null) log.info("redis_reachable_again", { runId, redis: where, afterMs: Date.now() - redisDownSince });
          redisDownSince = null;
        } catch (err) {
          if (err instanceof EngineError || err instanceof WorkerFailure) throw err;
          redisDownSince ??= Date.now();
          if (Date.now() - redisDownSince > outageMs) {
            throw new WorkerFailure(`Redis at ${where} could not be reached for ${Math.round(outageMs / 1000)} s: ${(err as Error).message}`, { code: "QUEUE_UNAVAILABLE", cause: err });
          }
        }
        await new Promise<void>((resolve) => {
          const timer = setTimeout(done, redisDownSince === null ? pollMs : Math.min(pollMs, 500));
          function done() {
            clearTimeout(timer);
            wake = null;
            resolve();
          }
          wake = done;
          if (poked.size > 0 || signal.aborted) done();
        });
      }
      cleanUp(parentId, ids);
    } catch (err) {
      cleanUp(parentId, ids);
      throw err;
    } finally {
      signal.removeEventListener("abort", onAbort);
      wakers.delete(onAbort);
      for (const id of ids) pokes.delete(id);
    }
  }

  const removals = new Set<Promise<void>>();
  function cleanUp(parentId: string, ids: string[]): void {
    const p = removeBatch(parentId, ids, 0).finally(() => removals.delete(p));
    removals.add(p);
  }

  /**
   * Removes a batch from Redis once nothing of it is running: its chunks, then the parent. A chunk still running
   * (after a cancel or a failure), or Redis may be away, so what is left is tried again up to 10 times, 2 s apart
   * doubling to 1 min (about 6 min in all); a finished job still left then is dropped by BullMQ after a day.
   */
  async function removeBatch(parentId: string, ids: string[], attempt: number): Promise<void> {
    const left: string[] = [];
    try {
      for (const id of ids) {
        const ok = await chunks.getJob(id).then((j) => j?.remove()).then(() => true, () => false);
        if (!ok) left.push(id);
      }
      await (await batches.getJob(parentId))?.remove();
    } catch {
      left.push("");
    }
    if (left.length > 0 && attempt < 10 && !closed) setTimeout(() => void removeBatch(parentId, left.filter(Boolean), attempt + 1), Math.min(2000 * 2 ** attempt, 60_000)).unref();
  }

  return {
    mode: "distributed",
    chunks,
    async runMonteCarlo(netlist, limits, runOptions, controls = {}) {
      const plan = planRun(netlist, limits, runOptions); // bad input fails here with its coded error, before Redis
      const runId = controls.runId ?? randomUUID();
      const base = { netlist, limits, options: runOptions };
      const local = new AbortController();
      const abort = () => local.abort();
      controls.signal?.addEventListener("abort", abort, { once: true });
      if (controls.signal?.aborted) local.abort();
      const chunkSize = controls.chunkSize ?? defaultChunk;
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
    async status(): Promise<DispatchStatus> {
      try {
        const [workers, counts] = await Promise.all([chunks.getWorkersCount(), chunks.getJobCounts("waiting", "active", "prioritized")]);
        return { mode: "distributed", redis: "up", workers, waitingChunks: (counts.waiting ?? 0) + (counts.prioritized ?? 0), activeChunks: counts.active ?? 0 };
      } catch {
        return { mode: "distributed", redis: "down", workers: null, waitingChunks: null, activeChunks: null };
      }
    },
    async close() {
      closed = true;
      for (const w of [...wakers]) w();
      // Let the removal of finished batches end (bounded: Redis may be away).
      await Promise.race([Promise.allSettled([...removals]), new Promise((r) => setTimeout(r, 3000).unref())]);
      await Promise.allSettled([events.close(), flows.close(), batches.close(), chunks.close()]);
    },
  };
}

/** The URL without its password, for messages and logs. */
export function redactUrl(raw: string): string {
  try {
    const u = new URL(raw);
    if (u.password) u.password = "***";
    return u.toString();
  } catch {
    return "(unreadable URL)";
  }
}
