/**
 * What the server and the worker processes agree on in distributed mode (BullMQ on Redis).
 *
 * - One BullMQ queue, `chunks`, under the key prefix `lotwise`. A job is one chunk of one run: the run's
 *   inputs (netlist, limits, options) and its trial range, so a worker needs nothing but Redis.
 * - Job id `<runId>.<start>.<count>`: the same chunk of the same run always has the same id, so adding it
 *   twice is a no-op, and a run re-started after a server restart picks up chunks finished before it.
 * - A job's return value is a ChunkJobResult: the chunk's aggregate (encodeAggregate), deflated and base64
 *   encoded (the envelope counts are mostly zeros: ~2 MB become a few tens of kB), or the chunk's EngineError
 *   as plain data (bad input gives the same error on every attempt, so it is returned, not thrown: no retry).
 *   Anything else a worker hits (its thread died, the process is killed) is thrown or stalls, and BullMQ
 *   retries the chunk on some worker (attempts, stalled-job recovery).
 */
import { deflateRawSync, inflateRawSync } from "node:zlib";
import type { ConnectionOptions } from "bullmq";
import { decodeAggregate, type TrialAggregate } from "../../shared/engine/aggregate";
import { EngineError } from "../../shared/engine/errors";
import type { ChunkTask } from "../../shared/engine/monte-carlo";
import { deserializeEngineError, type SerializedEngineError } from "../../shared/engine/task-errors";

export const CHUNK_QUEUE = "chunks";
/** The flow parents: one job per batch of a run, which no worker takes (see distributed-dispatcher.ts). */
export const BATCH_QUEUE = "batches";
export const CHUNK_QUEUE_PREFIX = "lotwise";
/** Tries per chunk before its run fails (a thrown error or a stall beyond maxStalledCount ends a try). */
export const CHUNK_ATTEMPTS = 3;

/** A chunk job's data. */
export interface ChunkJobData {
  runId: string;
  task: ChunkTask;
}

/** A chunk job's return value. */
export type ChunkJobResult = { aggregate: string } | { error: SerializedEngineError };

/** The job id of one chunk of one run. */
export function chunkJobId(runId: string, chunk: { start: number; count: number }): string {
  return `${runId}.${chunk.start}.${chunk.count}`;
}

/** Packs an encoded aggregate for Redis. */
export function packAggregate(bytes: Uint8Array): { aggregate: string } {
  return { aggregate: deflateRawSync(bytes, { level: 1 }).toString("base64") }; // level 1: ~9 ms for 2 MB, 8× smaller
}

/**
 * Unpacks a job's return value.
 * @throws EngineError (the chunk's own coded error, or INVALID_INPUT for a value that is not a chunk result)
 */
export function unpackChunkResult(value: unknown): TrialAggregate {
  const v = value as Partial<{ aggregate: unknown; error: SerializedEngineError }> | null;
  if (v && typeof v.aggregate === "string") return decodeAggregate(new Uint8Array(inflateRawSync(Buffer.from(v.aggregate, "base64"))));
  if (v && v.error && typeof v.error.code === "string") throw deserializeEngineError(v.error);
  throw new EngineError("INVALID_INPUT", "a chunk job returned something that is not a chunk result", { path: "returnvalue" });
}

/**
 * BullMQ connection options from a redis:// or rediss:// URL.
 * `role` "worker": commands wait while Redis is away (BullMQ's workers need maxRetriesPerRequest null);
 * "producer": commands fail at once while it is away, so the server notices an outage instead of hanging.
 */
export function redisConnection(url: string, role: "worker" | "producer"): ConnectionOptions {
  // TCP keep-alive every 10 s, so a link that was cut (a host unplugged, a network partition) is noticed and
  // reconnected rather than waited on.
  const common = { url, keepAlive: 10_000, retryStrategy: (times: number) => Math.min(100 * times, 2000) };
  return role === "worker"
    ? { ...common, maxRetriesPerRequest: null }
    : { ...common, maxRetriesPerRequest: 1, enableOfflineQueue: false, commandTimeout: 5000 };
}

/** The URL without its password or query (ioredis also reads `?password=`), for messages and logs. */
export function redactUrl(raw: string): string {
  try {
    const u = new URL(raw);
    if (u.password) u.password = "***";
    u.search = "";
    return u.toString();
  } catch {
    return "(unreadable URL)";
  }
}
