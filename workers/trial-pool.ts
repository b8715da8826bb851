/**
 * The Monte Carlo worker pool: piscina threads running workers/trials.worker.ts.
 *
 * A run is split into chunks (default 2500 trials; batches of `batchSize` first when the run stops
 * when sure), the chunks run on the pool in parallel, their aggregates merge exactly and the result
 * is finalized in this thread: the same seed gives the same result whatever the pool size or chunk
 * size. A chunk that fails fails its run with the chunk's EngineError, or with a WorkerFailure when
 * its worker thread exited or threw a plain Error; the pool keeps serving other runs (piscina replaces
 * a crashed thread). Cancellation: an AbortSignal aborts the run's queued and running tasks.
 */
import { randomUUID } from "node:crypto";
import { setMaxListeners } from "node:events";
import os from "node:os";
import { Piscina } from "piscina";
import { decodeAggregate, type TrialAggregate } from "../shared/engine/aggregate";
import { EngineError } from "../shared/engine/errors";
import { costBoundedChunkSize, driveRun, validateChunkSize, type ChunkTask } from "../shared/engine/monte-carlo";
import type { Netlist } from "../shared/engine/netlist";
import type { RunResult } from "../shared/engine/result";
import type { RunOptions } from "../shared/engine/run-options";
import { shapeRun, trialCost } from "../shared/engine/run-plan";
import { createLogger, type Logger } from "../server/logger";
import { createFairGate } from "./fair-gate";
import { deserializeEngineError } from "../shared/engine/task-errors";
import type { TrialsWorkerResult } from "./trials.worker";

/**
 * A chunk task that failed outside the engine: its worker thread exited or threw a plain Error (not an
 * EngineError). The run fails with code WORKER_FAILED and this message; piscina replaces the thread.
 */
export class WorkerFailure extends Error {
  /** the run's failure code: WORKER_FAILED, or in distributed mode QUEUE_UNAVAILABLE / NO_WORKERS */
  readonly code: "WORKER_FAILED" | "QUEUE_UNAVAILABLE" | "NO_WORKERS";
  constructor(message: string, options?: { cause?: unknown; code?: WorkerFailure["code"] }) {
    super(message, options);
    this.name = "WorkerFailure";
    this.code = options?.code ?? "WORKER_FAILED";
  }
}

/**
 * The abort reason the run queue gives when the server stops (as opposed to a cancel): distributed mode then leaves
 * the run's chunk jobs in Redis, so the next start, which re-queues the run, uses the chunks finished meanwhile.
 */
export class ServerStopping extends Error {
  constructor() {
    super("server stopping");
    this.name = "ServerStopping";
  }
}

/** Pool settings. */
export interface TrialPoolOptions {
  /** worker threads (default os.availableParallelism()) */
  size?: number;
  /** trials per chunk task (default 2500) */
  chunkSize?: number;
  /** where the pool's own errors go (default: a JSON log line on stderr, see the `error` listener below) */
  log?: Logger;
}

/** Per-run controls. */
export interface RunControls {
  signal?: AbortSignal;
  onProgress?: (progress: { done: number; total: number }) => void;
  /** overrides the pool's chunk size for this run */
  chunkSize?: number;
}

/** A pool that runs Monte Carlo analyses. */
export interface TrialPool {
  readonly size: number;
  runMonteCarlo(netlist: Netlist, limits: unknown, options: RunOptions, controls?: RunControls): Promise<RunResult>;
  /** Runs one chunk task on a worker as given (validated there) and returns its aggregate. */
  runChunk(task: ChunkTask, signal?: AbortSignal): Promise<TrialAggregate>;
  /** As runChunk, with the aggregate left packed (encodeAggregate). */
  runChunkPacked(task: ChunkTask, signal?: AbortSignal): Promise<Uint8Array>;
  close(): Promise<void>;
}

/**
 * Starts a pool.
 * @throws EngineError INVALID_INPUT for a bad size or chunk size
 */
