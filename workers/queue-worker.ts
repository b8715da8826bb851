/**
 * A Lotwise worker process for distributed mode: `npm run worker` on any host that reaches the Redis the server
 * uses. It takes chunk jobs (server/engine/chunk-jobs.ts) from BullMQ, runs each on its own piscina pool (the same
 * workers/trials.worker.ts threads the embedded mode uses) and returns the chunk's packed aggregate. It needs no
 * database, no mail and no inbound port: only Redis.
 *
 * Settings (environment):
 *   LOTWISE_REDIS_URL       required, e.g. redis://10.0.0.5:6390/ (the server's value)
 *   LOTWISE_WORKER_THREADS  trial threads, and so chunks at once (default: the host's cores)
 *   LOTWISE_WORKER_NAME     how this process shows in job records (default: <hostname>-<pid>)
 *   LOTWISE_CHUNK_LOCK_MS   lock time of a running chunk, renewed every half of it (default 10000). A process
 *                           that dies stops renewing; after this long, plus at most LOTWISE_STALLED_CHECK_MS
 *                           (default 5000), another worker's stalled-job check puts the chunk back and it is
 *                           run again. Every worker of one queue should use the same values.
 * SIGTERM or SIGINT: stops taking chunks, gives the running ones 30 s to finish, exits 0.
 */
import os from "node:os";
import { Worker } from "bullmq";
import { CHUNK_QUEUE, CHUNK_QUEUE_PREFIX, packAggregate, redactUrl, redisConnection, type ChunkJobData, type ChunkJobResult } from "../server/engine/chunk-jobs";
import { createTrialPool } from "./trial-pool";
import { redisUrlProblem } from "../server/config/env";
import { createLogger } from "../server/logger";
import { isEngineError } from "../shared/engine/errors";
import { serializeEngineError } from "../shared/engine/task-errors";

const log = createLogger();

function setting(name: string, fallback: number, min: number, max: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw.trim() === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min || n > max) fail(`${name}: must be an integer ${min}..${max} (got "${raw}")`);
  return n;
}

function fail(message: string): never {
  process.stderr.write(`lotwise worker: ${message}\n`);
  process.exit(2);
}

const redisUrl = process.env.LOTWISE_REDIS_URL?.trim();
if (!redisUrl) fail("LOTWISE_REDIS_URL is not set: give the Redis URL the server uses, e.g. LOTWISE_REDIS_URL=redis://127.0.0.1:6390/ npm run worker");
const problem = redisUrlProblem(redisUrl);
if (problem) fail(`LOTWISE_REDIS_URL: ${problem}`);
const threads = setting("LOTWISE_WORKER_THREADS", os.availableParallelism(), 1, 256);
const lockDuration = setting("LOTWISE_CHUNK_LOCK_MS", 10_000, 500, 600_000);
const stalledInterval = setting("LOTWISE_STALLED_CHECK_MS", 5_000, 200, 600_000);
const name = process.env.LOTWISE_WORKER_NAME?.trim() || `${os.hostname()}-${process.pid}`;

const pool = createTrialPool({ size: threads, log });
// Test-only hook (ignored when NODE_ENV is production): LOTWISE_TEST_CHUNK_FAULT="failfirst:SEED:START" makes the
// first try of every chunk of a run with that seed whose first trial is ≥ START throw, so its retry must succeed.
const firstTryFaults = (process.env.NODE_ENV === "production" ? "" : (process.env.LOTWISE_TEST_CHUNK_FAULT ?? "")).split(",").flatMap((spec) => {
  const m = /^failfirst:([^:]+):(\d+)$/.exec(spec.trim());
  return m ? [{ seed: m[1], start: Number(m[2]) }] : [];
});
let chunksDone = 0;

const worker = new Worker<ChunkJobData, ChunkJobResult>(
  CHUNK_QUEUE,
  async (job) => {
    const task = job.data.task;
    if (job.attemptsMade === 0 && firstTryFaults.some((f) => String(task?.options?.seed) === f.seed && task.start >= f.start)) {
      throw new Error(`test fault: the first try of trials ${task.start}.. fails`);
    }
    try {
      const started = Date.now();
      const packed = packAggregate(await pool.runChunkPacked(job.data.task));
      chunksDone++;
      log.info("chunk_done", { worker: name, jobId: job.id, trials: job.data.task.count, ms: Date.now() - started, bytes: packed.aggregate.length });
      return packed;
    } catch (err) {
      // Bad input fails the same way on every try: return it (no retry). A dead thread is thrown: BullMQ retries.
      if (isEngineError(err) && err.code !== "CANCELLED") return { error: serializeEngineError(err) };
      throw err;
    }
  },
  {
    connection: redisConnection(redisUrl, "worker"),
    prefix: CHUNK_QUEUE_PREFIX,
    name,
    // One chunk more than threads: the next chunk waits in the pool while a thread works, so no thread idles
    // while a finished chunk is sent and the next one fetched.
    concurrency: threads + 1,
    lockDuration,
    stalledInterval,
    maxStalledCount: 2,
  },
);

let lastErrorLog = 0;
worker.on("error", (err) => {
  if (Date.now() - lastErrorLog < 10_000) return;
  lastErrorLog = Date.now();
  log.warn("worker_redis_error", { worker: name, message: String(err?.message ?? err).slice(0, 200) });
});
worker.on("failed", (job, err) => log.warn("chunk_failed", { worker: name, jobId: job?.id, attempt: job?.attemptsMade, message: err.message.slice(0, 300) }));
worker.on("stalled", (jobId) => log.warn("chunk_stalled_requeued", { worker: name, jobId }));
worker.on("ready", () => log.info("worker_ready", { worker: name, threads, redis: redactUrl(redisUrl), lockDuration, stalledInterval }));

let stopping = false;
async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  log.info("worker_stopping", { worker: name, signal, chunksDone });
  // Running chunks get 30 s to finish (their results need Redis); after that, or while Redis is away, stop anyway:
  // a chunk left unfinished comes back to the queue when its lock runs out.
  const finished = await Promise.race([worker.close().then(() => true), new Promise<boolean>((r) => setTimeout(() => r(false), 30_000).unref())]);
  if (!finished) await Promise.race([worker.close(true), new Promise((r) => setTimeout(r, 2000).unref())]);
  await pool.close();
  process.exit(0);
}
process.on("SIGTERM", () => void stop("SIGTERM"));
process.on("SIGINT", () => void stop("SIGINT"));