export function createTrialPool(options: TrialPoolOptions = {}): TrialPool {
  const size = options.size ?? os.availableParallelism();
  if (!Number.isInteger(size) || size < 1 || size > 256) throw new EngineError("INVALID_INPUT", "pool `size` must be an integer 1..256", { path: "size" });
  const defaultChunk = validateChunkSize(options.chunkSize);
  const isTs = import.meta.url.endsWith(".ts");
  const needsTsx = isTs && !process.execArgv.some((a) => a.includes("tsx"));
  const piscina = new Piscina({
    filename: new URL(`./trials.worker.${isTs ? "ts" : "js"}`, import.meta.url).href,
    execArgv: needsTsx ? [...process.execArgv, "--import", "tsx"] : undefined,
    minThreads: size,
    maxThreads: size,
    idleTimeout: 60_000,
  });
  // Piscina emits 'error' for what belongs to no task: a reply from a thread it has just terminated (a running
  // chunk of a run that was aborted after another chunk failed) or the death of an idle thread. An EventEmitter
  // 'error' without a listener throws, which would stop the whole server; log it instead (the tasks concerned
  // have already been rejected, and piscina replaces the thread).
  const log = options.log ?? createLogger();
  piscina.on("error", (err: Error) => log.warn("trial_pool_stray_error", { message: String(err?.message ?? err).slice(0, 300) }));

  const gate = createFairGate(size);

  /**
   * One chunk on the pool (piscina runs one task per thread at a time: a thread's death takes only its own chunk).
   * The chunk first waits for a thread at the fair gate under its run's `key`, so runs executing at once share the
   * threads (fair-gate.ts) instead of queuing behind each other's chunks.
   */
  async function runChunk(base: Omit<ChunkTask, "start" | "count">, chunk: { start: number; count: number }, signal?: AbortSignal, share?: { key: string; perTrialCost: number }): Promise<TrialAggregate> {
    let out: TrialsWorkerResult;
    let release: (() => void) | null = null;
    try {
      if (share) release = await gate.acquire(share.key, chunk.count * share.perTrialCost, signal);
      out = await piscina.run({ ...base, ...chunk }, { signal });
    } catch (err) {
      if (signal?.aborted || (err as Error)?.name === "AbortError") throw new EngineError("CANCELLED", "run cancelled");
      const message = err instanceof Error ? err.message : String(err);
      throw new WorkerFailure(`A worker failed on trials ${chunk.start}..${chunk.start + chunk.count - 1}: ${message}`, { cause: err });
    } finally {
      release?.();
    }
    if (out instanceof Uint8Array) return decodeAggregate(out);
    throw deserializeEngineError(out.error);
  }

  /** One chunk task as given, its aggregate still packed (encodeAggregate): what a worker process sends on. */
  async function runChunkPacked(task: ChunkTask, signal?: AbortSignal): Promise<Uint8Array> {
    let out: TrialsWorkerResult;
    try {
      out = await piscina.run(task, { signal });
    } catch (err) {
      if (signal?.aborted || (err as Error)?.name === "AbortError") throw new EngineError("CANCELLED", "run cancelled");
      throw new WorkerFailure(`A worker thread failed on trials ${task?.start}..${task?.start + task?.count - 1}: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
    }
    if (out instanceof Uint8Array) return out;
    throw deserializeEngineError(out.error);
  }

  return {
    size,
    async runMonteCarlo(netlist, limits, runOptions, controls = {}) {
      // Validate and plan here too: bad input fails fast with its coded error, and finalizing needs the plan.
      // Validate here too, short of solving: bad input fails fast with its coded error. The plan itself (seconds for
      // the largest runs) is built by the workers, never on this thread, which answers requests.
      const plan = shapeRun(netlist, limits, runOptions);
      const base = { netlist, limits, options: runOptions };
      const share = { key: randomUUID(), perTrialCost: trialCost(plan) };
      const local = new AbortController();
      setMaxListeners(0, local.signal); // one listener per queued chunk task
      const abort = () => local.abort();
      controls.signal?.addEventListener("abort", abort, { once: true });
      if (controls.signal?.aborted) local.abort();
      try {
        return await driveRun(
          plan,
          async (chunks, accept) => {
            // Promise.all rejects on the first failing chunk; the catch below then aborts the rest.
            await Promise.all(chunks.map((c) => runChunk(base, c, local.signal, share).then(accept)));
          },
          { chunkSize: chunkSizeFor(plan.options, costBoundedChunkSize(plan, controls.chunkSize ?? defaultChunk), size), onProgress: controls.onProgress, cancel: local.signal },
        );
      } catch (err) {
        local.abort(); // drop this run's queued chunks
        if (controls.signal?.aborted && !(err instanceof EngineError && err.code === "CANCELLED")) throw new EngineError("CANCELLED", "run cancelled");
        throw err;
      } finally {
        controls.signal?.removeEventListener("abort", abort);
        gate.forget(share.key);
      }
    },
    runChunk: (task, signal) => runChunk(task, { start: task.start, count: task.count }, signal),
    runChunkPacked,
    close: () => piscina.destroy(),
  };
}

/**
 * Chunk size for a run: in stop-when-sure mode a batch is split across every thread
 * (≤ ⌈batchSize/size⌉ trials per chunk); chunking never changes the result, only the speed.
 */
function chunkSizeFor(options: { targetHalfWidth: number | null; batchSize: number }, chunkSize: number, size: number): number {
  return options.targetHalfWidth === null ? chunkSize : Math.min(chunkSize, Math.ceil(options.batchSize / size));
}
